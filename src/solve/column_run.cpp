// Runs the column dn/dt = f_transport(n) + f_chemistry(n; J(n)) (cm^-3 s^-1) to its steady
// state (pseudo-transient continuation, solve/steady_state.hpp) or through a transient
// (Strang splitting, solve/split_integrator.hpp): equations and sources in those headers,
// the driving in solve/column_run.hpp.
#include "solve/column_run.hpp"

#include <fmt/format.h>
#include <algorithm>
#include <cmath>
#include <memory>

#include "core/error.hpp"
#include "solve/progress.hpp"
#include "solve/residual_norm.hpp"
#include "solve/solver_options.hpp"
#include "solve/split_integrator.hpp"

namespace colchem {

std::string describe_sequence(const std::vector<SequenceLevel>& levels, bool with_times) {
  std::string out;
  for (const auto& l : levels) {
    out +=
        fmt::format("{}{} cells {} iterations{}{}", out.empty() ? "" : ", ", l.cells, l.iterations,
                    l.direct_beam ? " (direct beam)" : "", l.converged ? "" : " (not converged)");
    if (with_times) out += fmt::format(" ({:.2f} s)", l.wall_s);
  }
  return out;
}

double coupled_residual(ColumnModel& model, const SolverSpec& solver, std::span<const double> x,
                        double t) {
  return scaled_residual_norm(model.system(), x, steady_options(solver).scale, t).value;
}

const char* method_name(SolverMethod method) {
  switch (method) {
    case SolverMethod::kSteady:
      return "steady";
    case SolverMethod::kTransient:
      return "transient";
    case SolverMethod::kSplitSteady:
      return "split_steady";
  }
  return "unknown";
}

RunCheckpoint checkpoint_of(const RunOutcome& o) {
  return {o.method, o.iterations, o.time_s, o.step_s, o.x, o.snapshot_times_s, o.snapshots};
}

namespace {

/// Why x is no acceptable steady state, or "" (the solver's reject_reason).
std::string balance_defect(ColumnModel& model, const SolverSpec& solver,
                           std::span<const double> x) {
  const ColumnBalance b =
      model.column_balance(x, 0.0, solver.absolute_density_cm3, solver.reference_time_s);
  const auto& names = model.species();
  if (!(b.max_mole_fraction <= 1.0)) {
    return fmt::format("mole fraction of {} is {:.3g} at {:.4g} km: no physical steady state",
                       names[b.max_species], b.max_mole_fraction,
                       model.background().grid.center_cm[b.max_cell] * 1e-5);
  }
  if (!(b.worst <= solver.balance_tolerance)) {
    return fmt::format("column balance of {} is {:.3g} > {:.3g}", names[b.worst_species], b.worst,
                       solver.balance_tolerance);
  }
  return "";
}

/// from: the checkpoint a restart continues (nullptr for a fresh run).
RunOutcome run_steady(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& c, const RunCheckpoint* from) {
  SteadyStateOptions opt = steady_options(solver);
  const long before = from ? from->iteration : 0;
  if (!from && c.warm_start) {
    opt.initial_pseudo_step_s = std::min(solver.warm_pseudo_step_s, opt.max_pseudo_step_s);
  }
  if (from) {
    // The iteration limit counts the checkpoint's iterations; the pseudo-time step goes on
    // from the checkpoint's last one (the Newton limit of this scenario still applies).
    opt.max_iterations = static_cast<int>(std::max(0L, opt.max_iterations - before));
    if (from->step_s > 0.0) {
      opt.initial_pseudo_step_s = std::min(from->step_s, opt.max_pseudo_step_s);
    }
  }
  std::unique_ptr<Progress> progress;
  if (c.log) {
    ProgressOptions po;
    po.min_interval_s = c.progress_interval_s;
    po.max_iterations = opt.max_iterations;
    progress = std::make_unique<Progress>(*c.log, "steady", po);
  }
  SteadyStateCallbacks cb;
  cb.stop_requested = c.stop_requested;
  cb.reject_reason = [&](const std::vector<double>& x) { return balance_defect(model, solver, x); };
  if (c.give_up) {
    cb.give_up = [&](const SteadyIteration& it) {
      return c.give_up(before + it.iteration, it.residual_norm);
    };
  }
  cb.on_iteration = [&](const SteadyIteration& it) {
    if (progress) progress->update(it);
    // Where a solve spends its iterations: the entry that sets the residual and the one whose
    // relative change bounded the step that led here (README "Steady solves per grid").
    if (c.log != nullptr && c.log->should_log(spdlog::level::debug) && it.iteration > 0) {
      c.log->debug(
          "steady it {}: |F| {:.2e} at {}; change {:.2e} at {}{}", it.iteration, it.residual_norm,
          describe_entry(model.system(), it.worst_cell, it.worst_species), it.max_relative_change,
          describe_entry(model.system(), it.changed_cell, it.changed_species),
          it.clipped ? " (clipped)" : "");
    }
  };
  if (c.checkpoint) {
    cb.checkpoint = [&](int it, double dtau, const std::vector<double>& x) {
      c.checkpoint(RunCheckpoint{"steady", before + it, 0.0, dtau, x, {}, {}});
    };
  }
  const SteadyStateSolver solver_obj(model.system(), opt);
  SteadyStateResult r = solver_obj.solve(std::move(x0), cb);
  if (progress) progress->finish(to_string(r.status));
  RunOutcome out;
  out.status = r.status;
  out.method = "steady";
  out.reason = r.reason;
  out.iterations = before + r.iterations;
  out.wall_s = r.wall_s;
  // A checkpoint of this outcome starts again from the last pseudo-time step taken.
  out.step_s = from ? from->step_s : 0.0;
  for (const auto& h : r.history) {
    out.history.push_back({before + h.iteration, 0.0, h.pseudo_step_s, h.residual_norm,
                           h.max_relative_change, h.wall_s});
    if (h.pseudo_step_s > 0.0) out.step_s = h.pseudo_step_s;
  }
  out.x = std::move(r.x);
  return out;
}

RunOutcome run_split(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                     const RunControls& c, const RunCheckpoint* from) {
  const bool to_steady = solver.method == SolverMethod::kSplitSteady;
  SplitOptions opt = split_options(solver);
  for (const auto& inj : model.injections()) opt.breakpoints_s.push_back(inj.time_s);
  RunOutcome out;
  out.method = method_name(solver.method);
  if (from) {
    // Continue where the checkpoint stood: its time, its next step, its snapshots.
    opt.start_s = from->time_s;
    if (from->step_s > 0.0) opt.step_s = from->step_s;
    opt.steps_before = from->iteration;
    for (std::size_t k = 0; k < from->snapshots.size(); ++k) {
      opt.snapshots_before.push_back({from->snapshot_times_s[k], from->snapshots[k]});
    }
    if (opt.start_s >= opt.end_s) {  // nothing left to integrate
      out.status = to_steady ? SolveStatus::kNotConverged : SolveStatus::kCompleted;
      out.reason = "the checkpoint is at the end time already";
      out.iterations = from->iteration;
      out.time_s = from->time_s;
      out.step_s = from->step_s;
      out.snapshot_times_s = from->snapshot_times_s;
      out.snapshots = from->snapshots;
      out.x = std::move(x0);
      return out;
    }
  }
  std::unique_ptr<Progress> progress;
  if (c.log) {
    ProgressOptions po;
    po.min_interval_s = c.progress_interval_s;
    if (!to_steady) {
      po.start_s = opt.start_s;
      po.end_s = opt.end_s;
    }
    progress = std::make_unique<Progress>(*c.log, to_steady ? "split" : "transient", po);
  }
  SplitCallbacks cb;
  cb.refresh = [&](const std::vector<double>& x, double) { model.refresh_photolysis(x); };
  cb.stop_requested = c.stop_requested;
  const std::size_t S = model.species_count();
  // Each injection is applied once, after the step [t0, t1) that contains its time, whether
  // the run starts at that time or continues from a checkpoint taken there.
  cb.on_time_crossed = [&](double t0, double t1, std::vector<double>& x) {
    apply_injections(model.injections(), model.background().grid, S, t0, t1, x);
  };
  cb.on_step = [&](const SplitStepRecord& s) {
    if (progress) progress->update(s);
  };
  if (c.checkpoint) {
    cb.checkpoint = [&](const SplitResult& r, double next_step_s) {
      RunCheckpoint cp{out.method, r.steps, r.time_s, next_step_s, r.x, {}, {}};
      for (const auto& snap : r.snapshots) {
        cp.snapshot_times_s.push_back(snap.time_s);
        cp.snapshots.push_back(snap.x);
      }
      c.checkpoint(cp);
    };
  }
  SplitIntegrator integ(model.transport(), model.chemistry(), model.cells(), S, opt);
  SplitResult r = integ.run(std::move(x0), cb);
  if (progress) progress->finish(to_string(r.status));
  out.status = r.status;
  out.reason = r.reason;
  out.iterations = r.steps;
  out.time_s = r.time_s;
  out.step_s = r.next_step_s;
  out.wall_s = r.wall_s;
  for (const auto& h : r.history) {
    out.history.push_back({h.step, h.time_s, h.step_s, h.residual_norm, h.error, h.wall_s});
  }
  for (auto& s : r.snapshots) {
    out.snapshot_times_s.push_back(s.time_s);
    out.snapshots.push_back(std::move(s.x));
  }
  out.x = std::move(r.x);
  return out;
}

RunOutcome run_any(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                   const RunControls& controls, const RunCheckpoint* from) {
  RunOutcome out = solver.method == SolverMethod::kSteady
                       ? run_steady(model, solver, std::move(x0), controls, from)
                       : run_split(model, solver, std::move(x0), controls, from);
  // Every end state is scored by the same coupled residual (a split "steady state" keeps its
  // splitting error; this number shows how far it is from the true one).
  out.residual_norm = coupled_residual(model, solver, out.x, out.time_s);
  out.balance =
      model.column_balance(out.x, out.time_s, solver.absolute_density_cm3, solver.reference_time_s);
  return out;
}

}  // namespace

RunOutcome run_column(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& controls) {
  return run_any(model, solver, std::move(x0), controls, nullptr);
}

RunOutcome continue_column(ColumnModel& model, const SolverSpec& solver, const RunCheckpoint& from,
                           const RunControls& controls) {
  if (from.method != method_name(solver.method) ||
      from.x.size() != model.cells() * model.species_count() ||
      from.snapshots.size() != from.snapshot_times_s.size()) {
    throw RunError(ExitCode::kInternal,
                   "continue_column: a checkpoint of another method or "
                   "column (method '" +
                       from.method + "')");
  }
  return run_any(model, solver, from.x, controls, &from);
}

}  // namespace colchem
