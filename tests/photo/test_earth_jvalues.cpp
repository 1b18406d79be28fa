// J-values of an Earth-like column against textbook values (a published-order check).
//
// Column: U.S. Standard Atmosphere 1976 temperatures (from memory, at its layer breaks),
// hydrostatic from 1013.25 hPa, bulk N2 0.78 / O2 0.21 / Ar 0.01, and an invented
// mid-latitude-shaped ozone profile (peak 5e12 cm-3 at 22 km, about 300 DU; common
// practice, no source). Overhead sun, direct beam only, the shipped representative data
// (configs/photolysis/earth_oxygen.yaml, solar_1au.csv: from memory, coarse).
// Tolerances: the shipped tables are smoothed envelopes recalled from memory (no
// Schumann-Runge band structure, 5 nm anchors), the beam has no diffuse (scattered or
// reflected) light, which adds tens of per cent near the ground, so factors of 2-3 are the
// honest accuracy; the checks are still far tighter than the orders of magnitude that
// separate the regimes (J(O3) spans 1e-2 to 1e-4 s-1 and J(O2) 1e-5 to 1e-11 s-1 here).
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "core/constants.hpp"
#include "io/config_node.hpp"
#include "io/photolysis_loader.hpp"
#include "photo/photolysis_model.hpp"
#include "photo_test_support.hpp"

using namespace colchem;

namespace {

Background earth_column() {
  BackgroundSpec s;
  s.planet.name = "Earth-like check column";
  s.planet.radius_cm = 6371.0e5;
  s.planet.surface_gravity_cm_s2 = 980.665;
  s.planet.star_distance_au = 1.0;
  s.grid = Grid::uniform(0.0, 100.0e5, 100);
  // U.S. Standard Atmosphere 1976 (from memory): breaks of the piecewise-linear profile.
  const std::vector<double> z_km{0, 11, 20, 32, 47, 51, 71, 86, 100};
  const std::vector<double> T{288.15, 216.65, 216.65, 228.65, 270.65, 270.65, 214.65, 186.87, 195.08};
  for (double z : z_km) s.temperature_K.altitude_cm.push_back(z * 1e5);
  s.temperature_K.value = T;
  s.temperature_K.source = "U.S. Standard Atmosphere 1976 (from memory)";
  s.base_pressure_dyn_cm2 = 1.01325e6;
  s.bulk_mole_fraction = {{"N2", 0.78}, {"O2", 0.21}, {"Ar", 0.01}};
  s.mean_molecular_mass_amu = 28.96;
  s.eddy_cm2_s = 1e5;
  return build_background(s);
}

double ozone(double z_km) {
  if (z_km <= 22.0) return 5e12 * std::exp(-std::pow((z_km - 22.0) / 7.0, 2));
  if (z_km <= 35.0) return 5e12 * std::exp(-std::pow((z_km - 22.0) / 10.0, 2));
  return 5e12 * std::exp(-1.69) * std::exp(-(z_km - 35.0) / 4.5);
}

}  // namespace

TEST_CASE("Earth-like J(O2) and J(O3) match textbook values within stated factors", "[photo][published]") {
  const std::string src = COLCHEM_SOURCE_DIR;
  const auto file = test::write_file("earth.yaml",
      "photolysis:\n"
      "  data: " + src + "/configs/photolysis/earth_oxygen.yaml\n"
      "  spectrum: {table: " + src + "/configs/photolysis/solar_1au.csv}\n"
      "  illumination: {zenith_angle: 0 deg, day_fraction: 1}\n");
  const UnitSystem units;
  const ConfigDocument doc = ConfigDocument::load(file);
  const PhotolysisSpec spec = load_photolysis(doc.root().child("photolysis"), units);
  const Background bg = earth_column();
  PhotolysisModel model(spec, bg, {"O3"});
  const std::size_t N = bg.grid.cells();
  std::vector<double> n(N), J(model.channels().size() * N);
  double column = 0.0;
  for (std::size_t j = 0; j < N; ++j) {
    n[j] = ozone(bg.grid.center_cm[j] / 1e5);
    column += n[j] * bg.grid.width_cm(j);
  }
  REQUIRE(column / 2.687e16 == Approx(300.0).epsilon(0.1));  // Dobson unit (definition)
  model.compute(n, J);
  const int o2 = model.channel_index("O2_O_O");
  const int o1d = model.channel_index("O3_O2_O1D");
  const int o3p = model.channel_index("O3_O2_O");
  REQUIRE((o2 >= 0 && o1d >= 0 && o3p >= 0));
  auto at = [&](int c, double z_km) { return J[static_cast<std::size_t>(c) * N + static_cast<std::size_t>(z_km)]; };
  auto jo3 = [&](double z_km) { return at(o1d, z_km) + at(o3p, z_km); };
  INFO("J(O3) top " << jo3(99) << ", 40 km " << jo3(40) << ", ground " << jo3(0)
       << "; J(O3->O1D) ground " << at(o1d, 0) << "; J(O2) 40 km " << at(o2, 40) << ", 30 km "
       << at(o2, 30) << ", top " << at(o2, 99));

  // J(O3) at the top (mesosphere, nearly unattenuated): about 1e-2 s-1, mostly the Hartley
  // band (Brasseur and Solomon 2005, Aeronomy of the Middle Atmosphere, ch. 4; from memory).
  CHECK(jo3(99) > 1e-2 / 2.0);
  CHECK(jo3(99) < 1e-2 * 2.0);
  // J(O3) at the ground, overhead sun: about 4e-4 s-1, mostly the Chappuis band
  // (Seinfeld and Pandis, Atmospheric Chemistry and Physics, ch. 4/5; from memory).
  CHECK(jo3(0) > 4e-4 / 2.0);
  CHECK(jo3(0) < 4e-4 * 2.0);
  // J(O3 -> O(1D)) at the ground, overhead sun: about 3e-5 s-1 (Seinfeld and Pandis; from
  // memory). Factor 3: the 300-320 nm edge is where the coarse tables are poorest.
  CHECK(at(o1d, 0) > 3e-5 / 3.0);
  CHECK(at(o1d, 0) < 3e-5 * 3.0);
  // J(O2) at 40 km, overhead sun: about 1e-9 s-1, the Herzberg continuum (Brasseur and
  // Solomon 2005, ch. 4; from memory). Factor 3.
  CHECK(at(o2, 40) > 1e-9 / 3.0);
  CHECK(at(o2, 40) < 1e-9 * 3.0);
  // Ordering that any correct column must show (analytic): J falls downward.
  CHECK(at(o2, 30) < at(o2, 40));
  CHECK(at(o2, 40) < at(o2, 99));
}
