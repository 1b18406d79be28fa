// Scoring against observations: hand-computed chi-square on small cases, upper limits, the
// observation file format and its errors, averaging kernels (Rodgers 2000, "Inverse Methods
// for Atmospheric Sounding", ch. 2-3) and altitude uncertainties.
#include <catch2/catch.hpp>

#include <cmath>
#include <fstream>

#include "analysis/score.hpp"
#include "core/error.hpp"
#include "io/observation_loader.hpp"

using namespace colchem;

namespace {
ObservationPoint pt(double z_km, double v, double s, bool lim = false) {
  ObservationPoint o;
  o.altitude_cm = z_km * 1e5;
  o.species = "SO2";
  o.value = v;
  o.uncertainty = s;
  o.upper_limit = lim;
  return o;
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
  CHECK_THAT(
      error_of(hdr + "64, SO2, -1e-7, 1e-8, 0\n"),
      Catch::EndsWith("obs_bad.csv:2: 'value': expected a positive mole fraction, found -1e-07"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 0, 0\n"),
             Catch::Contains(":2: 'uncertainty': expected a positive uncertainty for a detection"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 2\n"),
             Catch::Contains(":2: 'upper_limit': expected 0 (detection) or 1 (upper limit)"));
  CHECK_THAT(error_of("altitude [km], species, value [K], uncertainty [1], upper_limit\n1, A, 1, 1, 0\n"),
             Catch::Contains("'value': expected a unit convertible to '1'"));
}

namespace {
// A kernel row over the given altitudes (km) and weights.
AveragingKernel kernel_row(const std::vector<double>& z_km, const std::vector<double>& w) {
  AveragingKernel k;
  for (double z : z_km) k.altitude_cm.push_back(z * 1e5);
  k.weight = w;
  return k;
}
}  // namespace

TEST_CASE("averaging kernels: delta rows give the plain score, uniform rows the layer mean",
          "[score][observations]") {
  // Model: a profile that is not log-linear between cells, so interpolation matters.
  const std::vector<double> z{0.0, 2e5, 4e5, 6e5, 8e5};
  const std::vector<double> f{3e-6, 1e-6, 4e-7, 3e-7, 2e-8};
  std::vector<ObservationPoint> plain{pt(1.0, 2e-6, 5e-7), pt(5.3, 2e-7, 5e-8),
                                      pt(7.0, 1e-8, 0.0, true)};
  // A delta row at the observed altitude: x_hat_i = x(z_i) (Rodgers 2000, ch. 3, A = I), also
  // with an a-priori term, which then cancels.
  std::vector<ObservationPoint> delta = plain;
  for (auto& o : delta) o.kernel = kernel_row({o.altitude_cm / 1e5}, {1.0});
  delta[1].kernel->a_priori = {3e-7};
  delta[1].kernel->a_priori_at_point = 3e-7;
  const SpeciesScore a = score_species("SO2", z, f, plain, 0);
  const SpeciesScore b = score_species("SO2", z, f, delta, 0);
  REQUIRE(a.points.size() == 3);
  CHECK(a.n_points == b.n_points);
  CHECK(a.chi2_log == b.chi2_log);  // exact: the same arithmetic path
  CHECK(a.chi2_linear == b.chi2_linear);
  for (std::size_t i = 0; i < 3; ++i) CHECK(a.points[i].model == b.points[i].model);

  // Uniform weights 1/N on the model's cell centres: the layer mean of f, computed here
  // directly (analytic).
  ObservationPoint mean_pt = pt(4.0, 5e-7, 1e-7);
  mean_pt.kernel = kernel_row({0, 2, 4, 6, 8}, std::vector<double>(5, 0.2));
  double mean = 0.0;
  for (double v : f) mean += v;
  mean /= 5.0;
  const SpeciesScore c = score_species("SO2", z, f, {mean_pt}, 0);
  CHECK(c.points[0].model == Approx(mean).epsilon(1e-14));
  CHECK(c.chi2_linear == Approx(std::pow((mean - 5e-7) / 1e-7, 2)).epsilon(1e-12));

  // Rodgers (2000) ch. 3: a model equal to the a-priori is retrieved as the a-priori,
  // whatever the kernel.
  ObservationPoint prior_pt = pt(3.0, 5e-7, 1e-7);
  prior_pt.kernel = kernel_row({0, 2, 4, 6, 8}, {0.1, 0.3, 0.4, 0.05, 0.0});
  prior_pt.kernel->a_priori = f;
  prior_pt.kernel->a_priori_at_point = 7e-7;
  const SpeciesScore d = score_species("SO2", z, f, {prior_pt}, 0);
  CHECK(d.points[0].model == Approx(7e-7).epsilon(1e-14));

  // A kernel altitude outside the model: the point is not counted.
  ObservationPoint out_pt = pt(3.0, 5e-7, 1e-7);
  out_pt.kernel = kernel_row({0, 9}, {0.5, 0.5});
  CHECK_FALSE(score_species("SO2", z, f, {out_pt}, 0).points[0].inside);
}

TEST_CASE("altitude uncertainty widens sigma by the profile's slope", "[score][observations]") {
  // f = f0 exp(-z/H) is exact under log-linear interpolation; df/dz = -f/H (analytic), so
  // s_eff^2 = s^2 + (f sigma_z / H)^2.
  const double H = 7e5, f0 = 1e-6;
  std::vector<double> z, f;
  for (int j = 0; j <= 10; ++j) {
    z.push_back(j * 2e5);
    f.push_back(f0 * std::exp(-z.back() / H));
  }
  ObservationPoint o = pt(9.0, 3e-7, 4e-8);
  o.altitude_uncertainty_cm = 1.5e5;
  const ModelledObservation m = modelled_observation(z, f, o);
  const double fz = f0 * std::exp(-9e5 / H);
  CHECK(m.value == Approx(fz).epsilon(1e-12));
  CHECK(m.sigma == Approx(std::sqrt(4e-8 * 4e-8 + std::pow(fz * 1.5e5 / H, 2))).epsilon(1e-12));
  const SpeciesScore s = score_species("SO2", z, f, {o}, 0);
  CHECK(s.chi2_linear == Approx(std::pow((fz - 3e-7) / m.sigma, 2)).epsilon(1e-12));

  // dr/df from observation_residual against central differences (analytic derivative of the
  // same function; the reference is the finite difference).
  for (bool log_space : {true, false}) {
    std::vector<std::pair<std::size_t, double>> dr;
    (void)observation_residual(m, o, log_space, &dr);
    for (std::size_t j : {std::size_t{4}, std::size_t{5}}) {
      double analytic = 0.0;
      for (const auto& [k, d] : dr) analytic += k == j ? d : 0.0;
      auto r_at = [&](double factor) {
        std::vector<double> g = f;
        g[j] *= factor;
        return observation_residual(modelled_observation(z, g, o), o, log_space, nullptr);
      };
      const double h = 1e-6;
      const double numeric = (r_at(1 + h) - r_at(1 - h)) / (2 * h * f[j]);
      INFO("cell " << j << " log " << log_space);
      CHECK(analytic == Approx(numeric).epsilon(1e-6));
    }
  }
}

TEST_CASE("observation files: kernels, altitude uncertainty and unknown columns",
          "[score][observations]") {
  const UnitSystem units;
  const std::string dir = COLCHEM_TEST_OUTPUT_DIR;
  auto write = [&](const std::string& name, const std::string& text) {
    std::ofstream(dir + "/" + name) << text;
    return dir + "/" + name;
  };
  write("obs_kernels.csv",
        "# invented\naltitude [km], a_priori [ppm], k64, k70\n60, 0.1, 0.2, 0\n64, 0.2, 0.6, "
        "0.1\n70, 0.4, 0.2, 0.9\n");
  const auto file =
      write("obs_with_kernels.csv",
            "# invented\naltitude [km], species, value [ppm], uncertainty [ppm], upper_limit, "
            "altitude_uncertainty [km], kernel, instrument\n"
            "62, SO2, 0.2, 0.05, 0, 0, obs_kernels.csv:k64, A\n"
            "70, SO2, 0.3, 0.05, 0, 0, obs_kernels.csv:k70, A\n"
            "80, SO2, 0.1, 0.02, 0, 2.5, -, B\n");
  const ObservationSet set = read_observations(file, units);
  REQUIRE(set.points.size() == 3);
  REQUIRE(set.points[0].kernel);
  CHECK(set.points[0].kernel->weight == std::vector<double>{0.2, 0.6, 0.2});
  CHECK(set.points[0].kernel->a_priori[2] == Approx(4e-7));
  // Linear interpolation of the a-priori at 62 km: 0.1 + 0.5 (0.2 - 0.1) ppm (analytic).
  CHECK(set.points[0].kernel->a_priori_at_point == Approx(1.5e-7));
  CHECK(set.points[1].kernel->weight == std::vector<double>{0.0, 0.1, 0.9});
  CHECK_FALSE(set.points[2].kernel);
  CHECK(set.points[2].altitude_uncertainty_cm == Approx(2.5e5));
  CHECK(set.kernel_files.size() == 1);
  REQUIRE(set.warnings.size() == 1);
  CHECK_THAT(set.warnings[0], Catch::Contains("obs_with_kernels.csv: unknown column 'instrument'"));
  CHECK_THAT(set.warnings[0], Catch::Contains("known columns: altitude, species"));

  auto error_of = [&](const std::string& text) {
    try {
      (void)read_observations(write("obs_bad_kernel.csv", text), units);
    } catch (const InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  const std::string hdr =
      "altitude [km], species, value [1], uncertainty [1], upper_limit, altitude_uncertainty "
      "[km], kernel\n";
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 0, 0, obs_kernels.csv:k99\n"),
             Catch::Contains(":2: 'kernel': expected a weight column of"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 0, 0, missing.csv\n"),
             Catch::Contains("which does not exist"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 0, 1, obs_kernels.csv:k64\n"),
             Catch::Contains(":2: 'altitude_uncertainty': expected 0 for a point with a kernel"));
  CHECK_THAT(error_of(hdr + "64, SO2, 1e-7, 1e-8, 0, -1, -\n"),
             Catch::Contains("expected a non-negative altitude uncertainty, found -1 km"));
  CHECK_THAT(error_of(hdr + "75, SO2, 1e-7, 1e-8, 0, 0, obs_kernels.csv:k64\n"),
             Catch::Contains("found 75 km"));
}
