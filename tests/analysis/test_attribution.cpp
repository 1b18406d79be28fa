// First-order variance attribution (analysis/attribution): the delta-method sum worked by
// hand on two reactions over two cells, and the sample variance and agreement rule.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "analysis/attribution.hpp"
#include "analysis/ensemble.hpp"

using namespace colchem;

TEST_CASE("first-order attribution sums S_rj sigma_r(T_j) per reaction", "[attribution]") {
  // G = 2; dG/d ln k: reaction 0 (0.4, 0.6), reaction 1 (-1, 0); sigma: reaction 0 (0.5,
  // 0.25), reaction 1 (0.3, 0.3). By hand: S_0 = 0.5, a_0 = 0.2*0.5 + 0.3*0.25 = 0.175;
  // S_1 = -0.5, a_1 = -0.15; Var_1 = 0.030625 + 0.0225 = 0.053125.
  const std::vector<double> dG{0.4, 0.6, -1.0, 0.0};
  const std::vector<double> sigma{0.5, 0.25, 0.3, 0.3};
  const AttributionTerms t = first_order_attribution(dG, 2.0, sigma, 2, 2);
  CHECK(t.log_sensitivity[0] == Approx(0.5).epsilon(1e-15));
  CHECK(t.log_sensitivity[1] == Approx(-0.5).epsilon(1e-15));
  CHECK(t.scaled[0] == Approx(0.175).epsilon(1e-15));
  CHECK(t.scaled[1] == Approx(-0.15).epsilon(1e-15));
  CHECK(t.variance == Approx(0.053125).epsilon(1e-15));
  CHECK(t.share[0] == Approx(0.030625 / 0.053125).epsilon(1e-15));
  CHECK(t.share[0] + t.share[1] == Approx(1.0).epsilon(1e-15));
  CHECK(t.largest_scaled == Approx(0.175).epsilon(1e-15));
  CHECK_THROWS(first_order_attribution(dG, 0.0, sigma, 2, 2));
  CHECK_THROWS(first_order_attribution(dG, 2.0, sigma, 2, 3));
}

TEST_CASE("sigma is ln f(T) / sigmas, the JPL form at the cell's temperature", "[attribution]") {
  // f(200 K) = 1.5 exp(100 |1/200 - 1/298|) (JPL Publication 19-5's form, by hand).
  RateUncertainty u;
  u.f298 = 1.5;
  u.g_K = 100.0;
  const double f200 = 1.5 * std::exp(100.0 * (1.0 / 200.0 - 1.0 / 298.0));
  CHECK(ensemble_log_sigma(u, 200.0, 1.0) == Approx(std::log(f200)).epsilon(1e-14));
  CHECK(ensemble_log_sigma(u, 200.0, 2.0) == Approx(std::log(f200) / 2.0).epsilon(1e-14));
  CHECK(std::log(ensemble_rate_factor(1.0, u, 200.0, 2.0)) ==
        Approx(ensemble_log_sigma(u, 200.0, 2.0)).epsilon(1e-14));
}

TEST_CASE("sample variance and the 20 % agreement rule", "[attribution]") {
  // 1, 2, 3, 4: mean 2.5, squares 2.25 + 0.25 + 0.25 + 2.25 = 5, / 3.
  const std::vector<double> v{1.0, 2.0, 3.0, 4.0};
  CHECK(sample_variance(v) == Approx(5.0 / 3.0).epsilon(1e-15));
  CHECK(std::isnan(sample_variance(std::vector<double>{1.0})));
  CHECK(attribution_agrees(1.19, 1.0));
  CHECK(attribution_agrees(0.81, 1.0));
  CHECK_FALSE(attribution_agrees(1.21, 1.0));
  CHECK_FALSE(attribution_agrees(0.79, 1.0));
  CHECK_FALSE(attribution_agrees(1.0, 0.0));
  CHECK_FALSE(attribution_agrees(1.0, std::nan("")));
}
