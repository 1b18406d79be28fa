#include "chem/species.hpp"

#include <cmath>

namespace colchem {

double default_diffusion_A(double species_mass_amu, double air_mass_amu) {
  // b = 1.52e18 [T (1/M_i + 1/M_a)]^(1/2) cm^-1 s^-1 (Banks and Kockarts 1973, Aeronomy,
  // part B; from memory).
  return 1.52e18 * std::sqrt(1.0 / species_mass_amu + 1.0 / air_mass_amu);
}

DiffusionParams Species::diffusion_params(double mean_air_mass_amu) const {
  if (diffusion) return *diffusion;
  return DiffusionParams{default_diffusion_A(molar_mass_g_mol, mean_air_mass_amu), 0.5};
}

double Species::thermal_diffusion_factor() const {
  if (thermal_diffusion) return *thermal_diffusion;
  // Light species diffuse up a temperature gradient (from memory): only H and H2.
  const auto& a = composition.atoms;
  if (a.size() == 1 && a.count("H") == 1 && a.at("H") <= 2) return -0.38;
  return 0.0;
}

}  // namespace colchem
