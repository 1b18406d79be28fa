// The column is a sum of operators. Transport and chemistry (with the photolysis rates it
// is handed) each implement this interface; the operator-split integrator and the coupled
// steady-state solver are built from the same operator objects, never from copies of
// their formulas.
//
//   dn/dt = sum_k f_k(n, t)      n: number densities (cm^-3), x[j*S + s], cell-major
#pragma once

#include <span>

#include "core/block_tridiagonal.hpp"

namespace colchem {

class ColumnOperator {
 public:
  virtual ~ColumnOperator() = default;

  /// Adds this operator's tendency f(n, t) (cm^-3 s^-1) into `tendency`.
  virtual void add_tendency(std::span<const double> n, double t, std::span<double> tendency) = 0;

  /// Adds d f / d n into `jac` (same ordering as n).
  virtual void add_jacobian(std::span<const double> n, double t, BlockTridiagonal& jac) = 0;

  /// Replaces n(t) by n(t + dt) of this operator alone, integrated implicitly (used by the
  /// operator-split integrator). Returns false if the step failed (the caller retries with a
  /// smaller dt); n is then left unchanged.
  virtual bool implicit_step(std::span<double> n, double t, double dt) = 0;
};

}  // namespace colchem
