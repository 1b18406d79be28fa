#include "transport/transport_species.hpp"

#include <cmath>

#include "core/constants.hpp"

namespace colchem {

double TransportSpecies::binary_diffusion(double T_K) const {
  return diffusion_A * std::pow(T_K, diffusion_s);
}

TransportSpecies default_transport_species(const std::string& name, double mass_amu,
                                           double air_mass_amu) {
  TransportSpecies sp;
  sp.name = name;
  sp.mass_g = mass_amu * constants::kAtomicMassUnit;
  // b = 1.52e18 [T (1/M_i + 1/M_a)]^(1/2) (from memory).
  sp.diffusion_A = 1.52e18 * std::sqrt(1.0 / mass_amu + 1.0 / air_mass_amu);
  sp.diffusion_s = 0.5;
  // Light species separate from the heavy background along a temperature gradient.
  sp.thermal_diffusion = (name == "H" || name == "H2") ? -0.38 : 0.0;  // from memory
  return sp;
}

}  // namespace colchem
