// Binary diffusion b_i(T) = A_i T^s_i (cm^-1 s^-1; D_i = b_i / n_a), default
// A_i = 1.52e18 (1/M_i + 1/M_a)^(1/2) (Banks and Kockarts 1973 form, coefficient from memory)
// and alpha_T = -0.38 for H and H2 (from memory): see transport/transport_species.hpp.
#include "transport/transport_species.hpp"

#include <cmath>

#include "core/constants.hpp"

namespace colchem {

double TransportSpecies::binary_diffusion(double T_K) const {
  return diffusion_A * std::pow(T_K, diffusion_s);
}

double default_diffusion_A(double species_mass_amu, double air_mass_amu) {
  // b = 1.52e18 [T (1/M_i + 1/M_a)]^(1/2) cm^-1 s^-1 (Banks and Kockarts 1973, Aeronomy,
  // part B; from memory).
  return 1.52e18 * std::sqrt(1.0 / species_mass_amu + 1.0 / air_mass_amu);
}

TransportSpecies default_transport_species(const std::string& name, double mass_amu,
                                           double air_mass_amu) {
  TransportSpecies sp;
  sp.name = name;
  sp.mass_g = mass_amu * constants::kAtomicMassUnit;
  sp.diffusion_A = default_diffusion_A(mass_amu, air_mass_amu);
  sp.diffusion_s = 0.5;
  // Light species separate from the heavy background along a temperature gradient.
  sp.thermal_diffusion = (name == "H" || name == "H2") ? -0.38 : 0.0;  // from memory
  return sp;
}

}  // namespace colchem
