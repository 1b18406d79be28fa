// Reader of observation files into an ObservationSet (analysis/observations.hpp; format in
// README "Observation files").
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "core/units.hpp"

namespace colchem {

/// Columns an observation file may have.
const std::vector<std::string>& observation_columns();

/// Reads and checks an observation file (values > 0, detections with uncertainty > 0,
/// upper_limit 0 or 1, altitude_uncertainty >= 0, kernels: increasing altitudes, finite
/// weights, not combined with an altitude uncertainty). Errors are InputError with
/// ExitCode::kInputData.
ObservationSet read_observations(const std::filesystem::path& file, const UnitSystem& units);

}  // namespace colchem
