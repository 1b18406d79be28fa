// Reading a scenario file into a Scenario (solve/scenario.hpp).
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "solve/scenario.hpp"

namespace colchem {

/// Loads and validates a scenario. `overrides` are "key.path=value" strings.
/// Throws InputError (exit codes kConfig, kInputData, kUsage) naming file, line and key.
Scenario load_scenario(const std::filesystem::path& file, const std::vector<std::string>& overrides,
                       const UnitSystem& units);

}  // namespace colchem
