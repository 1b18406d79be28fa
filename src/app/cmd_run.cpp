// colchem run CONFIG [-o OUT.nc] [--set key=value ...] [--restart OLD.nc]: solve a scenario's
// column (coupled steady state or transient) and write its CF NetCDF output.
#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <iostream>
#include <optional>
#include <sstream>

#include "analysis/observations.hpp"
#include "solve/resolution_runner.hpp"
#include "analysis/score.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "app/summary.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/restart_file.hpp"
#include "io/scenario.hpp"
#include "io/sweep_file.hpp"
#include "report/run_report.hpp"
#include "report/score_report.hpp"
#include "solve/column_run.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"

namespace colchem::app {

namespace {
std::filesystem::path checkpoint_path(const std::filesystem::path& out) {
  std::filesystem::path p = out;
  p.replace_extension(".checkpoint.nc");
  return p;
}

struct RunCliOptions {
  std::string config, output, restart, from_sweep;
  std::vector<std::string> sets;
  double progress_every = 0.2;
  long variant = -1;
};

/// --from-sweep FILE --variant N: the base scenario and the overrides of variant N as the
/// sweep stored them, followed by the command line's own --set values.
void take_sweep_variant(RunCliOptions& o) {
  if (o.from_sweep.empty() != (o.variant < 0)) {
    throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "--from-sweep/--variant",
                     "both --from-sweep FILE and --variant N, or neither",
                     o.from_sweep.empty() ? "--variant alone" : "--from-sweep alone");
  }
  if (o.from_sweep.empty()) {
    if (o.config.empty()) {
      throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "CONFIG",
                       "a scenario file, or --from-sweep FILE --variant N", "neither");
    }
    return;
  }
  if (!o.config.empty()) {
    throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "CONFIG",
                     "no scenario file with --from-sweep (the sweep file names it)",
                     "'" + o.config + "'");
  }
  const SweepFileRecord rec = read_sweep_file(o.from_sweep);
  const auto v = static_cast<std::size_t>(o.variant);
  if (v >= rec.overrides.size()) {
    throw InputError(
        ExitCode::kUsage, SourceLocation{"command line"}, "--variant",
        fmt::format("a variant of {} (0 to {})", o.from_sweep, rec.overrides.size() - 1),
        std::to_string(o.variant));
  }
  o.config = rec.scenario;
  std::vector<std::string> sets;
  std::istringstream in(rec.overrides[v]);
  for (std::string l; std::getline(in, l);) {
    if (!l.empty()) sets.push_back(l);
  }
  sets.insert(sets.end(), o.sets.begin(), o.sets.end());
  o.sets = std::move(sets);
}

/// The checkpoint in `restart` when it is one of this column and method (logged); else
/// none, and `start` notes why the file only gives the initial state.
std::optional<RunCheckpoint> read_restart(const std::string& restart, const ColumnModel& model,
                                          const Scenario& sc, BaseStart& start,
                                          spdlog::logger& log) {
  RestartFile rf = read_checkpoint(restart, model, sc.solver.method);
  std::optional<RunCheckpoint> resume = std::move(rf.checkpoint);
  if (resume) {
    if (resume->method == "steady") {
      log.info(
          "continuing the steady solve of {} after {} iterations, pseudo-time "
          "step {:.4g} s",
          restart, resume->iteration, resume->step_s);
    } else {
      log.info(
          "continuing the {} run of {} at t = {:.6g} s after {} steps, next "
          "step {:.4g} s",
          resume->method, restart, resume->time_s, resume->iteration, resume->step_s);
    }
  } else {
    start.restart_note = rf.why_not + "; the run starts afresh";
  }
  return resume;
}

int run_scenario(RunCliOptions o, Context& ctx) {
  take_sweep_variant(o);
  if (!o.from_sweep.empty()) {
    ctx.log->info("variant {} of sweep file {}: {} with {}", o.variant, o.from_sweep, o.config,
                  fmt::join(o.sets, " "));
  }
  const UnitSystem units;
  Scenario sc = load_scenario(o.config, o.sets, units);
  if (!o.output.empty()) sc.output.file = o.output;
  refuse_output_onto_input(sc.output.file, {{"the scenario file", o.config},
                                            {"the restart file", o.restart},
                                            {"the observation file", sc.observations}});
  // One live run per output file (and its checkpoint), held until the command ends.
  const auto claims = claim_outputs({sc.output.file, checkpoint_path(sc.output.file)});
  ColumnModel model(sc);
  ctx.log->info("scenario {}: {} cells, {} species", sc.name, model.cells(), model.species_count());
  std::vector<SpeciesScore> scores;
  ObservationSet obs;
  if (!sc.observations.empty()) {
    obs = read_observations(sc.observations, units);
    require_observed_species(obs, model.species());  // before solving, not after
  }

  if (!model.has_chemistry()) {  // the background column alone
    RunOutcome none;
    none.status = SolveStatus::kCompleted;
    none.method = "none";
    none.reason = "no chemistry section: background column only";
    write_dataset(run_dataset(sc, model, none, ctx.command_line, {}), sc.output.file);
    ctx.log->info("wrote {} (background only)", sc.output.file.string());
    return 0;
  }

  // PETSc (and MPI under it) only where a solver uses it: the coupled steady state. The
  // split integrators need neither, so a transient starts without initialising MPI.
  std::optional<PetscSession> petsc;
  if (sc.solver.method == SolverMethod::kSteady) petsc.emplace();
  const InterruptGuard interrupt;
  // A checkpoint of this column and method continues exactly where it stopped; any other
  // file only gives the initial state (interpolated onto this grid), from the start time.
  std::optional<RunCheckpoint> resume;
  BaseStart start(o.config, o.sets, o.restart);
  if (!o.restart.empty()) resume = read_restart(o.restart, model, sc, start, *ctx.log);
  StartState st;
  if (!resume) st = start_state(start, sc, model, units, ctx.log.get(), interrupt);
  const auto ckpt = checkpoint_path(sc.output.file);
  RunControls controls;
  controls.log = ctx.log.get();
  controls.stop_requested = interrupt.query();
  controls.warm_start = st.warm;
  controls.progress_interval_s = o.progress_every;
  controls.checkpoint = [&](const RunCheckpoint& cp) {
    write_dataset(checkpoint_dataset(sc, model, cp, ctx.command_line), ckpt);
  };
  RunOutcome r = resume ? continue_column(model, sc.solver, *resume, controls)
                        : run_column(model, sc.solver, std::move(st.x0), controls);
  r.sequence = std::move(st.sequence);

  if (r.status == SolveStatus::kInterrupted) {
    write_dataset(checkpoint_dataset(sc, model, checkpoint_of(r), ctx.command_line), ckpt);
    ctx.log->warn(
        "interrupted (signal {}); checkpoint written to {}; continue with "
        "--restart {}",
        interrupt.signal_number(), ckpt.string(), ckpt.string());
    return static_cast<int>(ExitCode::kInterrupted);
  }
  if (!obs.points.empty()) {
    scores = score_column(model.background().grid.center_cm, model.species(),
                          mole_fractions(model, r.x), obs, 0);
  }
  write_dataset(run_dataset(sc, model, r, ctx.command_line, scores), sc.output.file);
  std::cout << summarize_run(sc, model, r);
  if (!scores.empty()) std::cout << format_scores(scores);
  ctx.log->info("wrote {}", sc.output.file.string());
  if (!r.ok()) {
    ctx.log->error("{} solve did not converge: {}", r.method, r.reason);
    return static_cast<int>(ExitCode::kNotConverged);
  }
  return 0;
}

}  // namespace

void add_run_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand("run", "Solve a scenario's column and write its CF NetCDF output.");
  auto o = std::make_shared<RunCliOptions>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML; or --from-sweep and --variant)")
      ->check(CLI::ExistingFile);
  cmd->add_option("--from-sweep", o->from_sweep,
                  "Run one variant of a sweep: the sweep's NetCDF file (its base scenario and "
                  "the variant's stored overrides; --set values apply after them)")
      ->check(CLI::ExistingFile);
  cmd->add_option("--variant", o->variant,
                  "With --from-sweep: the variant's index (0-based, the 'variant' column of "
                  "the ranked table)")
      ->check(CLI::NonNegativeNumber);
  cmd->add_option("-o,--output", o->output, "Output NetCDF file (default: output.file of the "
                                            "scenario, else SCENARIO_NAME.nc)");
  cmd->add_option("--set", o->sets, "Override a config value by its dotted key path, e.g. "
                                    "--set grid.cells=120 (repeatable)");
  cmd->add_option("--restart", o->restart,
                  "Continue from a checkpoint of this scenario (its model time, step and "
                  "snapshots), or start from the state of any other run file (interpolated "
                  "onto this grid)")
      ->check(CLI::ExistingFile);
  cmd->add_option("--progress-every", o->progress_every,
                  "At most one progress line per this many seconds (0: every iteration or step)")
      ->check(CLI::NonNegativeNumber)
      ->capture_default_str();
  out.emplace_back(cmd, [o](Context& ctx) { return run_scenario(*o, ctx); });
}

}  // namespace colchem::app
