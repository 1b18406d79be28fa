// Species of a mechanism and their per-species physical properties.
//
// Composition and molar mass come from the name (core/composition.hpp); a trailing
// "(label)" is a state or isomer label sharing the base composition ("O(1D)").
// Molecular diffusion: b_i = A T^s (cm^-1 s^-1), D_i = b_i / n_a. Default (Banks and
// Kockarts 1973 form; coefficient from memory): A = 1.52e18 sqrt(1/M_i + 1/M_air) with
// masses in amu, s = 0.5. Thermal diffusion factor alpha_T: -0.38 for H and H2, 0 otherwise
// (from memory).
#pragma once

#include <optional>
#include <string>

#include "core/composition.hpp"
#include "core/error.hpp"
#include "transport/transport_species.hpp"  // default_diffusion_A

namespace colchem {

struct DiffusionParams {
  double A = 0.0;  ///< cm^-1 s^-1 K^-s
  double s = 0.5;
};

struct Species {
  std::string name;         ///< as written in the mechanism ("SO2(a3B1)")
  std::string description;
  Composition composition;  ///< element counts (of the base formula, or `formula:`)
  double molar_mass_g_mol = 0.0;
  bool fixed = false;       ///< held at its background mixing ratio (a bulk gas)
  std::optional<DiffusionParams> diffusion;  ///< override; else the default below
  std::optional<double> thermal_diffusion;  ///< override of alpha_T
  SourceLocation where;

  /// b = A T^s with the default A when not overridden; mean_air_mass_amu is M_air.
  [[nodiscard]] DiffusionParams diffusion_params(double mean_air_mass_amu) const;
  /// alpha_T: the override, else -0.38 for H and H2 (from memory), else 0.
  [[nodiscard]] double thermal_diffusion_factor() const;
};

}  // namespace colchem
