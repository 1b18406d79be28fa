// A scenario: everything one run needs, as typed and validated values.
//
// load_scenario() reads the YAML scenario (plus the files it includes, relative to itself),
// applies command-line overrides, checks every key, and fills these structs. Physics code
// receives the parts it needs (BackgroundSpec, ...) and never sees YAML.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/units.hpp"
#include "transport/column_species.hpp"
#include "io/chemistry_section.hpp"
#include "io/solver_section.hpp"
#include "photo/photolysis_spec.hpp"

namespace colchem {

/// A file the scenario read, kept so that an output can reproduce its run.
struct InputFile {
  std::string role;  ///< "temperature table", "mechanism", ...
  std::filesystem::path path;
  std::string text;
};

struct OutputSpec {
  std::filesystem::path file;  ///< relative to the working directory
};

struct Scenario {
  std::string name;
  std::string description;
  std::filesystem::path file;
  BackgroundSpec background;
  OutputSpec output;
  std::filesystem::path observations;  ///< optional: scored at the end of `colchem run`
  ColumnSpeciesSpec species_setup;  ///< `species:` and `injections:` (io/species_section)
  ChemistrySpec chemistry;  ///< empty mechanism when the scenario has no chemistry section
  SolverSpec solver;  ///< `solver:` (io/solver_section.hpp); defaults when absent
  PhotolysisSpec photolysis;    ///< the photolysis section, when has_photolysis
  bool has_photolysis = false;

  std::string resolved_yaml;               ///< the scenario after overrides
  std::vector<std::string> overrides;      ///< as given on the command line
  std::vector<InputFile> inputs;           ///< included files, for provenance
};

/// Loads and validates a scenario. `overrides` are "key.path=value" strings.
/// Throws InputError (exit codes kConfig, kInputData, kUsage) naming file, line and key.
Scenario load_scenario(const std::filesystem::path& file,
                       const std::vector<std::string>& overrides, const UnitSystem& units);

}  // namespace colchem
