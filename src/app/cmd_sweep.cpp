// colchem sweep SWEEP.yaml: run every variant of a scenario (module combinations x parameter
// grids x config overrides), on one process or under mpirun, score each against the
// observations, and write one NetCDF with a variant dimension plus a ranked table.
#include <mpi.h>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <cmath>
#include <iostream>
#include <limits>
#include <set>

#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "analysis/sweep_runner.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/scenario.hpp"
#include "io/sweep_loader.hpp"
#include "io/sweep_output.hpp"
#include "solve/column_run.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"

namespace colchem::app {

void add_sweep_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "sweep",
      "Run a sweep of scenario variants (modules x parameters x overrides); under "
      "mpirun the variants are shared among the ranks. Exits 5 when no variant "
      "converged; SIGINT/SIGTERM: unfinished variants are written as 'interrupted', "
      "exit 7.");
  struct Options {
    std::string file;
    std::vector<std::string> sets;
    std::string output, table;
  };
  auto o = std::make_shared<Options>();
  cmd->add_option("SWEEP", o->file, "Sweep file (YAML; README \"Sweeps\")")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--set", o->sets, "Override a value of the sweep file by its key path");
  cmd->add_option("-o,--output", o->output, "NetCDF output (default: sweep.output)");
  cmd->add_option("--table", o->table, "Ranked CSV table (default: sweep.table)");
  out.emplace_back(cmd, [o](Context& ctx) {
    const PetscSession petsc;  // initialises MPI as well
    int rank = 0, size = 1;
    MPI_Comm_rank(MPI_COMM_WORLD, &rank);
    MPI_Comm_size(MPI_COMM_WORLD, &size);
    const UnitSystem units;
    SweepSpec spec = load_sweep(o->file, o->sets);
    if (!o->output.empty()) spec.output = o->output;
    if (!o->table.empty()) spec.table = o->table;
    const auto variants = expand_variants(spec);
    // Rank 0 writes the files: it holds them for the whole sweep (one live writer per path).
    std::vector<OutputClaim> claims;
    if (rank == 0) claims = claim_outputs({spec.output, spec.table});

    // The base scenario fixes the grid and species every variant must share.
    const Scenario base = load_scenario(spec.scenario, spec.common_overrides, units);
    ColumnModel base_model(base);
    if (!base_model.has_chemistry()) {
      throw InputError(ExitCode::kConfig, SourceLocation{spec.scenario.string()}, "chemistry",
                       "a scenario with a chemistry section", "none");
    }
    // Every module a variant switches on exists in the mechanism: refused here (exit 3), not
    // as every variant failing.
    const Mechanism& mech = *base.chemistry.mechanism;
    for (const auto& ms : spec.module_sets) {
      for (const auto& name : ms.modules) {
        if (mech.module_index(name)) continue;
        std::vector<std::string> all;
        for (const auto& md : mech.modules) all.push_back(md.name);
        const auto near = nearest_word(name, all);
        throw InputError(ExitCode::kConfig, ms.where, ms.key_path,
                         "a module of mechanism '" + mech.name + "' (" +
                             fmt::format("{}", fmt::join(all, ", ")) + ")",
                         "unknown module '" + name + "'",
                         near ? "did you mean '" + *near + "'?" : std::string{});
      }
    }
    // Every swept parameter exists and every value lies within its bounds: refused here
    // (exit 3), not as every variant failing.
    for (const auto& a : spec.axes) {
      const auto idx = mech.parameter_index(a.name);
      if (!idx) {
        std::vector<std::string> all;
        for (const auto& p : mech.parameters) all.push_back(p.name);
        const auto near = nearest_word(a.name, all);
        throw InputError(ExitCode::kConfig, a.where, a.key_path,
                         "a parameter of mechanism '" + mech.name + "' (" +
                             fmt::format("{}", fmt::join(all, ", ")) + ")",
                         "unknown parameter '" + a.name + "'",
                         near ? "did you mean '" + *near + "'?" : std::string{});
      }
      const Parameter& p = mech.parameters[*idx];
      for (const double x : a.values) {
        if (!(x >= p.min && x <= p.max)) {
          throw InputError(ExitCode::kConfig, a.where, a.key_path,
                           fmt::format("values of '{}' within [{}, {}]", a.name, p.min, p.max),
                           fmt::format("{}", x));
        }
      }
    }
    const std::size_t S = base_model.species_count(), N = base_model.cells();
    ObservationSet obs;
    if (!spec.observations.empty()) {
      obs = read_observations(spec.observations, units);
      require_observed_species(obs, base_model.species());  // not as every variant failing
    }
    if (rank == 0) {
      ctx.log->info("sweep {}: {} variants on {} rank{}", spec.name, variants.size(), size,
                    size == 1 ? "" : "s");
    }
    const InterruptGuard interrupt;

    // Every variant starts from the base scenario's steady state, solved on every rank by
    // the same deterministic solve (grid sequencing as `colchem run`), so that a variant's
    // answer does not depend on the rank that ran it or on what that rank ran before: the
    // scores on 1 and 2 ranks are identical (tests/cli/sweep_test.sh). A variant that does
    // not converge from there (or every variant, when the base did not converge) starts
    // again from its own scenario's cold start, grid-sequenced as `colchem run` does.
    BaseStart base_start(spec.scenario.string(), spec.common_overrides);
    base_start.progress = rank == 0;
    const BaseSolve base_solve = solve_steady_base(base_start, base, base_model, units, ctx,
                                                   interrupt, "base state of the sweep");
    const bool base_ok = base_solve.run.ok();

    const VariantRunner runner = [&](const Variant& v) {
      VariantOutcome result;
      const Scenario sc = load_scenario(spec.scenario, v.overrides, units);
      ColumnModel model(sc);
      if (model.species_count() != S || model.cells() != N) {
        result.reason = "the variant changes the grid or the species of the base scenario";
        return result;
      }
      RunControls controls;
      controls.stop_requested = interrupt.query();
      RunOutcome r;
      if (base_ok) {
        std::vector<double> x0 = base_solve.run.x;
        model.impose_held(x0);
        controls.warm_start = true;
        r = run_column(model, sc.solver, std::move(x0), controls);
        result.warm_started = true;
      }
      if (!base_ok || (!r.ok() && r.status != SolveStatus::kInterrupted)) {
        BaseStart own(spec.scenario.string(), v.overrides);
        own.progress = false;
        StartState st;
        try {
          st = start_state(own, sc, model, units, nullptr, interrupt);
        } catch (const RunError& e) {
          if (e.code() != ExitCode::kInterrupted) throw;
          result.interrupted = true;
          result.reason = "interrupted";
          return result;
        }
        model.impose_held(st.x0);
        controls.warm_start = st.warm;
        const long before = base_ok ? r.iterations : 0;
        r = run_column(model, sc.solver, std::move(st.x0), controls);
        r.iterations += before;
        result.warm_started = false;
      }
      result.converged = r.ok();
      result.interrupted = r.status == SolveStatus::kInterrupted;
      result.reason = r.ok() ? std::string("converged")
                             : (result.interrupted ? std::string("interrupted") : r.reason);
      result.iterations = static_cast<int>(r.iterations);
      result.residual = r.residual_norm;
      result.values = mole_fractions(model, r.x);
      return result;
    };
    const VariantDone done = [&](const Variant& v, const VariantOutcome& r) {
      ctx.log->info("variant {}/{} [{}] {} on rank {}: {} ({} iterations, {:.2f} s)", v.index + 1,
                    variants.size(), v.label, r.warm_started ? "from the base" : "cold", rank,
                    r.converged ? "converged" : (r.interrupted ? r.reason : "FAILED: " + r.reason),
                    r.iterations, r.wall_seconds);
    };
    std::vector<VariantOutcome> outcomes =
        run_variants(MPI_COMM_WORLD, variants, runner, done, interrupt.query());
    // The other ranks wait for rank 0's exit code, so that none exits (and mpirun aborts the
    // job, killing rank 0) before rank 0 has written the files.
    if (rank != 0) {
      int code = 0;
      MPI_Bcast(&code, 1, MPI_INT, 0, MPI_COMM_WORLD);
      return code;
    }
    const auto finish = [](int code) {
      MPI_Bcast(&code, 1, MPI_INT, 0, MPI_COMM_WORLD);
      return code;
    };

    SweepResults res;
    res.variants = variants;
    res.species = base_model.species();
    for (const auto& a : spec.axes) res.parameter_names.push_back(a.name);
    std::set<std::string> modules;
    for (const auto& m : spec.module_sets) modules.insert(m.modules.begin(), m.modules.end());
    res.module_names.assign(modules.begin(), modules.end());
    for (auto& oc : outcomes) {
      res.mole_fraction.push_back(oc.converged ? oc.values : std::vector<double>{});
      std::vector<SpeciesScore> scores;
      if (!obs.points.empty() && oc.converged) {
        // Every variant is a fixed model, not a fit: p = 0 in the reduced chi-square.
        scores = score_column(base_model.background().grid.center_cm, res.species, oc.values, obs, 0);
      }
      res.scores.push_back(std::move(scores));
    }
    if (!obs.points.empty()) {
      // Failed variants get the observation layout with no model values, for a rectangular file.
      std::vector<SpeciesScore> layout;
      for (const auto& sc : res.scores) {
        if (!sc.empty()) {
          layout = sc;
          break;
        }
      }
      for (auto& sc : layout) {
        sc.chi2_log = sc.chi2_linear = sc.reduced_chi2_log = sc.reduced_chi2_linear =
            std::numeric_limits<double>::quiet_NaN();
        for (auto& p : sc.points) p.model = std::numeric_limits<double>::quiet_NaN();
      }
      for (auto& sc : res.scores) {
        if (sc.empty()) sc = layout;
      }
    }
    res.outcomes = std::move(outcomes);
    std::size_t converged = 0, interrupted = 0;
    for (const auto& oc : res.outcomes) {
      converged += oc.converged ? 1 : 0;
      interrupted += oc.interrupted ? 1 : 0;
    }
    const std::size_t failed = res.outcomes.size() - converged - interrupted;
    // What the files say about the sweep as a whole: complete only when nothing was
    // interrupted; a sweep with no converged variant is not a result either.
    const std::string sweep_status = interrupted > 0  ? "interrupted"
                                     : converged == 0 ? "failed"
                                                      : "complete";
    const auto ranking = rank_variants(res, spec.rank_by);
    {
      NcWriter nc(spec.output);
      write_provenance(nc, base, ctx.command_line);
      nc.global_text("colchem_sweep_file", spec.file.string());
      nc.global_number("colchem_sweep_ranks", size);
      nc.global_text(
          "colchem_sweep_status",
          fmt::format("{}: {} of {} variants converged, {} failed, {} interrupted", sweep_status,
                      converged, res.outcomes.size(), failed, interrupted));
      write_sweep_netcdf(nc, base_model.background(), res, ranking);
      nc.commit();
    }
    write_text_file(spec.table, sweep_table_csv(res, ranking, spec.rank_by));
    std::cout << sweep_table_text(res, ranking, spec.rank_by);
    ctx.log->info("wrote {} and {}; {} of {} variants converged, {} failed, {} interrupted",
                  spec.output.string(), spec.table.string(), converged, res.outcomes.size(), failed,
                  interrupted);
    if (interrupted > 0) {
      ctx.log->warn(
          "sweep interrupted (signal {}): {} variant{} not finished, recorded as "
          "'interrupted'; the results are incomplete",
          interrupt.signal_number(), interrupted, interrupted == 1 ? "" : "s");
      return finish(static_cast<int>(ExitCode::kInterrupted));
    }
    if (converged == 0) {
      ctx.log->error(
          "no variant of the sweep converged: 0 of {} ({} failed); the reasons are in the "
          "status column of {}",
          res.outcomes.size(), failed, spec.table.string());
      return finish(static_cast<int>(ExitCode::kNotConverged));
    }
    return finish(0);
  });
}

}  // namespace colchem::app
