// The `solver:` configuration section.
#include <catch2/catch.hpp>

#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/solver_section.hpp"
#include "solve/solver_options.hpp"

using namespace colchem;

namespace {
SolverSpec load(const std::string& yaml, const UnitSystem& u) {
  const ConfigDocument doc = ConfigDocument::from_text(yaml, "solver.yaml");
  return load_solver_section(doc.root().child("solver"), u);
}
}  // namespace

TEST_CASE("solver section: keys with units", "[solve][config]") {
  const UnitSystem u;
  const SolverSpec s = load(R"(solver:
  method: split_steady
  tolerance: 1e-9
  max_iterations: 50
  initial_pseudo_step: 1 ms
  absolute_density: 1e3 m-3
  checkpoint_every: 25
  transient:
    end: 30 day
    step: 1 h
    adaptive: false
    output_count: 3
)", u);
  CHECK(s.method == SolverMethod::kSplitSteady);
  CHECK(s.tolerance == 1e-9);
  CHECK(s.max_iterations == 50);
  CHECK(s.initial_pseudo_step_s == Approx(1e-3));  // unit conversion (analytic)
  CHECK(s.absolute_density_cm3 == Approx(1e-3));   // 1e3 m^-3 = 1e-3 cm^-3 (analytic)
  CHECK(s.checkpoint_every == 25);
  CHECK(s.transient.end_s == Approx(30 * 86400.0));  // analytic
  CHECK(s.transient.step_s == Approx(3600.0));
  CHECK_FALSE(s.transient.adaptive);
  REQUIRE(s.transient.output_times_s.size() == 3);
  CHECK(s.transient.output_times_s[0] == Approx(10 * 86400.0));
  const SplitOptions so = split_options(s);
  CHECK(so.to_steady_state);
  CHECK(so.steady_tolerance == 1e-9);
  const SteadyStateOptions ss = steady_options(s);
  CHECK(ss.max_iterations == 50);
  CHECK(ss.scale.absolute_density_cm3 == Approx(1e-3));
}

TEST_CASE("solver section: explicit output list and defaults", "[solve][config]") {
  const UnitSystem u;
  const SolverSpec s = load("solver:\n  method: transient\n  transient:\n    end: 10 day\n    outputs: \"[1, 5] day\"\n", u);
  CHECK(s.method == SolverMethod::kTransient);
  REQUIRE(s.transient.output_times_s.size() == 2);
  CHECK(s.transient.output_times_s[1] == Approx(5 * 86400.0));
  CHECK(s.tolerance == 1e-8);  // the documented default
}

TEST_CASE("solver section: bad input names the key", "[solve][config]") {
  const UnitSystem u;
  auto fails_with = [&](const std::string& yaml, const std::string& what) {
    try {
      (void)load(yaml, u);
      FAIL("no error for: " << yaml);
    } catch (const InputError& e) {
      CHECK_THAT(std::string(e.what()), Catch::Contains(what));
    }
  };
  fails_with("solver:\n  tolerence: 1e-8\n", "tolerance");          // did you mean
  fails_with("solver:\n  initial_pseudo_step: 1e-6\n", "unit");      // bare number
  fails_with("solver:\n  method: stedy\n", "steady");
  fails_with("solver:\n  method: transient\n", "transient");        // section missing
  fails_with("solver:\n  transient:\n    end: 1 day\n    outputs: [2 day]\n", "(0, end]");
  fails_with("solver:\n  positivity_fraction: 1.5\n", "[0, 1)");
}
