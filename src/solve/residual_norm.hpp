// The dimensionless convergence measure of the full coupled residual F = P - L - dPhi/dz.
//
//   ||F||_s = max_{j,s} |F_js| / w_js,
//   w_js    = (|n_js| + a_s) / t_ref  +  sum_c |J_js,c| |n_c|
//
// J is the Jacobian of F (row (j,s), every column c it touches: the species of cell j and
// species s in cells j-1, j+1). For a rate term R = k prod n^nu, |dR/dn_c| n_c = nu_c R, so
// the sum is the gross magnitude of all production, loss and exchange terms of that
// equation (each weighted by its reaction order). The ratio |F|/w is then the fraction of the
// gross turnover that fails to balance: 1e-8 means the budget of every species in every
// cell closes to eight digits, whatever its density or lifetime. The first term of w covers
// equations with no turnover at all (a species far below a_s, a cold start): there the
// measure reads "relative change of (n + a_s) per reference time t_ref". a_s (cm^-3) is the
// density below which a species no longer matters, t_ref (s) a time longer than any process
// of interest (defaults in ResidualScale; common practice, no source).
//
// The measure is used on ANY state: the split integrator's end state is scored by the same
// coupled residual as the steady-state solver's.
#pragma once

#include <cstddef>
#include <span>
#include <vector>

#include "core/block_tridiagonal.hpp"
#include "solve/column_system.hpp"

namespace colchem {

struct ResidualScale {
  double reference_time_s = 1e10;     ///< t_ref, s (about 300 years)
  double absolute_density_cm3 = 1.0;  ///< a_s for every species without its own value
  std::vector<double> species_absolute_cm3;  ///< per-species a_s (empty: use the above)

  [[nodiscard]] double absolute(std::size_t s) const {
    return s < species_absolute_cm3.size() ? species_absolute_cm3[s] : absolute_density_cm3;
  }
};

struct ScaledNorm {
  double value = 0.0;       ///< ||F||_s (NaN if F or x holds a NaN)
  std::size_t cell = 0;     ///< where the maximum is
  std::size_t species = 0;
};

/// The weights w_js above (cm^-3 s^-1), w[j*S + s].
void residual_weights(const BlockTridiagonal& jac, std::span<const double> x,
                      const ResidualScale& scale, std::span<double> w);

/// ||F||_s from an evaluated F and J at x.
ScaledNorm scaled_norm(std::span<const double> tendency, const BlockTridiagonal& jac,
                       std::span<const double> x, const ResidualScale& scale);

/// Evaluates F and J of all operators at x (time t) and returns ||F||_s.
ScaledNorm scaled_residual_norm(const ColumnSystem& sys, std::span<const double> x,
                                const ResidualScale& scale = {}, double t = 0.0);

/// max_i |dx_i| / (|x_i| + a_s): the relative change of a step.
double max_relative_change(std::span<const double> dx, std::span<const double> x,
                           std::size_t species, const ResidualScale& scale);
/// The index i of that maximum (0 for an empty state; the first non-finite one if any).
std::size_t max_relative_change_index(std::span<const double> dx, std::span<const double> x,
                                      std::size_t species, const ResidualScale& scale);

}  // namespace colchem
