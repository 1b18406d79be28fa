// What the transport operator needs to know about one species.
//
//   b_i(T) = A_i T^s_i            binary-diffusion parameter, cm^-1 s^-1 (D_i = b_i / n_a)
//   default A_i = 1.52e18 (1/M_i + 1/M_a)^(1/2), s_i = 0.5, masses in amu
//                                 (Banks and Kockarts 1973 form; coefficient from memory)
//   alpha_T,i = -0.38 for H and H2, 0 otherwise (thermal diffusion factor, from memory)
// Plain data with no dependency on the chemistry: the caller maps its species onto these.
#pragma once

#include <string>

namespace colchem {

struct TransportSpecies {
  std::string name;
  double mass_g = 0.0;       ///< molecule mass
  double diffusion_A = 0.0;  ///< b = diffusion_A * T^diffusion_s (cm^-1 s^-1, T in K)
  double diffusion_s = 0.5;
  double thermal_diffusion = 0.0;  ///< alpha_T (dimensionless)
  bool fixed = false;              ///< held at its background mixing ratio: no transport

  /// b_i(T), cm^-1 s^-1.
  [[nodiscard]] double binary_diffusion(double T_K) const;
};

/// The default binary-diffusion coefficient A_i = 1.52e18 (1/M_i + 1/M_a)^(1/2)
/// (cm^-1 s^-1 K^-1/2) for masses in amu (the one place of this formula).
double default_diffusion_A(double species_mass_amu, double air_mass_amu);

/// A species with the default diffusion parameters above; `air_mass_amu` is the mean
/// molecular mass of the background.
TransportSpecies default_transport_species(const std::string& name, double mass_amu,
                                           double air_mass_amu);

}  // namespace colchem
