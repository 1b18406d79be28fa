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
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "core/units.hpp"

namespace colchem {

struct ObservationPoint {
  double altitude_cm = 0.0;
  std::string species;
  double value = 0.0;        ///< mole fraction
  double uncertainty = 0.0;  ///< 1-sigma, mole fraction
  bool upper_limit = false;
  int line = 0;              ///< line in the file
};

struct ObservationSet {
  std::filesystem::path file;
  std::string text;  ///< the file as read (for provenance)
  std::vector<ObservationPoint> points;

  /// Species in order of first appearance.
  [[nodiscard]] std::vector<std::string> species() const;
};

/// Reads and checks an observation file (values > 0, detections with uncertainty > 0,
/// upper_limit 0 or 1). Errors are InputError with ExitCode::kInputData.
ObservationSet read_observations(const std::filesystem::path& file, const UnitSystem& units);

}  // namespace colchem
