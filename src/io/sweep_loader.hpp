// Sweep files (README "Sweeps"): YAML -> SweepSpec.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "analysis/sweep.hpp"
#include "core/units.hpp"

namespace colchem {

/// Loads and checks a sweep file; `overrides` are "--set" strings applied to the sweep file
/// itself. Throws InputError (ExitCode::kConfig).
SweepSpec load_sweep(const std::filesystem::path& file, const std::vector<std::string>& overrides);

}  // namespace colchem
