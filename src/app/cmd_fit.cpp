// colchem fit CONFIG --param PATH:MIN:MAX[:log] ...: fits named parameters, boundary values
// and scalings of K in altitude bands to the scenario's observations by bounded nonlinear
// least squares (solve/fit.hpp), prints the best fit with one-sigma uncertainties, the
// correlation matrix and the reduced chi-square, and writes them with the fitted profiles
// to CF NetCDF. --check compares the chi-square gradient of the fit's Jacobian, 2 J^T r,
// with central finite differences of the full steady solve. --module-set fits each set of
// modules and ranks the sets by AIC and BIC.
//
//   colchem fit configs/pyrene_full.yaml
//       --observations profiles/observed/pyrene_so2_invented.csv
//       -p species.SO2.bottom.mixing_ratio:1e-8:1e-4:log
//       -p "atmosphere.eddy_diffusion[58-71.9]:0.1:10:log" -o pyrene_fit.nc
//   colchem fit configs/pyrene_full.yaml
//       --observations profiles/observed/pyrene_so2_invented.csv
//       -p species.SO2.bottom.mixing_ratio:1e-8:1e-4:log --check --max-iterations 0
//   mpirun -n 2 colchem fit configs/pyrene_full.yaml
//       --observations profiles/observed/pyrene_so2_invented.csv
//       -p species.SO2.bottom.mixing_ratio:1e-8:1e-4:log
//       --module-set base=base --module-set uv=base,h2so4_uv -o pyrene_fit.nc
//
// A single fit (fit_once) 1. loads and checks the scenario, the observations and the
// parameters, 2. solves the steady state at the starting values, 3. checks the gradient
// (--check), 4. fits, writes the file and prints the table. A comparison of module sets
// 1. prepares every set, 2. fits the sets over the ranks, 3. ranks them on rank 0.
#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <iostream>
#include <limits>
#include <memory>
#include <sstream>

#include <mpi.h>

#include "analysis/observations.hpp"
#include "analysis/sweep.hpp"
#include "analysis/sweep_runner.hpp"
#include "app/batch.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/stopwatch.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"
#include "report/fit_report.hpp"
#include "solve/column_run.hpp"
#include "solve/fit.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"
#include "solve/resolution_runner.hpp"
#include "solve/solver_options.hpp"

namespace colchem::app {

namespace {

constexpr const char* kParamSyntax =
    "PATH:MIN:MAX or PATH:MIN:MAX:log, PATH one of chemistry.parameters.NAME, "
    "species.NAME.bottom.KIND, species.NAME.top.KIND (KIND the boundary's kind, e.g. "
    "mixing_ratio, flux), species.NAME.hold (a multiplier of the held profile), "
    "atmosphere.eddy_diffusion (a multiplier of K) or "
    "atmosphere.eddy_diffusion[LO-HI] (a multiplier of K at the edges from LO to HI km)";

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::size_t start = 0;
  while (true) {
    const std::size_t at = s.find(sep, start);
    out.push_back(s.substr(start, at - start));
    if (at == std::string::npos) return out;
    start = at + 1;
  }
}

double number(const std::string& text, bool& ok) {
  try {
    std::size_t used = 0;
    const double v = std::stod(text, &used);
    ok = ok && used == text.size() && std::isfinite(v);
    return v;
  } catch (const std::exception&) {
    ok = false;
    return 0.0;
  }
}

/// The refusal of one --param (exit 2): what was expected, and the text given.
struct ParamError {
  SourceLocation where;
  std::string text;
  [[nodiscard]] InputError operator()(const std::string& expected) const {
    return InputError(ExitCode::kUsage, where, "--param", expected, "'" + text + "'");
  }
};

/// PATH:MIN:MAX[:log]: the path, the bounds and the flag, checked (the path may hold no
/// ':'; the last two or three fields are the bounds and the flag).
FitParameter parse_bounds(const std::string& text, const ParamError& bad) {
  const auto fields = split(text, ':');
  if (fields.size() < 3 || fields.size() > 4) throw bad(kParamSyntax);
  FitParameter p;
  p.path = fields[0];
  bool ok = true;
  p.min = number(fields[1], ok);
  p.max = number(fields[2], ok);
  if (!ok) throw bad("finite numbers as MIN and MAX (" + std::string(kParamSyntax) + ")");
  if (fields.size() == 4) {
    if (fields[3] != "log") throw bad("'log' or nothing after MAX");
    p.log = true;
  }
  if (!(p.min < p.max)) throw bad("MIN < MAX");
  if (p.log && !(p.min > 0.0)) throw bad("MIN > 0 for a log parameter");
  return p;
}

/// chemistry.parameters.NAME: a named parameter of the mechanism.
void resolve_named(FitParameter& p, const std::string& name, const ColumnModel& model,
                   const ParamError& bad) {
  const auto& defs = model.chemistry().kinetics().mechanism().parameters;
  const auto it =
      std::find_if(defs.begin(), defs.end(), [&](const auto& d) { return d.name == name; });
  if (it == defs.end()) {
    std::string names;
    for (const auto& d : defs) names += (names.empty() ? "" : ", ") + d.name;
    throw bad("a named parameter of the mechanism (" + (names.empty() ? "none" : names) + ")");
  }
  p.kind = FitKind::kNamed;
  p.index = static_cast<std::size_t>(it - defs.begin());
  p.initial = model.chemistry().kinetics().parameters()[p.index];
}

/// species.NAME.bottom.KIND / species.NAME.top.KIND: the single value of a boundary as the
/// scenario sets it.
void resolve_boundary(FitParameter& p, const std::vector<std::string>& parts,
                      const ColumnModel& model, const ParamError& bad) {
  const auto& names = model.species();
  const auto it = std::find(names.begin(), names.end(), parts[1]);
  if (it == names.end()) throw bad("a species of the model in species.NAME.bottom.KIND");
  const auto s = static_cast<std::size_t>(it - names.begin());
  if (model.held(s)) throw bad("a species that is not held fixed");
  p.kind = FitKind::kBoundary;
  p.index = s;
  p.top = parts[2] == "top";
  const BoundaryCondition& bc = p.top ? model.boundaries()[s].top : model.boundaries()[s].bottom;
  const std::string kind = boundary_kind_name(bc.kind);
  const bool valued = bc.kind == BoundaryKind::kMixingRatio || bc.kind == BoundaryKind::kDensity ||
                      bc.kind == BoundaryKind::kFlux ||
                      bc.kind == BoundaryKind::kDepositionVelocity ||
                      bc.kind == BoundaryKind::kEscapeVelocity;
  if (!valued || kind != parts[3] || bc.value.value.size() != 1) {
    throw bad(fmt::format(
        "the {} boundary of {} as it is set in the scenario: {}", parts[2], parts[1],
        valued && bc.value.value.size() == 1 ? "species." + parts[1] + "." + parts[2] + "." + kind
                                             : kind + " (no single value to fit)"));
  }
  p.initial = bc.value.value[0];
}

/// species.NAME.hold: a multiplier of the species' held profile.
void resolve_held(FitParameter& p, const std::string& name, const ColumnModel& model,
                  const ParamError& bad) {
  const auto& names = model.species();
  const auto it = std::find(names.begin(), names.end(), name);
  const auto s = static_cast<std::size_t>(it - names.begin());
  if (it == names.end() || !model.has_chemistry() || !model.chemistry().has_held_profile(s)) {
    throw bad(
        "a species with a held profile (species.NAME.hold in the scenario) in "
        "species.NAME.hold");
  }
  p.kind = FitKind::kHeld;
  p.index = s;
  p.initial = 1.0;
}

/// atmosphere.eddy_diffusion[LO-HI] (`band`, empty for the whole column): a multiplier of K
/// at the cell edges from LO to HI km.
void resolve_eddy(FitParameter& p, const std::string& band, const ColumnModel& model,
                  const ParamError& bad) {
  const auto& edges = model.background().grid.edge_cm;
  p.kind = FitKind::kEddy;
  p.initial = 1.0;
  if (band.empty()) {
    p.edge_lo = 0;
    p.edge_hi = model.cells();
    return;
  }
  const auto dash = band.find('-', 2);
  if (band.front() != '[' || band.back() != ']' || dash == std::string::npos) {
    throw bad("atmosphere.eddy_diffusion[LO-HI] with LO and HI in km");
  }
  bool num_ok = true;
  const double lo = number(band.substr(1, dash - 1), num_ok) * constants::kCmPerKm;
  const double hi =
      number(band.substr(dash + 1, band.size() - dash - 2), num_ok) * constants::kCmPerKm;
  std::vector<std::size_t> in;
  for (std::size_t e = 0; e < edges.size(); ++e) {
    if (edges[e] >= lo && edges[e] <= hi) in.push_back(e);
  }
  if (!num_ok || in.empty()) {
    throw bad(
        fmt::format("atmosphere.eddy_diffusion[LO-HI] (km) holding at least one cell "
                    "edge ({:.4g}-{:.4g} km)",
                    edges.front() * 1e-5, edges.back() * 1e-5));
  }
  p.edge_lo = in.front();
  p.edge_hi = in.back();
}

/// Resolves one --param against the model: 1. the bounds, 2. the path (named parameter,
/// boundary value, held profile or K band), 3. a start within the bounds.
FitParameter parse_parameter(const std::string& text, const ColumnModel& model,
                             const Scenario& sc) {
  const ParamError bad{SourceLocation{sc.file.string()}, text};
  FitParameter p = parse_bounds(text, bad);
  const auto parts = split(p.path, '.');
  const std::string eddy = "atmosphere.eddy_diffusion";
  if (parts.size() == 3 && parts[0] == "chemistry" && parts[1] == "parameters") {
    resolve_named(p, parts[2], model, bad);
  } else if (parts.size() == 4 && parts[0] == "species" &&
             (parts[2] == "bottom" || parts[2] == "top")) {
    resolve_boundary(p, parts, model, bad);
  } else if (parts.size() == 3 && parts[0] == "species" && parts[2] == "hold") {
    resolve_held(p, parts[1], model, bad);
  } else if (p.path.rfind(eddy, 0) == 0) {
    resolve_eddy(p, p.path.substr(eddy.size()), model, bad);
  } else {
    throw bad(kParamSyntax);
  }
  if (!(p.initial >= p.min && p.initial <= p.max)) {
    throw bad(
        fmt::format("bounds that hold the starting value {:.6g} (set it with --set)", p.initial));
  }
  return p;
}

struct FitCliOptions {
  std::string config, output, restart, observations;
  std::vector<std::string> sets, params, module_sets, module_params;
  bool linear = false, check = false, benchmark = false;
  int max_iterations = 50;
  double gatol = 1e-3;
  double check_tolerance = 1e-4, check_step = 1e-3;
};

/// What the comparison of module sets needs from one fit.
struct FitSummary {
  double chi2 = 0.0;
  std::size_t points = 0, parameters = 0;
  bool converged = false;
};

/// One fit's inputs, loaded and checked (the scenario and the model on the heap: the model
/// refers to its scenario).
struct FitSetup {
  std::unique_ptr<UnitSystem> units = std::make_unique<UnitSystem>();
  std::vector<std::string> sets;  ///< the --set overrides the scenario was loaded with
  std::unique_ptr<Scenario> sc;
  std::unique_ptr<ColumnModel> model;
  ObservationSet obs;
  std::vector<FitParameter> params;
  std::filesystem::path file;
};

int fit_single(const FitCliOptions& o, Context& ctx);
int compare_module_sets(const FitCliOptions& o, Context& ctx);

}  // namespace

void add_fit_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "fit",
      "Fit named parameters, boundary values and K scalings to the observations (bounded "
      "Gauss-Newton, PETSc TAO): best fit, one-sigma uncertainties, correlations, reduced "
      "chi-square, fitted profiles.");
  auto o = std::make_shared<FitCliOptions>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML; solver.method steady)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("-p,--param", o->params,
                  std::string("Fitted parameter (repeatable): ") + kParamSyntax +
                      "; the start is the scenario's value (change it with --set)")
      ->required();
  cmd->add_option("--observations", o->observations,
                  "Observation file (default: the scenario's `observations`)")
      ->check(CLI::ExistingFile);
  cmd->add_flag("--linear", o->linear,
                "Residuals of chi2_linear, (f_m - f_o)/sigma (default: chi2_log, in log10 f)");
  cmd->add_option("-o,--output", o->output, "Output NetCDF file (default: SCENARIO_NAME.fit.nc)");
  cmd->add_option("--set", o->sets, "Override a config value by its dotted key path (repeatable)");
  cmd->add_option("--restart", o->restart,
                  "Start the first steady solve from this run file's state")
      ->check(CLI::ExistingFile);
  cmd->add_option("--max-iterations", o->max_iterations, "Gauss-Newton iterations at most")
      ->capture_default_str();
  cmd->add_option("--gradient-tolerance", o->gatol,
                  "Converged when the gradient norm of chi2/2 in the fitted variables is below "
                  "this (the step left is then at most sigma^2 times it)")
      ->capture_default_str();
  cmd->add_flag("--check", o->check,
                "Before fitting, compare the chi-square gradient 2 J^T r of the fit's Jacobian "
                "with central finite differences of the full steady solve at the start (exit 1 "
                "if one differs by more than --check-tolerance plus twice the finite "
                "difference's own error estimate)");
  cmd->add_option("--check-tolerance", o->check_tolerance,
                  "Relative disagreement allowed by --check")
      ->capture_default_str();
  cmd->add_option("--check-step", o->check_step,
                  "Step of --check in the fitted variable (ln p for log parameters, else "
                  "relative to |p|)")
      ->capture_default_str();
  cmd->add_option(
      "--module-set", o->module_sets,
      "Compare module sets (repeatable): LABEL=MODULE,MODULE,... (the modules "
      "switched on, chemistry.modules); each set is fitted with the same -p "
      "parameters plus its own --module-param ones and the sets are ranked by "
      "minimum chi-square, AIC and BIC; files OUTPUT_STEM.LABEL.nc; under mpirun the sets "
      "are distributed over the ranks");
  cmd->add_option(
      "--module-param", o->module_params,
      "A parameter fitted only in one module set (repeatable): LABEL=PATH:MIN:MAX[:log]");
  cmd->add_flag("--benchmark", o->benchmark,
                "Also time one warm steady solve (K x 1.01 from the fitted state) and print the "
                "fit's cost in such solves");
  out.emplace_back(cmd, [o](Context& ctx) {
    if (o->module_sets.empty()) return fit_single(*o, ctx);
    return compare_module_sets(*o, ctx);
  });
}

namespace {

/// A central finite difference of chi2 in fitted variable k at step h, with its error
/// estimate: chi2 at u0 + h, u0 - h, u0 + 2h, u0 - 2h, each solved from `x_start`; then at u0
/// again from the u0 + h state, whose difference from `chi0` is the steady solves' noise.
/// Central differences err by C h^2 (Richardson: fd(2h) - fd(h) = 3 C h^2), and the noise of
/// each chi2 is divided by h.
struct FiniteDifference {
  double value = 0.0, error = 0.0;
  bool ok = true;
};
FiniteDifference chi2_finite_difference(ColumnModel& model, const SolverSpec& solver,
                                        const ObservationSet& obs,
                                        const std::vector<FitParameter>& params,
                                        const FitOptions& fopt, const std::vector<double>& x_start,
                                        const std::vector<double>& u0, double chi0, std::size_t k,
                                        double h) {
  FiniteDifference out;
  const double offsets[4] = {h, -h, 2.0 * h, -2.0 * h};
  double chi[4] = {0.0, 0.0, 0.0, 0.0};
  std::vector<double> x_plus;
  for (int side = 0; side < 4; ++side) {
    FitProblem fd(model, solver, obs, params, x_start, fopt);
    std::vector<double> u = u0, r;
    u[k] += offsets[side];
    out.ok = fd.residuals(u, r) && out.ok;
    for (double v : r) chi[side] += v * v;
    if (side == 0) x_plus = fd.state();
  }
  FitProblem back(model, solver, obs, params, x_plus, fopt);
  std::vector<double> r;
  out.ok = back.residuals(u0, r) && out.ok;
  double c = 0.0;
  for (double v : r) c += v * v;
  const double noise = std::abs(c - chi0);
  out.value = (chi[0] - chi[1]) / (2.0 * h);
  const double fd2 = (chi[2] - chi[3]) / (4.0 * h);
  out.error = std::abs(fd2 - out.value) / 3.0 + noise / h;
  fopt.log->debug("--check {}: h {:.3g}, fd(h) {:.10g}, fd(2h) {:.10g}, solve noise {:.3g}",
                  params[k].path, h, out.value, fd2, noise);
  return out;
}

/// Compares the chi-square gradient 2 J^T r of the fit's Jacobian with central finite
/// differences of the full steady solve at the start `x`: 0, ExitCode::kInternal when one
/// disagrees, ExitCode::kNotConverged when the steady solve at the start failed.
int check_gradient(const FitCliOptions& o, ColumnModel& model, const Scenario& sc,
                   const ObservationSet& obs, const std::vector<FitParameter>& params,
                   const std::vector<double>& x, const FitOptions& fopt, std::ostream& out) {
  int status = 0;
  FitProblem probe(model, sc.solver, obs, params, x, fopt);
  // Tight tolerances: chi2 at u +- h must be accurate far below g h * tolerance. The Newton
  // end phase takes the scaled residual from ~1e-10 to round-off (~1e-15) in one step, so a
  // 1e-14 residual costs at most one solve more than 1e-12 and cuts the re-solves' noise.
  probe.solver().tolerance = std::min(probe.solver().tolerance, 1e-14);
  probe.solver().step_tolerance = 1e-12;
  probe.solver().max_iterations = 200;
  const std::vector<double> u0 = probe.initial_u();
  std::vector<double> r0, jac;
  if (!probe.residuals(u0, r0) || !probe.jacobian(u0, jac)) {
    fopt.log->error("--check: the steady solve at the start failed");
    return static_cast<int>(ExitCode::kNotConverged);  // no fit
  }
  const std::vector<double> x_start = probe.state();
  const std::size_t P = params.size();
  out << fmt::format(
      "gradient check at the start (central differences of the full steady solve at steps "
      "h and 2h; 'fd error' = truncation |fd(h) - fd(2h)|/3 + solve noise/h, relative):\n"
      "{:<40} {:>16} {:>16} {:>10} {:>10}\n",
      "parameter", "2 J^T r", "finite diff.", "rel. diff.", "fd error");
  double chi0 = 0.0;
  for (double v : r0) chi0 += v * v;
  double worst = 0.0;
  for (std::size_t k = 0; k < P; ++k) {
    double g = 0.0;
    for (std::size_t i = 0; i < r0.size(); ++i) g += 2.0 * jac[i * P + k] * r0[i];
    const double h = params[k].log ? o.check_step : o.check_step * std::max(std::abs(u0[k]), 1e-3);
    const FiniteDifference fd =
        chi2_finite_difference(model, probe.solver(), obs, params, fopt, x_start, u0, chi0, k, h);
    const bool ok = fd.ok;
    const double fdg = fd.value, fd_err = fd.error;
    const double mag = std::max({std::abs(g), std::abs(fdg), 1e-300});
    const double rel = std::abs(g - fdg) / mag;
    // The error estimate rests on one noise sample and one Richardson pair: twice it is
    // allowed beside the tolerance (common practice, no source).
    const bool good = ok && std::abs(g - fdg) <= o.check_tolerance * mag + 2.0 * fd_err;
    worst = std::max(worst, ok ? rel : 1.0);
    out << fmt::format("{:<40} {:>16.8g} {:>16.8g} {:>10.2e} {:>10.2e}{}\n", params[k].path, g, fdg,
                       rel, fd_err / mag, good ? "" : (ok ? "  DISAGREES" : "  (solve failed)"));
    if (!good) status = static_cast<int>(ExitCode::kInternal);
  }
  out << fmt::format("worst relative difference {:.2e} (tolerance {:.1e})\n\n", worst,
                     o.check_tolerance);
  return status;
}

/// The fit's summary, its parameter table and the correlation matrix.
void print_fit(const std::vector<FitParameter>& params, const FitResult& res, bool log_space,
               std::ostream& out) {
  const std::size_t P = params.size();
  out << fmt::format(
      "fit: {} after {} Gauss-Newton iterations; {} steady solves ({} Newton iterations, "
      "{:.3f} s), {} Jacobians ({:.3f} s); {:.3f} s in all\n",
      res.reason, res.iterations, res.steady_solves, res.newton_iterations, res.steady_s,
      res.jacobians, res.jacobian_s, res.wall_s);
  out << fmt::format(
      "chi2 ({}) {:.6g} (start {:.6g}); N = {} points, p = {}; reduced chi2 = chi2/(N - p) = "
      "{:.4g}\n\n",
      log_space ? "log" : "linear", res.chi2, res.chi2_initial, res.points, P, res.reduced_chi2);
  out << fmt::format("{:<40} {:>13} {:>13} {:>13} {:>13}  {}\n", "parameter", "start", "best fit",
                     "1 sigma", "sigma scaled", "bounds");
  for (std::size_t k = 0; k < P; ++k) {
    const auto& p = params[k];
    out << fmt::format("{:<40} {:>13.6g} {:>13.6g} {:>13.4g} {:>13.4g}  [{:.4g}, {:.4g}]{}{}\n",
                       p.path, p.initial, res.value[k], res.sigma[k], res.sigma_scaled[k], p.min,
                       p.max,
                       p.log ? fmt::format(" log (factor {:.4g})", std::exp(res.sigma_u[k])) : "",
                       res.at_bound[k] < 0   ? "  AT LOWER BOUND"
                       : res.at_bound[k] > 0 ? "  AT UPPER BOUND"
                                             : "");
  }
  out << "\ncorrelation\n";
  for (std::size_t k = 0; k < P; ++k) {
    std::string row = fmt::format("{:<40}", params[k].path);
    for (std::size_t l = 0; l < P; ++l) row += fmt::format(" {:>7.3f}", res.correlation[k * P + l]);
    out << row << "\n";
  }
}

/// One warm steady solve, K x 1.01 from the fitted state (as `sensitivity --benchmark`),
/// against the fit's time.
void print_fit_benchmark(ColumnModel& model, const Scenario& sc, const ObservationSet& obs,
                         const FitResult& res, const FitOptions& fopt, std::size_t P,
                         std::ostream& out) {
  FitParameter k;
  k.path = "atmosphere.eddy_diffusion";
  k.kind = FitKind::kEddy;
  k.edge_lo = 0;
  k.edge_hi = model.cells();
  k.initial = 1.0;
  k.min = 0.5;
  k.max = 2.0;
  FitProblem one(model, sc.solver, obs, {k}, res.x, fopt);
  std::vector<double> r;
  const auto t0 = std::chrono::steady_clock::now();
  one.residuals(std::vector<double>{1.01}, r);
  const double warm_s = seconds_since(t0);
  out << fmt::format(
      "\nbenchmark: {} parameters, {} cells; fit {:.3f} s; one warm steady solve (K x 1.01) "
      "{:.3f} s; the fit costs {:.1f} warm steady solves\n",
      P, model.cells(), res.wall_s, warm_s, res.wall_s / warm_s);
}

/// 1. The scenario, the observations and the fitted parameters, checked before any solve
/// (a comparison of module sets checks every set before it distributes them over ranks).
FitSetup prepare_fit(const FitCliOptions& o, const std::vector<std::string>& sets,
                     const std::vector<std::string>& param_texts, const std::string& output) {
  FitSetup f;
  f.sets = sets;
  f.sc = std::make_unique<Scenario>(load_scenario(o.config, sets, *f.units));
  f.model = std::make_unique<ColumnModel>(*f.sc);
  require_steady_chemistry(*f.sc, *f.model, "fits of a steady state");
  const std::filesystem::path obs_file = observation_file(o.observations, *f.sc);
  f.obs = read_observations(obs_file, *f.units);
  for (const auto& text : param_texts) {
    f.params.push_back(parse_parameter(text, *f.model, *f.sc));
    for (std::size_t k = 0; k + 1 < f.params.size(); ++k) {
      if (f.params[k].path == f.params.back().path) {
        throw InputError(ExitCode::kUsage, SourceLocation{f.sc->file.string()}, "--param",
                         "each path once", "'" + f.params[k].path + "' twice");
      }
    }
  }
  f.file = output.empty() ? std::filesystem::path(f.sc->name + ".fit.nc")
                          : std::filesystem::path(output);
  refuse_output_onto_input(f.file,
                           {{"the scenario file", f.sc->file}, {"the observations", obs_file}});
  return f;
}

int fit_once(const FitCliOptions& o, FitSetup& f, Context& ctx, std::ostream& out,
             FitSummary* summary) {
  Scenario& sc = *f.sc;
  ColumnModel& model = *f.model;
  const ObservationSet& obs = f.obs;
  const std::vector<FitParameter>& params = f.params;

  // 2. The steady state at the starting values.
  const InterruptGuard interrupt;
  const BaseStart start(o.config, f.sets, o.restart);
  const BaseSolve base = solve_steady_base(start, sc, model, *f.units, ctx, interrupt,
                                           "steady state at the starting values");
  if (base.exit_code != 0) return base.exit_code;
  const RunOutcome& run = base.run;

  FitOptions fopt;
  fopt.log_space = !o.linear;
  fopt.max_iterations = o.max_iterations;
  fopt.gatol = o.gatol;
  fopt.log = ctx.log.get();
  fopt.stop_requested = interrupt.query();
  int status = 0;

  // 3. The gradient check (before the fit: at the best fit the gradient vanishes).
  if (o.check) {
    status = check_gradient(o, model, sc, obs, params, run.x, fopt, out);
    if (status == static_cast<int>(ExitCode::kNotConverged)) return status;
  }

  // 4. The fit.
  FitProblem problem(model, sc.solver, obs, params, run.x, fopt);
  const FitResult res = problem.solve();
  write_dataset(fit_dataset(sc, model, params, res, fopt.log_space, ctx.command_line), f.file);

  const std::size_t P = params.size();
  print_fit(params, res, fopt.log_space, out);
  ctx.log->info("wrote {}", f.file.string());

  if (o.benchmark) print_fit_benchmark(model, sc, obs, res, fopt, P, out);
  if (!res.converged) {
    ctx.log->warn("the fit did not converge: {}", res.reason);
    if (status == 0) status = static_cast<int>(ExitCode::kNotConverged);
  }
  if (summary != nullptr) {
    summary->chi2 = res.chi2;
    summary->points = res.points;
    summary->parameters = P;
    summary->converged = res.converged;
  }
  return status;
}

int fit_single(const FitCliOptions& o, Context& ctx) {
  FitSetup f = prepare_fit(o, o.sets, o.params, o.output);
  const PetscSession petsc;
  return fit_once(o, f, ctx, std::cout, nullptr);
}

/// One module set of a comparison: its label, its modules ("a, b") and its fit's inputs.
struct ModuleSet {
  std::string label, modules;
  FitSetup setup;
};

/// The --module-set LABEL=MODULE,MODULE,... options (each label once) and the labels of the
/// --module-param LABEL=PATH:MIN:MAX[:log] options, checked; the fits are not set up yet.
std::vector<ModuleSet> parse_module_sets(const FitCliOptions& o) {
  std::vector<ModuleSet> sets;
  const SourceLocation where{o.config};
  for (const auto& spec : o.module_sets) {
    const auto eq = spec.find('=');
    if (eq == std::string::npos || eq == 0 || eq + 1 == spec.size()) {
      throw InputError(ExitCode::kUsage, where, "--module-set", "LABEL=MODULE,MODULE,...",
                       "'" + spec + "'");
    }
    ModuleSet set;
    set.label = spec.substr(0, eq);
    for (const auto& r : sets) {
      if (r.label == set.label) {
        throw InputError(ExitCode::kUsage, where, "--module-set", "each LABEL once",
                         "'" + set.label + "' twice");
      }
    }
    for (const auto& m : split(spec.substr(eq + 1), ',')) {
      set.modules += (set.modules.empty() ? "" : ", ") + m;
    }
    sets.push_back(std::move(set));
  }
  for (const auto& m : o.module_params) {
    const auto e = m.find('=');
    if (e == std::string::npos) {
      throw InputError(ExitCode::kUsage, where, "--module-param", "LABEL=PATH:MIN:MAX[:log]",
                       "'" + m + "'");
    }
    const std::string label = m.substr(0, e);
    if (std::none_of(sets.begin(), sets.end(),
                     [&](const ModuleSet& r) { return r.label == label; })) {
      throw InputError(ExitCode::kUsage, where, "--module-param", "the LABEL of a --module-set",
                       "'" + label + "'");
    }
  }
  return sets;
}

/// Every set's scenario (its modules switched on), observations and parameters (the -p ones
/// and its own), checked, with its output OUTPUT_STEM.LABEL.nc; one variant per set.
std::vector<Variant> prepare_module_sets(const FitCliOptions& o, std::vector<ModuleSet>& sets) {
  std::vector<Variant> variants;
  for (auto& set : sets) {
    std::vector<std::string> overrides = o.sets;
    overrides.push_back("chemistry.modules=[" + set.modules + "]");
    std::vector<std::string> params = o.params;
    for (const auto& mp : o.module_params) {
      const auto e = mp.find('=');
      if (mp.substr(0, e) == set.label) params.push_back(mp.substr(e + 1));
    }
    std::filesystem::path out =
        o.output.empty() ? std::filesystem::path("fit.nc") : std::filesystem::path(o.output);
    out.replace_extension();
    out += "." + set.label + ".nc";
    set.setup = prepare_fit(o, overrides, params, out.string());
    Variant v;
    v.index = variants.size();
    v.label = set.label;
    v.module_label = set.label;
    variants.push_back(v);
  }
  return variants;
}

/// Fits one module set, printing its block on standard output in one piece; the outcome's
/// values are chi2_min, N, k and the fit's exit code.
VariantOutcome fit_module_set(const FitCliOptions& o, ModuleSet& set, Context& ctx, int rank) {
  std::ostringstream text;
  text << fmt::format("=== module set {} (modules {}) on rank {}\n", set.label, set.modules, rank);
  VariantOutcome result;
  FitSummary fit;
  int code = 0;
  try {
    code = fit_once(o, set.setup, ctx, text, &fit);
    result.reason = fit.converged ? "converged" : "fit not converged";
  } catch (const InputError& e) {
    code = static_cast<int>(e.code());
    result.reason = e.what();
  } catch (const RunError& e) {
    code = static_cast<int>(e.code());
    result.reason = e.what();
  }
  if (code == static_cast<int>(ExitCode::kNotConverged) && fit.points == 0) {
    result.reason = "no steady state at the starting values";
  }
  result.converged = fit.converged && code == 0;
  result.interrupted = code == static_cast<int>(ExitCode::kInterrupted);
  result.values = {fit.points > 0 ? fit.chi2 : std::numeric_limits<double>::quiet_NaN(),
                   static_cast<double>(fit.points), static_cast<double>(fit.parameters),
                   static_cast<double>(code)};
  text << "\n";
  std::cout << text.str() << std::flush;  // one block per set, whatever the rank
  return result;
}

/// One row of the ranking: a set's chi2_min, N, k and how its fit ended.
struct SetRow {
  std::string label;
  double chi2 = 0.0, points = 0.0, k = 0.0;
  int status = 0;
  std::string reason;
  bool converged = false;
};

std::vector<SetRow> set_rows(const std::vector<ModuleSet>& sets,
                             const std::vector<VariantOutcome>& outcomes) {
  std::vector<SetRow> rows;
  for (std::size_t i = 0; i < sets.size(); ++i) {
    const VariantOutcome& r = outcomes[i];
    SetRow row;
    row.label = sets[i].label;
    row.converged = r.converged;
    row.reason = r.reason;
    if (r.values.size() == 4) {
      row.chi2 = r.values[0];
      row.points = r.values[1];
      row.k = r.values[2];
      row.status = static_cast<int>(r.values[3]);
    } else {  // never started (interrupted) or failed outside the fit
      row.chi2 = std::numeric_limits<double>::quiet_NaN();
      row.status = static_cast<int>(r.interrupted ? ExitCode::kInterrupted : ExitCode::kInternal);
    }
    rows.push_back(row);
  }
  return rows;
}

/// Prints the sets ranked by AIC with BIC and the Akaike weights; returns the exit code of
/// the best-ranked set whose fit did not end in 0, else 0.
int print_ranking(const std::vector<SetRow>& rows) {
  const double inf = std::numeric_limits<double>::infinity();
  double best_aic = inf, best_bic = inf;
  std::vector<double> aic, bic;
  for (const auto& r : rows) {
    const bool ok = std::isfinite(r.chi2) && r.points > 0.0;
    aic.push_back(ok ? r.chi2 + 2.0 * r.k : inf);
    bic.push_back(ok ? r.chi2 + r.k * std::log(r.points) : inf);
    best_aic = std::min(best_aic, aic.back());
    best_bic = std::min(best_bic, bic.back());
  }
  std::vector<std::size_t> order(rows.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return aic[a] < aic[b]; });
  std::cout << fmt::format(
      "module sets ranked by AIC = chi2_min + 2k (Akaike 1974); BIC = chi2_min + k ln N "
      "(Schwarz 1978); Akaike weight exp(-dAIC/2) normalised\n"
      "{:>4}  {:<24} {:>12} {:>3} {:>4} {:>12} {:>8} {:>12} {:>8} {:>8}  {}\n",
      "rank", "module set", "chi2_min", "k", "N", "AIC", "dAIC", "BIC", "dBIC", "weight", "fit");
  double wsum = 0.0;
  for (double a : aic) wsum += std::exp(-(a - best_aic) / 2.0);
  int status = 0;
  for (std::size_t i = 0; i < order.size(); ++i) {
    const std::size_t r = order[i];
    const SetRow& row = rows[r];
    std::cout << fmt::format(
        "{:>4}  {:<24} {:>12.6g} {:>3} {:>4} {:>12.6g} {:>8.3f} {:>12.6g} {:>8.3f} {:>8.4f}  {}\n",
        i + 1, row.label, row.chi2, static_cast<std::size_t>(row.k),
        static_cast<std::size_t>(row.points), aic[r], aic[r] - best_aic, bic[r], bic[r] - best_bic,
        std::exp(-(aic[r] - best_aic) / 2.0) / wsum,
        row.converged
            ? std::string("converged")
            : (row.status == static_cast<int>(ExitCode::kNotConverged) && std::isfinite(row.chi2)
                   ? std::string("NOT CONVERGED")
                   : "FAILED: " + row.reason));
    if (status == 0) status = row.status;
  }
  std::cout << std::flush;
  return status;
}

/// Each module set fitted, then ranked: AIC = chi2_min + 2k (Akaike 1974, IEEE Trans.
/// Autom. Control 19, 716) and BIC = chi2_min + k ln N (Schwarz 1978, Ann. Stat. 6, 461), k
/// the set's fitted parameters and N the observed points; with Gaussian errors of known
/// sigma -2 ln L_max = chi2_min + a constant the sets share (the same data). Under mpirun
/// the sets are distributed over the ranks as a sweep's variants are (run_variants: the next
/// set goes to the next free rank); each fit starts from its own scenario's steady state,
/// so its result does not depend on the rank that ran it, and the table is the same on any
/// number of ranks.
int compare_module_sets(const FitCliOptions& o, Context& ctx) {
  // 1. Every set's scenario, observations and parameters, checked on every rank before any
  //    solve (the same checks everywhere, so every rank stops alike on a bad input).
  std::vector<ModuleSet> sets = parse_module_sets(o);
  const std::vector<Variant> variants = prepare_module_sets(o, sets);

  // 2. The fits over the ranks; the outcomes on rank 0.
  const PetscSession petsc;  // one for every fit (PETSc initialises once per process)
  const InterruptGuard interrupt;
  const WorldRanks world = world_ranks();
  if (world.rank == 0) {
    ctx.log->info("fit: {} module sets on {} rank{}", sets.size(), world.size,
                  plural(static_cast<std::size_t>(world.size)));
  }
  const VariantRunner runner = [&](const Variant& v) {
    return fit_module_set(o, sets[v.index], ctx, world.rank);
  };
  const VariantDone done = [&](const Variant& v, const VariantOutcome& r) {
    ctx.log->info("module set {} ({}/{}) on rank {}: {} ({:.2f} s)", v.label, v.index + 1,
                  variants.size(), world.rank, r.converged ? "converged" : r.reason,
                  r.wall_seconds);
  };
  const std::vector<VariantOutcome> outcomes =
      run_variants(MPI_COMM_WORLD, variants, runner, done, interrupt.query());
  if (world.rank != 0) return exit_code_of_rank0(0);

  // 3. Rank 0 ranks the sets; every rank exits with its code.
  return exit_code_of_rank0(print_ranking(set_rows(sets, outcomes)));
}

}  // namespace

}  // namespace colchem::app
