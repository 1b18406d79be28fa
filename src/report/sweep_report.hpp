// A sweep's results: the file (a `variant` dimension) as a Dataset, the ranking of the
// variants and the ranked table (CSV and terminal).
#pragma once

#include <string>
#include <vector>

#include "analysis/score.hpp"
#include "analysis/sweep.hpp"
#include "analysis/sweep_runner.hpp"
#include "core/background.hpp"
#include "core/dataset.hpp"

namespace colchem {

/// Every variant's decoded result, in variant order.
struct SweepResults {
  std::vector<Variant> variants;
  std::vector<VariantOutcome> outcomes;
  std::vector<std::string> species;
  /// [v][s*N + j] mole fractions (NaN for a failed variant).
  std::vector<std::vector<double>> mole_fraction;
  /// Scores of each variant (empty without observations); NaN-filled for failed variants.
  std::vector<std::vector<SpeciesScore>> scores;
  std::vector<std::string> parameter_names;
  std::vector<std::string> module_names;
};

/// Ranking by `rank_by` (a score summed over the scored species); failed variants last.
/// Returns variant indices, best first.
std::vector<std::size_t> rank_variants(const SweepResults& r, const std::string& rank_by);

/// The sweep's variables after the provenance and the sweep's global attributes: the base
/// background, every variant's outcome and mole fractions, parameters, modules and scores
/// (read back by io/sweep_file.hpp).
void add_sweep(Dataset& ds, const Background& bg, const SweepResults& r,
               const std::vector<std::size_t>& ranking);

/// The ranked table as CSV (rank, variant, label, status, scores, iterations, residual, ...).
std::string sweep_table_csv(const SweepResults& r, const std::vector<std::size_t>& ranking,
                            const std::string& rank_by);
/// The same for the terminal.
std::string sweep_table_text(const SweepResults& r, const std::vector<std::size_t>& ranking,
                             const std::string& rank_by);

}  // namespace colchem
