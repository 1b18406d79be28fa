// Sweep variants: the cross product, its order, its overrides, and sweep-file errors.
#include <catch2/catch.hpp>

#include <cmath>
#include <fstream>

#include "analysis/sweep.hpp"
#include "core/error.hpp"
#include "io/sweep_loader.hpp"

using namespace colchem;

namespace {
std::string write(const std::string& name, const std::string& text) {
  const std::string path = std::string(COLCHEM_TEST_OUTPUT_DIR) + "/" + name;
  std::ofstream(path) << text;
  return path;
}
}  // namespace

TEST_CASE("variants cross module sets, override sets and parameter grids in a fixed order",
          "[sweep]") {
  const auto file = write("sweep_a.yaml", R"(
sweep: {name: t, scenario: s.yaml, set: ["grid.cells=20"]}
module_combinations: {always: [base], optional: [m1, m2]}
parameters:
  beta: [0.01, 0.02]
  scale: {log_range: {from: 0.1, to: 10, count: 3}}
overrides:
  nominal: []
  lowK: ["atmosphere.eddy_diffusion.constant=1e5 cm2 s-1"]
)");
  const SweepSpec spec = load_sweep(file, {});
  // 4 module subsets x 2 override sets x (2 x 3) parameter points = 48 (counted by hand).
  const auto v = expand_variants(spec);
  REQUIRE(v.size() == 48);
  CHECK(v[0].module_label == "none");
  CHECK(v[47].module_label == "m1+m2");
  CHECK(v[0].modules == std::vector<std::string>{"base"});
  // Last axis fastest: variant 1 differs from variant 0 only in 'scale'.
  CHECK(v[0].parameters[1].second == Approx(0.1));
  CHECK(v[1].parameters[1].second == Approx(1.0));  // geometric midpoint of 0.1 and 10
  CHECK(v[3].parameters[0].second == Approx(0.02));
  CHECK(v[0].overrides.front() == "grid.cells=20");
  CHECK(v[0].overrides[1] == "chemistry.modules=[base]");
  CHECK(v[0].overrides[2] == "chemistry.parameters.beta=0.01");
  CHECK(v[6].override_label == "lowK");
  CHECK(v[6].overrides.back() == "atmosphere.eddy_diffusion.constant=1e5 cm2 s-1");
  CHECK(spec.scenario.filename() == "s.yaml");
}

TEST_CASE("exact_number reads back bit for bit", "[sweep]") {
  for (double x : {0.1, 1.0 / 3.0, 6.02214076e23, 1e-300}) {
    CHECK(std::stod(exact_number(x)) == x);
  }
}

TEST_CASE("sweep-file errors", "[sweep]") {
  auto error_of = [](const std::string& text) {
    try {
      (void)load_sweep(write("sweep_bad.yaml", text), {});
    } catch (const InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  CHECK_THAT(error_of("sweep: {name: t, scenario: s.yaml}\nparameter: {beta: [1]}\n"),
             Catch::Contains("unknown key 'parameter'; did you mean 'parameters'?"));
  CHECK_THAT(error_of("sweep: {name: t, scenario: s.yaml}\nparameters: {b: {log_range: {from: 0, to: 1, count: 3}}}\n"),
             Catch::Contains("'parameters.b.log_range.from': expected a positive 'from' for a "
                             "logarithmic range, found '0'"));
  CHECK_THAT(error_of("sweep: {name: t, scenario: s.yaml}\nmodules: {a: [x]}\nmodule_combinations: {optional: [y]}\n"),
             Catch::Contains("expected either 'modules' or 'module_combinations', found both"));
  CHECK_THAT(error_of("sweep: {name: t, scenario: s.yaml}\noverrides: {a: [nonsense]}\n"),
             Catch::Contains("expected 'key.path=value' assignments, found 'nonsense'"));
  CHECK_THAT(error_of("sweep: {name: t, scenario: s.yaml, rank_by: chi}\n"),
             Catch::Contains("expected one of: chi2_log, chi2_linear"));
}

TEST_CASE("parameters that do not act on a variant do not multiply the variants", "[sweep]") {
  const auto file = write("sweep_dup.yaml", R"(
sweep: {name: t, scenario: s.yaml}
modules: {off: [base], on: [base, m1]}
parameters:
  beta: [0.01, 0.02, 0.03]
  gamma: [1, 2]
)");
  auto v = expand_variants(load_sweep(file, {}));
  REQUIRE(v.size() == 12);  // 2 module sets x 3 x 2 (counted by hand)
  // 'beta' acts only where module m1 is on; 'gamma' everywhere.
  std::vector<std::string> dropped;
  const std::size_t merged = merge_duplicate_variants(
      v,
      [](const Variant& x, const std::string& p) { return p == "gamma" || x.module_label == "on"; },
      &dropped);
  // off: the 3 beta values collapse, 2 gamma values remain; on: all 6 remain.
  CHECK(merged == 4);
  REQUIRE(v.size() == 8);
  CHECK(dropped == std::vector<std::string>{"off: beta"});
  for (std::size_t i = 0; i < v.size(); ++i) CHECK(v[i].index == i);
  CHECK(v[0].label == "off gamma=1");
  CHECK(v[1].label == "off gamma=2");
  CHECK(v[0].overrides ==
        std::vector<std::string>{"chemistry.modules=[base]", "chemistry.parameters.gamma=1"});
  CHECK(v[2].label == "on beta=0.01 gamma=1");
  CHECK(v[7].overrides.back() == "chemistry.parameters.gamma=2");
}

TEST_CASE("variant ranges for job arrays", "[sweep]") {
  CHECK(parse_variant_range("0:4", 9) == std::pair<std::size_t, std::size_t>{0, 4});
  CHECK(parse_variant_range("4:", 9) == std::pair<std::size_t, std::size_t>{4, 9});
  CHECK(parse_variant_range(":3", 9) == std::pair<std::size_t, std::size_t>{0, 3});
  CHECK_THROWS_WITH(parse_variant_range("4:4", 9), Catch::Contains("the sweep has 9 variants"));
  CHECK_THROWS_WITH(parse_variant_range("3:10", 9), Catch::Contains("0 <= A < B <= 9"));
  CHECK_THROWS_WITH(parse_variant_range("3", 9), Catch::Contains("no ':'"));
  CHECK_THROWS_WITH(parse_variant_range("a:3", 9), Catch::Contains("not a whole number"));
}

TEST_CASE("text digests tell texts apart (FNV-1a 64 reference values)", "[sweep]") {
  // FNV-1a 64-bit of "" and "a": the published test vectors of the FNV reference
  // (Fowler, Noll, Vo; from memory: cbf29ce484222325 and af63dc4c8601ec8c).
  CHECK(text_digest("") == "cbf29ce484222325");
  CHECK(text_digest("a") == "af63dc4c8601ec8c");
}
