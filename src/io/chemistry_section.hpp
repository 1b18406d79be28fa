// The `chemistry:` section of a scenario and the box-mode configuration.
//
//   chemistry:
//     mechanism: FILE          # relative to the scenario
//     modules: [base, ...]     # default: every module
//     parameters: {name: value}
//     condensation:            # (or "sinks") exchanges with a condensed phase
//       - {species: H2SO4, saturation: h2so4_ayers1980, timescale: 1 d, below: 70 km}
//       - {species: H2SO4, saturation: {h2so4_aqueous: {weight_fraction: 0.75}},
//          kinetic: {accommodation: 1, surface_area: {table: FILE, column: NAME}},
//          condensed: {table: FILE, column: NAME}, below: ..., above: ...}
// Unknown modules and parameter names (did-you-mean), values outside a parameter's bounds
// and inactive requirements are configuration errors (ExitCode::kConfig); a bad mechanism
// file is ExitCode::kInputData. Keys are documented in README.md, section Configuration reference.
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

/// Text summary for `colchem check`: modules, what each adds (species, reactions; the
/// reactions themselves when verbose), parameters, and the element-balance result.
std::string summarize_chemistry(const Mechanism& mech, const ChemistrySpec& spec, bool verbose);

}  // namespace colchem
