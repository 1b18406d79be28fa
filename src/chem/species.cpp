// Per-species properties: b_i = A T^s (cm^-1 s^-1, D_i = b_i / n_a) with the default A of
// transport/transport_species.hpp (Banks and Kockarts 1973 form, from memory) and the thermal
// diffusion factor alpha_T (from memory); see chem/species.hpp.
#include "chem/species.hpp"

namespace colchem {

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
