// Background column: gravity, scale height and hydrostatic pressure against published tables
// and closed forms.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "io/table.hpp"

using namespace colchem;
using constants::kCmPerKm;

namespace {
PlanetSpec earth_ussa76() {
  // U.S. Standard Atmosphere 1976: r0 = 6356.766 km and g0 = 9.80665 m/s2 define its
  // geopotential, i.e. exactly g(z) = g0 (r0/(r0+z))^2 (values from memory).
  return PlanetSpec{"Earth (USSA76)", 6356.766 * kCmPerKm, 980.665, 1.0};
}
}  // namespace

TEST_CASE("gravity falls with the inverse square of the distance from the centre", "[background]") {
  const PlanetSpec p{"test", 6000.0 * kCmPerKm, 900.0, 1.0};
  // Analytic: at z = R the distance doubles, so g = g_s/4.
  CHECK(gravity_at(p, 0.0) == Approx(900.0).epsilon(1e-15));
  CHECK(gravity_at(p, 6000.0 * kCmPerKm) == Approx(225.0).epsilon(1e-15));
}

TEST_CASE("scale height of sea-level air is 8.43 km", "[background]") {
  // H = k T/(m g) with USSA76 sea-level T = 288.15 K, M = 28.9644 g/mol, g0 = 9.80665 m/s2:
  // 1.380649e-23 * 288.15 / (28.9644 * 1.66053907e-27 * 9.80665) = 8434.5 m (hand calculation;
  // the standard's own table lists 8434.5 m at 0 km, from memory).
  BackgroundSpec s;
  s.planet = earth_ussa76();
  s.grid = Grid::uniform(0.0, 100.0, 1);  // one thin cell at the surface
  s.temperature_K = {{-1e5, 1e5}, {288.15, 288.15}, "isothermal"};
  s.base_pressure_dyn_cm2 = 1.01325e6;
  s.mean_molecular_mass_amu = 28.9644;
  s.eddy_cm2_s = 1e5;
  const Background bg = build_background(s);
  CHECK(bg.scale_height_cm[0] / 100.0 == Approx(8434.5).epsilon(2e-5));
}

TEST_CASE("isothermal hydrostatic column with inverse-square gravity matches the closed form",
          "[background]") {
  // Analytic: d ln p/dz = -m g_s R^2 /(k T (R+z)^2)  =>  ln(p/p0) = -(m g_s R/(k T)) z/(R+z).
  const PlanetSpec p{"test", 6050.0 * kCmPerKm, 887.0, 0.72};
  const double m = 43.45 * constants::kAtomicMassUnit;
  const double T = 230.0;
  for (double z_km : {1.0, 10.0, 50.0, 200.0}) {
    const double z = z_km * kCmPerKm;
    const double exact = -(m * p.surface_gravity_cm_s2 * p.radius_cm / (constants::kBoltzmann * T)) *
                         z / (p.radius_cm + z);
    const double got = hydrostatic_log_ratio(p, m, {0.0, 300.0 * kCmPerKm}, {T, T}, 0.0, z);
    CHECK(got == Approx(exact).epsilon(1e-12));
    // Integrating downward gives the opposite sign.
    CHECK(hydrostatic_log_ratio(p, m, {0.0, 300.0 * kCmPerKm}, {T, T}, z, 0.0) ==
          Approx(-exact).epsilon(1e-12));
  }
}

TEST_CASE("linear temperature with constant gravity matches the polytrope closed form",
          "[background]") {
  // Analytic: T = T0 + L z, constant g  =>  p/p0 = (T/T0)^(-m g/(k L)).
  const PlanetSpec p{"flat", 1e20, 980.0, 1.0};  // R -> infinity: constant gravity
  const double m = 28.96 * constants::kAtomicMassUnit;
  const double T0 = 288.0, L = -6.5e-5;  // K/cm (6.5 K/km)
  const double z = 11.0 * kCmPerKm;
  const double exact = (-m * 980.0 / (constants::kBoltzmann * L)) * std::log((T0 + L * z) / T0);
  const double got = hydrostatic_log_ratio(p, m, {0.0, z}, {T0, T0 + L * z}, 0.0, z);
  CHECK(got == Approx(exact).epsilon(1e-12));
}

TEST_CASE("hydrostatic integration of the U.S. Standard Atmosphere 1976 reproduces its pressures",
          "[background][ussa76]") {
  // Reference: U.S. Standard Atmosphere, 1976 (NOAA/NASA/USAF), table I, pressure at geometric
  // altitude (values from memory): 10 km 2.6500e4 Pa, 20 km 5.5293e3 Pa, 30 km 1.1970e3 Pa,
  // 40 km 2.8714e2 Pa, 50 km 7.9779e1 Pa. Acceptance: within 0.5 %.
  const UnitSystem units;
  const Table t = Table::read(COLCHEM_SOURCE_DIR "/profiles/ussa76_temperature.csv");
  BackgroundSpec s;
  s.planet = earth_ussa76();
  s.grid = Grid::from_edges({0.0, 10.0 * kCmPerKm, 20.0 * kCmPerKm, 30.0 * kCmPerKm,
                             40.0 * kCmPerKm, 50.0 * kCmPerKm});
  s.temperature_K = {t.column("altitude", units, "cm"), t.column("temperature", units, "K"),
                     "ussa76"};
  s.base_pressure_dyn_cm2 = 101325.0 * 10.0;
  s.base_altitude_cm = 0.0;
  s.mean_molecular_mass_amu = 28.9644;
  s.eddy_cm2_s = 1e5;
  const Background bg = build_background(s);
  const double expected_pa[] = {101325.0, 2.6500e4, 5.5293e3, 1.1970e3, 2.8714e2, 7.9779e1};
  for (std::size_t e = 0; e < 6; ++e) {
    INFO("altitude " << 10 * e << " km");
    CHECK(bg.edge_pressure_dyn_cm2[e] / 10.0 == Approx(expected_pa[e]).epsilon(5e-3));
  }
  // The USSA76 temperature at 10 km geometric altitude is 223.252 K (table I, from memory).
  CHECK(bg.edge_temperature_K[1] == Approx(223.252).epsilon(1e-5));
  // Number density at 20 km: 1.8458e24 m^-3 = 1.8458e18 cm^-3 (table I, from memory).
  CHECK(bg.edge_air_density_cm3[2] == Approx(1.8458e18).epsilon(5e-3));
}

TEST_CASE("eddy diffusion forms", "[background]") {
  BackgroundSpec s;
  s.planet = {"test", 6000.0 * kCmPerKm, 900.0, 1.0};
  s.grid = Grid::uniform(0.0, 40.0 * kCmPerKm, 40);
  s.temperature_K = {{0.0, 40.0 * kCmPerKm}, {200.0, 200.0}, "isothermal"};
  s.base_pressure_dyn_cm2 = 1e5;
  s.mean_molecular_mass_amu = 44.0;
  s.eddy_form = EddyForm::kDensityPower;
  s.eddy_cm2_s = 1e4;
  s.eddy_exponent = 0.5;
  s.eddy_max_cm2_s = 1e6;
  const Background bg = build_background(s);
  // Analytic: K = K0 (n0/n)^0.5; capped at the maximum.
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    const double k = std::min(1e6, 1e4 * std::sqrt(bg.edge_air_density_cm3[0] / bg.air_density_cm3[j]));
    CHECK(bg.eddy_cm2_s[j] == Approx(k).epsilon(1e-12));
  }
  CHECK(bg.edge_eddy_cm2_s.front() == Approx(1e4).epsilon(1e-12));
}
