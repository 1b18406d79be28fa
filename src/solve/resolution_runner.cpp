#include "solve/resolution_runner.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>

#include "core/column_state.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/interp.hpp"
#include "solve/scenario.hpp"
#include "solve/column_run.hpp"

namespace colchem {

std::string grid_override(std::span<const double> edges_cm) {
  std::string s = "grid={edges: {unit: km, values: [";
  for (std::size_t k = 0; k < edges_cm.size(); ++k) {
    s += fmt::format("{}{:.17g}", k ? ", " : "", edges_cm[k] / constants::kCmPerKm);
  }
  return s + "]}}";
}

bool start_from_level(const LevelResult& warm, const ColumnModel& model, std::vector<double>& x0) {
  if (!warm.converged || warm.species != model.species()) return false;
  const std::size_t S = model.species_count(), N = model.cells();
  const std::size_t M = warm.background.grid.cells();
  const auto& na_old = warm.background.air_density_cm3;
  for (std::size_t s = 0; s < S; ++s) {
    std::vector<double> n_old(M);
    for (std::size_t j = 0; j < M; ++j) {
      n_old[j] = std::max(warm.mole_fraction[s * M + j] * na_old[j], 1e-30);
    }
    const auto v =
        *interpolate(warm.background.grid.center_cm, n_old, model.background().grid.center_cm,
                     InterpScale::kLog, Extrapolation::kHoldEnds);
    for (std::size_t j = 0; j < N; ++j) x0[j * S + s] = v[j];
  }
  model.impose_held(x0);
  return true;
}

std::vector<std::vector<double>> coarser_grids(std::span<const double> edges_cm,
                                               std::size_t coarsest_cells) {
  std::vector<std::vector<double>> levels;
  std::vector<double> e(edges_cm.begin(), edges_cm.end());
  for (;;) {
    const std::size_t cells = e.size() - 1;
    if ((cells + 1) / 2 < std::max<std::size_t>(coarsest_cells, 1)) break;
    std::vector<double> c;
    for (std::size_t k = 0; k < e.size(); k += 2) c.push_back(e[k]);
    if (cells % 2 == 1) c.push_back(e.back());
    levels.insert(levels.begin(), c);
    e = std::move(c);
  }
  return levels;
}

SequencedStart sequenced_start(const SolveRequest& req, const ColumnModel& target,
                               std::size_t coarsest_cells, double level_tolerance,
                               const UnitSystem& units) {
  SequencedStart out;
  std::optional<LevelResult> last;
  // With the two-stream scheme the coarser levels take the direct beam: they only give the
  // start, and the Pyrene cold start with the diffuse field settles on no grid within the
  // iteration limit, while from a direct-beam steady state the two-stream solve converges
  // in 42-65 iterations (continuation in the physics as well as the grid: Allgower and
  // Georg 1990, Numerical Continuation Methods, ch. 1).
  const bool direct_beam_levels =
      target.photolysis() != nullptr && target.photolysis()->two_stream();
  SolveRequest level_req = req;
  if (direct_beam_levels) {
    level_req.overrides.emplace_back("photolysis.radiative_transfer={scheme: direct_beam}");
  }
  // Nested iteration: a coarser level is solved to its discretisation error only
  // (solve/solver_spec.hpp, sequence_tolerance); the step and balance tests belong to the
  // requested grid.
  level_req.overrides.push_back(fmt::format("solver.tolerance={:.17g}", level_tolerance));
  level_req.overrides.emplace_back("solver.step_tolerance=1e300");
  level_req.overrides.emplace_back("solver.balance_tolerance=1e300");
  for (const auto& edges : coarser_grids(target.background().grid.edge_cm, coarsest_cells)) {
    LevelResult r = solve_on_edges(level_req, edges, units, last ? &*last : nullptr);
    out.levels.push_back(
        {edges.size() - 1, r.iterations, r.wall_s, r.converged, direct_beam_levels});
    // A level that does not converge (a grid too coarse for the scenario's layers) is
    // skipped: the next finer one starts from the last converged level, or cold.
    if (r.converged) last = std::move(r);
  }
  if (last) {
    out.x0 = target.initial_state();
    start_from_level(*last, target, out.x0);
  }
  return out;
}

LevelResult solve_on_edges(const SolveRequest& req, std::span<const double> edges_cm,
                           const UnitSystem& units, const LevelResult* warm) {
  std::vector<std::string> overrides = req.overrides;
  overrides.push_back(grid_override(edges_cm));
  const Scenario sc = req.load_scenario(req.config, overrides, units);
  ColumnModel model(sc);
  if (!model.has_chemistry()) {
    throw InputError(ExitCode::kConfig, SourceLocation{req.config.string()}, "chemistry",
                     "a chemistry section (a resolution study solves the column)", "none");
  }
  const std::size_t S = model.species_count(), N = model.cells();
  LevelResult r;
  r.background = model.background();
  r.species = model.species();
  for (std::size_t s = 0; s < S; ++s) r.held.push_back(model.held(s));

  std::vector<double> x0 = model.initial_state();
  // A steady state does not depend on its start, so the previous level's solution is a
  // better start; a transient's end state does, so it always starts from the scenario's.
  const bool steady = sc.solver.method != SolverMethod::kTransient;
  const bool warm_start = steady && warm != nullptr && start_from_level(*warm, model, x0);
  RunControls controls;
  controls.warm_start = warm_start;
  controls.log = req.log;
  controls.stop_requested = req.stop_requested;
  const RunOutcome out = run_column(model, sc.solver, std::move(x0), controls);
  if (out.status == SolveStatus::kInterrupted) {
    throw RunError(ExitCode::kInterrupted,
                   "interrupted during the solve on " + std::to_string(N) + " cells");
  }
  r.converged = out.ok();
  r.reason = out.reason;
  r.iterations = out.iterations;
  r.wall_s = out.wall_s;
  r.residual = out.residual_norm;
  if (req.log) {
    req.log->info("{} cells: {} after {} iterations, residual {:.3g}", N,
                  r.converged ? "converged" : "not converged", r.iterations, r.residual);
  }
  if (!r.converged) return r;
  const ColumnDiagnostics diag = model.diagnostics(out.x, out.time_s);
  r.bottom_flux = diag.bottom_flux;
  r.top_flux = diag.top_flux;
  r.mole_fraction = mole_fractions(out.x, r.background.air_density_cm3);
  if (req.observations != nullptr && !req.observations->points.empty()) {
    r.scores =
        score_column(r.background.grid.center_cm, r.species, r.mole_fraction, *req.observations, 0);
  }
  return r;
}

bool ResolutionStudy::all_converged() const {
  return std::all_of(levels.begin(), levels.end(),
                     [](const LevelResult& l) { return l.converged; });
}

namespace {

std::vector<double> species_profile(const LevelResult& l, std::size_t s) {
  if (!l.converged) return {};
  const std::size_t N = l.background.grid.cells();
  return {l.mole_fraction.begin() + static_cast<std::ptrdiff_t>(s * N),
          l.mole_fraction.begin() + static_cast<std::ptrdiff_t>((s + 1) * N)};
}

ScoreResolution compare_scores(const std::vector<LevelResult>& levels, std::size_t q, double ratio,
                               const AsymptoticRange& range) {
  const std::size_t L = levels.size();
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  ScoreResolution r;
  const LevelResult* ref = nullptr;
  for (const auto& l : levels) {
    if (l.converged && q < l.scores.size()) ref = &l;
  }
  if (ref == nullptr) return r;
  r.species = ref->scores[q].species;
  std::vector<std::size_t> inside;
  for (std::size_t p = 0; p < ref->scores[q].points.size(); ++p) {
    if (ref->scores[q].points[p].inside) {
      inside.push_back(p);
      r.altitude_cm.push_back(ref->scores[q].points[p].obs.altitude_cm);
    }
  }
  r.log10_model.assign(L, std::vector<double>(inside.size(), kNaN));
  r.chi2_log.assign(L, kNaN);
  for (std::size_t l = 0; l < L; ++l) {
    if (!levels[l].converged || q >= levels[l].scores.size()) continue;
    const auto& sc = levels[l].scores[q];
    r.chi2_log[l] = sc.chi2_log;
    for (std::size_t i = 0; i < inside.size(); ++i) {
      r.log10_model[l][i] = std::log10(sc.points[inside[i]].model);
    }
  }
  r.chi2 = richardson_scalar(r.chi2_log[L - 3], r.chi2_log[L - 2], r.chi2_log[L - 1], ratio, range);
  for (std::size_t i = 0; i < inside.size(); ++i) {
    r.point.push_back(richardson_scalar(r.log10_model[L - 3][i], r.log10_model[L - 2][i],
                                        r.log10_model[L - 1][i], ratio, range));
  }
  return r;
}

}  // namespace

std::vector<BoundaryFluxResolution> compare_boundary_fluxes(const std::vector<LevelResult>& levels,
                                                            double ratio,
                                                            const AsymptoticRange& range,
                                                            double relative_floor) {
  std::vector<BoundaryFluxResolution> out;
  const std::size_t L = levels.size();
  if (L < 3) return out;
  const LevelResult* ref = nullptr;  // the finest converged level
  for (const auto& l : levels) {
    if (l.converged && !l.bottom_flux.empty()) ref = &l;
  }
  if (ref == nullptr) return out;
  double largest = 0.0;
  for (std::size_t s = 0; s < ref->species.size(); ++s) {
    if (ref->held[s]) continue;
    largest = std::max({largest, std::abs(ref->bottom_flux[s]), std::abs(ref->top_flux[s])});
  }
  if (!(largest > 0.0)) return out;
  constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
  for (std::size_t s = 0; s < ref->species.size(); ++s) {
    if (ref->held[s]) continue;
    for (const bool bottom : {true, false}) {
      const auto pick = [&](const LevelResult& l) {
        const auto& f = bottom ? l.bottom_flux : l.top_flux;
        return (l.converged && s < f.size()) ? f[s] : kNaN;
      };
      if (!(std::abs(pick(*ref)) > relative_floor * largest)) continue;
      BoundaryFluxResolution b;
      b.species = ref->species[s];
      b.end = bottom ? "bottom" : "top";
      for (const auto& l : levels) b.flux.push_back(pick(l));
      const double u1 = b.flux[L - 3], u2 = b.flux[L - 2], u3 = b.flux[L - 1];
      b.estimate = richardson_scalar(u1, u2, u3, ratio, range);
      const double d12 = u1 - u2, d23 = u2 - u3;
      b.grows = d12 * d23 > 0.0 && std::abs(d23) > std::abs(d12);
      out.push_back(std::move(b));
    }
  }
  return out;
}

ResolutionStudy compare_levels(std::vector<LevelResult> levels, std::size_t ratio,
                               const ResolutionOptions& options) {
  ResolutionStudy st;
  st.ratio = ratio;
  st.levels = std::move(levels);
  const auto& first = st.levels.front();
  std::vector<std::vector<double>> z;
  for (const auto& l : st.levels) z.push_back(l.background.grid.center_cm);
  for (std::size_t s = 0; s < first.species.size(); ++s) {
    std::vector<std::vector<double>> f;
    for (const auto& l : st.levels) f.push_back(species_profile(l, s));
    st.profiles.push_back(
        compare_species(first.species[s], z, f, static_cast<double>(ratio), options));
  }
  std::size_t Q = 0;
  for (const auto& l : st.levels) Q = std::max(Q, l.scores.size());
  for (std::size_t q = 0; q < Q; ++q) {
    st.scores.push_back(compare_scores(st.levels, q, static_cast<double>(ratio), options.range));
  }
  st.boundary_fluxes =
      compare_boundary_fluxes(st.levels, static_cast<double>(ratio), options.range);
  return st;
}

ResolutionStudy run_resolution_study(const SolveRequest& req, std::span<const double> base_edges,
                                     std::size_t level_count, std::size_t ratio,
                                     const ResolutionOptions& options, const UnitSystem& units) {
  std::vector<LevelResult> levels;
  std::size_t factor = 1;
  for (std::size_t l = 0; l < level_count; ++l) {
    const auto edges = refine_edges(base_edges, factor);
    levels.push_back(solve_on_edges(req, edges, units, l > 0 ? &levels.back() : nullptr));
    factor *= ratio;
  }
  return compare_levels(std::move(levels), ratio, options);
}

std::vector<double> adapt_grid(const SolveRequest& req, std::span<const double> start_edges,
                               std::size_t cells, int passes,
                               const EquidistributionOptions& options, const UnitSystem& units,
                               std::vector<LevelResult>* solves) {
  std::vector<double> edges(start_edges.begin(), start_edges.end());
  LevelResult last;
  for (int pass = 0; pass < passes; ++pass) {
    LevelResult r = solve_on_edges(req, edges, units, pass > 0 ? &last : nullptr);
    if (!r.converged) {
      throw RunError(ExitCode::kNotConverged,
                     fmt::format("the solve on {} cells for the adapted grid did not converge: {}",
                                 r.background.grid.cells(), r.reason));
    }
    std::vector<bool> use(r.held.size());
    for (std::size_t s = 0; s < use.size(); ++s) use[s] = !r.held[s];
    edges = equidistributed_edges(r.background.grid, r.mole_fraction, r.species.size(), use, cells,
                                  options);
    if (solves != nullptr) solves->push_back(r);
    last = std::move(r);
  }
  return edges;
}

}  // namespace colchem
