// Strang-split integration on operators with exact sub-steps.
#include <catch2/catch.hpp>

#include <cmath>

#include "solve/split_integrator.hpp"
#include "solve/steady_state.hpp"
#include "test_operators.hpp"

using namespace colchem;
using namespace colchem::testing;

namespace {

// Three cells, two species; exchange rate 1e-3 s^-1 (exact), chemistry P - k x (exact).
// Numbers invented.
struct Problem {
  ExactThreeCellExchange transport{2, 1e-3};
  LinearSourceLoss chemistry{{5.0, 1.0, 0.0, 2.0, 1.0, 0.0}, {1e-3, 3e-3, 2e-3, 1e-3, 4e-3, 5e-4}};
  ColumnSystem system{{&transport, &chemistry}, 3, 2};
};

double max_rel_diff(const std::vector<double>& a, const std::vector<double>& b) {
  double m = 0.0;
  for (std::size_t i = 0; i < a.size(); ++i) m = std::max(m, std::abs(a[i] - b[i]) / std::abs(b[i]));
  return m;
}

}  // namespace

TEST_CASE("Strang splitting: the split steady state approaches the coupled one at second "
          "order", "[solve][split]") {
  Problem p;
  const SteadyStateResult coupled =
      SteadyStateSolver(p.system).solve(std::vector<double>(6, 0.0));
  REQUIRE(coupled.converged());

  std::vector<double> err, res;
  for (double dt : {200.0, 100.0, 50.0}) {
    SplitOptions o;
    o.end_s = 1e5;  // 100 e-folds of the slowest rate (5e-4 s^-1): the fixed point
    o.step_s = dt;
    o.adaptive = false;
    const SplitResult r =
        SplitIntegrator(p.transport, p.chemistry, 3, 2, o).run(std::vector<double>(6, 0.0));
    REQUIRE(r.status == SolveStatus::kCompleted);
    CHECK(r.time_s == 1e5);
    err.push_back(max_rel_diff(r.x, coupled.x));
    res.push_back(r.residual_norm);
  }
  // Hundsdorfer and Verwer (2003), ch. IV: Strang splitting is second order; its fixed point
  // is O(dt^2) from the coupled steady state.
  for (std::size_t i = 0; i + 1 < err.size(); ++i) {
    const double order = std::log2(err[i] / err[i + 1]);
    INFO("dt ratio 2, errors " << err[i] << " -> " << err[i + 1]);
    CHECK(order > 1.7);
    CHECK(order < 2.3);
    // The coupled scaled residual of the end state shows the same splitting error.
    CHECK(std::log2(res[i] / res[i + 1]) > 1.7);
  }
  CHECK(res.back() > 1e-8);  // a split "steady state" is not a coupled one at this dt
}

TEST_CASE("Split integrator: outputs are hit exactly and a crossing callback fires once",
          "[solve][split]") {
  // Pure exchange conserves the column total (analytic), so an injection of 1e3 at
  // t = 170 s shows up exactly once in the total.
  ExactThreeCellExchange transport(1, 1e-2);
  LinearSourceLoss none({0.0, 0.0, 0.0}, {0.0, 0.0, 0.0});
  SplitOptions o;
  o.end_s = 400.0;
  o.step_s = 7.0;
  o.adaptive = true;
  o.relative_tolerance = 1e-6;
  o.output_times_s = {100.0, 250.0};
  o.breakpoints_s = {170.0};
  int injections = 0;
  SplitCallbacks cb;
  cb.on_time_crossed = [&](double from, double to, std::vector<double>& x) {
    if (from < 170.0 && 170.0 <= to) {
      ++injections;
      x[0] += 1e3;
    }
  };
  const std::vector<double> x0 = {10.0, 20.0, 30.0};
  const SplitResult r = SplitIntegrator(transport, none, 3, 1, o).run(x0, cb);
  REQUIRE(r.status == SolveStatus::kCompleted);
  REQUIRE(r.snapshots.size() == 2);
  CHECK(r.snapshots[0].time_s == 100.0);  // exact hits
  CHECK(r.snapshots[1].time_s == 250.0);
  CHECK(injections == 1);
  const double total = r.x[0] + r.x[1] + r.x[2];
  CHECK(total == Approx(60.0 + 1e3).epsilon(1e-12));  // analytic: conservation
  // The step grew from 7 s: the error control adapts (the final state is nearly uniform).
  double largest = 0.0;
  for (const auto& h : r.history) largest = std::max(largest, h.step_s);
  CHECK(largest > 7.0);
}

TEST_CASE("Split integrator: adaptive steps track the exact solution", "[solve][split]") {
  // One species, one cell split as two commuting linear parts (loss k1 and loss k2): the
  // splitting is exact, so the error is the error control's alone (analytic: e^-(k1+k2)t).
  LinearSourceLoss a({0.0}, {1e-3});
  LinearSourceLoss b({0.0}, {2e-3});
  SplitOptions o;
  o.end_s = 1000.0;
  o.step_s = 1.0;
  const SplitResult r = SplitIntegrator(a, b, 1, 1, o).run({1e6});
  REQUIRE(r.status == SolveStatus::kCompleted);
  CHECK(r.x[0] == Approx(1e6 * std::exp(-3.0)).epsilon(1e-12));
}

TEST_CASE(
    "Split integrator: to_steady_state stops on the coupled residual, a failing "
    "sub-step and an interrupt are reported",
    "[solve][split]") {
  Problem p;
  SECTION("not reached: the splitting error remains above a tight tolerance") {
    SplitOptions o;
    o.end_s = 2e4;
    o.step_s = 100.0;
    o.adaptive = false;
    o.to_steady_state = true;
    o.steady_tolerance = 1e-12;
    const SplitResult r = SplitIntegrator(p.transport, p.chemistry, 3, 2, o).run(
        std::vector<double>(6, 0.0));
    CHECK(r.status == SolveStatus::kNotConverged);
    CHECK(r.residual_norm > 1e-12);
  }
  SECTION("reached with a tolerance above the splitting error at this dt") {
    SplitOptions o;
    o.end_s = 1e6;
    o.step_s = 1.0;
    o.adaptive = false;
    o.to_steady_state = true;
    o.steady_tolerance = 1e-4;
    o.steady_check_every = 100;
    const SplitResult r = SplitIntegrator(p.transport, p.chemistry, 3, 2, o).run(
        std::vector<double>(6, 0.0));
    INFO(r.reason);
    CHECK(r.status == SolveStatus::kConverged);
    CHECK(r.residual_norm < 1e-4);
    CHECK(r.time_s < 1e6);
  }
  SECTION("a sub-step that always fails") {
    Dimerisation no_step({1.0}, 1e-11, 1e-5);  // its implicit_step returns false
    SplitOptions o;
    o.end_s = 10.0;
    o.step_s = 1.0;
    o.min_step_s = 1e-3;
    const SplitResult r = SplitIntegrator(no_step, no_step, 1, 2, o).run({0.0, 0.0});
    CHECK(r.status == SolveStatus::kFailed);
    CHECK_THAT(r.reason, Catch::Contains("implicit sub-step failed"));
  }
  SECTION("interrupt") {
    SplitOptions o;
    o.end_s = 1e5;
    o.step_s = 10.0;
    o.adaptive = false;
    long polls = 0;
    SplitCallbacks cb;
    cb.stop_requested = [&] { return ++polls > 5; };
    const SplitResult r = SplitIntegrator(p.transport, p.chemistry, 3, 2, o).run(
        std::vector<double>(6, 0.0), cb);
    CHECK(r.status == SolveStatus::kInterrupted);
    CHECK(r.steps == 5);
    CHECK(r.time_s == Approx(50.0));
  }
}

TEST_CASE(
    "Split integrator: a too-long first step is rejected and halved, the adaptive "
    "result matches a fine fixed-step run",
    "[solve][split]") {
  Problem p;
  SplitOptions o;
  o.end_s = 3000.0;
  o.step_s = 3000.0;  // far beyond what rtol allows
  o.relative_tolerance = 1e-6;
  const SplitResult r =
      SplitIntegrator(p.transport, p.chemistry, 3, 2, o).run(std::vector<double>(6, 0.0));
  REQUIRE(r.status == SolveStatus::kCompleted);
  CHECK(r.rejected_steps > 0);
  CHECK(r.history.front().step_s < 3000.0);

  SplitOptions fine;
  fine.end_s = 3000.0;
  fine.step_s = 0.25;  // splitting error ~ (0.25 s * 1e-3 s^-1)^2 ~ 1e-7 (analytic order)
  fine.adaptive = false;
  const SplitResult ref =
      SplitIntegrator(p.transport, p.chemistry, 3, 2, fine).run(std::vector<double>(6, 0.0));
  // The step-doubling estimate controls the local error to rtol; over ~tens of steps the
  // global error stays within a few hundred rtol (common practice, no source).
  CHECK(max_rel_diff(r.x, ref.x) < 1e-4);
}
