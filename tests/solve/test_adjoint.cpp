// Adjoint sensitivities of steady states (solve/adjoint.hpp) against references outside the
// adjoint: a closed-form linear column, and central finite differences of the full
// nonlinear steady solve on a small photochemical column (Tellin on 10 cells, photolysis
// coupling included).
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <complex>
#include <numeric>

#include "analysis/observations.hpp"
#include "core/units.hpp"
#include "io/observation_loader.hpp"
#include "io/scenario.hpp"
#include "solve/adjoint.hpp"
#include "solve/column_run.hpp"
#include "solve/solver_options.hpp"

using namespace colchem;

namespace {

const char* const kLinear = COLCHEM_SOURCE_DIR "/tests/solve/adjoint/linear_column.yaml";
const char* const kTellin = COLCHEM_SOURCE_DIR "/configs/tellin.yaml";
const char* const kTellinObs = COLCHEM_SOURCE_DIR "/tests/cli/sweep/tellin_so2_invented.csv";

/// The column of the closed-form steady state of
///   d/dz (K n_a df/dz) = k n_a f,  n_a = n0 exp(-z/H),  f(0) = f_b,  f'(L) = 0,
/// f = A e^{m1 z} + B e^{m2 z}, m = (1/H +- sqrt(1/H^2 + 4k/K))/2; G = int_0^L n_a f dz.
/// Templated on the number type for complex-step differentiation (Squire and Trapp 1998,
/// SIAM Rev. 40, 110): dG/dk = Im G(k + i h)/h to round-off.
template <class T>
T analytic_column(T k, T K, double H, double n0, double fb, double L) {
  const T root = std::sqrt(1.0 / (H * H) + 4.0 * k / K);
  const T m1 = (1.0 / H + root) / 2.0, m2 = (1.0 / H - root) / 2.0;
  const T e1 = std::exp(m1 * L), e2 = std::exp(m2 * L);
  const T A = fb * m2 * e2 / (m2 * e2 - m1 * e1);
  const T B = fb - A;
  const auto part = [&](T C, T m) {
    return C * (std::exp((m - 1.0 / H) * L) - 1.0) / (m - 1.0 / H);
  };
  return n0 * (part(A, m1) + part(B, m2));
}

struct Solved {
  Scenario sc;
  std::unique_ptr<ColumnModel> model;
  std::vector<double> x;
};

Solved solve(const char* file, const std::vector<std::string>& sets) {
  const UnitSystem units;
  Solved s{load_scenario(file, sets, units), nullptr, {}};
  s.model = std::make_unique<ColumnModel>(s.sc);
  RunOutcome r = run_column(*s.model, s.sc.solver, s.model->initial_state(), {});
  REQUIRE(r.status == SolveStatus::kConverged);
  s.x = std::move(r.x);
  return s;
}

SteadyStateOptions tight_options(const SolverSpec& spec) {
  SteadyStateOptions o = steady_options(spec);
  o.tolerance = 1e-12;
  o.step_tolerance = 1e-9;
  o.initial_pseudo_step_s = o.max_pseudo_step_s;
  o.max_iterations = 60;
  return o;
}

const SensitivityRow& row_named(const SensitivityResult& res, const std::string& name) {
  for (const auto& r : res.parameters) {
    if (r.parameter.name == name) return r;
  }
  FAIL("no parameter " << name);
  return res.parameters.front();
}

/// Adjoint against a central difference (step 1e-3 in ln p, 1e-3 p for named parameters)
/// of the full steady solve: agreement to 1e-4 relative (common practice, no source).
void check_fd(Solved& s, const Objective& obj, const SensitivityRow& row) {
  const bool logp = row.parameter.kind != ParameterKind::kNamed;
  const double h = logp ? 1e-4 : 1e-3 * std::max(std::abs(row.parameter.value), 1e-3);
  const FiniteDifference fd =
      finite_difference(*s.model, obj, s.x, row.parameter, h, tight_options(s.sc.solver));
  INFO(obj.label << ": " << row.parameter.name << " adjoint " << row.dG << " fd " << fd.dG << " ("
                 << fd.reason << ")");
  REQUIRE(fd.converged);
  CHECK(fd.dG != 0.0);
  CHECK(std::abs(row.dG - fd.dG) <= 1e-4 * std::abs(fd.dG));
}

std::vector<std::size_t> by_magnitude(const std::vector<SensitivityRow>& rows) {
  std::vector<std::size_t> idx(rows.size());
  std::iota(idx.begin(), idx.end(), 0);
  std::stable_sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
    return std::abs(rows[a].dG) > std::abs(rows[b].dG);
  });
  return idx;
}

}  // namespace

TEST_CASE("Adjoint: the linear column's sensitivities are those of its closed-form solution",
          "[solve][adjoint]") {
  Solved s = solve(kLinear, {});
  const ColumnModel& m = *s.model;
  const Background& bg = m.background();
  // Input data of the closed form: the model's own isothermal, uniform-gravity background.
  const double H = bg.scale_height_cm.front();
  REQUIRE(std::abs(bg.scale_height_cm.back() / H - 1.0) < 1e-6);
  const double n0 = bg.edge_air_density_cm3.front();
  const double L = bg.grid.edge_cm.back() - bg.grid.edge_cm.front();
  const double k = m.chemistry().kinetics().rate_constants()[0];
  const double K = bg.edge_eddy_cm2_s.front();
  const double fb = 1e-9;

  Objective obj;
  obj.kind = ObjectiveKind::kColumn;
  obj.species = 0;
  const SensitivityResult res = compute_sensitivities(*s.model, obj, s.x);
  const double G = analytic_column(k, K, H, n0, fb, L);
  // Second-order finite volumes on 400 cells (dz = 25 m against the 2.6 km decay length):
  // the discrete column matches the continuum to ~1e-5; 1e-4 fails on a first-order flux.
  CHECK(std::abs(res.value / G - 1.0) < 1e-4);
  const double hk = 1e-20 * k, hK = 1e-20 * K;
  using C = std::complex<double>;
  const double dlnG_dlnk = std::imag(analytic_column(C(k, hk), C(K), H, n0, fb, L)) / hk * k / G;
  const double dlnG_dlnK = std::imag(analytic_column(C(k), C(K, hK), H, n0, fb, L)) / hK * K / G;
  INFO("d ln G / d ln k: adjoint " << res.reactions[0].log_sensitivity << ", closed form "
                                   << dlnG_dlnk);
  CHECK(std::abs(res.reactions[0].log_sensitivity / dlnG_dlnk - 1.0) < 1e-4);
  CHECK(std::abs(row_named(res, "K (whole profile)").log_sensitivity / dlnG_dlnK - 1.0) < 1e-4);
  // G is proportional to the boundary value (a linear problem): d ln G / d ln f_b = 1.
  CHECK(std::abs(row_named(res, "SO2 bottom mixing_ratio").log_sensitivity - 1.0) < 1e-8);
  // The profile of dG/d ln k sums to the total.
  double sum = 0.0;
  for (std::size_t j = 0; j < m.cells(); ++j) sum += res.reaction_profile[j];
  CHECK(std::abs(sum / res.reactions[0].dG - 1.0) < 1e-12);
}

TEST_CASE("Adjoint: Tellin on 10 cells agrees with finite differences of the steady solve",
          "[solve][adjoint]") {
  Solved s = solve(kTellin, {"solver.method=steady", "grid.cells=10"});
  const auto& names = s.model->species();
  const auto index = [&](const std::string& n) {
    return static_cast<std::size_t>(std::find(names.begin(), names.end(), n) - names.begin());
  };

  SECTION("column of H2SO4(aer): 20 rate constants, a named parameter, a boundary value, K") {
    Objective obj;
    obj.kind = ObjectiveKind::kColumn;
    obj.species = index("H2SO4(aer)");
    obj.label = "column";
    const SensitivityResult res = compute_sensitivities(*s.model, obj, s.x);
    CHECK(res.photolysis_coupled);  // the photolysis coupling is in the adjoint
    CHECK(res.photolysis_reverse);  // Tellin: the direct beam, spherical paths
    const auto order = by_magnitude(res.reactions);
    for (std::size_t i = 0; i < 20; ++i) check_fd(s, obj, res.reactions[order[i]]);
    check_fd(s, obj, row_named(res, "sulfate_removal_scale"));
    check_fd(s, obj, row_named(res, "SO2 bottom mixing_ratio"));
    check_fd(s, obj, row_named(res, "H2SO4(aer) bottom deposition_velocity"));
    check_fd(s, obj, row_named(res, "K (whole profile)"));
    // The bands partition the edges, so their sensitivities add up to the whole profile's
    // (linearity of the derivative); each is a central difference accurate to ~1e-8.
    double bands = 0.0;
    for (const auto& r : res.parameters) {
      if (r.parameter.kind == ParameterKind::kEddy && r.parameter.name != "K (whole profile)") {
        bands += r.dG;
      }
    }
    CHECK(std::abs(bands / row_named(res, "K (whole profile)").dG - 1.0) < 1e-6);
    check_fd(s, obj, row_named(res, "stellar flux"));
  }
  SECTION("mole fraction of SO2 at 25 km") {
    Objective obj;
    obj.kind = ObjectiveKind::kMoleFraction;
    obj.species = index("SO2");
    obj.altitude_cm = 25e5;
    obj.label = "SO2 at 25 km";
    const SensitivityResult res = compute_sensitivities(*s.model, obj, s.x);
    const auto order = by_magnitude(res.reactions);
    for (std::size_t i = 0; i < 5; ++i) check_fd(s, obj, res.reactions[order[i]]);
    check_fd(s, obj, row_named(res, "K (whole profile)"));
  }
  SECTION("column rate of a photolysis reaction (direct dependence on k and on J)") {
    const Kinetics& kin = s.model->chemistry().kinetics();
    Objective obj;
    obj.kind = ObjectiveKind::kRate;
    for (std::size_t r = 0; r < kin.reaction_count(); ++r) {
      if (kin.mechanism().reactions[kin.mechanism_reaction(r)].equation.rfind("O3 + hv", 0) == 0) {
        obj.reaction = r;
        break;
      }
    }
    REQUIRE(kin.reaction_channel(obj.reaction) != Kinetics::npos);
    obj.label = "O3 photolysis rate";
    const SensitivityResult res = compute_sensitivities(*s.model, obj, s.x);
    const auto order = by_magnitude(res.reactions);
    for (std::size_t i = 0; i < 5; ++i) check_fd(s, obj, res.reactions[order[i]]);
    check_fd(s, obj, res.reactions[obj.reaction]);
    check_fd(s, obj, row_named(res, "O3 bottom mixing_ratio"));
  }
  SECTION("chi-square against invented SO2 observations") {
    const UnitSystem units;
    const ObservationSet obs = read_observations(kTellinObs, units);
    Objective obj;
    obj.kind = ObjectiveKind::kChiSquare;
    obj.observations = &obs;
    obj.label = "chi2";
    const SensitivityResult res = compute_sensitivities(*s.model, obj, s.x);
    REQUIRE(res.value > 0.0);
    const auto order = by_magnitude(res.reactions);
    for (std::size_t i = 0; i < 5; ++i) check_fd(s, obj, res.reactions[order[i]]);
    check_fd(s, obj, row_named(res, "SO2 bottom mixing_ratio"));
  }
}
