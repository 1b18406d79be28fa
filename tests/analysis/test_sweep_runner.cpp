// The MPI variant runner on one rank (tests/cli runs it under mpirun with two ranks):
// every variant runs once, results come back in variant order, and failures are recorded.
#include <catch2/catch.hpp>

#include <cmath>

#include "analysis/sweep_runner.hpp"
#include "../test_support.hpp"

using namespace colchem;

TEST_CASE("every variant runs once and outcomes return in order", "[sweep][mpi]") {
  colchem_test::ensure_mpi();
  SweepSpec spec;
  spec.axes.push_back({"x", {1.0, 2.0, 3.0, 4.0, 5.0}, false, {}, {}});
  const auto variants = expand_variants(spec);
  auto runner = [&](const Variant& v) {
    VariantOutcome o;
    const double x = v.parameters[0].second;
    if (x == 3.0) {
      o.converged = false;
      o.reason = "absurd parameter";
      return o;
    }
    o.converged = true;
    o.reason = "converged";
    o.values = {x * x};
    return o;
  };
  std::size_t calls = 0;
  std::vector<std::size_t> finished;
  const auto out =
      run_variants(MPI_COMM_SELF, variants, runner, [&](const Variant&, const VariantOutcome& r) {
        ++calls;
        finished.push_back(r.finished);
        CHECK(r.to_run == 5);
      });
  REQUIRE(out.size() == 5);
  CHECK(calls == 5);
  // The shared count of finished variants (for progress lines) on one rank: 1, 2, ..., 5.
  CHECK(finished == std::vector<std::size_t>{1, 2, 3, 4, 5});
  for (std::size_t i = 0; i < 5; ++i) CHECK(out[i].index == i);
  CHECK(out[2].converged == false);
  CHECK(out[2].reason == "absurd parameter");
  CHECK(out[4].values[0] == 25.0);
}

TEST_CASE("a runner that throws is recorded as a failed variant", "[sweep][mpi]") {
  colchem_test::ensure_mpi();
  SweepSpec spec;
  spec.axes.push_back({"x", {1.0, 2.0}, false, {}, {}});
  const auto variants = expand_variants(spec);
  const auto out = run_variants(
      MPI_COMM_SELF, variants,
      [](const Variant& v) -> VariantOutcome {
        if (v.index == 0) throw std::runtime_error("solver blew up");
        VariantOutcome o;
        o.converged = true;
        return o;
      },
      nullptr);
  CHECK_FALSE(out[0].converged);
  CHECK(out[0].reason == "solver blew up");
  CHECK(out[1].converged);
}

TEST_CASE("a stop request leaves the variants not run as interrupted, not failed", "[sweep][mpi]") {
  colchem_test::ensure_mpi();
  SweepSpec spec;
  spec.axes.push_back({"x", {1.0, 2.0, 3.0, 4.0}, false, {}, {}});
  const auto variants = expand_variants(spec);
  std::size_t started = 0;
  const auto out = run_variants(
      MPI_COMM_SELF, variants,
      [&](const Variant& v) {
        ++started;
        VariantOutcome o;
        // The second variant is the one running when the signal arrives.
        o.interrupted = v.index == 1;
        o.converged = !o.interrupted;
        o.reason = o.interrupted ? "interrupted" : "converged";
        return o;
      },
      nullptr, [&] { return started >= 2; });
  REQUIRE(out.size() == 4);
  CHECK(started == 2);
  CHECK(out[0].converged);
  CHECK(out[1].interrupted);
  for (std::size_t i = 2; i < 4; ++i) {
    CHECK(out[i].index == i);
    CHECK(out[i].interrupted);
    CHECK_FALSE(out[i].converged);
    CHECK(out[i].reason == "interrupted before it started");
  }
}
