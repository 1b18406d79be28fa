// Observed profiles: the observation file format (README "Observation files").
//
//   # source or "INVENTED" label
//   altitude [km], species, value [ppm], uncertainty [ppm], upper_limit
//   64, SO2, 0.20, 0.06, 0
//   88, SO2, 0.10, 0, 1
//
// value and uncertainty are mole fractions in any dimensionless UDUNITS-2 unit (1, ppm, ppb,
// ppt, %); uncertainty is one standard deviation; upper_limit is 0 (a detection) or 1 (the
// value is an upper limit). Several species may share a file.
//
// Two optional columns:
//   altitude_uncertainty [km]  one standard deviation of the altitude the point belongs to;
//                              the score widens the point's sigma by the model's local slope
//                              (analysis/score.hpp).
//   kernel                     "-" for none, or PATH or PATH:COLUMN: the point's averaging
//                              kernel row, a table (path relative to the observation file)
//                              with columns altitude [km], the weight column (named COLUMN,
//                              else "weight", dimensionless) and optionally a_priori (a mole
//                              fraction). One kernel file may hold the rows of several points
//                              as several weight columns.
// Any other column is ignored with a warning naming the file, the column and the known ones.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "core/error.hpp"
#include "core/units.hpp"

namespace colchem {

/// One row a_i of an averaging kernel (Rodgers 2000, "Inverse Methods for Atmospheric
/// Sounding", ch. 2-3): weights a_ik at altitudes z_k and, when given, the a-priori profile
/// x_a(z_k) and its value at the observed altitude.
struct AveragingKernel {
  std::string source;  ///< "file:column" as named in the observation file
  std::vector<double> altitude_cm;
  std::vector<double> weight;
  std::vector<double> a_priori;    ///< mole fractions at altitude_cm; empty: no a-priori term
  double a_priori_at_point = 0.0;  ///< x_a at the observed altitude (linear interpolation)
};

struct ObservationPoint {
  double altitude_cm = 0.0;
  std::string species;
  double value = 0.0;        ///< mole fraction
  double uncertainty = 0.0;  ///< 1-sigma, mole fraction
  bool upper_limit = false;
  int line = 0;              ///< line in the file
  double altitude_uncertainty_cm = 0.0;   ///< 1-sigma of the altitude; 0 when not given
  std::optional<AveragingKernel> kernel;  ///< none: the model at the observed altitude
};

struct ObservationSet {
  std::filesystem::path file;
  std::string text;  ///< the file as read (for provenance)
  std::vector<ObservationPoint> points;
  /// Kernel files read (path, text), for provenance.
  std::vector<std::pair<std::filesystem::path, std::string>> kernel_files;
  /// Warnings given while reading (unknown columns); also logged through spdlog.
  std::vector<std::string> warnings;

  /// Species in order of first appearance.
  [[nodiscard]] std::vector<std::string> species() const;
};

/// The physical sense of every point: value > 0; uncertainty >= 0, and > 0 for a detection;
/// altitude uncertainty >= 0, and 0 for a point with a kernel (the kernel carries its vertical
/// resolution). Throws InputError (ExitCode::kInputData) naming file, line and column.
void check_observations(const ObservationSet& set);

}  // namespace colchem
