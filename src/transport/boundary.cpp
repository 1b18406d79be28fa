// Boundary conditions and the Jeans escape velocity: equations, units and sources in
// transport/boundary.hpp.
#include "transport/boundary.hpp"

#include <algorithm>
#include <cmath>

#include "core/constants.hpp"
#include "core/interp.hpp"

namespace colchem {

double Schedule::at(double t_s) const {
  if (time_s.empty()) return value.empty() ? 0.0 : value.front();
  return interp_linear_hold(time_s, value, t_s);
}

const char* boundary_kind_name(BoundaryKind k) {
  switch (k) {
    case BoundaryKind::kZeroFlux:
      return "zero_flux";
    case BoundaryKind::kMixingRatio:
      return "mixing_ratio";
    case BoundaryKind::kDensity:
      return "density";
    case BoundaryKind::kFlux:
      return "flux";
    case BoundaryKind::kDepositionVelocity:
      return "deposition_velocity";
    case BoundaryKind::kEscapeVelocity:
      return "escape_velocity";
    case BoundaryKind::kJeans:
      return "jeans";
    case BoundaryKind::kDiffusionLimited:
      return "diffusion_limited";
  }
  return "unknown";
}

double jeans_velocity(double m_g, double T_K, double r_cm, double planet_mass_g) {
  const double kT = constants::kBoltzmann * T_K;
  const double U = std::sqrt(2.0 * kT / m_g);  // most probable speed
  const double lambda = constants::kGravitational * planet_mass_g * m_g / (kT * r_cm);
  return U / (2.0 * std::sqrt(constants::kPi)) * (1.0 + lambda) * std::exp(-lambda);
}

}  // namespace colchem
