// Rate-uncertainty ensembles (analysis/ensemble): the normal quantile against tabulated
// values, the Latin-hypercube property, quantiles of known samples, the JPL form of f(T),
// and the mechanism's uncertainty entries and defaults.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>

#include "analysis/ensemble.hpp"
#include "io/mechanism_loader.hpp"

using namespace colchem;
using Catch::Matchers::Contains;

TEST_CASE("standard normal quantile matches tabulated values", "[ensemble]") {
  // Abramowitz and Stegun (1964), table 26.5; Phi(1) = 0.841344746068543 (table 26.1).
  CHECK(standard_normal_quantile(0.975) == Approx(1.959963984540054).epsilon(1e-13));
  CHECK(standard_normal_quantile(0.995) == Approx(2.575829303548901).epsilon(1e-13));
  CHECK(standard_normal_quantile(0.841344746068543) == Approx(1.0).epsilon(1e-12));
  CHECK(std::abs(standard_normal_quantile(0.5)) < 1e-15);
  CHECK(standard_normal_quantile(0.025) == Approx(-1.959963984540054).epsilon(1e-13));
  CHECK_THROWS(standard_normal_quantile(0.0));
  CHECK_THROWS(standard_normal_quantile(1.0));
}

TEST_CASE("Latin hypercube: one draw per stratum, seeded and reproducible", "[ensemble]") {
  const std::size_t M = 97, R = 5;
  const auto z = draw_standard_normals(M, R, 42, EnsembleSampling::kLatinHypercube);
  REQUIRE(z.size() == M * R);
  // McKay et al. (1979): every reaction's M draws fall one into each stratum (analytic).
  for (std::size_t r = 0; r < R; ++r) {
    std::vector<int> hit(M, 0);
    for (std::size_t m = 0; m < M; ++m) {
      const double u = 0.5 * std::erfc(-z[m * R + r] / std::sqrt(2.0));
      hit[static_cast<std::size_t>(u * M)] += 1;
    }
    CHECK(std::all_of(hit.begin(), hit.end(), [](int h) { return h == 1; }));
  }
  CHECK(draw_standard_normals(M, R, 42, EnsembleSampling::kLatinHypercube) == z);
  CHECK(draw_standard_normals(M, R, 43, EnsembleSampling::kLatinHypercube) != z);
  // Random sampling: mean and variance of 20000 draws within 4 standard errors (analytic).
  const auto w = draw_standard_normals(20000, 1, 5, EnsembleSampling::kRandom);
  double mean = 0.0, var = 0.0;
  for (double v : w) mean += v / 20000.0;
  for (double v : w) var += (v - mean) * (v - mean) / 19999.0;
  CHECK(std::abs(mean) < 4.0 / std::sqrt(20000.0));
  CHECK(std::abs(var - 1.0) < 4.0 * std::sqrt(2.0 / 19999.0));
}

TEST_CASE("sample quantiles by definition 7 of Hyndman and Fan", "[ensemble]") {
  // Worked by hand (analytic): sorted 1..5, q = 0.25 -> h = 1 -> 2; q = 0.1 -> h = 0.4 -> 1.4.
  CHECK(sample_quantile({5, 1, 4, 2, 3}, 0.25) == Approx(2.0));
  CHECK(sample_quantile({5, 1, 4, 2, 3}, 0.1) == Approx(1.4));
  CHECK(sample_quantile({5, 1, 4, 2, 3}, 1.0) == Approx(5.0));
  CHECK(std::isnan(sample_quantile({}, 0.5)));
  const auto p = ensemble_percentiles({{1, 10}, {}, {3, 30}, {2, 20}});
  REQUIRE(p.size() == 5);
  CHECK(p[2][0] == Approx(2.0));   // median of 1, 2, 3 (the failed member left out)
  CHECK(p[0][1] == Approx(10.5));  // 2.5 %: h = 0.05 -> 10 + 0.05 * 10
}

TEST_CASE("rate factors follow the JPL form f(T) = f298 exp|g (1/T - 1/298)|", "[ensemble]") {
  RateUncertainty u;
  u.f298 = 1.2;
  u.g_K = 100.0;
  // JPL Publication 19-5 form (analytic): at 200 K, f = 1.2 exp(100 |1/200 - 1/298|).
  const double f200 = 1.2 * std::exp(100.0 * (1.0 / 200.0 - 1.0 / 298.0));
  CHECK(u.factor(200.0) == Approx(f200).epsilon(1e-14));
  CHECK(u.factor(298.0) == Approx(1.2).epsilon(1e-14));
  CHECK(ensemble_rate_factor(1.0, u, 200.0, 1.0) == Approx(f200).epsilon(1e-14));
  CHECK(ensemble_rate_factor(-2.0, u, 298.0, 2.0) == Approx(1.0 / 1.2).epsilon(1e-14));
}

TEST_CASE("mechanism uncertainty: stated values, defaults by kind, refusals", "[ensemble]") {
  const UnitSystem units;
  const auto load = [&](const std::string& extra) {
    return load_mechanism_text(R"(
mechanism: {name: u}
species: [{name: O}, {name: O2}, {name: O3}, {name: N2, fixed: true}]
modules:
  - name: base
    reactions:
      - {id: o_o2_m, equation: O + O2 + M -> O3 + M, rate: {arrhenius: {A: 6e-34, b: -2.4}}, source: JPL}
      - {id: o_o3, equation: O + O3 -> 2 O2, rate: {arrhenius: {A: 8e-12, E: 2060}}, source: JPL)" +
                                   extra + R"(}
      - {id: o3_photo, equation: O3 + hv -> O2 + O, rate: {photolysis: {channel: O3}}, source: JPL}
      - {id: o2, equation: O2 -> 2 O, rate: {first_order: {k: 1e-9}}, source: invented}
)",
                               "u.yaml", units);
  };
  const auto m = load(", uncertainty: {f298: 1.15, g: 200, source: JPL 19-5 (from memory)}");
  REQUIRE(m->reactions.size() == 4);
  CHECK(m->reactions[1].uncertainty.stated);
  CHECK(m->reactions[1].uncertainty.f298 == 1.15);
  CHECK(m->reactions[1].uncertainty.g_K == 200.0);
  // Defaults (README, "Rate-uncertainty ensembles"; common practice, no source).
  CHECK_FALSE(m->reactions[0].uncertainty.stated);
  CHECK(m->reactions[0].uncertainty.f298 == 1.5);  // termolecular
  CHECK(m->reactions[2].uncertainty.f298 == 1.3);  // photolysis
  CHECK(m->reactions[2].uncertainty.g_K == 0.0);
  CHECK(m->reactions[3].uncertainty.f298 == 3.0);  // invented
  CHECK_THROWS_WITH(load(", uncertainty: {f298: 0.5}"), Contains("f298 >= 1"));
  CHECK_THROWS_WITH(load(", uncertainty: {f298: 1.2, g: -1}"), Contains("g >= 0"));
  CHECK_THROWS_WITH(load(", uncertainty: {f298: 1.2, sigma: 1}"), Contains("sigma"));
}
