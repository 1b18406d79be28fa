// colchem run CONFIG [-o OUT.nc] [--set key=value ...] [--restart OLD.nc]: solve a scenario's
// column (coupled steady state or transient) and write its CF NetCDF output.
#include <fmt/format.h>

#include <algorithm>
#include <iostream>
#include <optional>

#include "analysis/observations.hpp"
#include "analysis/resolution_runner.hpp"
#include "analysis/score.hpp"
#include "app/commands.hpp"
#include "app/summary.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/run_output.hpp"
#include "io/scenario.hpp"
#include "io/score_output.hpp"
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
}  // namespace

void add_run_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand("run", "Solve a scenario's column and write its CF NetCDF output.");
  struct Options {
    std::string config, output, restart;
    std::vector<std::string> sets;
    double progress_every = 0.2;
  };
  auto o = std::make_shared<Options>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML)")->required()->check(CLI::ExistingFile);
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
  out.emplace_back(cmd, [o](Context& ctx) {
    const UnitSystem units;
    Scenario sc = load_scenario(o->config, o->sets, units);
    if (!o->output.empty()) sc.output.file = o->output;
    refuse_output_onto_input(sc.output.file, {{"the scenario file", o->config},
                                              {"the restart file", o->restart},
                                              {"the observation file", sc.observations}});
    // One live run per output file (and its checkpoint), held until the command ends.
    const auto claims = claim_outputs({sc.output.file, checkpoint_path(sc.output.file)});
    ColumnModel model(sc);
    ctx.log->info("scenario {}: {} cells, {} species", sc.name, model.cells(), model.species_count());
    std::vector<SpeciesScore> scores;
    ObservationSet obs;
    if (!sc.observations.empty()) obs = read_observations(sc.observations, units);

    if (!model.has_chemistry()) {  // the background column alone
      RunOutcome none;
      none.status = SolveStatus::kCompleted;
      none.method = "none";
      none.reason = "no chemistry section: background column only";
      write_run_file(sc.output.file, sc, model, none, ctx.command_line, {});
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
    std::vector<double> x0;
    bool warm = false;  // x0 is a converged state (a restart file or a grid sequence)
    if (!o->restart.empty()) {
      RestartFile rf = read_checkpoint(o->restart, model, sc.solver.method);
      resume = std::move(rf.checkpoint);
      if (resume) {
        if (resume->method == "steady") {
          ctx.log->info(
              "continuing the steady solve of {} after {} iterations, pseudo-time "
              "step {:.4g} s",
              o->restart, resume->iteration, resume->step_s);
        } else {
          ctx.log->info(
              "continuing the {} run of {} at t = {:.6g} s after {} steps, next "
              "step {:.4g} s",
              resume->method, o->restart, resume->time_s, resume->iteration, resume->step_s);
        }
      } else {
        x0 = model.initial_state();
        const std::size_t n = model.take_restart(o->restart, x0);
        // A converged state of the same scenario (on another grid, say) starts warm.
        warm = n == model.species_count();
        ctx.log->info("initial state from {} ({}): {} of {} species; the run starts afresh",
                      o->restart, rf.why_not, n, model.species_count());
      }
    } else {
      x0 = model.initial_state();
    }
    // A steady cold start on a fine grid starts from the same scenario solved on coarser
    // grids (io/solver_section.hpp, grid_sequencing).
    std::vector<SequenceLevel> sequence;
    if (o->restart.empty() && sc.solver.method == SolverMethod::kSteady &&
        sc.solver.grid_sequencing) {
      SolveRequest req;
      req.config = o->config;
      req.overrides = o->sets;
      req.log = ctx.log.get();
      req.stop_requested = interrupt.query();
      SequencedStart seq = sequenced_start(req, model, sc.solver.coarsest_cells, units);
      sequence = std::move(seq.levels);
      if (!seq.x0.empty()) {
        x0 = std::move(seq.x0);
        // A start from direct-beam levels is no converged state of this (two-stream)
        // scenario: its first step at solver.warm_pseudo_step (1e8 s) changed densities
        // 1e10-fold, and whether PTC recovered from there depended on round-off (the
        // BLAS library; issue 10). It starts with solver.initial_pseudo_step instead.
        warm = std::none_of(sequence.begin(), sequence.end(),
                            [](const SequenceLevel& l) { return l.direct_beam; });
      }
      for (const SequenceLevel& l : sequence) {
        if (!l.converged) {
          ctx.log->warn("grid sequencing: the solve on {} cells did not converge in {} "
                        "iterations; the next grid starts from the last converged one (or cold)",
                        l.cells, l.iterations);
        }
      }
    }
    const auto ckpt = checkpoint_path(sc.output.file);
    RunControls controls;
    controls.log = ctx.log.get();
    controls.stop_requested = interrupt.query();
    controls.warm_start = warm;
    controls.progress_interval_s = o->progress_every;
    controls.checkpoint = [&](const RunCheckpoint& cp) {
      write_checkpoint(ckpt, sc, model, cp, ctx.command_line);
    };
    RunOutcome r = resume ? continue_column(model, sc.solver, *resume, controls)
                          : run_column(model, sc.solver, std::move(x0), controls);
    r.sequence = std::move(sequence);

    if (r.status == SolveStatus::kInterrupted) {
      write_checkpoint(ckpt, sc, model, checkpoint_of(r), ctx.command_line);
      ctx.log->warn("interrupted (signal {}); checkpoint written to {}; continue with "
                    "--restart {}",
                    interrupt.signal_number(), ckpt.string(), ckpt.string());
      return static_cast<int>(ExitCode::kInterrupted);
    }
    if (!obs.points.empty()) {
      const std::size_t S = model.species_count(), N = model.cells();
      std::vector<double> f(S * N);
      for (std::size_t s = 0; s < S; ++s) {
        for (std::size_t j = 0; j < N; ++j) {
          f[s * N + j] = r.x[j * S + s] / model.background().air_density_cm3[j];
        }
      }
      scores = score_column(model.background().grid.center_cm, model.species(), f, obs, 0);
    }
    write_run_file(sc.output.file, sc, model, r, ctx.command_line, scores);
    std::cout << summarize_run(sc, model, r);
    if (!scores.empty()) std::cout << format_scores(scores);
    ctx.log->info("wrote {}", sc.output.file.string());
    if (!r.ok()) {
      ctx.log->error("{} solve did not converge: {}", r.method, r.reason);
      return static_cast<int>(ExitCode::kNotConverged);
    }
    return 0;
  });
}

}  // namespace colchem::app
