// colchem ensemble CONFIG: how sure is the model of its own steady state? Draws N members of
// the mechanism's rate uncertainties (analysis/ensemble.hpp), solves each member's steady
// state from the base state (on MPI ranks with the sweep's dynamic balancing), and writes
// per altitude the percentiles of every species' mole fraction, the distribution of the
// chi-square against the observations, each member's draws, and which observed points lie
// inside the base network's 95 % band. With --attribution / --attribute, the variance of
// ln(mole fraction) at chosen points is attributed to the reactions to first order from the
// adjoint sensitivities of the base state (analysis/attribution.hpp) and compared with the
// ensemble's own variance there: here, not in `colchem sensitivity`, because the check needs
// the members and both must use the same uncertainties and --sigmas.
//
//   colchem ensemble configs/pyrene_full.yaml -n 12 --seed 1 -o pyrene_ensemble.nc
//   mpirun -n 2 colchem ensemble configs/pyrene_full.yaml -n 12 --seed 1   same file, 2 ranks
//   colchem ensemble configs/pyrene_full.yaml -n 12 --attribute SO2@90     variance shares there
//
// run_ensemble() 1. loads the scenario, the observations and the attribution targets,
// 2. solves the base state, 3. draws the members, 4. solves them over the ranks, 5. on
// rank 0 computes the statistics and the attribution and writes the file.
#include <mpi.h>

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iostream>
#include <limits>
#include <memory>

#include "analysis/attribution.hpp"
#include "analysis/ensemble.hpp"
#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "analysis/sweep_runner.hpp"
#include "app/batch.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"
#include "report/column_report.hpp"
#include "report/ensemble_report.hpp"
#include "solve/adjoint.hpp"
#include "solve/column_run.hpp"
#include "solve/continuation.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"
#include "solve/progress.hpp"
#include "solve/solver_options.hpp"

namespace colchem::app {

namespace {

double kNaN() {
  return std::numeric_limits<double>::quiet_NaN();
}

/// Sets the member's rate factors on every active reaction of the model.
void apply_member(ColumnModel& model, std::span<const double> z_member, double sigmas) {
  Kinetics& kin = model.chemistry().kinetics();
  const Mechanism& mech = kin.mechanism();
  const auto& T = model.background().temperature_K;
  std::vector<double> f(model.cells());
  for (std::size_t a = 0; a < kin.reaction_count(); ++a) {
    const std::size_t r = kin.mechanism_reaction(a);
    for (std::size_t j = 0; j < f.size(); ++j) {
      f[j] = ensemble_rate_factor(z_member[r], mech.reactions[r].uncertainty, T[j], sigmas);
    }
    kin.set_rate_factors(a, f);
  }
}

struct AttributionTarget {
  std::size_t species = 0;
  double altitude_cm = 0.0;
};

/// The targets: every observed point of a model species inside the column (with
/// `observed`), then every SPECIES@KM of `--attribute`, each once.
std::vector<AttributionTarget> attribution_targets(const ColumnModel& model, const Scenario& sc,
                                                   const ObservationSet& obs, bool observed,
                                                   const std::vector<std::string>& extra) {
  std::vector<AttributionTarget> out;
  const auto& names = model.species();
  const auto& zc = model.background().grid.center_cm;
  const auto add = [&](std::size_t s, double z) {
    for (const auto& t : out) {
      if (t.species == s && t.altitude_cm == z) return;
    }
    out.push_back({s, z});
  };
  if (observed || !extra.empty()) {
    for (const auto& p : obs.points) {
      const auto it = std::find(names.begin(), names.end(), p.species);
      if (it == names.end()) continue;
      const auto s = static_cast<std::size_t>(it - names.begin());
      if (model.held(s) || p.altitude_cm < zc.front() || p.altitude_cm > zc.back()) continue;
      add(s, p.altitude_cm);
    }
  }
  for (const auto& text : extra) {
    const auto at = text.find('@');
    const std::string name = text.substr(0, at);
    const auto it = std::find(names.begin(), names.end(), name);
    double km = kNaN();
    if (at != std::string::npos) {
      try {
        std::size_t used = 0;
        km = std::stod(text.substr(at + 1), &used);
        if (used != text.size() - at - 1) km = kNaN();
      } catch (const std::exception&) {
        km = kNaN();
      }
    }
    const double z = km * constants::kCmPerKm;
    if (it == names.end() || model.held(static_cast<std::size_t>(it - names.begin())) ||
        !(z >= zc.front() && z <= zc.back())) {
      throw InputError(
          ExitCode::kUsage, SourceLocation{sc.file.string()}, "--attribute",
          fmt::format("SPECIES@KM with a species of the model that is not held "
                      "and an altitude within the cell centres, {:.4g}-{:.4g} km",
                      zc.front() / constants::kCmPerKm, zc.back() / constants::kCmPerKm),
          "'" + text + "'");
    }
    add(static_cast<std::size_t>(it - names.begin()), z);
  }
  return out;
}

/// The first-order attribution of one target (analysis/attribution.hpp) from the adjoint of
/// the base state x, and the ensemble's own variance of ln x there over the converged
/// members' mole fractions `values` (interpolated as the objective interpolates).
EnsembleAttribution attribute_target(ColumnModel& model, const Scenario& sc,
                                     std::span<const double> x, const AttributionTarget& t,
                                     double sigmas,
                                     const std::vector<std::vector<double>>& values) {
  const std::size_t N = model.cells();
  const auto& zc = model.background().grid.center_cm;
  const auto& T = model.background().temperature_K;
  Objective obj;
  obj.kind = ObjectiveKind::kMoleFraction;
  obj.species = t.species;
  obj.altitude_cm = t.altitude_cm;
  obj.units = "1";
  SensitivityOptions sopt;
  sopt.eddy_bands = 0;
  sopt.shift = 1.0 / steady_options(sc.solver).max_pseudo_step_s;
  const SensitivityResult sens = compute_sensitivities(model, obj, x, sopt);
  if (!(sens.value > 0.0)) {
    throw RunError(
        ExitCode::kNotConverged,
        fmt::format("attribution: the base state's {} at {} km is {}, not positive: "
                    "no variance of its logarithm",
                    model.species()[t.species], t.altitude_cm / constants::kCmPerKm, sens.value));
  }

  const Kinetics& kin = model.chemistry().kinetics();
  const Mechanism& mech = kin.mechanism();
  const std::size_t A = kin.reaction_count();
  std::vector<double> sigma(A * N);
  for (std::size_t a = 0; a < A; ++a) {
    const auto& u = mech.reactions[kin.mechanism_reaction(a)].uncertainty;
    for (std::size_t j = 0; j < N; ++j) sigma[a * N + j] = ensemble_log_sigma(u, T[j], sigmas);
  }
  const AttributionTerms terms =
      first_order_attribution(sens.reaction_profile, sens.value, sigma, A, N);

  EnsembleAttribution out;
  out.species = model.species()[t.species];
  out.altitude_cm = t.altitude_cm;
  out.base_value = sens.value;
  out.first_order_variance = terms.variance;
  out.largest_scaled = terms.largest_scaled;
  const std::size_t R = mech.reactions.size();
  out.log_sensitivity.assign(R, 0.0);
  out.scaled.assign(R, 0.0);
  out.share.assign(R, 0.0);
  for (std::size_t a = 0; a < A; ++a) {
    const std::size_t r = kin.mechanism_reaction(a);
    out.log_sensitivity[r] = terms.log_sensitivity[a];
    out.scaled[r] = terms.scaled[a];
    out.share[r] = terms.share[a];
  }
  std::vector<double> ln_x;
  for (const auto& v : values) {
    if (v.empty()) continue;
    const double f = interpolate_log_profile(
        zc, std::span<const double>(v).subspan(t.species * N, N), t.altitude_cm);
    ln_x.push_back(std::log(f));
  }
  out.ensemble_variance = sample_variance(ln_x);
  out.ensemble_members = static_cast<double>(ln_x.size());
  out.agree = attribution_agrees(out.first_order_variance, out.ensemble_variance) ? 1 : 0;
  return out;
}

struct EnsembleCliOptions {
  std::string config;
  std::vector<std::string> sets;
  std::string output;
  std::size_t members = 100;
  std::uint64_t seed = 1;
  std::string sampling = "latin_hypercube";
  double sigmas = 1.0;
  double above_km = 90.0;
  bool attribution = false;
  std::vector<std::string> attribute;
  double progress_every = 0.2;
};

/// Stagnation window and factor of the members' solves: see attempt_give_up
/// (solve/continuation.hpp). On 8 Pyrene members at 108 cells (seed 1) windows of 25, 40 and 80
/// iterations cost 2913, 2734 and 3683 iterations in all, every member converged (a window too long
/// wastes iterations on stalled solves, one too short gives up solves that were converging).
constexpr long kStallWindow = 40;
constexpr double kStallFactor = 0.1;
/// Divergence factor of the members' solves (see attempt_give_up). On 20 Pyrene members at
/// 108 cells (seed 1) 26 of 67 attempts failed, 22 of them after the residual had risen
/// 10^5-10^18-fold; 1 of the 41 that converged rose above 10^4 on the way. On 40 members it
/// cut the iterations from 6254 to 5118, the same 5 members failing.
constexpr double kDivergenceFactor = 1e4;
/// First pseudo-time step (s) of a member's warm solves, in place of solver.warm_pseudo_step
/// (bounded by solver.max_pseudo_step): a member starts from a solved state moved along the
/// path's tangent, much closer to its steady state than another grid's solution, so the
/// solve may start nearer Newton's method (common practice, no source). On 40 Pyrene members
/// at 108 cells (seed 1, with the divergence test) 1e8, 1e10, 1e11 and 1e13 s cost 5118,
/// 4029, 3705 and 2929 iterations in all (6254 before the divergence test); 1e13 s lost a
/// member that the others converged (on another path in s), the others failed the same 5.
constexpr double kMemberWarmPseudoStep = 1e11;

/// Scaled residual at which an intermediate point of a member's path (s < 1) counts as
/// solved, its step and column-balance tests waived: it only gives the next step its start
/// and tangent, so polishing it to solver.tolerance buys nothing (nested iteration, as for
/// the coarser levels of a grid sequence: Briggs, Henson and McCormick 2000, A Multigrid
/// Tutorial, 2nd ed., ch. 3). s = 1 is always solved to solver.tolerance. On 40 Pyrene
/// members at 108 cells (seed 1, with the step control below) 1e-1, 1e-2, 1e-3 and 1e-5 cost
/// 2283, 2321, 2487 and 2533 iterations in all, solver.tolerance itself 2905; 1e-3 and 1e-5
/// converged the same 35 members as solver.tolerance (percentiles within 1.5e-6 relative),
/// 1e-2 those and one more, 1e-1 lost one.
constexpr double kIntermediateTolerance = 1e-2;
/// Bound of the predicted change of ln x in one continuation step (ContinuationOptions::
/// max_predicted_log_change). On the same 40 members (intermediate tolerance 1e-3) 2, 3 and
/// 4.6 cost 2319, 2487 and 3078 iterations; 2 lost a member that the others converged;
/// at solver.tolerance itself, 3 cost 2905 and no bound 3385.
constexpr double kMaxPredictedLogChange = 3.0;

/// Half-width of the central difference in s that gives dF/ds at a fixed state: F is a sum
/// of terms each linear in one k_r(s) = k_r exp(s a_r), so the difference is exact to
/// O(h^2 a_r^3) (common practice, no source).
constexpr double kPathStep = 1e-3;

/// How a member converged, for member_status: "converged" (s = 1 in one step) or
/// "converged by continuation (s = 1 (failed) 0.5 1)".
std::string member_path(const ContinuationResult& c) {
  if (c.steps.size() <= 1) return "converged";
  std::string steps;
  for (const auto& st : c.steps) {
    steps +=
        fmt::format("{}{:.4g}{}", steps.empty() ? "" : " ", st.s, st.converged ? "" : " (failed)");
  }
  return "converged by continuation (s = " + steps + ")";
}

/// One member: the scenario with the member's rate factors, solved by continuation in its
/// rate factors from the base state `x0` (solve/continuation.hpp: factors f^s, s from 0 to 1,
/// each s started from the state predicted along the path's tangent at the last solved s;
/// first s = 1 in one step unless the prediction says that is too far). A member whose path
/// stalls is recorded as failed with the reason: a solve from the scenario's cold start,
/// tried once after that, converged none of the 5 such members of 40 on Pyrene at 108
/// cells and cost 320 of their 3705 iterations. Iterations count the tangents' solves.
VariantOutcome solve_member(const Scenario& sc, std::span<const double> z_member, double sigmas,
                            const std::vector<double>& x0, const InterruptGuard& interrupt) {
  VariantOutcome result;
  try {
    ColumnModel model(sc);
    const SteadyStateOptions steady = steady_options(sc.solver);
    SolverSpec spec = sc.solver;
    spec.warm_pseudo_step_s = std::min(kMemberWarmPseudoStep, spec.max_pseudo_step_s);
    std::vector<double> zs(z_member.begin(), z_member.end());
    const auto set_s = [&](double s) {
      for (std::size_t r = 0; r < zs.size(); ++r) zs[r] = s * z_member[r];
      apply_member(model, zs, sigmas);
    };
    const auto solve_at = [&](double s, std::vector<double> from, bool warm) {
      set_s(s);
      RunControls controls;
      controls.stop_requested = interrupt.query();
      controls.warm_start = warm;
      controls.give_up = attempt_give_up(kStallWindow, kStallFactor, kDivergenceFactor);
      if (s >= 1.0) return run_column(model, spec, std::move(from), controls);
      SolverSpec intermediate = spec;
      intermediate.tolerance = std::max(spec.tolerance, kIntermediateTolerance);
      intermediate.step_tolerance = std::numeric_limits<double>::infinity();
      intermediate.balance_tolerance = std::numeric_limits<double>::infinity();
      return run_column(model, intermediate, std::move(from), controls);
    };
    // dx/ds at (x, s): dF/ds by a central difference of the model's own tendency.
    const ContinuationTangent tangent = [&](double s, const std::vector<double>& x) {
      const ColumnSystem sys = model.system();
      std::vector<double> f(x.size()), fp(x.size()), fm(x.size()), dx_ds;
      const auto tendency_at = [&](double at, std::vector<double>& out) {
        set_s(at);
        if (sys.coupling != nullptr) sys.coupling->refresh(x);
        evaluate_tendency(sys, x, steady.time_s, out);
      };
      tendency_at(s + kPathStep, fp);
      tendency_at(s - kPathStep, fm);
      tendency_at(s, f);
      for (std::size_t i = 0; i < x.size(); ++i) fp[i] = (fp[i] - fm[i]) / (2.0 * kPathStep);
      std::string why;
      if (!path_tangent(sys, x, f, fp, steady, dx_ds, why)) dx_ds.clear();
      return dx_ds;
    };
    ContinuationOptions copt;
    copt.first_step = 1.0;
    copt.max_predicted_log_change = kMaxPredictedLogChange;
    const ContinuationResult c = continue_to_target(
        x0, [&](double s, const std::vector<double>& x) { return solve_at(s, x, true); }, copt,
        tangent);
    result.converged = c.status == SolveStatus::kConverged;
    result.interrupted = c.status == SolveStatus::kInterrupted;
    result.reason = result.converged     ? member_path(c)
                    : result.interrupted ? std::string("interrupted")
                                         : c.reason;
    result.iterations = static_cast<int>(c.iterations + c.tangents);
    result.residual = c.residual_norm;
    if (result.converged) result.values = mole_fractions(model, c.x);
  } catch (const std::exception& e) {
    result.converged = false;
    result.reason = e.what();
  }
  return result;
}

/// The ensemble's settings, the mechanism's stated uncertainties and each member's outcome;
/// `values` gets the converged members' mole fractions (empty for the others).
EnsembleResults ensemble_results(const EnsembleCliOptions& o, const ColumnModel& base_model,
                                 EnsembleSampling sampling, const std::vector<double>& z,
                                 const std::vector<VariantOutcome>& outcomes,
                                 std::vector<std::vector<double>>& values) {
  const Mechanism& mech = base_model.chemistry().kinetics().mechanism();
  EnsembleResults res;
  res.species = base_model.species();
  res.sampling = sampling_name(sampling);
  res.seed = o.seed;
  res.sigmas = o.sigmas;
  res.above_km = o.above_km;
  res.z = z;
  for (const auto& rx : mech.reactions) {
    res.ids.push_back(rx.id);
    res.equations.push_back(rx.equation);
    res.f298.push_back(rx.uncertainty.f298);
    res.g_K.push_back(rx.uncertainty.g_K);
    res.stated.push_back(rx.uncertainty.stated ? 1 : 0);
  }
  for (const auto& oc : outcomes) {
    res.converged.push_back(oc.converged ? 1 : 0);
    res.reasons.push_back(oc.reason);
    res.iterations.push_back(oc.iterations);
    values.push_back(oc.converged ? oc.values : std::vector<double>{});
  }
  return res;
}

/// The scores of the base state and of every converged member (`values`, empty where a
/// member failed) against the observations: chi-square per species, the 95 % band of the
/// members at each observed point, and the chance that a member reaches the observations
/// above `above_km`.
void score_members(EnsembleResults& res, const std::vector<std::vector<double>>& values,
                   const ObservationSet& obs, const std::vector<double>& zc, double above_km) {
  const std::size_t M = values.size();
  const auto base_scores = score_column(zc, res.species, res.base_mole_fraction, obs, 0);
  for (const auto& s : base_scores) {
    res.scored_species.push_back(s.species);
    res.base_chi2_log.push_back(s.chi2_log);
  }
  res.member_chi2_log.assign(M * base_scores.size(), std::numeric_limits<double>::quiet_NaN());
  // Per observed point: the member values there, for the band and the chance to reach.
  std::vector<std::vector<double>> at_point;
  for (const auto& s : base_scores) {
    for (const auto& p : s.points) {
      res.points.push_back({p.obs, p.inside, p.model, kNaN(), kNaN(), -1});
      at_point.emplace_back();
    }
  }
  for (std::size_t m = 0; m < M; ++m) {
    if (values[m].empty()) continue;
    const auto scores = score_column(zc, res.species, values[m], obs, 0);
    std::size_t k = 0;
    for (std::size_t q = 0; q < scores.size(); ++q) {
      res.member_chi2_log[m * scores.size() + q] = scores[q].chi2_log;
      for (const auto& p : scores[q].points) at_point[k++].push_back(p.model);
    }
  }
  for (std::size_t k = 0; k < res.points.size(); ++k) {
    auto& p = res.points[k];
    if (!p.inside || at_point[k].empty()) continue;
    p.low95 = sample_quantile(at_point[k], 0.025);
    p.high95 = sample_quantile(at_point[k], 0.975);
    p.inside95 = p.point.upper_limit
                     ? (p.low95 <= p.point.value ? 1 : 0)
                     : (p.point.value >= p.low95 && p.point.value <= p.high95 ? 1 : 0);
  }
  // The chance that the base network alone reaches the observations above `above`:
  // the share of converged members whose value at every detected point of the species
  // above that altitude is at least the observed value minus its 1-sigma uncertainty.
  for (const auto& sp : res.scored_species) {
    std::size_t reach = 0, total = 0, npts = 0;
    for (std::size_t m = 0; m < M; ++m) {
      if (values[m].empty()) continue;
      ++total;
      bool all = true;
      npts = 0;
      const auto scores = score_column(zc, res.species, values[m], obs, 0);
      for (const auto& s : scores) {
        for (const auto& p : s.points) {
          if (s.species != sp || !p.inside || p.obs.upper_limit) continue;
          if (p.obs.altitude_cm < above_km * constants::kCmPerKm) continue;
          ++npts;
          if (p.model < p.obs.value - p.obs.uncertainty) all = false;
        }
      }
      if (all && npts > 0) ++reach;
    }
    res.reach_points.push_back(static_cast<double>(npts));
    res.reach_probability.push_back(
        total > 0 && npts > 0 ? static_cast<double>(reach) / static_cast<double>(total) : kNaN());
  }
}

/// The M members (z: R standard normals a member), shared among the ranks of MPI_COMM_WORLD;
/// the outcomes of all members on rank 0.
std::vector<VariantOutcome> run_members(const Scenario& sc, const std::vector<double>& z,
                                        std::size_t M, const Mechanism& mech, double sigmas,
                                        const std::vector<double>& x0,
                                        const InterruptGuard& interrupt, spdlog::logger& log,
                                        int rank, double progress_every) {
  const std::size_t R = mech.reactions.size();
  std::vector<double> log_sigma(R);
  for (std::size_t r = 0; r < R; ++r) {
    log_sigma[r] = ensemble_log_sigma(mech.reactions[r].uncertainty, 298.15, sigmas);
  }
  std::vector<Variant> members(M);
  for (std::size_t m = 0; m < members.size(); ++m) {
    members[m].index = m;
    members[m].label = fmt::format("member {}", m + 1);
  }
  const VariantRunner runner = [&](const Variant& v) {
    return solve_member(sc, std::span<const double>(z).subspan(v.index * R, R), sigmas, x0,
                        interrupt);
  };
  // Members handed out in decreasing expected cost, so that no long member starts last and
  // holds a rank alone at the end: the cost grows with how far the member's rate constants
  // lie from the base, sum_r |z_r| sigma_r at 298 K (common practice, no source).
  std::vector<double> distance(M, 0.0);
  for (std::size_t m = 0; m < M; ++m) {
    for (std::size_t r = 0; r < R; ++r) distance[m] += std::abs(z[m * R + r]) * log_sigma[r];
  }
  std::vector<std::size_t> order(M);
  for (std::size_t m = 0; m < M; ++m) order[m] = m;
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return distance[a] > distance[b]; });
  const VariantDone line = [&](const Variant& v, const VariantOutcome& r) {
    log.debug("{} on rank {}: {} ({} iterations, {:.2f} s)", v.label, rank,
              r.converged ? "converged" : "FAILED: " + r.reason, r.iterations, r.wall_seconds);
  };
  return run_batch(members, runner, {log, "ensemble members", progress_every, line}, {}, &order);
}

/// The ensemble's CF NetCDF file.
void write_ensemble_file(const std::filesystem::path& output, const Scenario& sc,
                         const ColumnModel& base_model, const EnsembleResults& res, int ranks,
                         const std::string& command_line) {
  Dataset ds;
  add_provenance(ds, sc, command_line);
  ds.global_number("colchem_ensemble_ranks", ranks);
  add_ensemble(ds, base_model.background(), res);
  write_dataset(ds, output);
}

/// The draws: R standard normals for each of the M members, the same on every rank.
struct Draws {
  EnsembleSampling sampling = EnsembleSampling::kLatinHypercube;
  std::size_t members = 0, reactions = 0;
  std::vector<double> z;
};

Draws draw_members(const EnsembleCliOptions& o, const ColumnModel& base_model) {
  Draws d;
  d.reactions = base_model.chemistry().kinetics().mechanism().reactions.size();
  d.members = o.members;
  d.sampling =
      o.sampling == "random" ? EnsembleSampling::kRandom : EnsembleSampling::kLatinHypercube;
  d.z = draw_standard_normals(d.members, d.reactions, o.seed, d.sampling);
  return d;
}

/// Statistics over the converged members: the percentiles, the scores against the
/// observations, and the attribution at every target, one adjoint solve of the base state
/// `x` each (a target whose adjoint fails is reported and left out).
EnsembleResults ensemble_statistics(const EnsembleCliOptions& o, ColumnModel& base_model,
                                    const Scenario& sc, const Draws& d,
                                    const std::vector<double>& x, const ObservationSet& obs,
                                    const std::vector<VariantOutcome>& outcomes,
                                    const std::vector<AttributionTarget>& targets,
                                    spdlog::logger& log) {
  std::vector<std::vector<double>> values;
  EnsembleResults res = ensemble_results(o, base_model, d.sampling, d.z, outcomes, values);
  res.base_mole_fraction = mole_fractions(base_model, x);
  res.percentile = ensemble_percentiles(values);
  const auto& zc = base_model.background().grid.center_cm;
  if (!obs.points.empty()) score_members(res, values, obs, zc, o.above_km);
  for (const auto& t : targets) {
    try {
      res.attribution.push_back(attribute_target(base_model, sc, x, t, o.sigmas, values));
    } catch (const RunError& e) {
      log.warn("attribution left out: {}", e.what());
    }
  }
  return res;
}

int run_ensemble(const EnsembleCliOptions& o, Context& ctx) {
  const PetscSession petsc;  // initialises MPI as well
  const WorldRanks world = world_ranks();
  const UnitSystem units;

  // 1. Load the scenario, the observations and the attribution targets (all checked before
  //    any member is solved).
  const Scenario sc = load_scenario(o.config, o.sets, units);
  ColumnModel base_model(sc);
  require_steady_chemistry(sc, base_model, "an ensemble compares steady states");
  const std::filesystem::path output = o.output.empty()
                                           ? std::filesystem::path(sc.name + "_ensemble.nc")
                                           : std::filesystem::path(o.output);
  const ObservationSet obs = read_model_observations(sc.observations, base_model, units);
  const std::vector<AttributionTarget> targets =
      attribution_targets(base_model, sc, obs, o.attribution, o.attribute);
  const InterruptGuard interrupt;

  // 2. The base state, solved on every rank (the same deterministic solve), from which
  //    every member starts: members do not depend on which rank ran them.
  //    A cold start is grid-sequenced as the scenario says (as `colchem run` solves it).
  BaseStart start(o.config, o.sets);
  start.progress = world.rank == 0;
  const BaseSolve base_solve =
      solve_steady_base(start, sc, base_model, units, ctx, interrupt, "base state");
  if (base_solve.exit_code != 0) return base_solve.exit_code;
  const RunOutcome& base = base_solve.run;

  // 3. The draws, the same on every rank.
  const Draws d = draw_members(o, base_model);
  if (world.rank == 0) {
    ctx.log->info(
        "ensemble of {}: {} members ({} sampling, seed {}) of {} reactions on {} "
        "rank{}",
        sc.name, d.members, sampling_name(d.sampling), o.seed, d.reactions, world.size,
        plural(static_cast<std::size_t>(world.size)));
  }

  // 4. The members over the ranks; their outcomes on rank 0.
  const std::vector<VariantOutcome> outcomes =
      run_members(sc, d.z, d.members, base_model.chemistry().kinetics().mechanism(), o.sigmas,
                  base.x, interrupt, *ctx.log, world.rank, o.progress_every);
  if (interrupt.query()()) {
    if (world.rank == 0) ctx.log->warn("interrupted: nothing written");
    return static_cast<int>(ExitCode::kInterrupted);
  }
  if (world.rank != 0) return 0;

  // 5. Statistics and attribution on rank 0; the file and the summary.
  const EnsembleResults res =
      ensemble_statistics(o, base_model, sc, d, base.x, obs, outcomes, targets, *ctx.log);
  write_ensemble_file(output, sc, base_model, res, world.size, ctx.command_line);
  std::cout << ensemble_summary_text(res);
  ctx.log->info("wrote {}", output.string());
  if (std::none_of(res.converged.begin(), res.converged.end(), [](int c) { return c != 0; })) {
    ctx.log->error("no member converged");
    return static_cast<int>(ExitCode::kNotConverged);
  }
  return 0;
}

}  // namespace

void add_ensemble_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "ensemble",
      "Draw members of the mechanism's rate uncertainties, solve each steady state, and report "
      "the percentiles of every profile, the chi-square distribution and whether the "
      "observations lie inside the model's 95 % band; under mpirun the members are shared "
      "among the ranks.");
  auto o = std::make_shared<EnsembleCliOptions>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML) with a steady solver")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--set", o->sets, "Override a config value by its dotted key path (repeatable)");
  cmd->add_option("-o,--output", o->output,
                  "Output NetCDF file (default: SCENARIO_NAME_ensemble.nc)");
  cmd->add_option("-n,--members", o->members, "Number of members")
      ->check(CLI::Range(std::size_t{2}, std::size_t{1000000}));
  cmd->add_option("--seed", o->seed, "Seed of the draws (the same seed gives the same members)");
  cmd->add_option("--sampling", o->sampling, "latin_hypercube or random")
      ->check(CLI::IsMember({"latin_hypercube", "random"}));
  cmd->add_option("--sigmas", o->sigmas,
                  "How many standard deviations of ln k a stated factor f spans (1: f is a "
                  "1-sigma factor; 2: a 2-sigma bound)")
      ->check(CLI::Range(0.1, 10.0));
  cmd->add_option("--above", o->above_km,
                  "Altitude (km) above which the chance that a member reaches the observed "
                  "values is reported");
  cmd->add_flag("--attribution", o->attribution,
                "Attribute the variance of ln(mole fraction) at every observed point to the "
                "reactions (first order, from the adjoint sensitivities of the base state) and "
                "compare it with the ensemble's own variance");
  cmd->add_option("--attribute", o->attribute,
                  "An attribution target SPECIES@KM, e.g. SO2@90 (repeatable; implies "
                  "--attribution, adds to the observed points)");
  cmd->add_option("--progress-every", o->progress_every,
                  "At most one progress line (members done/total, time left) per this many "
                  "seconds (0: one per member)")
      ->check(CLI::NonNegativeNumber)
      ->capture_default_str();
  out.emplace_back(cmd, [o](Context& ctx) { return run_ensemble(*o, ctx); });
}

}  // namespace colchem::app
