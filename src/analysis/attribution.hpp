// First-order attribution of a profile's ensemble variance to the reactions' uncertainties
// (issue 15, item 3).
//
// A member of the ensemble (analysis/ensemble.hpp) moves ln k_r in cell j by
// z_r sigma_r(T_j), sigma_r(T) = ln f_r(T) / K, z_r independent standard normals. For an
// objective G (here a mole fraction at one altitude), to first order in the z_r
//   delta ln G = sum_r z_r a_r,   a_r = sum_j S_rj sigma_r(T_j),
//   S_rj = d ln G / d ln k_r(z_j)   (the adjoint's per-cell profile, solve/adjoint.hpp),
// so the first-order ("delta method") variance and each reaction's share are
//   Var_1(ln G) = sum_r a_r^2,   share_r = a_r^2 / Var_1.
// Temperature: every cell keeps its own T, as the ensemble applies f(T) there; no single
// column temperature is needed. For an isothermal column a_r = S_r sigma_r with
// S_r = sum_j S_rj the whole-column log-sensitivity.
// Var_1 is the variance of ln G exactly when ln G is linear in the ln k_r; its error grows
// with the size of a_r (the second-order terms are of relative size a_r^2 and beyond), so a
// disagreement with the ensemble's own variance is reported beside the largest |a_r|.
#pragma once

#include <cstddef>
#include <span>
#include <vector>

namespace colchem {

struct AttributionTerms {
  std::vector<double> log_sensitivity;  ///< S_r = sum_j S_rj, per reaction
  std::vector<double> scaled;           ///< a_r (signed)
  std::vector<double> share;            ///< a_r^2 / variance (0 when the variance is 0)
  double variance = 0.0;                ///< Var_1(ln G)
  double largest_scaled = 0.0;          ///< max_r |a_r|
};

/// The terms from dG/d ln k_r(z_j) (`dG_profile[r*N + j]`, R reactions, N cells), G and
/// sigma_r(T_j) (`sigma[r*N + j]`). G must be positive.
AttributionTerms first_order_attribution(std::span<const double> dG_profile, double G,
                                         std::span<const double> sigma, std::size_t reactions,
                                         std::size_t cells);

/// Unbiased sample variance (divisor n - 1); NaN for fewer than two values.
double sample_variance(std::span<const double> values);

/// The agreement rule of the attribution check: |first_order / ensemble - 1| <= tolerance
/// (0.2: issue 15). False when either is not finite or the ensemble variance is 0.
bool attribution_agrees(double first_order, double ensemble, double tolerance = 0.2);

}  // namespace colchem
