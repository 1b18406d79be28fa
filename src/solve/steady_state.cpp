// Pseudo-transient continuation with switched evolution relaxation: see steady_state.hpp
// for the equations, the step-size rule, positivity and the convergence test.
#include "solve/steady_state.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <limits>

#include "core/error.hpp"
#include "solve/ptc_linear_solver.hpp"

namespace colchem {

const char* to_string(SolveStatus s) {
  switch (s) {
    case SolveStatus::kConverged:
      return "converged";
    case SolveStatus::kCompleted:
      return "completed";
    case SolveStatus::kNotConverged:
      return "not_converged";
    case SolveStatus::kFailed:
      return "failed";
    case SolveStatus::kInterrupted:
      return "interrupted";
  }
  return "unknown";
}

SteadyStateSolver::SteadyStateSolver(ColumnSystem system, SteadyStateOptions options)
    : system_(std::move(system)), options_(std::move(options)) {
  if (system_.size() == 0) throw RunError(ExitCode::kInternal, "steady state: empty column");
  if (!(options_.initial_pseudo_step_s > 0.0) ||
      !(options_.max_pseudo_step_s >= options_.initial_pseudo_step_s) ||
      !(options_.positivity_fraction >= 0.0 && options_.positivity_fraction < 1.0) ||
      !(options_.min_growth > 0.0 && options_.min_growth <= 1.0 && options_.max_growth >= 1.0)) {
    throw RunError(ExitCode::kInternal, "steady state: inconsistent solver options");
  }
}

namespace {

using Clock = std::chrono::steady_clock;

double since(Clock::time_point t0) {
  return std::chrono::duration<double>(Clock::now() - t0).count();
}

std::string sci(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3g", v);
  return buf;
}

/// A row is held fixed when the operators give it neither tendency nor Jacobian entries.
void find_held_rows(const BlockTridiagonal& jac, std::span<const double> f,
                    std::vector<char>& held) {
  const std::size_t S = jac.species;
  for (std::size_t j = 0; j < jac.cells; ++j) {
    for (std::size_t r = 0; r < S; ++r) {
      const std::size_t i = j * S + r;
      bool zero = f[i] == 0.0 && jac.l(j, r) == 0.0 && jac.u(j, r) == 0.0;
      for (std::size_t c = 0; zero && c < S; ++c) zero = jac.d(j, r, c) == 0.0;
      held[i] = zero ? 1 : 0;
    }
  }
}

/// Largest lambda <= 1 keeping x_i + lambda dx_i >= f x_i for densities above a_s.
double positivity_damping(std::span<const double> x, std::span<const double> dx,
                          std::size_t species, const SteadyStateOptions& o) {
  double lambda = 1.0;
  const double keep = 1.0 - o.positivity_fraction;
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (dx[i] < 0.0 && x[i] > o.scale.absolute(i % species)) {
      lambda = std::min(lambda, keep * x[i] / -dx[i]);
    }
  }
  return lambda;
}

}  // namespace

SteadyStateResult SteadyStateSolver::solve(std::vector<double> x0,
                                           const SteadyStateCallbacks& cb) const {
  const auto where = [this](std::size_t cell, std::size_t species) {
    return describe_entry(system_, cell, species);
  };
  const auto t_start = Clock::now();
  const SteadyStateOptions& o = options_;
  const std::size_t n = system_.size();
  const std::size_t S = system_.species;
  if (x0.size() != n) {
    throw RunError(ExitCode::kInternal, "steady state: state has " + std::to_string(x0.size()) +
                                            " values, expected " + std::to_string(n));
  }
  SteadyStateResult res;
  res.x = std::move(x0);
  std::vector<double>& x = res.x;
  for (double& v : x) v = std::max(v, 0.0);  // densities start non-negative

  PtcLinearSolver linear(system_.cells, S);
  std::vector<double> f(n), dx(n), x_prev(n), weights(n);
  std::vector<char> held(n, 0);
  BlockTridiagonal jac(system_.cells, S);

  double dtau = o.initial_pseudo_step_s;
  double dtau_before_newton = 0.0;  // > 0 while the last step was a Newton jump
  double prev_norm = std::numeric_limits<double>::quiet_NaN();
  double last_change = std::numeric_limits<double>::infinity();
  double last_dtau = 0.0;
  bool last_clipped = false;     // the last step clipped a density at its positivity floor
  std::size_t last_changed = 0;  // the entry of the largest relative change of that step
  double rejected_dtau = std::numeric_limits<double>::infinity();  // last dtau undone
  bool have_prev = false;

  auto finish = [&](SolveStatus st, std::string why, double norm) {
    res.status = st;
    res.reason = std::move(why);
    res.residual_norm = norm;
    res.max_relative_change = last_change;
    res.assembly_s = linear.assembly_seconds();
    res.factor_solve_s = linear.factor_solve_seconds();
    res.wall_s = since(t_start);
    return res;
  };
  auto shrink_or_fail = [&]() -> bool {
    ++res.rejected_steps;
    last_dtau = 0.0;  // the undone step neither counts as Newton step nor as change
    last_change = std::numeric_limits<double>::infinity();
    // Nor as a clipped step: the cap after a clipped step (last_dtau times a growth) would
    // set dtau to 0 here, whose shift 1/dtau is infinite, so that every later linear solve
    // failed ("non-finite Jacobian entry" in the first row not held) and the step
    // "collapsed" at once: 40 % of the Pyrene ensemble's members failed so.
    last_clipped = false;
    rejected_dtau = dtau;
    dtau *= 0.1;
    dtau_before_newton = 0.0;
    return dtau >= o.min_pseudo_step_s;
  };

  for (int it = 0;; ++it) {
    if (cb.stop_requested && cb.stop_requested()) {
      const double nrm = res.history.empty() ? std::numeric_limits<double>::quiet_NaN()
                                             : res.history.back().residual_norm;
      return finish(SolveStatus::kInterrupted,
                    "interrupted after " + std::to_string(res.iterations) + " iterations", nrm);
    }
    if (cb.on_state) cb.on_state(x);

    const auto t_eval = Clock::now();
    if (system_.coupling != nullptr) system_.coupling->refresh(x);
    evaluate_tendency(system_, x, o.time_s, f);
    evaluate_jacobian(system_, x, o.time_s, jac);
    const ScaledNorm norm = scaled_norm(f, jac, x, o.scale);
    res.evaluate_s += since(t_eval);

    if (!std::isfinite(norm.value)) {
      if (!have_prev) {
        return finish(
            SolveStatus::kFailed,
            "non-finite residual at the initial state (" + where(norm.cell, norm.species) + ")",
            norm.value);
      }
      x = x_prev;  // undo the step and retry it shorter
      if (!shrink_or_fail()) {
        return finish(SolveStatus::kFailed,
                      "pseudo-time step collapsed below " + sci(o.min_pseudo_step_s) +
                          " s after non-finite residuals (last at " +
                          where(norm.cell, norm.species) + ")",
                      norm.value);
      }
      continue;
    }

    SteadyIteration rec;
    rec.iteration = it;
    rec.residual_norm = norm.value;
    rec.max_relative_change = last_change;
    rec.worst_cell = norm.cell;
    rec.worst_species = norm.species;
    rec.changed_cell = S > 0 ? last_changed / S : 0;
    rec.changed_species = S > 0 ? last_changed % S : 0;
    rec.clipped = last_clipped;

    auto record = [&](double step, double lambda) {
      rec.pseudo_step_s = step;
      rec.damping = lambda;
      rec.wall_s = since(t_start);
      res.history.push_back(rec);
      if (cb.on_iteration) cb.on_iteration(rec);
    };

    const bool newton_step_done = last_dtau >= o.max_pseudo_step_s;
    std::string refused;
    if (norm.value < o.tolerance && newton_step_done && last_change < o.step_tolerance) {
      if (cb.reject_reason) refused = cb.reject_reason(x);
      if (refused.empty()) {
        record(0.0, 1.0);
        return finish(SolveStatus::kConverged,
                      "scaled residual " + sci(norm.value) + " < " + sci(o.tolerance) +
                          ", last relative change " + sci(last_change),
                      norm.value);
      }
    }
    if (res.iterations >= o.max_iterations) {
      record(0.0, 1.0);
      return finish(SolveStatus::kNotConverged,
                    "no convergence in " + std::to_string(o.max_iterations) + " iterations (" +
                        (refused.empty() ? "scaled residual " + sci(norm.value) + " at " +
                                               where(norm.cell, norm.species) + ", tolerance " +
                                               sci(o.tolerance)
                                         : refused) +
                        ")",
                    norm.value);
    }

    if (cb.give_up) {
      rec.wall_s = since(t_start);
      std::string why = cb.give_up(rec);
      if (!why.empty()) {
        record(0.0, 1.0);
        return finish(SolveStatus::kNotConverged, std::move(why), norm.value);
      }
    }

    // Switched evolution relaxation.
    if (have_prev) {
      const double ratio = prev_norm / std::max(norm.value, 1e-300);
      if (dtau_before_newton > 0.0 && ratio < 1.0) {
        dtau = dtau_before_newton * o.min_growth;  // the Newton jump did not pay off
      } else {
        double growth = std::clamp(o.growth_increment * ratio, o.min_growth, o.max_growth);
        // A step that barely moved the state and clipped nothing was far shorter than the
        // state can follow; the scaled residual, set by the slowest cells, does not show it.
        // The fast growth stops short of the last step that had to be undone.
        if (!last_clipped && ratio >= o.min_growth && last_change < o.change_target) {
          growth = std::max(growth, std::min({o.max_change_growth, o.change_target / last_change,
                                              rejected_dtau * o.min_growth / dtau}));
        }
        dtau *= growth;
      }
      // A clipped step (a density titrated away, limited at its positivity floor) says
      // the linearisation overshot somewhere; whether dtau is beyond what the state can
      // follow is for the residual to say (SER): after a clipped step whose residual did
      // not rise, dtau may grow by at most clipped_growth, after one whose residual rose
      // it shrinks by min_growth. A titration front that moves one cell per few steps
      // clips nearly every step while the residual falls, and holding dtau there cost ~55
      // iterations of a 73-iteration cold start; growing it even where the residual rose
      // let dtau reach the Newton limit with the residual stalled near 1 (README "Steady
      // solves per grid").
      if (last_clipped) {
        dtau = std::min(dtau, last_dtau * (ratio >= 1.0 ? o.clipped_growth : o.min_growth));
      }
    }
    dtau_before_newton = 0.0;
    // Never below the tolerance: convergence is declared only after a Newton step.
    if (norm.value < std::max(o.newton_switch, o.tolerance) && dtau < o.max_pseudo_step_s) {
      dtau_before_newton = dtau;
      dtau = o.max_pseudo_step_s;
    }
    dtau = std::min(dtau, o.max_pseudo_step_s);

    find_held_rows(jac, f, held);
    residual_weights(jac, x, o.scale, weights);
    std::string why;
    bool solved = false;
    if (system_.coupling != nullptr) {
      const double eta = std::min(o.krylov_rtol_max, std::max(o.krylov_rtol_min, norm.value));
      const PtcLinearSolver::Product product = [&](std::span<const double> v,
                                                   std::span<double> out) {
        system_.coupling->add_jacobian_product(x, v, out);
      };
      solved = linear.solve_coupled(jac, 1.0 / dtau, held, f, weights, product, eta, dx, why);
      rec.krylov_iterations = linear.krylov_iterations();
      res.krylov_iterations += linear.krylov_iterations();
    } else {
      solved = linear.solve(jac, 1.0 / dtau, held, f, dx, why);
    }
    if (!solved) {
      record(dtau, 0.0);
      // A failed solve counts as an iteration: otherwise a matrix that is singular only in
      // the Newton limit (a conserved mode) fails, shrinks, jumps back and loops forever.
      ++res.iterations;
      prev_norm = norm.value;
      have_prev = true;
      if (!shrink_or_fail()) {
        return finish(SolveStatus::kFailed,
                      "pseudo-time step collapsed below " + sci(o.min_pseudo_step_s) + " s: " + why,
                      norm.value);
      }
      continue;
    }
    ++res.iterations;

    // A single nearly-empty species must not stall the whole column: the global damping is
    // bounded below by min_damping (1 by default: no global damping), and each density is
    // then limited on its own. Where the linear update would take n_i below f n_i, the
    // update of Newton's method in ln n_i is used instead, n_i exp(lambda dx_i / n_i) (to
    // first order the same step, positive for any dx_i), but at most f n_i: a density the
    // linearisation overshoots by far (dx_i/n_i << -1, a species titrated away) falls many
    // decades in one step, not one decade per step.
    const double lambda = std::max(positivity_damping(x, dx, S, o), o.min_damping);
    x_prev = x;
    last_clipped = false;
    for (std::size_t i = 0; i < n; ++i) {
      const double want = x[i] + lambda * dx[i];
      const double floor = o.positivity_fraction * x[i];
      if (want >= floor) {
        x[i] = want;
      } else if (x[i] > 0.0) {
        if (x[i] > o.scale.absolute(i % S)) last_clipped = true;
        x[i] *= std::min(o.positivity_fraction, std::exp(lambda * dx[i] / x[i]));
      } else if (f[i] > 0.0 && held[i] == 0) {
        // A density at exactly zero cannot move by the multiplicative rule, and one whose
        // own production is positive must not stay there: where the coupled step still
        // points below zero (an inexact Krylov step, or a neighbour's change that the
        // linearisation overshoots), take the local (Jacobi) step of its own row instead,
        // F_i / (1/dtau - dF_i/dx_i), which is positive.
        const double diag = 1.0 / dtau - jac.d(i / S, i % S, i % S);
        if (diag > 0.0) x[i] = f[i] / diag;
      }
      dx[i] = x[i] - x_prev[i];
    }
    last_change = max_relative_change(dx, x, S, o.scale);
    // Where a cold start spends its iterations (README "Steady solves per grid"): the entry
    // whose relative change bounds the step, reported with the next iteration.
    last_changed = n > 0 ? max_relative_change_index(dx, x, S, o.scale) : 0;
    last_dtau = dtau;
    prev_norm = norm.value;
    have_prev = true;
    record(dtau, lambda);

    if (o.checkpoint_every > 0 && cb.checkpoint && res.iterations % o.checkpoint_every == 0) {
      cb.checkpoint(res.iterations, dtau, x);
    }
  }
}

}  // namespace colchem
