// Chapman (1931) production layer: single absorber, exponential atmosphere, monochromatic
// beam. q(z) = sigma n(z) F exp(-sigma n(z) H / mu0) peaks where the slant optical depth is 1,
// with q_max = F mu0 / (e H). Also the validation case validation/photo/chapman_layer
// (run: build/tests/colchem_tests "[chapman]").
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "core/constants.hpp"
#include "photo/photolysis_model.hpp"
#include "photo/slant_path.hpp"
#include "photo_test_support.hpp"

using namespace colchem;

namespace {

struct LayerResult {
  double peak_z = 0.0, peak_q = 0.0;   // parabola through the three largest cell values
  double expected_z = 0.0, expected_q = 0.0;
  double max_error = 0.0;              // max_j |q_j - q(z_j)| / q_max
};

constexpr double kSigma = 1.0e-19;  // cm2 (invented)
constexpr double kFlux = 1.0e13;    // photons cm-2 s-1 nm-1 (invented), one 1 nm bin
constexpr double kMu = 0.5;         // 60 deg

LayerResult chapman_layer(std::size_t cells, SlantPath path = SlantPath::kPlaneParallel) {
  const Background bg = test::flat_isothermal(cells, 140.0);
  const double H = bg.scale_height_cm[0];
  // Peak (sigma n H / mu0 = 1) five scale heights above the bottom.
  const double n0 = kMu / (kSigma * H) * std::exp(5.0);

  PhotolysisSpec spec;
  spec.bin_edges_nm = {299.5, 300.5};
  spec.spectrum.table = test::flat_table(250.0, 350.0, kFlux);
  AbsorberSpec ab;
  ab.species = "X";
  ab.cross_section.tables.push_back(test::flat_table(250.0, 350.0, kSigma));
  spec.absorbers.push_back(ab);
  spec.channels.push_back(test::make_channel("X_photolysis", "X"));
  spec.illumination.zenith_angle_rad = std::acos(kMu);
  spec.slant_path = path;

  PhotolysisModel model(spec, bg, {"X"});
  std::vector<double> n(cells), J(cells), q(cells);
  for (std::size_t j = 0; j < cells; ++j) n[j] = n0 * std::exp(-bg.grid.center_cm[j] / H);
  model.compute(n, J);

  LayerResult r;
  r.expected_q = kFlux * kMu / (std::exp(1.0) * H);
  r.expected_z = H * std::log(kSigma * n0 * H / kMu);
  std::size_t jmax = 0;
  for (std::size_t j = 0; j < cells; ++j) {
    q[j] = n[j] * J[j];
    if (q[j] > q[jmax]) jmax = j;
    const double z = bg.grid.center_cm[j];
    const double nz = n0 * std::exp(-z / H);
    const double exact = kSigma * nz * kFlux * std::exp(-kSigma * nz * H / kMu);
    r.max_error = std::max(r.max_error, std::abs(q[j] - exact) / r.expected_q);
  }
  // Parabola through (z_{j-1}, q_{j-1}), (z_j, q_j), (z_{j+1}, q_{j+1}) on a uniform grid.
  const double dz = bg.grid.width_cm(jmax);
  const double a = q[jmax - 1], b = q[jmax], c = q[jmax + 1];
  const double s = 0.5 * (a - c) / (a - 2.0 * b + c);
  r.peak_z = bg.grid.center_cm[jmax] + s * dz;
  r.peak_q = b - 0.25 * (a - c) * s;
  return r;
}

}  // namespace

TEST_CASE("Chapman layer: peak height and peak rate", "[photo][chapman][validation]") {
  // 140 km over 140 cells: dz = 1 km, about H/7.
  const auto r = chapman_layer(140);
  const double H = test::flat_isothermal(140, 140.0).scale_height_cm[0];
  INFO("peak at " << r.peak_z / 1e5 << " km (expected " << r.expected_z / 1e5 << " km, H = "
       << H / 1e5 << " km); q_max " << r.peak_q << " (expected " << r.expected_q << ")");
  // Chapman (1931): the peak lies where sigma n H / mu0 = 1 ...
  CHECK(std::abs(r.peak_z - r.expected_z) < 0.01 * H);
  // ... and q_max = F mu0 / (e H).
  CHECK(r.peak_q == Approx(r.expected_q).epsilon(0.01));
}

TEST_CASE("Chapman layer: the error falls at second order in dz", "[photo][chapman][validation]") {
  // Analytic: the cell-centred column (midpoint rule on every cell, half the own cell) is
  // second-order accurate, so halving dz divides the error by about 4.
  const double e1 = chapman_layer(35).max_error;
  const double e2 = chapman_layer(70).max_error;
  const double e3 = chapman_layer(140).max_error;
  const double p1 = std::log2(e1 / e2);
  const double p2 = std::log2(e2 / e3);
  INFO("errors " << e1 << " " << e2 << " " << e3 << ", observed orders " << p1 << " " << p2);
  CHECK(p1 > 1.8);
  CHECK(p1 < 2.2);
  CHECK(p2 > 1.8);
  CHECK(p2 < 2.2);
  CHECK(e3 < 0.01);  // 1 % of the peak at dz = 1 km (H/7)
}

TEST_CASE("Chapman layer: spherical shells reduce to the plane-parallel layer on a flat planet",
          "[photo][chapman][validation]") {
  // Analytic: with R = 1e15 cm the rays through the shells are straight slant lines.
  const auto pp = chapman_layer(70, SlantPath::kPlaneParallel);
  const auto sp = chapman_layer(70, SlantPath::kSpherical);
  CHECK(sp.peak_q == Approx(pp.peak_q).epsilon(1e-6));
  CHECK(sp.peak_z == Approx(pp.peak_z).epsilon(1e-6));
}

TEST_CASE("spherical rays through the shells give n H Ch(X, chi) in an exponential atmosphere",
          "[photo][chapman][validation]") {
  // Analytic (Chapman 1931): the slant column from z towards zenith angle chi through
  // n = n0 exp(-z/H) around a sphere is n(z) H Ch((R + z)/H, chi). Earth-sized planet,
  // dz = 0.5 km, H = 7 km; the absorber is weak so J gives the column: N = -ln(J/(sigma F))/sigma.
  BackgroundSpec s;
  s.planet = PlanetSpec{"spherical test planet (invented)", 6371.0e5, 980.0, 1.0};
  s.grid = Grid::uniform(0.0, 200.0e5, 400);
  s.temperature_K = ProfileSpec{{0.0, 200.0e5}, {250.0, 250.0}, "isothermal"};
  s.base_pressure_dyn_cm2 = 1.0e6;
  s.bulk_mole_fraction = {{"N2", 1.0}};
  s.mean_molecular_mass_amu = 28.0;
  s.eddy_cm2_s = 1e5;
  const Background bg = build_background(s);
  const double H = 7.0e5;
  const double n0 = 1.0e19;
  PhotolysisSpec spec;
  spec.bin_edges_nm = {299.5, 300.5};
  spec.spectrum.table = test::flat_table(250.0, 350.0, kFlux);
  AbsorberSpec ab;
  ab.species = "X";
  ab.cross_section.tables.push_back(test::flat_table(250.0, 350.0, 1e-26));
  spec.absorbers.push_back(ab);
  spec.channels.push_back(test::make_channel("X_photolysis", "X"));
  spec.slant_path = SlantPath::kSpherical;
  std::vector<double> n(400), J(400);
  for (std::size_t j = 0; j < 400; ++j) n[j] = n0 * std::exp(-bg.grid.center_cm[j] / H);
  for (double chi_deg : {60.0, 85.0, 90.0}) {
    spec.illumination.zenith_angle_rad = chi_deg * constants::kPi / 180.0;
    PhotolysisModel m(spec, bg, {"X"});
    m.compute(n, J);
    for (std::size_t j : {20u, 100u, 200u}) {
      const double column = -std::log(J[j] / (1e-26 * kFlux)) / 1e-26;
      const double X = (s.planet.radius_cm + bg.grid.center_cm[j]) / H;
      const double expected = n[j] * H * chapman_function(X, spec.illumination.zenith_angle_rad);
      INFO("chi " << chi_deg << " deg, z " << bg.grid.center_cm[j] / 1e5 << " km");
      CHECK(column == Approx(expected).epsilon(2e-3));
    }
  }
}
