// The shared readers every loader is built from: key tables (io/key_table.hpp) and amounts
// and bulk compositions (io/amount.hpp). Messages are our own format: file, line, key,
// expected, found.
#include <catch2/catch.hpp>

#include "../test_support.hpp"

#include <limits>
#include <optional>

#include "io/amount.hpp"
#include "io/config_node.hpp"
#include "io/key_table.hpp"

using namespace colchem;

using colchem_test::error_of;

namespace {

struct Settings {
  double step_s = 3600.0;
  double fraction = 0.1;
  int iterations = 200;
  bool adaptive = true;
  std::optional<double> alpha;
};

/// Reads `text` (a map under `s:`) through one key table into a Settings.
Settings read(const std::string& text, const UnitSystem& u) {
  const auto doc = ConfigDocument::from_text(text, "k.yaml");
  const auto n = doc.root().child("s");
  Settings s;
  const double inf = std::numeric_limits<double>::infinity();
  const Key keys[] = {
      positive("step", &s.step_s, "s", "1 h"),
      number("fraction", &s.fraction, 0.0, 1.0, "a fraction in [0, 1)").below_hi(),
      count("iterations", &s.iterations, 1, 1000),
      flag("adaptive", &s.adaptive),
      number("alpha", &s.alpha, -inf, inf, "a finite number"),
  };
  read_keys(n, u, keys);
  n.done();
  return s;
}

}  // namespace

TEST_CASE("key table: absent keys keep the struct's defaults, given ones are converted",
          "[config]") {
  const UnitSystem u;
  const Settings d = read("s: {}\n", u);
  CHECK(d.step_s == 3600.0);
  CHECK(d.iterations == 200);
  CHECK_FALSE(d.alpha.has_value());
  const Settings s = read("s: {step: 2 min, fraction: 0.5, iterations: 7, adaptive: false, "
                          "alpha: -0.38}\n",
                          u);
  CHECK(s.step_s == Approx(120.0));
  CHECK(s.fraction == 0.5);
  CHECK(s.iterations == 7);
  CHECK_FALSE(s.adaptive);
  REQUIRE(s.alpha.has_value());
  CHECK(*s.alpha == -0.38);
}

TEST_CASE("key table: each row's bounds give the error with file, line, key and found",
          "[config]") {
  const UnitSystem u;
  CHECK(error_of([&] { (void)read("s:\n  step: -1 h\n", u); }) ==
        "k.yaml:2:9: 's.step': expected a positive value such as '1 h', found '-1 h'");
  CHECK(error_of([&] { (void)read("s:\n  fraction: 1\n", u); }) ==
        "k.yaml:2:13: 's.fraction': expected a fraction in [0, 1), found '1'");
  CHECK(error_of([&] { (void)read("s:\n  iterations: 0\n", u); }) ==
        "k.yaml:2:15: 's.iterations': expected an integer from 1 to 1000, found '0'");
  CHECK_THAT(error_of([&] { (void)read("s:\n  step: 5\n", u); }),
             Catch::Contains("'s.step'") && Catch::Contains("no unit"));
}

TEST_CASE("key table: a separate message above the upper bound, and required keys",
          "[config]") {
  const UnitSystem u;
  auto pressure = [&](const std::string& text) {
    const auto doc = ConfigDocument::from_text(text, "p.yaml");
    double p = 0.0;
    const Key keys[] = {quantity("pressure", &p, "bar", "1 bar", 0.0, 10.0, "a positive pressure")
                            .above_lo()
                            .above_message("a pressure of at most 10 bar")
                            .needed()};
    read_keys(doc.root(), u, keys);
    return p;
  };
  CHECK(pressure("pressure: 2 bar\n") == Approx(2.0));
  CHECK_THAT(error_of([&] { (void)pressure("pressure: 0 bar\n"); }),
             Catch::Contains("expected a positive pressure, found '0 bar'"));
  CHECK_THAT(error_of([&] { (void)pressure("pressure: 11 bar\n"); }),
             Catch::Contains("expected a pressure of at most 10 bar, found '11 bar'"));
  CHECK_THAT(error_of([&] { (void)pressure("other: 1\n"); }),
             Catch::Contains("expected a key 'pressure' here"));
}

TEST_CASE("amounts: the first kind whose unit fits, a bare number as the first kind",
          "[config]") {
  const UnitSystem u;
  auto amount = [&](const std::string& value) {
    const auto doc = ConfigDocument::from_text("a: " + value + "\n", "a.yaml");
    return read_amount(doc.root().child("a"), u, {AmountKind::kFraction, AmountKind::kDensity},
                       "a mixing ratio or a density");
  };
  CHECK(amount("2 ppm").kind == AmountKind::kFraction);
  CHECK(amount("2 ppm").value == Approx(2e-6));
  CHECK(amount("1e-3").kind == AmountKind::kFraction);
  CHECK(amount("3 m-3").kind == AmountKind::kDensity);
  CHECK(amount("3 m-3").value == Approx(3e-6));
  CHECK_THAT(error_of([&] { (void)amount("2 K"); }),
             Catch::Contains("found '2 K' (none of: dimensionless, a density)"));
  CHECK_THAT(error_of([&] { (void)amount("2 blorp"); }), Catch::Contains("(unknown unit)"));
}

TEST_CASE("bulk composition: fractions in (0, 1] that sum to 1", "[config]") {
  auto bulk = [](const std::string& text) {
    const auto doc = ConfigDocument::from_text(text, "b.yaml");
    return read_bulk_composition(doc.root().child("bulk"));
  };
  const auto x = bulk("bulk: {N2: 0.78, O2: 0.22}\n");
  CHECK(x.at("N2") == 0.78);
  CHECK_THAT(error_of([&] { (void)bulk("bulk: {N2: 0.5}\n"); }),
             Catch::Contains("summing to 1 (within 0.001), found a sum of 0.5"));
  CHECK_THAT(error_of([&] { (void)bulk("bulk: {N2: 1.5}\n"); }),
             Catch::Contains("'bulk.N2': expected a mole fraction in (0, 1]"));
  CHECK_THAT(error_of([&] { (void)bulk("bulk: {}\n"); }),
             Catch::Contains("at least one bulk gas"));
}
