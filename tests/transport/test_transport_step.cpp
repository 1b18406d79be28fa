// Jacobian, implicit time steps, injections and boundary schedules of the transport operator.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

#include "transport/column_species.hpp"
#include "transport/transport_operator.hpp"
#include "transport_fixtures.hpp"

using namespace colchem;
using colchem::test::column_total;
using colchem::test::isothermal_column;
using colchem::test::varying_column;

namespace {
std::vector<TransportSpecies> four_species() {
  std::vector<TransportSpecies> sp = {
      default_transport_species("H", 1.008, 28.0), default_transport_species("SO2", 64.0, 28.0),
      default_transport_species("O", 16.0, 28.0), default_transport_species("N2", 28.0, 28.0)};
  sp[3].fixed = true;
  return sp;
}

/// Boundary values of the size of the state near them, so that finite differences of the
/// tendency are not swamped by the constant boundary terms.
std::vector<SpeciesBoundaries> mixed_boundaries(const Background& bg) {
  std::vector<SpeciesBoundaries> bc(4);
  bc[0].bottom = BoundaryCondition::of(BoundaryKind::kMixingRatio, 1e-6);
  bc[0].top.kind = BoundaryKind::kJeans;
  bc[1].bottom = BoundaryCondition::of(BoundaryKind::kDepositionVelocity, 0.2);
  bc[1].top = BoundaryCondition::of(BoundaryKind::kFlux, -1e7);
  bc[2].bottom = BoundaryCondition::of(BoundaryKind::kFlux, 3e8);
  bc[2].top = BoundaryCondition::of(BoundaryKind::kDensity, 1e-6 * bg.edge_air_density_cm3.back());
  return bc;
}

/// A smooth positive state with every species present.
std::vector<double> smooth_state(const Background& bg, std::size_t S) {
  const std::size_t N = bg.grid.cells();
  std::vector<double> n(N * S);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t s = 0; s < S; ++s) {
      const double z = bg.grid.center_cm[j] / 1e7;
      n[j * S + s] =
          bg.air_density_cm3[j] * 1e-6 * (1.0 + 0.5 * std::sin(3.0 * z + static_cast<double>(s)));
    }
  }
  return n;
}
}  // namespace

TEST_CASE("transport Jacobian equals central finite differences of the tendency", "[transport]") {
  // Transport is affine in n, so central differences are exact up to round-off; relative
  // 1e-7 (common practice, no source).
  const Background bg = varying_column(12, false);
  const auto sp = four_species();
  TransportOperator op(bg, sp, mixed_boundaries(bg));
  const std::size_t N = 12, S = sp.size();
  const auto n = smooth_state(bg, S);
  BlockTridiagonal jac(N, S);
  op.add_jacobian(n, 0.0, jac);

  std::vector<double> fp(N * S), fm(N * S);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t s = 0; s < S; ++s) {
      auto x = n;
      const double h = 1e-4 * n[j * S + s];
      x[j * S + s] += h;
      std::fill(fp.begin(), fp.end(), 0.0);
      op.add_tendency(x, 0.0, fp);
      x[j * S + s] -= 2.0 * h;
      std::fill(fm.begin(), fm.end(), 0.0);
      op.add_tendency(x, 0.0, fm);
      for (std::size_t i = 0; i < N; ++i) {
        for (std::size_t r = 0; r < S; ++r) {
          const double fd = (fp[i * S + r] - fm[i * S + r]) / (2.0 * h);
          double an = 0.0;
          if (i == j)
            an = jac.d(i, r, s);
          else if (r == s && i == j + 1)
            an = jac.l(i, s);
          else if (r == s && i + 1 == j)
            an = jac.u(i, s);
          const double scale = std::abs(jac.d(i, r, r)) + 1e-300;
          INFO("cell " << i << " row species " << r << " column cell " << j << " species " << s);
          CHECK(std::abs(fd - an) <= 1e-7 * scale);  // common practice, no source
        }
      }
    }
  }
  // The fixed species contributes nothing.
  CHECK(jac.d(5, 3, 3) == 0.0);
  CHECK(jac.d(5, 0, 0) < 0.0);
}

namespace {
std::vector<double> step_error(TransportOperator& op, const std::vector<double>& n0,
                               const std::vector<double>& ref, double T_end, int steps) {
  auto n = n0;
  const double dt = T_end / steps;
  for (int k = 0; k < steps; ++k) REQUIRE(op.implicit_step(n, k * dt, dt));
  // Per species, each relative to its own largest density.
  const std::size_t S = op.species_count();
  std::vector<double> out;
  for (std::size_t s = 0; s < S; ++s) {
    double err = 0.0, scale = 0.0;
    for (std::size_t i = s; i < n.size(); i += S) {
      err = std::max(err, std::abs(n[i] - ref[i]));
      scale = std::max(scale, std::abs(ref[i]));
    }
    out.push_back(err / scale);
  }
  return out;
}
}  // namespace

TEST_CASE("TR-BDF2 transport steps converge at second order in dt", "[transport]") {
  // Smooth transient with a time-dependent bottom mixing ratio and a time-dependent escape
  // velocity at the top (schedules). Reference: 8192 steps (its own error is ~1e-6 of the coarsest);
  // observed order against a second-order method (Hosea and Shampine 1996).
  const Background bg = isothermal_column(40, 80.0e5, 250.0, 900.0, 28.0, 1e15, 2e6);
  std::vector<TransportSpecies> sp = {default_transport_species("O", 16.0, 28.0),
                                      default_transport_species("CO", 28.0, 28.0)};
  std::vector<SpeciesBoundaries> bc(2);
  bc[0].bottom.kind = BoundaryKind::kMixingRatio;
  bc[0].bottom.value = Schedule{{0.0, 4.0e4}, {1e-6, 3e-6}};
  bc[0].top.kind = BoundaryKind::kEscapeVelocity;  // time-dependent A: scheduled velocity
  bc[0].top.value = Schedule{{0.0, 2.0e4}, {20.0, 80.0}};
  bc[1].bottom = BoundaryCondition::of(BoundaryKind::kFlux, 1e10);
  TransportOperator op(bg, sp, bc);
  const auto n0 = smooth_state(bg, 2);
  const double T_end = 2.0e4;  // comparable to the column mixing time (L^2/K ~ 3e4 s)
  auto ref = n0;
  for (int k = 0; k < 8192; ++k) REQUIRE(op.implicit_step(ref, k * T_end / 8192, T_end / 8192));
  std::vector<std::vector<double>> e;
  for (int steps : {8, 16, 32, 64}) e.push_back(step_error(op, n0, ref, T_end, steps));
  for (std::size_t s = 0; s < 2; ++s) {
    for (std::size_t i = 0; i + 1 < e.size(); ++i) {
      const double order = std::log2(e[i][s] / e[i + 1][s]);
      WARN("TR-BDF2 " << sp[s].name << ": steps " << (8 << i) << " error " << e[i][s]
                      << " observed order " << order);
      CHECK(order > 1.8);  // second-order method
      CHECK(order < 2.2);
    }
  }
  CHECK(op.positivity_fallbacks() == 0);
}

TEST_CASE("transport steps keep densities non-negative", "[transport]") {
  // A spike in one cell with a long step: TR-BDF2 (not positivity preserving) undershoots
  // next to it; the backward-Euler fallback keeps every density >= 0 and conserves the
  // column with zero-flux boundaries (analytic: M-matrix, conservative fluxes).
  const Background bg = isothermal_column(50, 100.0e5, 250.0, 900.0, 28.0, 1e15, 1e7);
  std::vector<TransportSpecies> sp = {default_transport_species("SO2", 64.0, 28.0)};
  TransportOperator op(bg, sp, std::vector<SpeciesBoundaries>(1));
  std::vector<double> n(50, 0.0);
  n[25] = 1e10;
  const double before = column_total(bg.grid, n, 1, 0);
  REQUIRE(op.implicit_step(n, 0.0, 1e5));
  CHECK(op.positivity_fallbacks() == 1);
  CHECK(*std::min_element(n.begin(), n.end()) >= 0.0);
  CHECK(column_total(bg.grid, n, 1, 0) == Approx(before).epsilon(1e-12));
  // A moderate step from a smooth state needs no fallback.
  for (std::size_t j = 0; j < 50; ++j) n[j] = 1e-6 * bg.air_density_cm3[j];
  REQUIRE(op.implicit_step(n, 0.0, 1e3));
  CHECK(op.positivity_fallbacks() == 1);
}

TEST_CASE("implicit steps approach the steady state and conserve zero-flux columns",
          "[transport]") {
  // Huge dt: TR-BDF2 is L-stable, so one step lands on the steady state (fixed bottom
  // mixing ratio, eddy only: uniform f; analytic).
  const Background bg = varying_column(30);
  TransportSpecies x;
  x.name = "X";
  x.mass_g = 50.0 * constants::kAtomicMassUnit;
  std::vector<SpeciesBoundaries> bc(1);
  bc[0].bottom = BoundaryCondition::of(BoundaryKind::kMixingRatio, 2e-9);
  TransportOperator op(bg, {x}, bc);
  std::vector<double> n(30, 0.0);
  REQUIRE(op.implicit_step(n, 0.0, 1e20));
  for (std::size_t j = 0; j < 30; ++j) {
    CHECK(n[j] / bg.air_density_cm3[j] == Approx(2e-9).epsilon(1e-8));  // analytic
  }
}

namespace {
/// Test-local first-order loss dn/dt = -k n for every species, integrated exactly.
class UniformLoss final : public ColumnOperator {
 public:
  explicit UniformLoss(double k) : k_(k) {}
  void add_tendency(std::span<const double> n, double, std::span<double> f) override {
    for (std::size_t i = 0; i < n.size(); ++i) f[i] -= k_ * n[i];
  }
  void add_jacobian(std::span<const double>, double, BlockTridiagonal& jac) override {
    for (std::size_t j = 0; j < jac.cells; ++j) {
      for (std::size_t s = 0; s < jac.species; ++s) jac.d(j, s, s) -= k_;
    }
  }
  bool implicit_step(std::span<double> n, double, double dt) override {
    for (double& v : n) v *= std::exp(-k_ * dt);
    return true;
  }

 private:
  double k_;
};
}  // namespace

TEST_CASE("an injected pulse decays with the imposed e-folding time", "[transport][validation]") {
  // Zero-flux boundaries: transport conserves the column, so with a uniform loss k the column
  // total is N(t) = N0 exp(-k t) (analytic). Strang splitting: transport dt/2, loss dt,
  // transport dt/2; injections applied once when a step crosses their time.
  const Background bg = varying_column(60, false);
  std::vector<TransportSpecies> sp = {default_transport_species("SO2", 64.0, 28.0),
                                      default_transport_species("CO2", 44.0, 28.0)};
  TransportOperator transport(bg, sp, std::vector<SpeciesBoundaries>(2));
  const double k = 1.0 / (5.0 * 86400.0);
  UniformLoss loss(k);

  ColumnSpeciesSpec spec;
  InjectionSpec inj;
  inj.species = "SO2";
  inj.amount_kind = InjectionAmount::kGlobalMass;
  inj.amount = 1.0e13;  // 10 Tg in g (invented)
  inj.time_s = 0.0;
  inj.bottom_cm = 51.3e5;  // not on cell edges
  inj.top_cm = 77.7e5;
  spec.injections.push_back(inj);
  const auto injections = resolve_injections(spec, bg, sp);
  REQUIRE(injections.size() == 1);
  const double R = bg.planet.radius_cm;
  const double N0 = 1.0e13 / sp[0].mass_g / (4.0 * constants::kPi * R * R);  // analytic
  CHECK(injections[0].column_cm2 == Approx(N0).epsilon(1e-14));

  std::vector<double> n(60 * 2, 0.0);
  const double dt = 0.05 / k;
  std::size_t applied = 0;
  double t = 0.0;
  const auto advance_to = [&](double t_end) {
    while (t < t_end - 0.5 * dt) {
      applied += apply_injections(injections, bg.grid, 2, t, t + dt, n);
      REQUIRE(transport.implicit_step(n, t, 0.5 * dt));
      REQUIRE(loss.implicit_step(n, t, dt));
      REQUIRE(transport.implicit_step(n, t + 0.5 * dt, 0.5 * dt));
      t += dt;
    }
  };
  advance_to(1.0 / k);
  CHECK(applied == 1);
  WARN("pulse: N(1/k) relative error "
       << column_total(bg.grid, n, 2, 0) / (N0 * std::exp(-1.0)) - 1.0 << ", positivity fallbacks "
       << transport.positivity_fallbacks());
  CHECK(column_total(bg.grid, n, 2, 0) == Approx(N0 * std::exp(-1.0)).epsilon(1e-3));
  advance_to(3.0 / k);
  CHECK(applied == 1);
  CHECK(column_total(bg.grid, n, 2, 0) == Approx(N0 * std::exp(-3.0)).epsilon(1e-3));
  CHECK(column_total(bg.grid, n, 2, 1) == 0.0);  // the other species was not touched
  // The pulse has spread beyond its injection range.
  CHECK(n[0] > 0.0);
}

TEST_CASE("injections add their column amount once, uniformly in density", "[transport]") {
  Grid g = Grid::from_edges({0.0, 1e5, 3e5, 6e5, 10e5});
  std::vector<Injection> inj = {Injection{1, 2.0e15, 100.0, 0.5e5, 4.5e5}};
  std::vector<double> n(4 * 2, 0.0);
  CHECK(apply_injections(inj, g, 2, 0.0, 100.0, n) == 0);  // [t_from, t_to) excludes 100
  CHECK(apply_injections(inj, g, 2, 100.0, 200.0, n) == 1);
  CHECK(apply_injections(inj, g, 2, 200.0, 300.0, n) == 0);
  const double dn = 2.0e15 / 4.0e5;  // analytic: column / range
  CHECK(n[0 * 2 + 1] == Approx(dn * 0.5e5 / 1e5));
  CHECK(n[1 * 2 + 1] == Approx(dn));
  CHECK(n[2 * 2 + 1] == Approx(dn * 1.5e5 / 3e5));
  CHECK(n[3 * 2 + 1] == 0.0);
  CHECK(column_total(g, n, 2, 1) == Approx(2.0e15));
}

TEST_CASE("boundary schedules are piecewise linear and held outside", "[transport]") {
  const Schedule s{{0.0, 10.0, 30.0}, {1.0, 3.0, 2.0}};
  CHECK(s.at(-5.0) == 1.0);  // held (analytic)
  CHECK(s.at(5.0) == Approx(2.0));
  CHECK(s.at(20.0) == Approx(2.5));
  CHECK(s.at(99.0) == 2.0);
  CHECK(Schedule::constant(7.0).at(1e9) == 7.0);

  // A scheduled bottom density drives the reported boundary flux: the Dirichlet value sits on
  // the edge, half a cell below the first centre (eddy only: Phi = -K (n_1 - n_b)/h for a
  // uniform n_a; analytic).
  const Background bg = isothermal_column(10, 10.0e5, 250.0, 1e-30, 28.0, 1e15, 1e5);
  TransportSpecies x;
  x.name = "X";
  x.mass_g = 30.0 * constants::kAtomicMassUnit;
  std::vector<SpeciesBoundaries> bc(1);
  bc[0].bottom.kind = BoundaryKind::kDensity;
  bc[0].bottom.value = Schedule{{0.0, 100.0}, {1e6, 3e6}};
  TransportOperator op(bg, {x}, bc);
  std::vector<double> n(10, 1e6);
  CHECK(op.boundary_fluxes(n, 50.0)[0].bottom == Approx(-1e5 * (1e6 - 2e6) / 0.5e5));
}

TEST_CASE("fixed species and misplaced boundary kinds", "[transport]") {
  const Background bg = isothermal_column(5, 10.0e5, 250.0, 900.0, 28.0, 1e15, 1e5);
  auto sp = four_species();
  std::vector<SpeciesBoundaries> bc(4);
  bc[0].bottom.kind = BoundaryKind::kJeans;
  CHECK_THROWS_AS(TransportOperator(bg, sp, bc), std::invalid_argument);
  bc[0].bottom.kind = BoundaryKind::kZeroFlux;
  bc[0].top.kind = BoundaryKind::kDepositionVelocity;
  CHECK_THROWS_AS(TransportOperator(bg, sp, bc), std::invalid_argument);
  CHECK_THROWS_AS(TransportOperator(bg, sp, std::vector<SpeciesBoundaries>(3)),
                  std::invalid_argument);
  TransportOperator op(bg, sp, std::vector<SpeciesBoundaries>(4));
  // The fixed species (N2) is left alone by a step.
  std::vector<double> m(5 * 4, 1e8);
  m[2 * 4 + 3] = 5e8;
  REQUIRE(op.implicit_step(m, 0.0, 1e4));
  CHECK(m[2 * 4 + 3] == 5e8);
  CHECK(m[1 * 4 + 3] == 1e8);
}
