// Pseudo-transient continuation with switched evolution relaxation: see steady_state.hpp
// for the equations, the step-size rule, positivity and the convergence test.
#include "solve/steady_state.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <limits>
#include <optional>

#include "core/error.hpp"
#include "core/stopwatch.hpp"
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

std::string sci(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3g", v);
  return buf;
}

}  // namespace

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

namespace {

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

/// One run of the PTC iteration (steady_state.hpp): the state the step-size rules carry from
/// one step to the next, and the named steps of the loop.
class PtcRun {
 public:
  PtcRun(const ColumnSystem& system, const SteadyStateOptions& o, const SteadyStateCallbacks& cb,
         std::vector<double> x0)
      : sys_(system),
        o_(o),
        cb_(cb),
        n_(system.size()),
        S_(system.species),
        linear_(system.cells, system.species),
        f_(n_),
        dx_(n_),
        x_prev_(n_),
        weights_(n_),
        held_(n_, 0),
        jac_(system.cells, system.species),
        dtau_(o.initial_pseudo_step_s) {
    res_.x = std::move(x0);
    for (double& v : res_.x) v = std::max(v, 0.0);  // densities start non-negative
  }

  SteadyStateResult run();

 private:
  [[nodiscard]] std::string where(std::size_t cell, std::size_t species) const {
    return describe_entry(sys_, cell, species);
  }
  SteadyStateResult finish(SolveStatus st, std::string why, double norm);
  bool shrink_or_fail();
  ScaledNorm evaluate();
  [[nodiscard]] SteadyIteration record_of(int it, const ScaledNorm& norm) const;
  void record(SteadyIteration& rec, double step, double lambda);
  std::optional<SteadyStateResult> stop_test(SteadyIteration& rec, const ScaledNorm& norm);
  void next_pseudo_step(double norm);
  bool solve_linear(SteadyIteration& rec, double norm, std::string& why);
  double update_state();

  const ColumnSystem& sys_;
  const SteadyStateOptions& o_;
  const SteadyStateCallbacks& cb_;
  const Clock::time_point t_start_ = Clock::now();
  std::size_t n_, S_;
  PtcLinearSolver linear_;
  std::vector<double> f_, dx_, x_prev_, weights_;
  std::vector<char> held_;
  BlockTridiagonal jac_;
  SteadyStateResult res_;

  double dtau_;
  double dtau_before_newton_ = 0.0;  // > 0 while the last step was a Newton jump
  double prev_norm_ = std::numeric_limits<double>::quiet_NaN();
  double last_change_ = std::numeric_limits<double>::infinity();
  double last_dtau_ = 0.0;
  bool last_clipped_ = false;     // the last step clipped a density at its positivity floor
  std::size_t last_changed_ = 0;  // the entry of the largest relative change of that step
  double rejected_dtau_ = std::numeric_limits<double>::infinity();  // last dtau undone
  bool have_prev_ = false;
};

SteadyStateResult PtcRun::finish(SolveStatus st, std::string why, double norm) {
  res_.status = st;
  res_.reason = std::move(why);
  res_.residual_norm = norm;
  res_.max_relative_change = last_change_;
  res_.assembly_s = linear_.assembly_seconds();
  res_.factor_solve_s = linear_.factor_solve_seconds();
  res_.wall_s = seconds_since(t_start_);
  return std::move(res_);
}

bool PtcRun::shrink_or_fail() {
  ++res_.rejected_steps;
  last_dtau_ = 0.0;  // the undone step neither counts as Newton step nor as change
  last_change_ = std::numeric_limits<double>::infinity();
  // Nor as a clipped step: the cap after a clipped step (last_dtau times a growth) would
  // set dtau to 0 here, whose shift 1/dtau is infinite, so that every later linear solve
  // failed ("non-finite Jacobian entry" in the first row not held) and the step
  // "collapsed" at once: 40 % of the Pyrene ensemble's members failed so.
  last_clipped_ = false;
  rejected_dtau_ = dtau_;
  dtau_ *= 0.1;
  dtau_before_newton_ = 0.0;
  return dtau_ >= o_.min_pseudo_step_s;
}

/// F and J at the current state (the coupling refreshed there first), and ||F||_s.
ScaledNorm PtcRun::evaluate() {
  const auto t_eval = Clock::now();
  if (sys_.coupling != nullptr) sys_.coupling->refresh(res_.x);
  evaluate_tendency(sys_, res_.x, o_.time_s, f_);
  evaluate_jacobian(sys_, res_.x, o_.time_s, jac_);
  const ScaledNorm norm = scaled_norm(f_, jac_, res_.x, o_.scale);
  res_.evaluate_s += seconds_since(t_eval);
  return norm;
}

SteadyIteration PtcRun::record_of(int it, const ScaledNorm& norm) const {
  SteadyIteration rec;
  rec.iteration = it;
  rec.residual_norm = norm.value;
  rec.max_relative_change = last_change_;
  rec.worst_cell = norm.cell;
  rec.worst_species = norm.species;
  rec.changed_cell = S_ > 0 ? last_changed_ / S_ : 0;
  rec.changed_species = S_ > 0 ? last_changed_ % S_ : 0;
  rec.clipped = last_clipped_;
  return rec;
}

void PtcRun::record(SteadyIteration& rec, double step, double lambda) {
  rec.pseudo_step_s = step;
  rec.damping = lambda;
  rec.wall_s = seconds_since(t_start_);
  res_.history.push_back(rec);
  if (cb_.on_iteration) cb_.on_iteration(rec);
}

/// Converged, out of iterations, or given up by the caller: the result; otherwise none.
std::optional<SteadyStateResult> PtcRun::stop_test(SteadyIteration& rec, const ScaledNorm& norm) {
  const bool newton_step_done = last_dtau_ >= o_.max_pseudo_step_s;
  std::string refused;
  if (norm.value < o_.tolerance && newton_step_done && last_change_ < o_.step_tolerance) {
    if (cb_.reject_reason) refused = cb_.reject_reason(res_.x);
    if (refused.empty()) {
      record(rec, 0.0, 1.0);
      return finish(SolveStatus::kConverged,
                    "scaled residual " + sci(norm.value) + " < " + sci(o_.tolerance) +
                        ", last relative change " + sci(last_change_),
                    norm.value);
    }
  }
  if (res_.iterations >= o_.max_iterations) {
    record(rec, 0.0, 1.0);
    return finish(SolveStatus::kNotConverged,
                  "no convergence in " + std::to_string(o_.max_iterations) + " iterations (" +
                      (refused.empty()
                           ? "scaled residual " + sci(norm.value) + " at " +
                                 where(norm.cell, norm.species) + ", tolerance " + sci(o_.tolerance)
                           : refused) +
                      ")",
                  norm.value);
  }
  if (cb_.give_up) {
    rec.wall_s = seconds_since(t_start_);
    std::string why = cb_.give_up(rec);
    if (!why.empty()) {
      record(rec, 0.0, 1.0);
      return finish(SolveStatus::kNotConverged, std::move(why), norm.value);
    }
  }
  return std::nullopt;
}

/// The pseudo-time step of the next step: switched evolution relaxation, the bounds after a
/// clipped step, the Newton switch.
void PtcRun::next_pseudo_step(double norm) {
  if (have_prev_) {
    const double ratio = prev_norm_ / std::max(norm, 1e-300);
    if (dtau_before_newton_ > 0.0 && ratio < 1.0) {
      dtau_ = dtau_before_newton_ * o_.min_growth;  // the Newton jump did not pay off
    } else {
      double growth = std::clamp(o_.growth_increment * ratio, o_.min_growth, o_.max_growth);
      // A step that barely moved the state and clipped nothing was far shorter than the
      // state can follow; the scaled residual, set by the slowest cells, does not show it.
      // The fast growth stops short of the last step that had to be undone.
      if (!last_clipped_ && ratio >= o_.min_growth && last_change_ < o_.change_target) {
        growth = std::max(growth, std::min({o_.max_change_growth, o_.change_target / last_change_,
                                            rejected_dtau_ * o_.min_growth / dtau_}));
      }
      dtau_ *= growth;
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
    if (last_clipped_) {
      dtau_ = std::min(dtau_, last_dtau_ * (ratio >= 1.0 ? o_.clipped_growth : o_.min_growth));
    }
  }
  dtau_before_newton_ = 0.0;
  // Never below the tolerance: convergence is declared only after a Newton step.
  if (norm < std::max(o_.newton_switch, o_.tolerance) && dtau_ < o_.max_pseudo_step_s) {
    dtau_before_newton_ = dtau_;
    dtau_ = o_.max_pseudo_step_s;
  }
  dtau_ = std::min(dtau_, o_.max_pseudo_step_s);
}

/// (I/dtau - J) dx = F: direct, or GMRES with the nonlocal coupling's product.
bool PtcRun::solve_linear(SteadyIteration& rec, double norm, std::string& why) {
  find_held_rows(jac_, f_, held_);
  residual_weights(jac_, res_.x, o_.scale, weights_);
  if (sys_.coupling == nullptr) return linear_.solve(jac_, 1.0 / dtau_, held_, f_, dx_, why);
  const double eta = std::min(o_.krylov_rtol_max, std::max(o_.krylov_rtol_min, norm));
  const std::vector<double>& x = res_.x;
  const PtcLinearSolver::Product product = [&](std::span<const double> v, std::span<double> out) {
    sys_.coupling->add_jacobian_product(x, v, out);
  };
  const bool solved =
      linear_.solve_coupled(jac_, 1.0 / dtau_, held_, f_, weights_, product, eta, dx_, why);
  rec.krylov_iterations = linear_.krylov_iterations();
  res_.krylov_iterations += linear_.krylov_iterations();
  return solved;
}

/// x + lambda dx with each density limited on its own (positivity); returns lambda.
double PtcRun::update_state() {
  // A single nearly-empty species must not stall the whole column: the global damping is
  // bounded below by min_damping (1 by default: no global damping), and each density is
  // then limited on its own. Where the linear update would take n_i below f n_i, the
  // update of Newton's method in ln n_i is used instead, n_i exp(lambda dx_i / n_i) (to
  // first order the same step, positive for any dx_i), but at most f n_i: a density the
  // linearisation overshoots by far (dx_i/n_i << -1, a species titrated away) falls many
  // decades in one step, not one decade per step.
  std::vector<double>& x = res_.x;
  const double lambda = std::max(positivity_damping(x, dx_, S_, o_), o_.min_damping);
  x_prev_ = x;
  last_clipped_ = false;
  for (std::size_t i = 0; i < n_; ++i) {
    const double want = x[i] + lambda * dx_[i];
    const double floor = o_.positivity_fraction * x[i];
    if (want >= floor) {
      x[i] = want;
    } else if (x[i] > 0.0) {
      if (x[i] > o_.scale.absolute(i % S_)) last_clipped_ = true;
      x[i] *= std::min(o_.positivity_fraction, std::exp(lambda * dx_[i] / x[i]));
    } else if (f_[i] > 0.0 && held_[i] == 0) {
      // A density at exactly zero cannot move by the multiplicative rule, and one whose
      // own production is positive must not stay there: where the coupled step still
      // points below zero (an inexact Krylov step, or a neighbour's change that the
      // linearisation overshoots), take the local (Jacobi) step of its own row instead,
      // F_i / (1/dtau - dF_i/dx_i), which is positive.
      const double diag = 1.0 / dtau_ - jac_.d(i / S_, i % S_, i % S_);
      if (diag > 0.0) x[i] = f_[i] / diag;
    }
    dx_[i] = x[i] - x_prev_[i];
  }
  last_change_ = max_relative_change(dx_, x, S_, o_.scale);
  // Where a cold start spends its iterations (README "Steady solves per grid"): the entry
  // whose relative change bounds the step, reported with the next iteration.
  last_changed_ = n_ > 0 ? max_relative_change_index(dx_, x, S_, o_.scale) : 0;
  last_dtau_ = dtau_;
  return lambda;
}

SteadyStateResult PtcRun::run() {
  for (int it = 0;; ++it) {
    if (cb_.stop_requested && cb_.stop_requested()) {
      const double nrm = res_.history.empty() ? std::numeric_limits<double>::quiet_NaN()
                                              : res_.history.back().residual_norm;
      return finish(SolveStatus::kInterrupted,
                    "interrupted after " + std::to_string(res_.iterations) + " iterations", nrm);
    }
    if (cb_.on_state) cb_.on_state(res_.x);
    const ScaledNorm norm = evaluate();
    if (!std::isfinite(norm.value)) {
      if (!have_prev_) {
        return finish(
            SolveStatus::kFailed,
            "non-finite residual at the initial state (" + where(norm.cell, norm.species) + ")",
            norm.value);
      }
      res_.x = x_prev_;  // undo the step and retry it shorter
      if (!shrink_or_fail()) {
        return finish(SolveStatus::kFailed,
                      "pseudo-time step collapsed below " + sci(o_.min_pseudo_step_s) +
                          " s after non-finite residuals (last at " +
                          where(norm.cell, norm.species) + ")",
                      norm.value);
      }
      continue;
    }
    SteadyIteration rec = record_of(it, norm);
    if (auto done = stop_test(rec, norm)) return std::move(*done);
    next_pseudo_step(norm.value);
    std::string why;
    if (!solve_linear(rec, norm.value, why)) {
      record(rec, dtau_, 0.0);
      // A failed solve counts as an iteration: otherwise a matrix that is singular only in
      // the Newton limit (a conserved mode) fails, shrinks, jumps back and loops forever.
      ++res_.iterations;
      prev_norm_ = norm.value;
      have_prev_ = true;
      if (!shrink_or_fail()) {
        return finish(
            SolveStatus::kFailed,
            "pseudo-time step collapsed below " + sci(o_.min_pseudo_step_s) + " s: " + why,
            norm.value);
      }
      continue;
    }
    ++res_.iterations;
    const double lambda = update_state();
    prev_norm_ = norm.value;
    have_prev_ = true;
    record(rec, dtau_, lambda);
    if (o_.checkpoint_every > 0 && cb_.checkpoint && res_.iterations % o_.checkpoint_every == 0) {
      cb_.checkpoint(res_.iterations, dtau_, res_.x);
    }
  }
}

}  // namespace

SteadyStateResult SteadyStateSolver::solve(std::vector<double> x0,
                                           const SteadyStateCallbacks& cb) const {
  if (x0.size() != system_.size()) {
    throw RunError(ExitCode::kInternal, "steady state: state has " + std::to_string(x0.size()) +
                                            " values, expected " + std::to_string(system_.size()));
  }
  return PtcRun(system_, options_, cb, std::move(x0)).run();
}

}  // namespace colchem
