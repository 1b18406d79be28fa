// The ideal-gas law and the pressure scale height, the one place each is written.
//
//   n = p / (k_B T)          (cm^-3; p in dyn cm^-2, T in K)
//   p = n k_B T              (dyn cm^-2)
//   H = k_B T / (m g)        (cm; m the molecule mass in g, g in cm s^-2)
// (e.g. Chamberlain and Hunten 1987, Theory of Planetary Atmospheres, ch. 1; from memory).
#pragma once

#include "core/constants.hpp"

namespace colchem {

/// Number density n = p / (k_B T) (cm^-3) of an ideal gas at pressure p (dyn cm^-2).
inline double ideal_gas_density(double p_dyn_cm2, double T_K) {
  return p_dyn_cm2 / (constants::kBoltzmann * T_K);
}

/// Pressure p = n k_B T (dyn cm^-2) of an ideal gas of number density n (cm^-3).
inline double ideal_gas_pressure(double n_cm3, double T_K) {
  return n_cm3 * constants::kBoltzmann * T_K;
}

/// Pressure scale height H = k_B T / (m g) (cm).
inline double scale_height(double T_K, double molecule_mass_g, double gravity_cm_s2) {
  return constants::kBoltzmann * T_K / (molecule_mass_g * gravity_cm_s2);
}

}  // namespace colchem
