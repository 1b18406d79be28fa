// Chapman function and illumination quadrature.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "photo/slant_path.hpp"

using namespace colchem;

namespace {
double deg(double d) { return d * constants::kPi / 180.0; }
}  // namespace

TEST_CASE("Chapman function tends to sec(chi) at small zenith angles", "[photo][chapman]") {
  // Analytic: Ch(X, 0) = 1 exactly; Ch -> sec chi as X -> infinity, with a relative
  // correction of order tan^2(chi) / X (Smith and Smith 1972).
  CHECK(chapman_function(900.0, 0.0) == Approx(1.0).epsilon(1e-12));
  for (double chi : {10.0, 30.0, 50.0, 70.0}) {
    const double sec = 1.0 / std::cos(deg(chi));
    const double tol = 2.0 * std::pow(std::tan(deg(chi)), 2) / 900.0 + 1e-9;
    CHECK(chapman_function(900.0, deg(chi)) == Approx(sec).epsilon(tol));
    CHECK(chapman_function(1.0e7, deg(chi)) == Approx(sec).epsilon(1e-5));
  }
}

TEST_CASE("Chapman function at grazing incidence equals sqrt(pi X / 2)", "[photo][chapman]") {
  // Analytic: Ch(X, 90 deg) = X e^X K_1(X) = sqrt(pi X / 2) (1 + 3/(8X) - 15/(128 X^2) + ...)
  // (Abramowitz and Stegun 1964, 9.7.2; Chapman 1931).
  for (double X : {50.0, 300.0, 900.0, 5000.0}) {
    const double series = std::sqrt(constants::kPi * X / 2.0) *
                          (1.0 + 3.0 / (8.0 * X) - 15.0 / (128.0 * X * X));
    CHECK(chapman_function(X, deg(90.0)) == Approx(series).epsilon(2e-6));
    CHECK(chapman_function(X, deg(90.0)) == Approx(std::sqrt(constants::kPi * X / 2.0)).epsilon(1.0 / X));
  }
}

TEST_CASE("diurnal quadrature: mean cos(zenith) at the equator at equinox is 1/pi", "[photo]") {
  // Analytic: (1/pi) int_0^{pi/2} cos h dh = 1/pi.
  IlluminationSpec s;
  s.form = IlluminationForm::kDiurnal;
  s.latitude_rad = 0.0;
  s.declination_rad = 0.0;
  s.hour_angle_points = 8;
  double mean_mu = 0.0;
  double day = 0.0;
  for (const auto& n : illumination_nodes(s)) {
    mean_mu += n.weight * n.mu0;
    day += n.weight;
  }
  CHECK(mean_mu == Approx(1.0 / constants::kPi).epsilon(1e-12));
  CHECK(day == Approx(0.5).epsilon(1e-12));  // analytic: 12 h of daylight
  // Latitude 60 N at the June solstice (dec 23.44 deg): day fraction h_s / pi with
  // cos h_s = -tan(lat) tan(dec), and mean mu0 = (h_s sin lat sin dec + cos lat cos dec sin h_s) / pi.
  s.latitude_rad = deg(60.0);
  s.declination_rad = deg(23.44);
  mean_mu = 0.0;
  day = 0.0;
  for (const auto& n : illumination_nodes(s)) {
    mean_mu += n.weight * n.mu0;
    day += n.weight;
  }
  const double hs = std::acos(-std::tan(s.latitude_rad) * std::tan(s.declination_rad));
  CHECK(day == Approx(hs / constants::kPi).epsilon(1e-12));  // analytic
  const double mu_exact = (hs * std::sin(s.latitude_rad) * std::sin(s.declination_rad) +
                           std::cos(s.latitude_rad) * std::cos(s.declination_rad) * std::sin(hs)) /
                          constants::kPi;
  CHECK(mean_mu == Approx(mu_exact).epsilon(1e-10));  // analytic
  // Polar night: no sun at 80 S in June (analytic).
  s.latitude_rad = deg(-80.0);
  CHECK(illumination_nodes(s).empty());
}

TEST_CASE("fixed illumination carries the day fraction", "[photo]") {
  IlluminationSpec s;
  s.zenith_angle_rad = deg(60.0);
  s.day_fraction = 0.5;
  const auto nodes = illumination_nodes(s);
  REQUIRE(nodes.size() == 1);
  CHECK(nodes[0].mu0 == Approx(0.5));     // analytic: cos 60 deg
  CHECK(nodes[0].weight == Approx(0.5));  // as given
}
