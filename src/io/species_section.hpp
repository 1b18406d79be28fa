// The scenario's `species:` and `injections:` sections (README.md, "Configuration reference")
// -> ColumnSpeciesSpec (transport/column_species.hpp). Species names are kept as written with
// their file position; the caller checks them against the mechanism.
#pragma once

#include <vector>

#include "core/units.hpp"
#include "io/config_node.hpp"
#include "io/scenario.hpp"
#include "transport/column_species.hpp"

namespace colchem {

/// Reads `species:` into spec.default_initial and spec.species. Tables it reads are appended
/// to `inputs` (for provenance) when given.
void load_species_section(const ConfigNode& n, const UnitSystem& units, ColumnSpeciesSpec& spec,
                          std::vector<InputFile>* inputs = nullptr);

/// Reads `injections:` (a list) into spec.injections.
void load_injections_section(const ConfigNode& n, const UnitSystem& units, ColumnSpeciesSpec& spec);

}  // namespace colchem
