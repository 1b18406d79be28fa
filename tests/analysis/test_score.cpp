// Scoring against observations: hand-computed chi-square on small cases, upper limits, the
// observation file format and its errors.
#include <catch2/catch.hpp>

#include <cmath>
#include <fstream>

#include "analysis/score.hpp"
#include "core/error.hpp"

using namespace colchem;

namespace {
ObservationPoint pt(double z_km, double v, double s, bool lim = false) {
  return {z_km * 1e5, "SO2", v, s, lim, 0};
}
}  // namespace

TEST_CASE("interpolation is linear in altitude and in log mixing ratio", "[score]") {
  const std::vector<double> z{0.0, 10e5};
  const std::vector<double> f{1e-6, 1e-8};
  // Analytic: halfway in altitude is the geometric mean, 1e-7.
  CHECK(interpolate_log_profile(z, f, 5e5) == Approx(1e-7).epsilon(1e-12));
  CHECK(std::isnan(interpolate_log_profile(z, f, 11e5)));
}

TEST_CASE("chi-square by hand: detections in log and linear space", "[score]") {
  // Model: f = 1e-7 everywhere. Observations (hand computation):
  //  z=1 km: f_o = 2e-7, s = 5e-8  -> r_lin = (1e-7 - 2e-7)/5e-8 = -2
  //          s_log = 5e-8/(2e-7 ln10) = 0.10857; r_log = log10(0.5)/0.10857 = -2.7726
  //  z=2 km: f_o = 1e-7, s = 1e-8  -> r = 0 in both spaces
  //  chi2_lin = 4, chi2_log = 7.6873; N = 2, p = 0: reduced = chi2/2.
  const std::vector<double> z{0.0, 5e5};
  const std::vector<double> f{1e-7, 1e-7};
  const auto s = score_species("SO2", z, f, {pt(1, 2e-7, 5e-8), pt(2, 1e-7, 1e-8)}, 0);
  CHECK(s.n_points == 2);
  CHECK(s.chi2_linear == Approx(4.0).epsilon(1e-12));
  CHECK(s.points[0].residual_log == Approx(-2.77259).epsilon(1e-5));
  CHECK(s.chi2_log == Approx(7.68725).epsilon(1e-5));
  CHECK(s.reduced_chi2_log == Approx(7.68725 / 2).epsilon(1e-5));
  CHECK(s.reduced_chi2_linear == Approx(2.0).epsilon(1e-12));
}

TEST_CASE("upper limits count only when exceeded", "[score]") {
  const std::vector<double> z{0.0, 5e5};
  const std::vector<double> f{1e-7, 1e-7};
  // Limit 2e-7 not exceeded by 1e-7: contributes 0 but counts in N.
  const auto a = score_species("SO2", z, f, {pt(1, 2e-7, 0.0, true)}, 0);
  CHECK(a.n_points == 1);
  CHECK_FALSE(a.points[0].counted);
  CHECK(a.chi2_log == 0.0);
  // Limit 5e-8 exceeded: zero uncertainty -> s = limit, s_log = 1/ln10 = 0.434294;
  // r_log = log10(2)/0.434294 = ln 2 = 0.693147; r_lin = (1e-7 - 5e-8)/5e-8 = 1 (by hand).
  const auto b = score_species("SO2", z, f, {pt(1, 5e-8, 0.0, true)}, 0);
  CHECK(b.points[0].counted);
  CHECK(b.points[0].residual_log == Approx(std::log(2.0)).epsilon(1e-12));
  CHECK(b.chi2_linear == Approx(1.0).epsilon(1e-12));
  // With an explicit uncertainty 2.5e-8: r_lin = 5e-8/2.5e-8 = 2.
  const auto c = score_species("SO2", z, f, {pt(1, 5e-8, 2.5e-8, true)}, 0);
  CHECK(c.chi2_linear == Approx(4.0).epsilon(1e-12));
}

TEST_CASE("points outside the model and degrees of freedom", "[score]") {
  const std::vector<double> z{0.0, 5e5};
  const std::vector<double> f{1e-7, 1e-7};
  const auto s = score_species("SO2", z, f, {pt(1, 2e-7, 5e-8), pt(9, 1e-7, 1e-8)}, 1);
  CHECK(s.points.size() == 2);
  CHECK_FALSE(s.points[1].inside);
  CHECK(s.n_points == 1);
  CHECK(std::isnan(s.reduced_chi2_log));  // N - p = 0
}

TEST_CASE("observation files: format and errors", "[score][observations]") {
  const UnitSystem units;
  const std::string dir = COLCHEM_TEST_OUTPUT_DIR;
  auto write = [&](const std::string& name, const std::string& text) {
    std::ofstream(dir + "/" + name) << text;
    return dir + "/" + name;
  };
  const auto good = write("obs_good.csv",
                          "# invented\naltitude [km], species, value [ppm], uncertainty [ppm], "
                          "upper_limit\n64, SO2, 0.2, 0.05, 0\n90, SO2, 0.1, 0, 1\n70, SO, 10, 2, 0\n");
  const auto set = read_observations(good, units);
  REQUIRE(set.points.size() == 3);
  CHECK(set.points[0].altitude_cm == Approx(64e5));
  CHECK(set.points[0].value == Approx(2e-7));  // 0.2 ppm (UDUNITS-2 ppm = 1e-6)
  CHECK(set.points[1].upper_limit);
  CHECK(set.species() == std::vector<std::string>{"SO2", "SO"});
  auto error_of = [&](const std::string& text) {
    try {
      (void)read_observations(write("obs_bad.csv", text), units);
    } catch (const InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  const std::string hdr = "altitude [km], species, value [1], uncertainty [1], upper_limit\n";
  CHECK_THAT(error_of(hdr + "64, SO2, -1e-7, 1e-8, 0\n"),
             Catch::EndsWith("obs_bad.csv:2: 'value': expected a positive mole fraction, found -0.000000"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 0, 0\n"),
             Catch::Contains(":2: 'uncertainty': expected a positive uncertainty for a detection"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 2\n"),
             Catch::Contains(":2: 'upper_limit': expected 0 (detection) or 1 (upper limit)"));
  CHECK_THAT(error_of("altitude [km], species, value [K], uncertainty [1], upper_limit\n1, A, 1, 1, 0\n"),
             Catch::Contains("'value': expected a unit convertible to '1'"));
}
