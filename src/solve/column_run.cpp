#include "solve/column_run.hpp"

#include <cmath>
#include <cstdio>
#include <memory>

#include "solve/progress.hpp"
#include "solve/residual_norm.hpp"
#include "solve/solver_options.hpp"
#include "solve/split_integrator.hpp"

namespace colchem {

double coupled_residual(ColumnModel& model, const SolverSpec& solver, std::span<const double> x,
                        double t) {
  return scaled_residual_norm(model.system(), x, steady_options(solver).scale, t).value;
}

namespace {

std::string sci(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3g", v);
  return buf;
}

/// Why x is no acceptable steady state, or "" (the solver's reject_reason).
std::string balance_defect(ColumnModel& model, const SolverSpec& solver,
                           std::span<const double> x) {
  const ColumnBalance b =
      model.column_balance(x, 0.0, solver.absolute_density_cm3, solver.reference_time_s);
  const auto& names = model.species();
  if (!(b.max_mole_fraction <= 1.0)) {
    return "mole fraction of " + names[b.max_species] + " is " + sci(b.max_mole_fraction) +
           " at " + sci(model.background().grid.center_cm[b.max_cell] * 1e-5) +
           " km: no physical steady state";
  }
  if (!(b.worst <= solver.balance_tolerance)) {
    return "column balance of " + names[b.worst_species] + " is " + sci(b.worst) + " > " +
           sci(solver.balance_tolerance);
  }
  return "";
}

RunOutcome run_steady(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& c) {
  std::unique_ptr<Progress> progress;
  if (c.log) progress = std::make_unique<Progress>(*c.log, "steady");
  SteadyStateCallbacks cb;
  cb.stop_requested = c.stop_requested;
  cb.reject_reason = [&](const std::vector<double>& x) { return balance_defect(model, solver, x); };
  cb.on_iteration = [&](const SteadyIteration& it) {
    if (progress) progress->update(it);
  };
  if (c.checkpoint) {
    cb.checkpoint = [&](int it, const std::vector<double>& x) { c.checkpoint(it, 0.0, x); };
  }
  const SteadyStateSolver solver_obj(model.system(), steady_options(solver));
  SteadyStateResult r = solver_obj.solve(std::move(x0), cb);
  if (progress) progress->finish(to_string(r.status));
  RunOutcome out;
  out.status = r.status;
  out.method = "steady";
  out.reason = r.reason;
  out.iterations = r.iterations;
  out.wall_s = r.wall_s;
  for (const auto& h : r.history) {
    out.history.push_back({h.iteration, 0.0, h.pseudo_step_s, h.residual_norm,
                           h.max_relative_change, h.wall_s});
  }
  out.x = std::move(r.x);
  return out;
}

RunOutcome run_split(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                     const RunControls& c, bool to_steady) {
  SplitOptions opt = split_options(solver);
  opt.to_steady_state = to_steady;
  for (const auto& inj : model.injections()) opt.breakpoints_s.push_back(inj.time_s);
  std::unique_ptr<Progress> progress;
  if (c.log) progress = std::make_unique<Progress>(*c.log, to_steady ? "split" : "transient");
  SplitCallbacks cb;
  cb.refresh = [&](const std::vector<double>& x, double) { model.refresh_photolysis(x); };
  cb.stop_requested = c.stop_requested;
  const std::size_t S = model.species_count();
  cb.on_time_crossed = [&](double t0, double t1, std::vector<double>& x) {
    apply_injections(model.injections(), model.background().grid, S, t0, t1, x);
  };
  cb.on_step = [&](const SplitStepRecord& s) {
    if (progress) progress->update(s);
  };
  if (c.checkpoint) cb.checkpoint = c.checkpoint;
  // Injections at the start time are applied before the first step.
  apply_injections(model.injections(), model.background().grid, S, opt.start_s - 1e-9 * (1.0 + std::abs(opt.start_s)),
                   opt.start_s + 1e-9 * (1.0 + std::abs(opt.start_s)), x0);
  SplitIntegrator integ(model.transport(), model.chemistry(), model.cells(), S, opt);
  SplitResult r = integ.run(std::move(x0), cb);
  if (progress) progress->finish(to_string(r.status));
  RunOutcome out;
  out.status = r.status;
  out.method = to_steady ? "split_steady" : "transient";
  out.reason = r.reason;
  out.iterations = r.steps;
  out.time_s = r.time_s;
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

}  // namespace

RunOutcome run_column(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& controls) {
  RunOutcome out;
  switch (solver.method) {
    case SolverMethod::kSteady:
      out = run_steady(model, solver, std::move(x0), controls);
      break;
    case SolverMethod::kTransient:
      out = run_split(model, solver, std::move(x0), controls, false);
      break;
    case SolverMethod::kSplitSteady:
      out = run_split(model, solver, std::move(x0), controls, true);
      break;
  }
  // Every end state is scored by the same coupled residual (a split "steady state" keeps its
  // splitting error; this number shows how far it is from the true one).
  out.residual_norm = coupled_residual(model, solver, out.x, out.time_s);
  out.balance = model.column_balance(out.x, out.time_s, solver.absolute_density_cm3,
                                     solver.reference_time_s);
  return out;
}

}  // namespace colchem
