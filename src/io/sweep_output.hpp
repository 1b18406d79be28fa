// A sweep's results: one NetCDF with a `variant` dimension and a ranked CSV table.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "analysis/score.hpp"
#include "analysis/sweep.hpp"
#include "analysis/sweep_runner.hpp"
#include "core/background.hpp"
#include "io/netcdf_file.hpp"

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

void write_sweep_netcdf(NcWriter& nc, const Background& bg, const SweepResults& r,
                        const std::vector<std::size_t>& ranking);

/// The ranked table as CSV (rank, variant, label, status, scores, iterations, residual, ...).
std::string sweep_table_csv(const SweepResults& r, const std::vector<std::size_t>& ranking,
                            const std::string& rank_by);
/// The same for the terminal.
std::string sweep_table_text(const SweepResults& r, const std::vector<std::size_t>& ranking,
                             const std::string& rank_by);

/// What a variant's entry in a sweep file holds (variable variant_state).
enum class VariantState : int { kNotRun = 0, kConverged = 1, kFailed = 2, kInterrupted = 3 };

/// A sweep file read back: its definition and every variant's recorded outcome (to resume
/// a sweep, merge pieces of one, or run one of its variants).
struct SweepFileRecord {
  std::filesystem::path file;
  std::string definition;       ///< colchem_sweep_definition ("what: digest" lines)
  std::string definition_hash;  ///< colchem_sweep_definition_hash
  std::string scenario;         ///< colchem_sweep_scenario (the base scenario file)
  std::string piece;            ///< colchem_sweep_piece ("A:B"), empty for a whole sweep
  std::vector<std::string> labels, status, overrides;  ///< overrides: "\n"-separated
  std::vector<VariantState> state;
  std::vector<VariantOutcome> outcomes;  ///< values = mole fractions, state left empty
};

/// Reads a sweep file written by write_sweep_netcdf; throws InputError (exit 4) for a file
/// that is not one (naming the file and what is missing).
SweepFileRecord read_sweep_file(const std::filesystem::path& file);

/// For commands that take a run file: when `nc` is a sweep file, the message saying so and
/// how to get a run file of one of its variants; else empty.
std::string sweep_file_instead_of_run(const NcReader& nc);

/// Writes text to a file through a temporary and a rename.
void write_text_file(const std::filesystem::path& file, const std::string& text);

}  // namespace colchem
