// A scenario: everything one run needs, as typed and validated values.
//
// load_scenario() (io/scenario.hpp) reads the YAML scenario (plus the files it includes, relative
// to itself), applies command-line overrides, checks every key, and fills these structs. Physics
// code receives the parts it needs (BackgroundSpec, ...) and never sees YAML.
#pragma once

#include <filesystem>
#include <string>
#include <vector>

#include "chem/mechanism.hpp"
#include "core/background.hpp"
#include "photo/photolysis_spec.hpp"
#include "solve/solver_spec.hpp"
#include "transport/column_species.hpp"

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
  ColumnSpeciesSpec species_setup;     ///< `species:` and `injections:` (io/species_section)
  ChemistrySpec chemistry;    ///< empty mechanism when the scenario has no chemistry section
  SolverSpec solver;          ///< `solver:` (solve/solver_spec.hpp); defaults when absent
  PhotolysisSpec photolysis;  ///< the photolysis section, when has_photolysis
  bool has_photolysis = false;

  std::string resolved_yaml;           ///< the scenario after overrides
  std::vector<std::string> overrides;  ///< as given on the command line
  std::vector<InputFile> inputs;       ///< included files, for provenance
};

}  // namespace colchem
