// colchem sensitivity CONFIG --objective KIND [...]: solves the scenario's steady state (or
// starts from a run file), then the discrete adjoint for one objective, and prints the
// reactions and parameters ranked by their influence on it (solve/adjoint.hpp); writes the
// ranked tables, the profiles dG/d ln k_r(z) and the adjoint to CF NetCDF. --check N
// compares the adjoint gradients with central finite differences of the full nonlinear
// solve; --benchmark times one warm steady solve against the adjoint.
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <iostream>
#include <numeric>
#include <optional>

#include "analysis/observations.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/stopwatch.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/scenario.hpp"
#include "report/sensitivity_report.hpp"
#include "solve/adjoint.hpp"
#include "solve/column_run.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"
#include "solve/resolution_runner.hpp"
#include "solve/solver_options.hpp"

namespace colchem::app {

namespace {

std::string species_list(const std::vector<std::string>& names) {
  std::string list;
  for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
  return list;
}

std::size_t species_of(const ColumnModel& model, const std::string& name, const Scenario& sc,
                       const std::string& option) {
  const auto& names = model.species();
  const auto it = std::find(names.begin(), names.end(), name);
  if (name.empty() || it == names.end()) {
    throw InputError(ExitCode::kUsage, SourceLocation{sc.file.string()}, option,
                     "a species of the model (" + species_list(names) + ")",
                     name.empty() ? std::string("none") : "'" + name + "'");
  }
  if (model.held(static_cast<std::size_t>(it - names.begin()))) {
    throw InputError(ExitCode::kUsage, SourceLocation{sc.file.string()}, option,
                     "a species that is not held fixed", "'" + name + "' (held)");
  }
  return static_cast<std::size_t>(it - names.begin());
}

/// The reaction given by its id, or by its equation when no other reaction has that equation.
std::size_t reaction_of(const ColumnModel& model, const std::string& text, const Scenario& sc) {
  const Kinetics& kin = model.chemistry().kinetics();
  std::string why = "none";
  if (!text.empty()) {
    if (const auto m = kin.mechanism().find_reaction(text, &why)) {
      for (std::size_t r = 0; r < kin.reaction_count(); ++r) {
        if (kin.mechanism_reaction(r) == *m) return r;
      }
      why = "'" + text + "', a reaction of a module that is off";
    }
  }
  throw InputError(ExitCode::kUsage, SourceLocation{sc.file.string()}, "--reaction",
                   "an active reaction: its id in the mechanism file (or its equation, when no "
                   "other reaction has that equation)",
                   why);
}

std::vector<std::size_t> ranked(const std::vector<SensitivityRow>& rows) {
  std::vector<std::size_t> idx(rows.size());
  std::iota(idx.begin(), idx.end(), 0);
  std::stable_sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
    return std::abs(rows[a].dG) > std::abs(rows[b].dG);
  });
  return idx;
}

struct SensitivityCliOptions {
  std::string config, output, restart, objective = "chi2", species, reaction, observations;
  std::vector<std::string> sets, check_parameters;
  double altitude_km = std::nan("");
  std::size_t bands = 5, top = 15, check = 0;
  double check_tolerance = 1e-4, check_step = 1e-3;
  bool benchmark = false;
};

/// The objective the options name; `obs` holds the observations of a chi-square one.
Objective make_objective(const SensitivityCliOptions& o, const ColumnModel& model,
                         const Scenario& sc, const UnitSystem& units, ObservationSet& obs) {
  Objective obj;
  if (o.objective == "chi2" || o.objective == "chi2_linear") {
    const std::filesystem::path file = observation_file(o.observations, sc);
    obs = read_observations(file, units);
    obj.kind = ObjectiveKind::kChiSquare;
    obj.observations = &obs;
    obj.log_space = o.objective == "chi2";
    obj.label = fmt::format("{} against {}", o.objective, file.filename().string());
    obj.units = "1";
  } else if (o.objective == "mole_fraction") {
    obj.kind = ObjectiveKind::kMoleFraction;
    obj.species = species_of(model, o.species, sc, "--species");
    const auto& zc = model.background().grid.center_cm;
    const double z = o.altitude_km * constants::kCmPerKm;
    if (!(z >= zc.front() && z <= zc.back())) {
      throw InputError(
          ExitCode::kUsage, SourceLocation{sc.file.string()}, "--altitude",
          fmt::format("an altitude within the cell centres, {:.4g}-{:.4g} km", zc.front() * 1e-5,
                      zc.back() * 1e-5),
          std::isnan(o.altitude_km) ? std::string("none") : fmt::format("'{} km'", o.altitude_km));
    }
    obj.altitude_cm = z;
    obj.label = fmt::format("mole fraction of {} at {} km", o.species, o.altitude_km);
    obj.units = "1";
  } else if (o.objective == "column") {
    obj.kind = ObjectiveKind::kColumn;
    obj.species = species_of(model, o.species, sc, "--species");
    obj.label = fmt::format("column of {}", o.species);
    obj.units = "cm-2";
  } else {
    obj.kind = ObjectiveKind::kRate;
    obj.reaction = reaction_of(model, o.reaction, sc);
    obj.label =
        fmt::format("column rate of {}",
                    model.chemistry()
                        .kinetics()
                        .mechanism()
                        .reactions[model.chemistry().kinetics().mechanism_reaction(obj.reaction)]
                        .equation);
    obj.units = "cm-2 s-1";
  }
  return obj;
}

/// The ranked reaction table (the `top` rows) and the parameter table.
void print_sensitivities(const SensitivityCliOptions& o, const Objective& obj,
                         const SensitivityResult& res) {
  std::cout << fmt::format("objective: {} = {:.6g} {}\n", obj.label, res.value, obj.units);
  std::cout << fmt::format(
      "adjoint: {:.3f} s (Jacobian {:.3f} s, photolysis coupling {} {:.3f} s, "
      "transposed solve {:.3f} s with {} GMRES iterations, parameters {:.3f} s)\n",
      res.total_s, res.jacobian_s,
      !res.photolysis_coupled  ? std::string("none")
      : res.photolysis_reverse ? std::string("in reverse mode")
                               : fmt::format("assembled over {} columns", res.absorber_columns),
      res.photolysis_jacobian_s, res.solve_s, res.krylov_iterations, res.parameters_s);
  const auto shares = reaction_shares(res);
  std::size_t id_w = 2;
  for (const auto& r : res.reactions) id_w = std::max(id_w, r.parameter.name.size());
  std::cout << fmt::format("\n{:>4}  {:<{}} {:<40} {:>14} {:>8}\n", "rank", "id", id_w, "equation",
                           "dlnG/dlnk", "share");
  const auto order = ranked(res.reactions);
  for (std::size_t i = 0; i < std::min(o.top, order.size()); ++i) {
    const auto& r = res.reactions[order[i]];
    std::cout << fmt::format("{:>4}  {:<{}} {:<40} {:>14.6g} {:>7.1f}%\n", i + 1, r.parameter.name,
                             id_w, r.equation, r.log_sensitivity, 100.0 * shares[order[i]]);
  }
  std::cout << fmt::format("\n{:<34} {:>12} {:>14} {:>14}\n", "parameter", "value", "dG/dp",
                           "dlnG/dlnp");
  for (std::size_t i : ranked(res.parameters)) {
    const auto& p = res.parameters[i];
    const bool logp = p.parameter.kind != ParameterKind::kNamed;
    std::cout << fmt::format("{:<34} {:>12.5g} {:>14.6g} {:>14.6g}{}\n", p.parameter.name,
                             p.parameter.value, p.dG + 0.0, p.log_sensitivity + 0.0,
                             logp ? "  (per ln p)" : "");
  }
}

/// Times one warm steady solve (K x 1.01 from the state) against the adjoint.
void print_benchmark(ColumnModel& model, const RunOutcome& run, const SensitivityResult& res,
                     const SteadyStateOptions& tight) {
  ParameterRef k;
  k.kind = ParameterKind::kEddy;
  k.edge_lo = 0;
  k.edge_hi = model.cells();
  perturb_parameter(model, k, std::log(1.01));
  const auto t0 = std::chrono::steady_clock::now();
  const SteadyStateResult warm = SteadyStateSolver(model.system(), tight).solve(run.x);
  const double warm_s = seconds_since(t0);
  perturb_parameter(model, k, 0.0);
  model.refresh(run.x);
  std::cout << fmt::format(
      "\nbenchmark: {} cells, {} reactions, {} parameters: adjoint (all sensitivities) "
      "{:.3f} s; one warm steady solve (K x 1.01) {:.3f} s, {} iterations ({}); ratio "
      "{:.2f}\n",
      model.cells(), res.reactions.size(), res.parameters.size(), res.total_s, warm_s,
      warm.iterations, to_string(warm.status), res.total_s / warm_s);
}

/// Checks the adjoint's gradients against central finite differences of the full steady
/// solve: 0, or ExitCode::kInternal when one disagrees.
int check_sensitivities(const SensitivityCliOptions& o, ColumnModel& model, const Scenario& sc,
                        const Objective& obj, const RunOutcome& run, const SensitivityResult& res,
                        SteadyStateOptions tight) {
  int status = 0;
  // Tight tolerances: G at p +- h must be accurate to far below (dG/dp) h * tolerance.
  tight.tolerance = std::min(tight.tolerance, 1e-12);
  tight.step_tolerance = 1e-9;
  tight.initial_pseudo_step_s = tight.max_pseudo_step_s;
  tight.max_iterations = 60;
  std::vector<const SensitivityRow*> rows;
  const auto rorder = ranked(res.reactions);
  for (std::size_t i = 0; i < std::min(o.check, rorder.size()); ++i) {
    rows.push_back(&res.reactions[rorder[i]]);
  }
  // --check 0 with --check-parameter: only the parameters named.
  bool named = o.check == 0, boundary = o.check == 0, eddy = o.check == 0;
  for (std::size_t i : ranked(res.parameters)) {
    const auto& p = res.parameters[i];
    if (p.parameter.kind == ParameterKind::kNamed && !named && p.dG != 0.0) {
      rows.push_back(&p);
      named = true;
    } else if (p.parameter.kind == ParameterKind::kBoundary && !boundary) {
      rows.push_back(&p);
      boundary = true;
    } else if (p.parameter.kind == ParameterKind::kEddy && p.parameter.edge_lo == 0 &&
               p.parameter.edge_hi == model.cells() && !eddy) {
      rows.push_back(&p);
      eddy = true;
    }
  }
  for (const auto& name : o.check_parameters) {
    const auto it = std::find_if(res.parameters.begin(), res.parameters.end(),
                                 [&](const SensitivityRow& r) { return r.parameter.name == name; });
    if (it == res.parameters.end()) {
      std::string list;
      for (const auto& r : res.parameters) list += (list.empty() ? "" : ", ") + r.parameter.name;
      throw InputError(ExitCode::kUsage, SourceLocation{sc.file.string()}, "--check-parameter",
                       "a parameter of the table (" + list + ")", "'" + name + "'");
    }
    if (std::find(rows.begin(), rows.end(), &*it) == rows.end()) rows.push_back(&*it);
  }
  std::cout << fmt::format(
      "\nfinite-difference check (central, full steady solve):\n"
      "{:<34} {:>16} {:>16} {:>10}\n",
      "parameter", "adjoint", "finite diff.", "rel. diff.");
  double worst = 0.0;
  for (const SensitivityRow* row : rows) {
    const bool logp = row->parameter.kind != ParameterKind::kNamed;
    const double h =
        logp ? o.check_step : o.check_step * std::max(std::abs(row->parameter.value), 1e-3);
    const FiniteDifference fd = finite_difference(model, obj, run.x, row->parameter, h, tight);
    const double rel = std::abs(row->dG - fd.dG) / std::max(std::abs(fd.dG), std::abs(row->dG));
    const bool ok = fd.converged && (rel <= o.check_tolerance || row->dG == fd.dG);
    worst = std::max(worst, fd.converged ? rel : 1.0);
    std::cout << fmt::format(
        "{:<34} {:>16.8g} {:>16.8g} {:>10.2e}{}\n", row->parameter.name, row->dG, fd.dG, rel,
        ok ? "" : (fd.converged ? "  DISAGREES" : "  (solve: " + fd.reason + ")"));
    if (!ok) status = static_cast<int>(ExitCode::kInternal);
  }
  std::cout << fmt::format("worst relative difference {:.2e} (tolerance {:.1e})\n", worst,
                           o.check_tolerance);
  return status;
}

int run_sensitivity(const SensitivityCliOptions& o, Context& ctx) {
  // 1. The scenario and the objective.
  const UnitSystem units;
  Scenario sc = load_scenario(o.config, o.sets, units);
  ColumnModel model(sc);
  require_steady_chemistry(sc, model, "sensitivities of a steady state");
  ObservationSet obs;
  const Objective obj = make_objective(o, model, sc, units, obs);
  const std::filesystem::path file = o.output.empty()
                                         ? std::filesystem::path(sc.name + ".sensitivity.nc")
                                         : std::filesystem::path(o.output);

  // 2. The steady state.
  const PetscSession petsc;
  const InterruptGuard interrupt;
  const BaseStart start(o.config, o.sets, o.restart);
  const BaseSolve base = solve_steady_base(start, sc, model, units, ctx, interrupt, "steady state");
  if (base.exit_code != 0) return base.exit_code;
  const RunOutcome& run = base.run;

  // 3. The adjoint and every sensitivity, written and printed.
  SensitivityOptions sopt;
  sopt.eddy_bands = o.bands;
  sopt.shift = 1.0 / steady_options(sc.solver).max_pseudo_step_s;
  const SensitivityResult res = compute_sensitivities(model, obj, run.x, sopt);
  write_dataset(sensitivity_dataset(sc, model, run.x, obj, res, ctx.command_line), file);
  print_sensitivities(o, obj, res);
  ctx.log->info("wrote {}", file.string());

  // 4. The benchmark and the finite-difference check.
  const SteadyStateOptions tight = steady_options(sc.solver);
  if (o.benchmark) print_benchmark(model, run, res, tight);
  if (o.check > 0 || !o.check_parameters.empty()) {
    return check_sensitivities(o, model, sc, obj, run, res, tight);
  }
  return 0;
}

}  // namespace

void add_sensitivity_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "sensitivity",
      "Adjoint sensitivities of one objective of a steady state to every rate constant, "
      "named parameter, boundary value and the eddy profile.");
  auto o = std::make_shared<SensitivityCliOptions>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML; solver.method steady)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--objective", o->objective,
                  "chi2 (log-space chi-square against the observations), chi2_linear, "
                  "mole_fraction (--species, --altitude), column (--species) or rate "
                  "(--reaction: its column-integrated rate)")
      ->check(CLI::IsMember({"chi2", "chi2_linear", "mole_fraction", "column", "rate"}))
      ->capture_default_str();
  cmd->add_option("--species", o->species, "Species of a mole_fraction or column objective");
  cmd->add_option("--altitude", o->altitude_km,
                  "Altitude in km of a mole_fraction objective (inside the cell centres)");
  cmd->add_option("--reaction", o->reaction,
                  "Reaction of a rate objective: its id in the mechanism file (or its "
                  "equation when no other reaction has it)");
  cmd->add_option("--observations", o->observations,
                  "Observation file of a chi2 objective (default: the scenario's "
                  "`observations`)")
      ->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", o->output,
                  "Output NetCDF file (default: SCENARIO_NAME.sensitivity.nc)");
  cmd->add_option("--set", o->sets, "Override a config value by its dotted key path (repeatable)");
  cmd->add_option("--restart", o->restart,
                  "Start the steady solve from this run file's state (interpolated onto the "
                  "grid); a converged state of the same scenario needs no iteration")
      ->check(CLI::ExistingFile);
  cmd->add_option("--eddy-bands", o->bands,
                  "Altitude bands of equal height for the eddy-profile sensitivities")
      ->capture_default_str();
  cmd->add_option("--top", o->top, "Rows of the ranked reaction table")->capture_default_str();
  cmd->add_option("--check", o->check,
                  "Check the N most influential rate constants, the most influential named "
                  "parameter and boundary value, and K, against central finite differences "
                  "of the full steady solve (exit 1 if one disagrees); with 0 and "
                  "--check-parameter only the parameters named")
      ->capture_default_str();
  cmd->add_option("--check-parameter", o->check_parameters,
                  "Also check this parameter (its name as printed; repeatable)");
  cmd->add_option("--check-tolerance", o->check_tolerance,
                  "Relative disagreement allowed by --check")
      ->capture_default_str();
  cmd->add_option("--check-step", o->check_step,
                  "Step of --check: in ln p, or relative to |p| for a named parameter")
      ->capture_default_str();
  cmd->add_flag("--benchmark", o->benchmark,
                "Also time one warm steady solve (K scaled by 1.01, from the state) and print "
                "the ratio of the adjoint's time to it");
  out.emplace_back(cmd, [o](Context& ctx) { return run_sensitivity(*o, ctx); });
}

}  // namespace colchem::app
