// Continuation in a parameter s with the tangent predictor (solve/continuation.hpp) on a
// small nonlinear column whose steady state is known.
#include <catch2/catch.hpp>

#include <cmath>

#include "solve/continuation.hpp"
#include "solve/steady_state.hpp"
#include "test_operators.hpp"

using namespace colchem;
using namespace colchem::testing;

namespace {

// Invented magnitudes: a source of A from 1e3 to 1e4 cm^-3 s^-1, A + A -> B at
// k(s) = k0 exp(s a), B lost at kB, exchange between cells at c.
constexpr std::size_t kCells = 12;
constexpr double kK0 = 1e-12, kA = 3.0, kB = 1e-4, kC = 1e-4;

std::vector<double> sources() {
  std::vector<double> p(kCells);
  for (std::size_t j = 0; j < kCells; ++j) p[j] = 1e3 * std::pow(10.0, double(j) / (kCells - 1));
  return p;
}

SteadyStateOptions options() {
  SteadyStateOptions o;
  o.scale.absolute_density_cm3 = 1e-3;
  o.initial_pseudo_step_s = 1e2;
  o.tolerance = 1e-12;
  return o;
}

/// The steady state at s from x0, and F there (f), with or without the exchange.
SteadyStateResult solve_at(double s, std::vector<double> x0, bool exchange) {
  Dimerisation chem(sources(), kK0 * std::exp(s * kA), kB);
  Diffusion diff(kCells, {kC, kC});
  ColumnSystem sys{{&chem}, kCells, 2};
  if (exchange) sys.operators.push_back(&diff);
  return SteadyStateSolver(sys, options()).solve(std::move(x0));
}

std::vector<double> tendency_at(double s, const std::vector<double>& x) {
  Dimerisation chem(sources(), kK0 * std::exp(s * kA), kB);
  Diffusion diff(kCells, {kC, kC});
  const ColumnSystem sys{{&chem, &diff}, kCells, 2};
  std::vector<double> f(x.size());
  evaluate_tendency(sys, x, 0.0, f);
  return f;
}

}  // namespace

TEST_CASE("predict_state steps in ln x, bounded, and keeps zeros non-negative",
          "[solve][continuation]") {
  const std::vector<double> x{1.0, 0.0, 2.0, 1.0, 0.0};
  const std::vector<double> t{0.5, -1.0, 2.0, 10.0, 3.0};
  const auto p = predict_state(x, t, 2.0, 4.6);
  CHECK(p[0] == Approx(std::exp(1.0)).epsilon(1e-15));  // 1 exp(2 0.5 / 1)
  CHECK(p[1] == 0.0);                                   // max(0, 0 - 2)
  CHECK(p[2] == Approx(2.0 * std::exp(2.0)).epsilon(1e-15));
  CHECK(p[3] == Approx(std::exp(4.6)).epsilon(1e-15));  // 20 bounded at 4.6
  CHECK(p[4] == 6.0);                                   // 0 + 2 3
}

TEST_CASE("path_tangent matches the difference of solved steady states", "[solve][continuation]") {
  const double s = 0.4, h = 1e-4;
  std::vector<double> x0(2 * kCells, 1e6);
  const SteadyStateResult r = solve_at(s, x0, true);
  REQUIRE(r.converged());
  const SteadyStateResult rp = solve_at(s + h, r.x, true);
  const SteadyStateResult rm = solve_at(s - h, r.x, true);
  REQUIRE(rp.converged());
  REQUIRE(rm.converged());
  // dF/ds exactly: -2 a k A^2 for A, a k A^2 for B (the exchange does not depend on s).
  std::vector<double> dF(r.x.size());
  const double k = kK0 * std::exp(s * kA);
  for (std::size_t j = 0; j < kCells; ++j) {
    const double a2 = r.x[2 * j] * r.x[2 * j];
    dF[2 * j] = -2.0 * kA * k * a2;
    dF[2 * j + 1] = kA * k * a2;
  }
  Dimerisation chem(sources(), k, kB);
  Diffusion diff(kCells, {kC, kC});
  const ColumnSystem sys{{&chem, &diff}, kCells, 2};
  std::vector<double> t;
  std::string why;
  REQUIRE(path_tangent(sys, r.x, tendency_at(s, r.x), dF, options(), t, why));
  for (std::size_t i = 0; i < t.size(); ++i) {
    const double fd = (rp.x[i] - rm.x[i]) / (2.0 * h);
    INFO("entry " << i);
    CHECK(t[i] == Approx(fd).epsilon(1e-5));
  }
}

TEST_CASE("limited_step bounds the predicted change of ln x at its 99th percentile",
          "[solve][continuation]") {
  ContinuationOptions o;
  o.max_predicted_log_change = 3.0;
  // 100 entries above the floor changing at |d ln x / ds| = 1, one at 100 (the top 1 %,
  // ignored), one below the floor at 1e6 (ignored).
  std::vector<double> x(102, 1e6), t(102, 1e6);
  t[0] = 1e8;
  x[101] = 10.0;
  t[101] = 1e7;
  CHECK(limited_step(x, t, 1.0, o) == 1.0);                         // 1 x 1 <= 3
  CHECK(limited_step(x, t, 4.0, o) == Approx(3.0).epsilon(1e-15));  // 4 x 1 > 3: 3 / 1
  for (std::size_t i = 1; i < 101; ++i) t[i] = -1e9;                // 1000: 3e-3, below min_step
  CHECK(limited_step(x, t, 1.0, o) == o.min_step);
  o.max_predicted_log_change = 0.0;  // no bound
  CHECK(limited_step(x, t, 1.0, o) == 1.0);
  CHECK(limited_step(x, {}, 1.0, ContinuationOptions{.max_predicted_log_change = 3.0}) == 1.0);
}

TEST_CASE("continuation with the tangent reaches the analytic state at s = 1",
          "[solve][continuation]") {
  std::vector<double> x0(2 * kCells, 1e6);
  const SteadyStateResult base = solve_at(0.0, x0, false);
  REQUIRE(base.converged());
  const ContinuationSolve solve = [](double s, const std::vector<double>& x) {
    const SteadyStateResult r = solve_at(s, x, false);
    RunOutcome out;
    out.status = r.status;
    out.reason = r.reason;
    out.x = r.x;
    out.iterations = r.iterations;
    out.residual_norm = r.residual_norm;
    return out;
  };
  // Without exchange the tangent is analytic too: dA/ds = -a A / 2, dB/ds = 0; here it
  // comes from path_tangent with dF/ds exact.
  const ContinuationTangent tangent = [](double s, const std::vector<double>& x) {
    const double k = kK0 * std::exp(s * kA);
    Dimerisation chem(sources(), k, kB);
    const ColumnSystem sys{{&chem}, kCells, 2};
    std::vector<double> f(x.size()), dF(x.size()), t;
    evaluate_tendency(sys, x, 0.0, f);
    for (std::size_t j = 0; j < kCells; ++j) {
      dF[2 * j] = -2.0 * kA * k * x[2 * j] * x[2 * j];
      dF[2 * j + 1] = kA * k * x[2 * j] * x[2 * j];
    }
    std::string why;
    REQUIRE(path_tangent(sys, x, f, dF, options(), t, why));
    for (std::size_t j = 0; j < kCells; ++j) {
      CHECK(t[2 * j] == Approx(-0.5 * kA * x[2 * j]).epsilon(1e-9));
      CHECK(std::abs(t[2 * j + 1]) <= 1e-9 * x[2 * j + 1]);
    }
    return t;
  };
  ContinuationOptions copt;
  copt.first_step = 1.0;
  const ContinuationResult with = continue_to_target(base.x, solve, copt, tangent);
  const ContinuationResult without = continue_to_target(base.x, solve, copt);
  REQUIRE(with.status == SolveStatus::kConverged);
  REQUIRE(without.status == SolveStatus::kConverged);
  CHECK(with.tangents >= 1);
  const auto P = sources();
  const double k1 = kK0 * std::exp(kA);
  for (std::size_t j = 0; j < kCells; ++j) {
    CHECK(with.x[2 * j] == Approx(std::sqrt(P[j] / (2.0 * k1))).epsilon(1e-8));
    CHECK(with.x[2 * j + 1] == Approx(P[j] / (2.0 * kB)).epsilon(1e-8));
  }
  // The predicted start is the exact ln A of the next s (ln A is linear in s here), so the
  // corrector has less to do than from the last state.
  INFO("iterations with tangent " << with.iterations << ", without " << without.iterations);
  CHECK(with.iterations < without.iterations);
  // A bound of 0.5 on the predicted change of ln x: ln A falls by a/2 = 1.5 per unit of s
  // and ln B not at all, so every step is 1/3 long (step doubling meets the bound again).
  copt.max_predicted_log_change = 0.5;
  const ContinuationResult bounded = continue_to_target(base.x, solve, copt, tangent);
  REQUIRE(bounded.status == SolveStatus::kConverged);
  REQUIRE(bounded.steps.size() == 3);
  CHECK(bounded.steps[0].s == Approx(1.0 / 3.0).epsilon(1e-6));
  CHECK(bounded.steps[1].s == Approx(2.0 / 3.0).epsilon(1e-6));
  CHECK(bounded.steps[2].s == 1.0);
  for (std::size_t j = 0; j < kCells; ++j) {
    CHECK(bounded.x[2 * j] == Approx(std::sqrt(P[j] / (2.0 * k1))).epsilon(1e-8));
  }
}

TEST_CASE("attempt_give_up stops a diverging or stalled attempt and lets a converging one run",
          "[solve][continuation]") {
  SECTION("diverged: above 10^4 times the starting residual, not at 10^4 times") {
    const auto test = attempt_give_up(40, 0.1, 1e4);
    CHECK(test(0, 0.5).empty());
    CHECK(test(1, 2.0).empty());
    CHECK(test(2, 5e3).empty());  // exactly 10^4 times 0.5
    const std::string why = test(3, 5.1e3);
    CHECK(why.rfind("diverged", 0) == 0);
  }
  SECTION("stalled: the best residual not ten times below that of `window` iterations before") {
    const auto test = attempt_give_up(3, 0.1, 1e4);
    CHECK(test(0, 1.0).empty());
    CHECK(test(1, 0.9).empty());
    CHECK(test(2, 0.8).empty());  // fewer than 3 iterations since the start: no window yet
    CHECK(test(3, 0.7).rfind("stalled", 0) == 0);  // 0.7 > 0.1 x 1.0, 3 iterations before
    const auto falling = attempt_give_up(3, 0.1, 1e4);
    for (long it = 0; it < 3; ++it) CHECK(falling(it, 1.0).empty());
    CHECK(falling(3, 0.09).empty());  // below 0.1 x 1.0
  }
  SECTION("a converging attempt is not given up, and each call is a fresh test") {
    const auto test = attempt_give_up(3, 0.1, 1e4);
    double r = 1.0;
    for (long it = 0; it < 20; ++it, r *= 0.3) CHECK(test(it, r).empty());
    const auto fresh = attempt_give_up(3, 0.1, 1e4);
    CHECK(fresh(0, 1e3).empty());  // a new start, not 10^4 times the last test's residual
  }
}
