// Boundary conditions of the column, per species, at the bottom and the top edge.
//
// Fluxes are positive upward (cm^-2 s^-1). Kinds:
//   fixed mixing ratio f_b / fixed density n_b: a Dirichlet value AT THE BOUNDARY EDGE; the
//     flux through the edge uses the half-cell distance between the edge and the first
//     (last) cell centre, and is reported like any other edge flux.
//   fixed flux F:                 Phi_edge = F
//   deposition velocity (bottom): Phi_bottom = -v_d n(bottom edge)
//   escape velocity (top):        Phi_top = v_e n(top edge)
//     (the edge density follows from the half-cell flux, see transport_operator.hpp)
//   Jeans escape (top):           v_J = U/(2 sqrt(pi)) (1 + lambda) exp(-lambda),
//                                 U = sqrt(2 k T/m), lambda = G M m/(k T r)
//                                 (Chamberlain and Hunten 1987, ch. 7)
//   diffusion-limited (top):      Phi_top = b_i f_i / H_a (Hunten 1973), i.e. an escape
//                                 velocity v = b_i/(H_a n_a) on the top edge
//   zero flux (the default).
// Every value may follow a piecewise-linear schedule in time (held constant outside it).
#pragma once

#include <string>
#include <vector>

#include "core/background.hpp"

namespace colchem {

/// A value constant in time, or piecewise linear through (time_s, value) pairs and held at
/// the end values outside them.
struct Schedule {
  std::vector<double> time_s;  ///< strictly increasing; empty means constant `value`
  std::vector<double> value;   ///< same length as time_s, or one entry when constant

  static Schedule constant(double v) { return Schedule{{}, {v}}; }
  [[nodiscard]] double at(double t_s) const;
};

enum class BoundaryKind {
  kZeroFlux,
  kMixingRatio,
  kDensity,
  kFlux,
  kDepositionVelocity,  ///< bottom only
  kEscapeVelocity,      ///< top only
  kJeans,               ///< top only
  kDiffusionLimited,    ///< top only
};

struct BoundaryCondition {
  BoundaryKind kind = BoundaryKind::kZeroFlux;
  Schedule value = Schedule::constant(0.0);  ///< mixing ratio, cm^-3, cm^-2 s^-1 or cm s^-1
  /// kJeans: exobase temperature (K); 0 takes the temperature at the top edge. The exobase
  /// is placed at the top edge.
  double exobase_temperature_K = 0.0;

  static BoundaryCondition zero_flux() { return {}; }
  static BoundaryCondition of(BoundaryKind k, double v) { return {k, Schedule::constant(v), 0.0}; }
};

struct SpeciesBoundaries {
  BoundaryCondition bottom;
  BoundaryCondition top;
};

[[nodiscard]] const char* boundary_kind_name(BoundaryKind k);

/// Jeans effusion velocity (cm s^-1) of a molecule of mass m_g at temperature T_K and
/// radius r_cm from the centre of a planet of mass planet_mass_g.
double jeans_velocity(double m_g, double T_K, double r_cm, double planet_mass_g);

}  // namespace colchem
