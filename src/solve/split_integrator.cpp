// Strang-split integration with step doubling: see split_integrator.hpp.
#include "solve/split_integrator.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <optional>

#include "core/error.hpp"
#include "core/step_control.hpp"
#include "core/stopwatch.hpp"

namespace colchem {

namespace {
using Clock = std::chrono::steady_clock;
std::string sci(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.4g", v);
  return buf;
}
/// Times to land on exactly, in order, within (start, end].
std::vector<double> stop_times(const SplitOptions& o) {
  std::vector<double> stops;
  for (double s : o.output_times_s)
    if (s > o.start_s && s <= o.end_s) stops.push_back(s);
  for (double s : o.breakpoints_s)
    if (s > o.start_s && s <= o.end_s) stops.push_back(s);
  stops.push_back(o.end_s);
  std::sort(stops.begin(), stops.end());
  stops.erase(std::unique(stops.begin(), stops.end()), stops.end());
  return stops;
}
}  // namespace

SplitIntegrator::SplitIntegrator(ColumnOperator& transport, ColumnOperator& chemistry,
                                 std::size_t cells, std::size_t species, SplitOptions options)
    : transport_(transport),
      chemistry_(chemistry),
      system_{{&transport, &chemistry}, cells, species},
      options_(std::move(options)) {
  if (!(options_.end_s > options_.start_s) || !(options_.step_s > 0.0) ||
      !(options_.min_step_s > 0.0)) {
    throw RunError(ExitCode::kInternal, "split integrator: need end > start and positive steps");
  }
}

bool SplitIntegrator::strang_step(std::vector<double>& x, double t, double dt,
                                  const SplitCallbacks& cb) const {
  if (!transport_.implicit_step(x, t, 0.5 * dt)) return false;
  if (cb.refresh) cb.refresh(x, t + 0.5 * dt);
  if (!chemistry_.implicit_step(x, t, dt)) return false;
  if (!transport_.implicit_step(x, t + 0.5 * dt, 0.5 * dt)) return false;
  for (double v : x) {
    if (!std::isfinite(v)) return false;
  }
  return true;
}

bool SplitIntegrator::try_step(const std::vector<double>& x, double t, double dt,
                               const SplitCallbacks& cb, std::vector<double>& x1,
                               std::vector<double>& x2, double& err) const {
  const SplitOptions& o = options_;
  const std::size_t S = system_.species;
  x1 = x;
  if (!o.adaptive) return strang_step(x1, t, dt, cb);
  x2 = x;
  if (!(strang_step(x1, t, dt, cb) && strang_step(x2, t, 0.5 * dt, cb) &&
        strang_step(x2, t + 0.5 * dt, 0.5 * dt, cb))) {
    return false;
  }
  err = StepController::doubling_error(x2.data(), x1.data(), x.size(), [&](std::size_t i) {
    return o.relative_tolerance * (std::abs(x2[i]) + o.scale.absolute(i % S));
  });
  if (err > 1.0) return false;
  std::swap(x1, x2);  // keep the more accurate two half steps
  return true;
}

namespace {

/// Why a run ends: its status and the reason (finish() adds the coupled residual).
struct RunEnd {
  SolveStatus status;
  std::string reason;
};

/// An interrupt or the step limit, checked before each attempt.
std::optional<RunEnd> limit_reached(const SplitResult& res, const SplitOptions& o,
                                    const SplitCallbacks& cb) {
  if (cb.stop_requested && cb.stop_requested()) {
    return RunEnd{SolveStatus::kInterrupted, "interrupted at t = " + sci(res.time_s) + " s after " +
                                                 std::to_string(res.steps) + " steps"};
  }
  if (res.steps >= o.max_steps) {
    return RunEnd{SolveStatus::kNotConverged, "step limit " + std::to_string(o.max_steps) +
                                                  " reached at t = " + sci(res.time_s) + " s"};
  }
  return std::nullopt;
}

/// After an accepted step that ended at res.time_s: the step's record (with the coupled
/// residual every steady_check_every steps), the snapshot at an output time, the
/// checkpoint, then the steady-state and end-time tests.
std::optional<RunEnd> record_step(const ColumnSystem& system, const SplitOptions& o,
                                  const SplitCallbacks& cb, SplitResult& res, double dt, double err,
                                  double dt_want, double wall_s, bool hits_stop) {
  const double t_new = res.time_s;
  SplitStepRecord rec{res.steps, t_new, dt, err, std::numeric_limits<double>::quiet_NaN(), wall_s};
  const bool check_steady = o.to_steady_state && res.steps % std::max(1, o.steady_check_every) == 0;
  if (check_steady) rec.residual_norm = scaled_residual_norm(system, res.x, o.scale, t_new).value;
  res.history.push_back(rec);
  if (cb.on_step) cb.on_step(rec);
  const bool is_output =
      std::find(o.output_times_s.begin(), o.output_times_s.end(), t_new) != o.output_times_s.end();
  if (hits_stop && is_output) res.snapshots.push_back(SplitSnapshot{t_new, res.x});
  if (o.checkpoint_every > 0 && cb.checkpoint && res.steps % o.checkpoint_every == 0) {
    cb.checkpoint(res, dt_want);
  }
  if (check_steady && rec.residual_norm < o.steady_tolerance) {
    return RunEnd{SolveStatus::kConverged, "coupled scaled residual " + sci(rec.residual_norm) +
                                               " < " + sci(o.steady_tolerance) +
                                               " at t = " + sci(t_new) + " s"};
  }
  if (hits_stop && t_new >= o.end_s) {
    if (o.to_steady_state) {
      return RunEnd{SolveStatus::kNotConverged, "end time " + sci(o.end_s) +
                                                    " s reached before the coupled residual "
                                                    "fell below " +
                                                    sci(o.steady_tolerance)};
    }
    return RunEnd{SolveStatus::kCompleted, "end time " + sci(o.end_s) + " s reached"};
  }
  return std::nullopt;
}

}  // namespace

SplitResult SplitIntegrator::run(std::vector<double> x0, const SplitCallbacks& cb) const {
  const auto t_start = Clock::now();
  const SplitOptions& o = options_;
  SplitResult res;
  if (x0.size() != system_.size()) {
    throw RunError(ExitCode::kInternal, "split integrator: state of wrong size");
  }
  res.x = std::move(x0);
  std::vector<double>& x = res.x;
  res.time_s = o.start_s;
  res.steps = o.steps_before;
  res.snapshots = o.snapshots_before;
  const std::vector<double> stops = stop_times(o);

  double dt_want = std::min(o.step_s, o.max_step_s);
  auto finish = [&](RunEnd end) {
    res.status = end.status;
    res.next_step_s = dt_want;
    res.residual_norm = scaled_residual_norm(system_, x, o.scale, res.time_s).value;
    res.reason =
        std::move(end.reason) + " (coupled scaled residual " + sci(res.residual_norm) + ")";
    res.wall_s = seconds_since(t_start);
    return res;
  };

  std::size_t next_stop = 0;
  std::vector<double> x1, x2;
  while (true) {
    if (auto end = limit_reached(res, o, cb)) return finish(std::move(*end));
    const double t = res.time_s;
    const double stop = stops[next_stop];
    // Land on the stop exactly; avoid a sliver step just before it.
    double dt = dt_want;
    const bool hits_stop = t + dt >= stop * (1.0 - 1e-12) || t + 1.01 * dt >= stop;
    if (hits_stop) dt = stop - t;

    double err = 0.0;
    const bool ok = try_step(x, t, dt, cb, x1, x2, err);
    if (!ok) {
      ++res.rejected_steps;
      dt_want = 0.5 * dt;
      if (dt_want < o.min_step_s) {
        return finish(
            {SolveStatus::kFailed, "step size fell below " + sci(o.min_step_s) +
                                       " s at t = " + sci(t) + " s (" +
                                       (err > 1.0 ? "error estimate " + sci(err)
                                                  : std::string("an implicit sub-step failed")) +
                                       ")"});
      }
      continue;
    }

    // Accept.
    x.swap(x1);
    const double t_new = hits_stop ? stop : t + dt;
    res.time_s = t_new;
    ++res.steps;
    if (o.adaptive) {
      // Strang splitting is second order: the local error is O(dt^3).
      const double next = dt * StepController{3, 0.9, 0.2, 5.0}.factor(err);
      // A step shortened to hit a stop says nothing about the step the error allows.
      dt_want = std::min(hits_stop ? std::max(next, dt_want) : next, o.max_step_s);
    }
    if (cb.on_time_crossed) cb.on_time_crossed(t, t_new, x);
    if (auto end =
            record_step(system_, o, cb, res, dt, err, dt_want, seconds_since(t_start), hits_stop)) {
      return finish(std::move(*end));
    }
    if (hits_stop) ++next_stop;
  }
}

}  // namespace colchem
