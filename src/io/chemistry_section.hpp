// The `chemistry:` section of a scenario and the box-mode configuration (README.md,
// "Configuration reference"). Unknown modules and parameters, values outside a parameter's
// bounds and inactive requirements are ExitCode::kConfig; a bad mechanism file kInputData.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "chem/box_model.hpp"
#include "chem/mechanism.hpp"
#include "chem/stiff_integrator.hpp"
#include "core/units.hpp"

namespace colchem {

class ConfigNode;
struct Scenario;
struct InputFile;

/// Reads the section into sc.chemistry (the background section must be loaded: the rate
/// constants are checked at the column's temperatures and densities).
void load_chemistry_section(const ConfigNode& n, const UnitSystem& units, Scenario& sc);

/// The common part: mechanism, modules, parameters (sinks only when allow_sinks).
/// The mechanism file is appended to `inputs` for provenance.
ChemistrySpec load_chemistry_spec(const ConfigNode& n, const UnitSystem& units,
                                  std::vector<InputFile>& inputs, bool allow_sinks);

/// Loads a box configuration; `overrides` are "key.path=value" strings.
BoxSpec load_box_config(const std::filesystem::path& file,
                        const std::vector<std::string>& overrides, const UnitSystem& units);

}  // namespace colchem
