// The sulfur-oxygen-hydrogen test network (configs/mechanisms/test_soh.yaml) with every
// module on, shared by the chemistry tests.
#pragma once

#include <map>
#include <string>

#include "chem/chemistry_operator.hpp"
#include "core/units.hpp"
#include "io/mechanism_loader.hpp"

namespace colchem::test {

inline ChemistrySpec soh_spec(const UnitSystem& units) {
  ChemistrySpec spec;
  spec.mechanism = load_mechanism(COLCHEM_SOURCE_DIR "/configs/mechanisms/test_soh.yaml", units);
  for (std::size_t i = 0; i < spec.mechanism->modules.size(); ++i) spec.modules.push_back(i);
  spec.parameters = spec.mechanism->default_parameters();
  return spec;
}

inline const std::map<std::string, double> kBulk{{"CO2", 0.965}, {"N2", 0.035}};

}  // namespace colchem::test
