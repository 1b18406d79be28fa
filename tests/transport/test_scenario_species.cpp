// The scenario loader reads the `species:` and `injections:` sections (io/scenario_loader).
#include <catch2/catch.hpp>

#include <fstream>

#include "io/scenario.hpp"

using namespace colchem;

TEST_CASE("load_scenario fills species_setup from the species and injections sections",
          "[transport][io]") {
  const std::string dir = COLCHEM_TEST_OUTPUT_DIR;
  const std::string src = COLCHEM_SOURCE_DIR;
  const std::string file = dir + "/transport_scenario.yaml";
  {
    std::ofstream f(file);
    f << "scenario: {name: transport_check}\n"
         "planet: {name: Pyrene (fictional), radius: 6050 km, surface_gravity: 8.87 m s-2, "
         "star_distance: 0.72 au}\n"
         "grid: {bottom: 58 km, top: 112 km, cells: 54}\n"
         "atmosphere:\n"
         "  bulk_composition: {CO2: 0.965, N2: 0.035}\n"
         "  temperature: "
      << src
      << "/profiles/pyrene_temperature.csv\n"
         "  pressure: {hydrostatic: {base: 300 mbar, at: 58 km}}\n"
         "  eddy_diffusion: {constant: 1e6 cm2 s-1}\n"
         "species:\n"
         "  SO2: {initial: 1 ppm, bottom: {mixing_ratio: 1 ppm}, top: zero_flux}\n"
         "  CO2: {fixed: true}\n"
         "injections:\n"
         "  - {species: SO2, amount: 1 Tg, time: 1 day, from: 70 km, to: 75 km}\n";
  }
  const UnitSystem units;
  const Scenario sc = load_scenario(file, {}, units);
  const auto& s = sc.species_setup;
  REQUIRE(s.species.size() == 2);
  CHECK(s.find("SO2")->boundaries.bottom.kind == BoundaryKind::kMixingRatio);
  CHECK(s.find("SO2")->initial->mixing_ratio == Approx(1e-6));  // UDUNITS-2: ppm = 1e-6
  CHECK(*s.find("CO2")->fixed);
  REQUIRE(s.injections.size() == 1);
  CHECK(s.injections[0].amount == Approx(1e12));  // 1 Tg = 1e12 g (analytic)
  CHECK(s.injections[0].where.line == 13);
  // A command-line override reaches the section too.
  const Scenario sc2 = load_scenario(file, {"species.SO2.top={escape_velocity: 5 cm s-1}"}, units);
  CHECK(sc2.species_setup.find("SO2")->boundaries.top.kind == BoundaryKind::kEscapeVelocity);
  // Misspelt keys inside the section are reported.
  CHECK_THROWS_AS(load_scenario(file, {"species.SO2.botom=zero_flux"}, units), InputError);
}
