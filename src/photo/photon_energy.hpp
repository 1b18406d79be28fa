// Photon energy as a wavenumber, the one place each relation is written:
//
//   nu~ = E / (h c)                (cm^-1; E in erg per photon)
//   nu~ = E_m / (N_A h c)          (E_m in J mol^-1, times 1e7 erg/J)
//   dnu~ = dlambda / lambda^2      (a width in wavelength as a width in wavenumber)
// (e.g. Atkins and de Paula 2006, Physical Chemistry, 8th ed., ch. 13; from memory).
#pragma once

#include <optional>
#include <string>

#include "core/constants.hpp"
#include "core/units.hpp"

namespace colchem {

/// cm^-1 per erg of photon energy: 1 / (h c).
inline double wavenumber_per_energy(double erg) {
  return erg / (constants::kPlanck * constants::kSpeedOfLight);
}

/// cm^-1 of a photon whose energy per mole of photons is `j_per_mol` J mol^-1 (4184 J mol^-1
/// for kcal/mol with the thermochemical calorie: 349.76 cm^-1).
inline double wavenumber_per_molar_energy(double j_per_mol) {
  return wavenumber_per_energy(j_per_mol * 1e7 / constants::kAvogadro);
}

/// The width in wavenumber (cm^-1) of a width `width_nm` about `center_nm`.
inline double wavenumber_width(double width_nm, double center_nm) {
  const double center_cm = center_nm * 1e-7;
  return width_nm * 1e-7 / (center_cm * center_cm);
}

/// cm^-1 per unit of an energy written in `unit` (per photon: erg, eV; per mole of photons:
/// J/mol, kJ/mol, kcal/mol; or a wavenumber, cm-1), or nullopt for any other unit.
inline std::optional<double> wavenumber_per_energy_unit(const UnitSystem& units,
                                                        const std::string& unit) {
  if (unit == "kcal/mol" || unit == "kcal mol-1") return wavenumber_per_molar_energy(4184.0);
  if (same_dimension(units, unit, "J mol-1")) {
    return wavenumber_per_molar_energy(*units.convert(1.0, unit, "J mol-1"));
  }
  if (same_dimension(units, unit, "erg")) {
    return wavenumber_per_energy(*units.convert(1.0, unit, "erg"));
  }
  if (same_dimension(units, unit, "cm-1")) return *units.convert(1.0, unit, "cm-1");
  return std::nullopt;
}

}  // namespace colchem
