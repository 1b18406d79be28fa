#include "solve/continuation.hpp"

#include <fmt/format.h>
#include <algorithm>
#include <cmath>
#include <limits>
#include <memory>

#include "solve/ptc_linear_solver.hpp"

namespace colchem {

std::vector<double> predict_state(std::span<const double> x, std::span<const double> dx_ds,
                                  double ds, double max_log_change) {
  std::vector<double> out(x.begin(), x.end());
  for (std::size_t i = 0; i < out.size(); ++i) {
    const double dx = ds * dx_ds[i];
    if (!std::isfinite(dx)) continue;
    if (x[i] > 0.0) {
      out[i] = x[i] * std::exp(std::clamp(dx / x[i], -max_log_change, max_log_change));
    } else {
      out[i] = std::max(0.0, x[i] + dx);
    }
  }
  return out;
}

double limited_step(std::span<const double> x, std::span<const double> dx_ds, double step,
                    const ContinuationOptions& options) {
  if (!(options.max_predicted_log_change > 0.0) || dx_ds.size() != x.size()) return step;
  std::vector<double> rate;  // |d ln x_i / ds| over the entries above the floor
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (x[i] > options.prediction_floor && std::isfinite(dx_ds[i])) {
      rate.push_back(std::abs(dx_ds[i] / x[i]));
    }
  }
  if (rate.empty()) return step;
  const auto at = rate.begin() + static_cast<std::ptrdiff_t>(rate.size() * 99 / 100);
  std::nth_element(rate.begin(), at, rate.end());
  if (!(*at * step > options.max_predicted_log_change)) return step;
  return std::max(options.min_step, options.max_predicted_log_change / *at);
}

bool path_tangent(const ColumnSystem& system, std::span<const double> x, std::span<const double> f,
                  std::span<const double> dF_ds, const SteadyStateOptions& options,
                  std::vector<double>& dx_ds, std::string& reason) {
  const std::size_t n = system.size();
  BlockTridiagonal jac(system.cells, system.species);
  if (system.coupling != nullptr) system.coupling->refresh(x);
  evaluate_jacobian(system, x, options.time_s, jac);
  std::vector<char> held(n, 0);
  find_held_rows(jac, f, held);
  std::vector<double> rhs(dF_ds.begin(), dF_ds.end());
  for (std::size_t i = 0; i < n; ++i) {
    if (held[i] != 0) rhs[i] = 0.0;
  }
  dx_ds.assign(n, 0.0);
  PtcLinearSolver linear(system.cells, system.species);
  const double shift = 1.0 / options.max_pseudo_step_s;
  if (system.coupling == nullptr) return linear.solve(jac, shift, held, rhs, dx_ds, reason);
  std::vector<double> weights(n);
  residual_weights(jac, x, options.scale, weights);
  const PtcLinearSolver::Product product = [&](std::span<const double> v, std::span<double> out) {
    system.coupling->add_jacobian_product(x, v, out);
  };
  const double rtol = std::sqrt(options.krylov_rtol_min);
  return linear.solve_coupled(jac, shift, held, rhs, weights, product, rtol, dx_ds, reason);
}

std::function<std::string(long, double)> attempt_give_up(long window, double factor,
                                                         double divergence) {
  auto best = std::make_shared<std::vector<double>>();  // best residual up to each iteration
  return [best, window, factor, divergence](long it, double residual) -> std::string {
    if (!best->empty() && residual > divergence * best->front()) {
      return fmt::format(
          "diverged: scaled residual {:.2e} after {} iterations, above {:.0e} times its "
          "{:.2e} at the start",
          residual, it, divergence, best->front());
    }
    const double b = best->empty() ? residual : std::min(best->back(), residual);
    best->push_back(std::isfinite(b) ? b : std::numeric_limits<double>::infinity());
    const auto n = static_cast<long>(best->size());
    if (n <= window) return "";
    const double before = (*best)[static_cast<std::size_t>(n - 1 - window)];
    if (best->back() > factor * before) {
      return fmt::format(
          "stalled: scaled residual {:.2e} after {} iterations, not below {} "
          "times its best {:.2e} of {} iterations before",
          residual, it, factor, before, window);
    }
    return "";
  };
}

ContinuationResult continue_to_target(std::vector<double> x0, const ContinuationSolve& solve,
                                      const ContinuationOptions& options,
                                      const ContinuationTangent& tangent) {
  ContinuationResult out;
  out.x = std::move(x0);
  double step = options.first_step;
  std::vector<double> dx_ds;  // the tangent at (out.x, out.reached)
  bool have_tangent = false;
  bool last_failed = false;  // the attempt before this one failed
  while (out.reached < 1.0) {
    if (tangent && !have_tangent) {
      dx_ds = tangent(out.reached, out.x);
      ++out.tangents;
      have_tangent = true;
    }
    step = limited_step(out.x, dx_ds, step, options);
    const double s = std::min(1.0, out.reached + step);
    RunOutcome r =
        solve(s, dx_ds.size() == out.x.size()
                     ? predict_state(out.x, dx_ds, s - out.reached, options.max_log_change)
                     : out.x);
    out.iterations += r.iterations;
    out.residual_norm = r.residual_norm;
    out.steps.push_back({s, r.ok(), r.iterations});
    if (r.status == SolveStatus::kInterrupted) {
      out.status = SolveStatus::kInterrupted;
      out.reason = "interrupted";
      return out;
    }
    if (r.ok()) {
      out.x = std::move(r.x);
      out.reached = s;
      have_tangent = false;
      if (!last_failed) step *= 2.0;
      last_failed = false;
      continue;
    }
    last_failed = true;
    step *= 0.5;
    if (step < options.min_step) {
      out.reason = fmt::format("continuation stalled at s = {:.4g} (step below {:.4g}; {})",
                               out.reached, options.min_step, r.reason);
      return out;
    }
  }
  out.status = SolveStatus::kConverged;
  return out;
}

}  // namespace colchem
