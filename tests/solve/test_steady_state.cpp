// Pseudo-transient continuation on small operators whose steady states are known.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <csignal>

#include "core/error.hpp"
#include "solve/interrupt.hpp"
#include "solve/residual_norm.hpp"
#include "solve/steady_state.hpp"
#include "test_operators.hpp"

using namespace colchem;
using namespace colchem::testing;

namespace {

double rel_err(double a, double b) { return std::abs(a - b) / std::abs(b); }

std::vector<OxygenCycle::Cell> oxygen_cells() {
  // Invented but typical magnitudes: j1 from 1e-13 to 1e-9 s^-1, k2[M] 6e-17 cm^3 s^-1
  // with O2 = 2e16 cm^-3 (a 1.2 s^-1 loss of O), j3 1e-3 to 1e-2 s^-1: rates over 13
  // orders of magnitude.
  std::vector<OxygenCycle::Cell> c;
  for (int j = 0; j < 8; ++j) {
    c.push_back({1e-13 * std::pow(10.0, 0.5 * j), 6e-17, 1e-3 * std::pow(10.0, j / 7.0), 8e-15});
  }
  return c;
}

}  // namespace

TEST_CASE("PTC: linear diffusion with first-order loss matches the direct solve and the "
          "discrete analytic solution", "[solve][steady]") {
  const std::size_t N = 40, S = 2;
  const double c0 = 1e-4, c1 = 3e-5;  // K/dz^2 (s^-1): 1e6 cm^2 s^-1 over 1 km; invented
  const double k0 = 1e-6, k1 = 2e-6;  // first-order loss (s^-1); invented
  const double n0 = 1e10;             // species 0 held at the bottom (cm^-3)
  const double q_top = 1e3;           // species 1 produced in the top cell (cm^-3 s^-1)
  Diffusion diff(N, {c0, c1}, {true, false});
  std::vector<double> P(N * S, 0.0), K(N * S, 0.0);
  for (std::size_t j = 0; j < N; ++j) {
    K[j * S] = j == 0 ? 0.0 : k0;  // the held cell has no chemistry either
    K[j * S + 1] = k1;
  }
  P[(N - 1) * S + 1] = q_top;
  LinearSourceLoss chem(P, K);
  ColumnSystem sys{{&diff, &chem}, N, S};

  std::vector<double> x0(N * S, 0.0);
  x0[0] = n0;  // cold start: nothing but the boundary value
  SteadyStateOptions opt;
  opt.scale.absolute_density_cm3 = 1e-3;
  opt.initial_pseudo_step_s = 0.1 / c0;
  const SteadyStateResult r = SteadyStateSolver(sys, opt).solve(x0);
  INFO(r.reason);
  REQUIRE(r.converged());
  CHECK(r.residual_norm < 1e-8);
  // From a cold start PTC needs about log10(t_slow / dtau0) steps of at most 10x growth
  // before Newton's method takes over: with dtau0 a tenth of the cell exchange time 1/c0 and
  // t_slow = 1/k0 that is a handful (analytic for a linear problem: each mode's residual
  // falls by 1/(1 + lambda dtau) per step).
  CHECK(r.iterations <= 10);

  // Direct linear solve J x = -b (b = F(0) with the held value), held row -> identity.
  BlockTridiagonal J(N, S);
  evaluate_jacobian(sys, x0, 0.0, J);
  std::vector<double> b(N * S), zero(N * S, 0.0);
  evaluate_tendency(sys, zero, 0.0, b);
  std::vector<double> A = to_dense(J);
  const std::size_t n = N * S;
  for (double& v : b) v = -v;
  A[0] = 1.0;
  b[0] = n0;
  const std::vector<double> direct = dense_solve(A, b);
  double worst = 0.0;
  for (std::size_t i = 0; i < n; ++i) worst = std::max(worst, rel_err(r.x[i], direct[i]));
  CHECK(worst < 1e-10);  // analytic: the same linear system, solved directly

  // Discrete analytic solution for species 0: x_j = a r^j + b r^-j, r + 1/r = 2 + k/c,
  // x_0 = n0, and the zero-flux top (ghost x_N = x_{N-1}) gives a = b r^-(2N-1).
  const double beta = 2.0 + k0 / c0;
  const double rr = 0.5 * (beta + std::sqrt(beta * beta - 4.0));
  const double bb = n0 / (1.0 + std::pow(rr, -(2.0 * N - 1.0)));
  const double aa = bb * std::pow(rr, -(2.0 * N - 1.0));
  double worst_analytic = 0.0;
  for (std::size_t j = 0; j < N; ++j) {
    const double exact = aa * std::pow(rr, double(j)) + bb * std::pow(rr, -double(j));
    worst_analytic = std::max(worst_analytic, rel_err(r.x[j * S], exact));
  }
  CHECK(worst_analytic < 1e-10);  // analytic (discrete closed form)
  CHECK(r.x[0] == n0);            // the held species did not move
}

TEST_CASE("PTC: steady A + A -> B with a source reaches the closed form", "[solve][steady]") {
  const std::vector<double> P = {1e3, 1e5, 1e7};  // cm^-3 s^-1, invented
  const double k = 1e-11, kB = 1e-5;              // cm^3 s^-1, s^-1, invented
  Dimerisation chem(P, k, kB);
  ColumnSystem sys{{&chem}, P.size(), 2};
  const SteadyStateResult r = SteadyStateSolver(sys).solve(std::vector<double>(6, 0.0));
  INFO(r.reason);
  REQUIRE(r.converged());
  CHECK(r.residual_norm < 1e-8);
  for (std::size_t j = 0; j < P.size(); ++j) {
    CHECK(rel_err(r.x[2 * j], std::sqrt(P[j] / (2 * k))) < 1e-8);  // analytic
    CHECK(rel_err(r.x[2 * j + 1], P[j] / (2 * kB)) < 1e-8);        // analytic
  }
  // The history is complete and ends at the converged state.
  REQUIRE(!r.history.empty());
  CHECK(r.history.back().residual_norm == r.residual_norm);

  // A looser tolerance than the Newton switch still ends with a Newton step and stops on
  // it (fewer iterations, residual below the looser tolerance).
  SteadyStateOptions loose;
  loose.tolerance = 1e-3;
  const SteadyStateResult rl = SteadyStateSolver(sys, loose).solve(std::vector<double>(6, 0.0));
  REQUIRE(rl.converged());
  CHECK(rl.residual_norm < 1e-3);
  CHECK(rl.iterations <= r.iterations);
}

TEST_CASE("PTC: A + A -> B in a diffusing column keeps its column budget",
          "[solve][steady]") {
  // With zero-flux ends the column total of the steady source balances the loss:
  // sum_j P_j = 2 k sum_j A_j^2 (analytic: integrate the A equation over the column).
  const std::size_t N = 30;
  std::vector<double> P(N, 0.0);
  P[0] = 1e6;  // all production at the bottom (invented)
  Dimerisation chem(P, 1e-11, 1e-5);
  Diffusion diff(N, {1e-4, 1e-4});
  ColumnSystem sys{{&diff, &chem}, N, 2};
  const SteadyStateResult r = SteadyStateSolver(sys).solve(std::vector<double>(2 * N, 0.0));
  INFO(r.reason);
  REQUIRE(r.converged());
  double loss = 0.0;
  for (std::size_t j = 0; j < N; ++j) loss += 2e-11 * r.x[2 * j] * r.x[2 * j];
  CHECK(rel_err(loss, 1e6) < 1e-7);
  CHECK(scaled_residual_norm(sys, r.x).value < 1e-8);
}

TEST_CASE("PTC: a stiff oxygen-like cycle converges from a cold start to its analytic state",
          "[solve][steady]") {
  const auto cells = oxygen_cells();
  OxygenCycle chem(cells);
  ColumnSystem sys{{&chem}, cells.size(), 3};
  std::vector<double> x0(3 * cells.size(), 0.0);
  for (std::size_t j = 0; j < cells.size(); ++j) x0[3 * j] = 2e16;  // O2 fixed (cm^-3)
  const SteadyStateResult r = SteadyStateSolver(sys).solve(x0);
  INFO(r.reason << " after " << r.iterations);
  REQUIRE(r.converged());
  CHECK(r.residual_norm < 1e-8);
  for (std::size_t j = 0; j < cells.size(); ++j) {
    const double o = OxygenCycle::steady_o(cells[j]);
    CHECK(rel_err(r.x[3 * j + 1], o) < 1e-7);                                    // analytic
    CHECK(rel_err(r.x[3 * j + 2], cells[j].j1 * 2e16 / (cells[j].k4 * o)) < 1e-7);  // analytic
    CHECK(r.x[3 * j] == 2e16);
  }

  SECTION("restart from the converged state converges again in at most two iterations") {
    const SteadyStateResult again = SteadyStateSolver(sys).solve(r.x);
    REQUIRE(again.converged());
    CHECK(again.iterations <= 2);
  }
  SECTION("two iterations are not enough: a failure status with a reason") {
    SteadyStateOptions o;
    o.max_iterations = 2;
    const SteadyStateResult f = SteadyStateSolver(sys, o).solve(x0);
    CHECK(f.status == SolveStatus::kNotConverged);
    CHECK_THAT(f.reason, Catch::Contains("no convergence in 2 iterations"));
    CHECK(f.iterations == 2);
    CHECK(f.x.size() == x0.size());
  }
  SECTION("checkpoints come every N iterations") {
    SteadyStateOptions o;
    o.checkpoint_every = 5;
    std::vector<int> at;
    SteadyStateCallbacks c2;
    c2.checkpoint = [&](int it, double, const std::vector<double>&) { at.push_back(it); };
    const SteadyStateResult f = SteadyStateSolver(sys, o).solve(x0, c2);
    REQUIRE(f.converged());
    REQUIRE(at.size() == static_cast<std::size_t>(f.iterations / 5));
    for (std::size_t i = 0; i < at.size(); ++i) CHECK(at[i] == 5 * int(i + 1));
  }
}

TEST_CASE("PTC: a NaN-producing operator fails with a reason", "[solve][steady]") {
  SECTION("NaN at the initial state") {
    NanAbove op(-1.0, 1.0);
    ColumnSystem sys{{&op}, 4, 1};
    const SteadyStateResult r = SteadyStateSolver(sys).solve(std::vector<double>(4, 1.0));
    CHECK(r.status == SolveStatus::kFailed);
    CHECK_THAT(r.reason, Catch::Contains("non-finite residual at the initial state"));
  }
  SECTION("NaN beyond a density the solver keeps trying to reach") {
    // Steady state would be q/1e-6 = 1e6, but the operator breaks down above 10.
    NanAbove op(10.0, 1.0);
    ColumnSystem sys{{&op}, 4, 1};
    SteadyStateOptions o;
    o.initial_pseudo_step_s = 1e3;
    const SteadyStateResult r = SteadyStateSolver(sys, o).solve(std::vector<double>(4, 1.0));
    CHECK(r.status == SolveStatus::kFailed);
    CHECK_THAT(r.reason, Catch::Contains("pseudo-time step collapsed"));
    CHECK(r.rejected_steps > 0);
    for (double v : r.x) CHECK(std::isfinite(v));  // the returned state is the last good one
  }
}

TEST_CASE("PTC: SIGINT through the InterruptGuard stops the solver", "[solve][steady]") {
  const auto cells = oxygen_cells();
  OxygenCycle chem(cells);
  ColumnSystem sys{{&chem}, cells.size(), 3};
  std::vector<double> x0(3 * cells.size(), 0.0);
  for (std::size_t j = 0; j < cells.size(); ++j) x0[3 * j] = 2e16;
  InterruptGuard guard;
  int calls = 0;
  SteadyStateCallbacks cb;
  cb.stop_requested = guard.query();
  cb.on_state = [&](const std::vector<double>&) {
    if (++calls == 3) std::raise(SIGINT);  // delivered to the guard's handler
  };
  const SteadyStateResult r = SteadyStateSolver(sys).solve(x0, cb);
  CHECK(r.status == SolveStatus::kInterrupted);
  CHECK(guard.signal_number() == SIGINT);
  CHECK(r.iterations == 3);
  CHECK(r.x.size() == x0.size());
  {
    // A nested guard keeps the flag; only the outermost one clears it.
    const InterruptGuard inner;
    CHECK(inner.signal_number() == SIGINT);
  }
  CHECK(guard.requested());
}

namespace {

// Photolysis shielded by the O3 column above each cell (Beer-Lambert,
// j = j_top exp(-sigma N_above); invented cross sections chosen so that the shielding is of
// order one at the bottom), as a NonlocalCoupling with its exact Jacobian product (the
// derivative of the exponentials, analytic), or without it (the J-values lagged).
class Shielding final : public NonlocalCoupling {
 public:
  Shielding(OxygenCycle& chem, std::size_t cells, double dz_cm, bool with_product)
      : chem_(chem), n_(cells), dz_(dz_cm), with_product_(with_product) {}
  void refresh(std::span<const double> x) override {
    double above = 0.0;
    for (std::size_t j = n_; j-- > 0;) {
      const double col = above + 0.5 * x[3 * j + 2] * dz_;
      chem_.cells()[j].j1 = kJ1 * std::exp(-kSigma1 * col);
      chem_.cells()[j].j3 = kJ3 * std::exp(-kSigma3 * col);
      above += x[3 * j + 2] * dz_;
    }
  }
  void add_jacobian_product(std::span<const double> x, std::span<const double> v,
                            std::span<double> out) override {
    if (!with_product_) return;
    double above = 0.0;
    for (std::size_t j = n_; j-- > 0;) {
      const double dcol = above + 0.5 * v[3 * j + 2] * dz_;
      const auto& c = chem_.cells()[j];
      const double dj1 = -kSigma1 * c.j1 * dcol, dj3 = -kSigma3 * c.j3 * dcol;
      out[3 * j + 1] += 2 * dj1 * x[3 * j] + dj3 * x[3 * j + 2];
      out[3 * j + 2] += -dj3 * x[3 * j + 2];
      above += v[3 * j + 2] * dz_;
    }
  }
  static constexpr double kJ1 = 1e-10, kJ3 = 1e-2, kSigma1 = 1e-17, kSigma3 = 3e-18;

 private:
  OxygenCycle& chem_;
  std::size_t n_;
  double dz_;
  bool with_product_;
};

struct ShieldedColumn {
  static constexpr std::size_t N = 12;
  static constexpr double dz = 1e5;  // cm
  OxygenCycle chem{std::vector<OxygenCycle::Cell>(N, {1e-10, 6e-17, 1e-2, 8e-15})};
  Diffusion diff{N, {0.0, 1e-4, 1e-4}};
  Shielding shield;
  ColumnSystem sys;
  explicit ShieldedColumn(bool with_product)
      : shield(chem, N, dz, with_product), sys{{&diff, &chem}, N, 3, &shield} {}
  [[nodiscard]] static std::vector<double> start() {
    std::vector<double> x0(3 * N, 0.0);
    for (std::size_t j = 0; j < N; ++j) x0[3 * j] = 2e16;
    return x0;
  }
};

}  // namespace

TEST_CASE("PTC with a nonlocal coupling: the photolysis rates converge with the state",
          "[solve][steady]") {
  // The rates depend on the solution, so they can only be right if the coupling is
  // refreshed with the state.
  ShieldedColumn col(true);
  const SteadyStateResult r = SteadyStateSolver(col.sys).solve(ShieldedColumn::start());
  INFO(r.reason);
  REQUIRE(r.converged());
  // The rates are not constant: the bottom sees real shielding (analytic consequence of
  // Beer-Lambert with a positive column).
  col.shield.refresh(r.x);
  CHECK(col.chem.cells()[0].j1 < 0.5 * col.chem.cells()[ShieldedColumn::N - 1].j1);
  // With rates recomputed from the converged state, its coupled residual is below the
  // tolerance.
  CHECK(scaled_residual_norm(col.sys, r.x).value < 1e-8);
}

TEST_CASE(
    "Newton-Krylov with the coupling's Jacobian product converges quadratically, "
    "without it (lagged J) only linearly",
    "[solve][steady]") {
  // Newton's method converges quadratically near a root with a Lipschitz Jacobian (Kelley
  // 1995, Iterative Methods for Linear and Nonlinear Equations, Theorem 5.1.2); with a
  // Jacobian that omits a term of order one the iteration is a chord-like method and
  // converges linearly (Kelley 1995, section 5.4). Measured on the residual history of the
  // full Newton steps (dtau = max): ||F_{k+1}|| / ||F_k||^2 stays bounded while the
  // residual falls, where the lagged iteration's ratio ||F_{k+1}|| / ||F_k|| stays of order
  // its contraction factor.
  SteadyStateOptions o;
  o.tolerance = 1e-13;
  o.step_tolerance = 1e-12;
  const auto newton_history = [](const SteadyStateResult& r, double limit) {
    std::vector<double> h;
    for (const auto& it : r.history) {
      if (it.residual_norm < limit) h.push_back(it.residual_norm);
    }
    return h;
  };
  ShieldedColumn full(true);
  const SteadyStateResult rf = SteadyStateSolver(full.sys, o).solve(ShieldedColumn::start());
  INFO(rf.reason);
  REQUIRE(rf.converged());
  const auto hf = newton_history(rf, 1e-3);
  REQUIRE(hf.size() >= 3);
  // Quadratic: from 1e-3 the residual reaches the 1e-13 tolerance in at most 4 steps, and
  // every step that is not limited by round-off (||F|| > 1e-12) squares the residual up to
  // a constant.
  CHECK(hf.size() <= 5);
  for (std::size_t k = 0; k + 1 < hf.size(); ++k) {
    if (hf[k + 1] > 1e-12) CHECK(hf[k + 1] < 1e2 * hf[k] * hf[k]);
  }
  ShieldedColumn lagged(false);
  SteadyStateOptions ol = o;
  ol.max_iterations = 400;
  const SteadyStateResult rl = SteadyStateSolver(lagged.sys, ol).solve(ShieldedColumn::start());
  const auto hl = newton_history(rl, 1e-3);
  // Linear: the lagged iteration needs more than twice as many steps below 1e-3.
  CHECK(hl.size() > 2 * hf.size());
}
