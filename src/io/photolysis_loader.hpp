// Photolysis section of a scenario and the photolysis data file it names -> PhotolysisSpec.
// Every key is documented in README.md, section Configuration reference ("Scenario keys", "Data
// file schema"); every bad input is an InputError naming the file, line and key.
#pragma once

#include <filesystem>
#include <vector>

#include "core/units.hpp"
#include "io/config_node.hpp"
#include "io/scenario.hpp"
#include "photo/photolysis_spec.hpp"

namespace colchem {

struct Mechanism;

/// Reads the scenario's `photolysis:` section (and the data file and tables it names) into
/// sc.photolysis, sets sc.has_photolysis and records every file read in sc.inputs.
void load_photolysis_section(const ConfigNode& section, const UnitSystem& units, Scenario& sc);

/// The same, into a spec (files read are appended to `inputs` when given).
PhotolysisSpec load_photolysis(const ConfigNode& section, const UnitSystem& units,
                               std::vector<InputFile>* inputs = nullptr);

/// Resolves the named parameters the data refer to against the mechanism (null: there is
/// none) and checks their values over each parameter's [min, max]. An undeclared name is an
/// InputError at the reference; a mechanism parameter that neither a reaction's scale nor
/// the data refer to is an InputError at its declaration (both ExitCode::kInputData).
void resolve_photolysis_parameters(PhotolysisSpec& spec, const Mechanism* mech);

/// Reads a photolysis data file (absorbers, channels, rayleigh) into `spec`.
void load_photolysis_data(const std::filesystem::path& file, const UnitSystem& units,
                          PhotolysisSpec& spec, std::vector<InputFile>* inputs = nullptr);

}  // namespace colchem
