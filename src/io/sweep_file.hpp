// A sweep file read back (written by report/sweep_report.hpp through write_dataset): its
// definition and every variant's recorded outcome, to resume a sweep, merge pieces of one,
// or run one of its variants.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "analysis/sweep_runner.hpp"
#include "io/netcdf_file.hpp"

namespace colchem {

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

/// Reads a sweep file; throws InputError (exit 4) for a file that is not one (naming the
/// file and what is missing).
SweepFileRecord read_sweep_file(const std::filesystem::path& file);

/// For commands that take a run file: when `nc` is a sweep file, the message saying so and
/// how to get a run file of one of its variants; else empty.
std::string sweep_file_instead_of_run(const NcReader& nc);

}  // namespace colchem
