// Step-size control by step doubling, the one controller every adaptive integrator uses
// (the cell's stiff integrator, chem/stiff_integrator.hpp, and the operator-split column
// integrator, solve/split_integrator.hpp).
//
// One step of h (y_h) is compared with two steps of h/2 (y_{h/2}); their difference is the
// leading term of the local error (Hundsdorfer and Verwer 2003, Numerical Solution of
// Time-Dependent Advection-Diffusion-Reaction Equations, sec. II.4; Hairer, Norsett and
// Wanner 1993, Solving ODEs I, sec. II.4):
//   err = max_i |y_{h/2,i} - y_{h,i}| / w_i            (w_i the scale of component i)
// A step is accepted when err <= 1. For a method whose local error is O(h^(q+1)) the next
// step is
//   h_new = h clamp(safety err^(-1/(q+1)), min_factor, max_factor)
// (err = 0 gives max_factor). The safety factor 0.9 and the clamps are common practice,
// no source.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstddef>

namespace colchem {

struct StepController {
  int local_order = 2;      ///< q + 1: the local error is O(h^(q+1))
  double safety = 0.9;      ///< common practice, no source
  double min_factor = 0.2;  ///< smallest h_new / h
  double max_factor = 5.0;  ///< largest h_new / h

  /// The scaled error estimate max_i |a_i - b_i| / weight(i) of the two results.
  template <class Weight>
  [[nodiscard]] static double doubling_error(const double* a, const double* b, std::size_t n,
                                             Weight weight) {
    double err = 0.0;
    for (std::size_t i = 0; i < n; ++i) err = std::max(err, std::abs(a[i] - b[i]) / weight(i));
    return err;
  }

  /// h_new / h for the error estimate err.
  [[nodiscard]] double factor(double err) const {
    if (!(err > 0.0)) return max_factor;
    // err^(-1/2) through the correctly rounded square root rather than pow.
    const double grow = local_order == 2 ? safety / std::sqrt(err)
                                         : safety * std::pow(err, -1.0 / local_order);
    return std::clamp(grow, min_factor, max_factor);
  }
};

}  // namespace colchem
