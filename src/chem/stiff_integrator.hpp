// Implicit stiff integrator for one well-mixed cell: dn/dt = f(n), n >= 0.
//
// Variable-step backward Euler, n1 = n0 + h f(n1), solved by Newton's method on
// (I - h J) dn = -(n - n0 - h f(n)) with dense LU and partial pivoting. The local error is
// estimated by step doubling (one step of h against two of h/2; the difference is the
// leading error term of the two-step result, Hundsdorfer and Verwer 2003, sec. II.4). The
// accepted value is the Richardson extrapolation 2 y_{h/2} - y_h (second order; its
// stability function 2/(1 - z/2)^2 - 1/(1 - z) vanishes as z -> -infinity), or the
// two-half-step result where the extrapolation would be negative. Positivity: a Newton iterate with a density below
// -negative_tolerance is rejected and the step halved; values in [-tolerance, 0) (round-off
// around an exhausted species) are set to zero. Results are therefore never negative.
#pragma once

#include <cstddef>
#include <functional>
#include <span>
#include <vector>

namespace colchem {

/// f(n) -> dndt (size S); J(n) -> row-major S x S d f / d n (overwrite).
using CellRhs = std::function<void(const double* n, double* dndt)>;
using CellJacobian = std::function<void(const double* n, double* jac)>;

struct StiffOptions {
  double rtol = 1e-4;
  double atol = 1e-5;          ///< cm^-3
  double first_step = 0.0;     ///< s; 0 = 1e-6 of the interval
  double min_step = 0.0;       ///< s; 0 = 1e-18 of the interval
  int max_newton = 8;
  double newton_tol = 1e-3;    ///< scaled Newton correction at convergence
  std::size_t max_steps = 200000;
};

struct StiffStats {
  std::size_t steps = 0, rejected = 0, negative_rejections = 0, newton_failures = 0,
              jacobians = 0;
  double last_step = 0.0;
};

/// Solves A x = b in place (A row-major S x S, destroyed). Returns false if singular.
bool lu_solve(std::span<double> A, std::span<double> b, std::size_t S,
              std::span<std::size_t> pivots);

class StiffIntegrator {
 public:
  StiffIntegrator(std::size_t species, StiffOptions options = {});

  /// Advances n from t0 to t1. Returns false (n unchanged) when the step size falls below
  /// min_step or max_steps is exceeded.
  bool integrate(std::span<double> n, double t0, double t1, const CellRhs& f,
                 const CellJacobian& jac);
  [[nodiscard]] const StiffStats& stats() const { return stats_; }
  [[nodiscard]] const StiffOptions& options() const { return opt_; }

 private:
  /// One backward-Euler step of size h from y0 into y. False on failure or negativity.
  bool be_step(const double* y0, double h, double* y, const CellRhs& f,
               const CellJacobian& jac);

  std::size_t S_;
  StiffOptions opt_;
  StiffStats stats_;
  std::vector<double> A_, rhs_, fval_, y1_, y2_, ymid_, ystart_;
  std::vector<std::size_t> piv_;
};

}  // namespace colchem
