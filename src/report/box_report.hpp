// The file of `colchem box` as a Dataset: the time series of one well-mixed cell (number
// densities, mole fractions, production, loss and reaction rates) with CF time.
#pragma once

#include <string>

#include "chem/box_model.hpp"
#include "chem/mechanism.hpp"
#include "core/dataset.hpp"

namespace colchem {

/// What the file says about the box beside its results.
struct BoxFileHeader {
  std::string name;
  std::string configuration_yaml;  ///< the box configuration after every --set
  double temperature_K = 0.0;
  double pressure_dyn_cm2 = 0.0;
  double air_cm3 = 0.0;  ///< air number density (mole fractions = n / air_cm3)
};

Dataset box_dataset(const BoxFileHeader& box, const Mechanism& m, const BoxResult& res,
                    const std::string& command_line);

}  // namespace colchem
