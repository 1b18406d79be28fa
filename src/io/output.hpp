// Reading colchem's own files back: the species profiles of a run file (compare, restart,
// photo --from) and the reaction diagnostics `colchem budget` needs, every value checked
// (shape, finite, altitudes increasing, densities not negative) before use; and the refusal
// of an output path that names an input.
#pragma once

#include <filesystem>
#include <string>
#include <utility>
#include <vector>

#include "core/model_column.hpp"
#include "io/netcdf_file.hpp"

namespace colchem {

/// Refuses (exit 6, before anything is computed) an output path that names one of the
/// inputs (`inputs`: what the file is, e.g. "the scenario file", and its path): writing it
/// would overwrite the input. Paths are compared as files (links and relative paths
/// resolved), so "./a.yaml" and "a.yaml" are the same; inputs that do not exist are skipped.
void refuse_output_onto_input(
    const std::filesystem::path& output,
    const std::vector<std::pair<std::string, std::filesystem::path>>& inputs);

/// The species profiles of a run file (read back for compare, restart and budgets).
ModelColumn read_model_column(const NcReader& nc);
ModelColumn read_model_column(const std::filesystem::path& file);

/// What `colchem budget` needs from a run file.
struct BudgetInputs;
BudgetInputs read_budget_inputs(const NcReader& nc);

}  // namespace colchem
