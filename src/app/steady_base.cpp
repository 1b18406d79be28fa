// The start and the base solve the commands share (app/steady_base.hpp).
#include "app/steady_base.hpp"

#include <algorithm>

#include "analysis/score.hpp"
#include "core/column_state.hpp"
#include "core/error.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"

namespace colchem::app {

SolveRequest solve_request(const BaseStart& start, spdlog::logger* log,
                           const InterruptGuard& interrupt) {
  SolveRequest req;
  req.config = start.config;
  req.overrides = start.sets;
  req.log = log;
  req.stop_requested = interrupt.query();
  req.load_scenario = load_scenario;
  return req;
}

StartState start_state(const BaseStart& start, const Scenario& sc, const ColumnModel& model,
                       const UnitSystem& units, spdlog::logger* log,
                       const InterruptGuard& interrupt) {
  StartState st;
  st.x0 = model.initial_state();
  if (!start.restart.empty()) {
    const std::size_t n = model.take_restart(read_model_column(start.restart), st.x0);
    // A converged state of the same scenario (on another grid, say) starts warm.
    st.warm = n == model.species_count();
    if (log != nullptr) {
      log->info("initial state from {}{}: {} of {} species", start.restart,
                start.restart_note.empty() ? "" : " (" + start.restart_note + ")", n,
                model.species_count());
    }
    return st;
  }
  // A steady cold start on a fine grid starts from the same scenario solved on coarser
  // grids (solve/solver_spec.hpp, grid_sequencing).
  if (sc.solver.method != SolverMethod::kSteady || !sc.solver.grid_sequencing ||
      !start.grid_sequencing) {
    return st;
  }
  SequencedStart seq =
      sequenced_start(solve_request(start, log, interrupt), model, sc.solver.coarsest_cells,
                      sc.solver.sequence_tolerance, units);
  st.sequence = std::move(seq.levels);
  if (!seq.x0.empty()) {
    st.x0 = std::move(seq.x0);
    // A start from direct-beam levels is no converged state of this (two-stream)
    // scenario: its first step at solver.warm_pseudo_step (1e8 s) changed densities
    // 1e10-fold, and whether PTC recovered from there depended on round-off (the
    // BLAS library; issue 10). It starts with solver.initial_pseudo_step instead.
    st.warm = std::none_of(st.sequence.begin(), st.sequence.end(),
                           [](const SequenceLevel& l) { return l.direct_beam; });
  }
  for (const SequenceLevel& l : st.sequence) {
    if (!l.converged && log != nullptr) {
      log->warn(
          "grid sequencing: the solve on {} cells did not converge in {} "
          "iterations; the next grid starts from the last converged one (or cold)",
          l.cells, l.iterations);
    }
  }
  return st;
}

void require_steady_chemistry(const Scenario& sc, const ColumnModel& model,
                              std::string_view purpose) {
  const SourceLocation where{sc.file.string()};
  if (sc.solver.method != SolverMethod::kSteady) {
    throw InputError(ExitCode::kConfig, where, "solver.method",
                     "steady (" + std::string(purpose) + "; --set solver.method=steady)",
                     "'" + std::string(method_name(sc.solver.method)) + "'");
  }
  if (!model.has_chemistry()) {
    throw InputError(ExitCode::kConfig, where, "chemistry", "a chemistry section", "none");
  }
}

std::filesystem::path observation_file(const std::string& option, const Scenario& sc) {
  const std::filesystem::path file =
      option.empty() ? sc.observations : std::filesystem::path(option);
  if (file.empty()) {
    throw InputError(ExitCode::kUsage, SourceLocation{sc.file.string()}, "--observations",
                     "an observation file (the option or the scenario's `observations`)", "none");
  }
  return file;
}

ObservationSet read_model_observations(const std::filesystem::path& file, const ColumnModel& model,
                                       const UnitSystem& units) {
  ObservationSet obs;
  if (!file.empty()) {
    obs = read_observations(file, units);
    require_observed_species(obs, model.species());
  }
  return obs;
}

BaseSolve solve_steady_base(const BaseStart& start, const Scenario& sc, ColumnModel& model,
                            const UnitSystem& units, Context& ctx, const InterruptGuard& interrupt,
                            std::string_view what) {
  spdlog::logger* progress = start.progress ? ctx.log.get() : nullptr;
  StartState st = start_state(start, sc, model, units, progress, interrupt);
  RunControls controls;
  controls.log = progress;
  controls.stop_requested = interrupt.query();
  BaseSolve b;
  b.run = run_column(model, sc.solver, std::move(st.x0), controls);
  b.run.sequence = std::move(st.sequence);
  if (b.run.status == SolveStatus::kInterrupted) {
    ctx.log->warn("interrupted (signal {}) during the {}", interrupt.signal_number(), what);
    b.exit_code = static_cast<int>(ExitCode::kInterrupted);
  } else if (!b.run.ok()) {
    ctx.log->error("the {} did not converge: {}", what, b.run.reason);
    b.exit_code = static_cast<int>(ExitCode::kNotConverged);
  } else if (progress != nullptr) {
    ctx.log->info("{}: {} iterations, {:.3f} s", what, b.run.iterations, b.run.wall_s);
  }
  return b;
}

std::vector<double> mole_fractions(const ColumnModel& model, std::span<const double> x) {
  return colchem::mole_fractions(x, model.background().air_density_cm3);
}

}  // namespace colchem::app
