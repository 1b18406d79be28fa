// Backward Euler with step doubling for one cell: method and sources in
// chem/stiff_integrator.hpp; the step-size rule in core/step_control.hpp.
#include "chem/stiff_integrator.hpp"

#include <algorithm>
#include <cmath>

#include "core/step_control.hpp"

namespace colchem {

bool lu_solve(std::span<double> A, std::span<double> b, std::size_t S,
              std::span<std::size_t> piv) {
  for (std::size_t c = 0; c < S; ++c) {
    std::size_t p = c;
    double big = std::abs(A[c * S + c]);
    for (std::size_t r = c + 1; r < S; ++r) {
      if (std::abs(A[r * S + c]) > big) {
        big = std::abs(A[r * S + c]);
        p = r;
      }
    }
    if (!(big > 0.0) || !std::isfinite(big)) return false;
    piv[c] = p;
    if (p != c) {
      for (std::size_t k = 0; k < S; ++k) std::swap(A[c * S + k], A[p * S + k]);
      std::swap(b[c], b[p]);
    }
    const double inv = 1.0 / A[c * S + c];
    for (std::size_t r = c + 1; r < S; ++r) {
      const double f = A[r * S + c] * inv;
      if (f == 0.0) continue;
      A[r * S + c] = f;
      for (std::size_t k = c + 1; k < S; ++k) A[r * S + k] -= f * A[c * S + k];
      b[r] -= f * b[c];
    }
  }
  for (std::size_t i = S; i-- > 0;) {
    double s = b[i];
    for (std::size_t k = i + 1; k < S; ++k) s -= A[i * S + k] * b[k];
    b[i] = s / A[i * S + i];
  }
  return true;
}

StiffIntegrator::StiffIntegrator(std::size_t species, StiffOptions options)
    : S_(species),
      opt_(options),
      A_(species * species),
      rhs_(species),
      fval_(species),
      y1_(species),
      y2_(species),
      ymid_(species),
      ystart_(species),
      piv_(species) {}

bool StiffIntegrator::be_step(const double* y0, double h, double* y, const CellRhs& f,
                              const CellJacobian& jac) {
  std::copy(y0, y0 + S_, y);
  const double neg_tol = 1e-6 * opt_.atol;
  for (int it = 0; it < opt_.max_newton; ++it) {
    jac(y, A_.data());
    ++stats_.jacobians;
    f(y, fval_.data());
    for (std::size_t r = 0; r < S_; ++r) {
      for (std::size_t c = 0; c < S_; ++c) A_[r * S_ + c] *= -h;
      A_[r * S_ + r] += 1.0;
      rhs_[r] = -(y[r] - y0[r] - h * fval_[r]);
    }
    if (!lu_solve(A_, rhs_, S_, piv_)) return false;
    double norm = 0.0;
    for (std::size_t s = 0; s < S_; ++s) {
      double v = y[s] + rhs_[s];
      if (!std::isfinite(v)) return false;
      if (v < 0.0) {
        if (v < -neg_tol) {
          ++stats_.negative_rejections;
          return false;
        }
        v = 0.0;  // round-off around an exhausted species
      }
      const double w = opt_.atol + opt_.rtol * std::max(std::abs(v), std::abs(y[s]));
      norm = std::max(norm, std::abs(v - y[s]) / w);
      y[s] = v;
    }
    if (norm < opt_.newton_tol) return true;
  }
  ++stats_.newton_failures;
  return false;
}

bool StiffIntegrator::integrate(std::span<double> n, double t0, double t1, const CellRhs& f,
                                const CellJacobian& jac) {
  std::copy(n.begin(), n.end(), ystart_.begin());
  // Local time from 0, so that steps far below the ulp of t0 still advance.
  const double span = t1 - t0;
  double t = 0.0;
  double h = opt_.first_step > 0.0 ? opt_.first_step : 1e-6 * span;
  if (stats_.last_step > 0.0) h = std::max(h, stats_.last_step);
  const double hmin = opt_.min_step > 0.0 ? opt_.min_step : 1e-18 * span;
  std::size_t steps = 0;
  while (t < span) {
    if (++steps > opt_.max_steps || h < hmin) {
      std::copy(ystart_.begin(), ystart_.end(), n.begin());
      return false;
    }
    const bool last = t + h >= span * (1.0 - 1e-12);
    const double hs = last ? span - t : h;
    // Step doubling: one step of hs (y1) against two of hs/2 (y2).
    bool ok = be_step(n.data(), hs, y1_.data(), f, jac) &&
              be_step(n.data(), 0.5 * hs, ymid_.data(), f, jac) &&
              be_step(ymid_.data(), 0.5 * hs, y2_.data(), f, jac);
    if (!ok) {
      ++stats_.rejected;
      h = 0.5 * hs;
      continue;
    }
    const double err =
        StepController::doubling_error(y2_.data(), y1_.data(), S_, [&](std::size_t s) {
          return opt_.atol + opt_.rtol * std::max(std::abs(y2_[s]), std::abs(n[s]));
        });
    // Backward Euler's local error is O(h^2): the step scales with err^(-1/2).
    const StepController control{2, 0.9, 0.2, 4.0};
    const double factor = control.factor(err);
    if (err > 1.0) {
      ++stats_.rejected;
      h = hs * std::max(factor, 0.2);
      continue;
    }
    bool extrapolate = true;
    for (std::size_t s = 0; s < S_; ++s) extrapolate = extrapolate && 2 * y2_[s] - y1_[s] >= 0.0;
    for (std::size_t s = 0; s < S_; ++s) n[s] = extrapolate ? 2 * y2_[s] - y1_[s] : y2_[s];
    t = last ? span : t + hs;
    ++stats_.steps;
    h = hs * factor;
    stats_.last_step = h;
  }
  return true;
}

}  // namespace colchem
