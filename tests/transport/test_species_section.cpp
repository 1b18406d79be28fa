// The `species:` and `injections:` loaders: typed values, units, and errors users can act on.
#include <catch2/catch.hpp>

#include <fstream>

#include "core/constants.hpp"
#include "io/species_section.hpp"
#include "transport/column_species.hpp"
#include "transport_fixtures.hpp"

using namespace colchem;

namespace {
ColumnSpeciesSpec load(const std::string& yaml) {
  const UnitSystem units;
  ConfigDocument doc = ConfigDocument::from_text(yaml, "test.yaml");
  ColumnSpeciesSpec spec;
  const ConfigNode root = doc.root();
  if (auto s = root.find("species")) load_species_section(*s, units, spec);
  if (auto i = root.find("injections")) load_injections_section(*i, units, spec);
  root.done();
  return spec;
}

std::string error_of(const std::string& yaml) {
  try {
    load(yaml);
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}
}  // namespace

TEST_CASE("species section: values, units, boundaries and schedules", "[transport][io]") {
  const auto spec = load(R"(
species:
  default: {initial: 1e-12}
  SO2:
    initial: 3 ppm
    bottom: {mixing_ratio: 1e-6}
    top: zero_flux
  H2O:
    bottom: {mixing_ratio: {schedule: {times: [0 s, 30 day], values: [1e-6, 2 ppm]}}}
    top: {escape_velocity: 10 m s-1}
  H:
    bottom: {flux: -2e9 cm-2 s-1}
    top: {jeans: {exobase_temperature: 1000 K}}
    thermal_diffusion: -0.25
    binary_diffusion: {A: 4.8e17 cm-1 s-1, s: 0.7}
  H2:
    bottom: {density: 1e10 cm-3}
    top: diffusion_limited
  O3:
    bottom: {deposition_velocity: 1 mm s-1}
    top: {flux: {schedule: {times: '[0, 1] day', values: [1e8 cm-2 s-1, 3e8 cm-2 s-1]}}}
  N2: {fixed: true}
)");
  // Conversions: UDUNITS-2 (ppm = 1e-6, day = 86400 s, 1 mm s-1 = 0.1 cm s-1; analytic).
  CHECK(spec.default_initial.mixing_ratio == 1e-12);
  REQUIRE(spec.species.size() == 6);
  const auto* so2 = spec.find("SO2");
  REQUIRE(so2);
  CHECK(so2->initial->mixing_ratio == Approx(3e-6));
  CHECK(so2->boundaries.bottom.kind == BoundaryKind::kMixingRatio);
  CHECK(so2->boundaries.bottom.value.at(0.0) == 1e-6);
  CHECK(so2->boundaries.top.kind == BoundaryKind::kZeroFlux);
  CHECK(so2->where.line == 5);  // where its settings start, kept for name checks
  const auto* h2o = spec.find("H2O");
  CHECK(h2o->boundaries.bottom.value.time_s == std::vector<double>{0.0, 30.0 * 86400.0});
  CHECK(h2o->boundaries.bottom.value.at(15.0 * 86400.0) == Approx(1.5e-6));
  CHECK(h2o->boundaries.top.kind == BoundaryKind::kEscapeVelocity);
  CHECK(h2o->boundaries.top.value.at(0.0) == Approx(1000.0));
  const auto* h = spec.find("H");
  CHECK(h->boundaries.bottom.value.at(0.0) == -2e9);
  CHECK(h->boundaries.top.kind == BoundaryKind::kJeans);
  CHECK(h->boundaries.top.exobase_temperature_K == 1000.0);
  CHECK(*h->thermal_diffusion == -0.25);
  CHECK(*h->diffusion_A == 4.8e17);
  CHECK(*h->diffusion_s == 0.7);
  CHECK(spec.find("H2")->boundaries.bottom.kind == BoundaryKind::kDensity);
  CHECK(spec.find("H2")->boundaries.top.kind == BoundaryKind::kDiffusionLimited);
  const auto* o3 = spec.find("O3");
  CHECK(o3->boundaries.bottom.value.at(0.0) == Approx(0.1));
  CHECK(o3->boundaries.top.value.at(43200.0) == Approx(2e8));
  CHECK(*spec.find("N2")->fixed);
  CHECK(spec.find("CO") == nullptr);
}

TEST_CASE("species section: errors name the key, expected and found", "[transport][io]") {
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {mixing_ratio: 2}}\n"),
             Catch::Contains("mixing ratio from 0 to 1") && Catch::Contains("test.yaml:2"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {density: 1e10}}\n"),
             Catch::Contains("every dimensional value carries its unit"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {density: 1e10 cm s-1}}\n"),
             Catch::Contains("cm-3"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {escape_velocity: 1 cm s-1}}\n"),
             Catch::Contains("only a top boundary"));
  CHECK_THAT(error_of("species:\n  SO2: {top: {deposition_velocity: 1 cm s-1}}\n"),
             Catch::Contains("only a bottom boundary"));
  CHECK_THAT(error_of("species:\n  SO2: {top: {fluxx: 1 cm-2 s-1}}\n"),
             Catch::Contains("did you mean 'flux'"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: jeans}\n"), Catch::Contains("zero_flux"));
  CHECK_THAT(error_of("species:\n  SO2: {inital: 1e-6}\n"), Catch::Contains("initial"));
  CHECK_THAT(error_of("species:\n  SO2: {initial: 3 K}\n"), Catch::Contains("not dimensionless"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {flux: {schedule: {times: [0 s, 2 s, 1 s], "
                      "values: [1 cm-2 s-1, 2 cm-2 s-1, 3 cm-2 s-1]}}}}\n"),
             Catch::Contains("increasing"));
  CHECK_THAT(error_of("species:\n  SO2: {bottom: {flux: {schedule: {times: [0 s, 2 s], "
                      "values: [1 cm-2 s-1]}}}}\n"),
             Catch::Contains("2 values"));
  CHECK_THAT(error_of("species:\n  SO2: {}\n  SO2: {}\n"), Catch::Contains("SO2"));
  CHECK_THAT(error_of("species:\n  default: {initial: {table: x.csv}}\n"),
             Catch::Contains("'column' naming the table column"));
}

TEST_CASE("injections section: amounts in molecules, moles, mass or column", "[transport][io]") {
  const auto spec = load(R"(
injections:
  - {species: SO2, amount: 10 Tg, time: 0 s, from: 18 km, to: 22 km}
  - {species: SO2, amount: 1e34, time: 2 day, from: 18 km, to: 22 km}
  - {species: H2O, amount: 1e34 molecule, time: 1 h, from: 1000 m, to: 2 km}
  - {species: O3, column: 1e16 cm-2, time: 0 s, from: 0 km, to: 1 km}
  - {species: O3, column: 10 DU, time: 0 s, from: 0 km, to: 1 km}
)");
  REQUIRE(spec.injections.size() == 5);
  const auto& a = spec.injections;
  CHECK(a[0].amount_kind == InjectionAmount::kGlobalMass);
  CHECK(a[0].amount == Approx(1e13));  // 10 Tg = 1e13 g (analytic)
  CHECK(a[0].bottom_cm == Approx(18e5));
  CHECK(a[0].where.line == 3);
  CHECK(a[1].amount == 1e34);
  CHECK(a[1].time_s == Approx(2.0 * 86400.0));
  CHECK(a[2].amount_kind == InjectionAmount::kGlobalMolecules);
  CHECK(a[2].amount == Approx(1e34));  // UDUNITS-2: molecule = 1/N_A mol
  CHECK(a[2].bottom_cm == Approx(1e5));
  CHECK(a[3].amount_kind == InjectionAmount::kColumn);
  CHECK(a[3].amount == 1e16);
  // 1 DU = 2.687e16 cm-2 (from memory); UDUNITS-2 defines it as 446.2 micromol m-2.
  CHECK(a[4].amount == Approx(2.687e17).epsilon(1e-3));

  CHECK_THAT(
      error_of("injections:\n  - {species: SO2, amount: 10 K, time: 0 s, from: 1 km, to: 2 km}\n"),
      Catch::Contains("a mass"));
  CHECK_THAT(
      error_of("injections:\n  - {species: SO2, amount: 1, time: 0 s, from: 3 km, to: 2 km}\n"),
      Catch::Contains("above 'from'"));
  CHECK_THAT(error_of("injections:\n  - {species: SO2, time: 0 s, from: 1 km, to: 2 km}\n"),
             Catch::Contains("neither"));
}

TEST_CASE("initial state from defaults, values, tables and fixed species", "[transport][io]") {
  const std::string table = std::string(COLCHEM_TEST_OUTPUT_DIR) + "/initial_so2.csv";
  {
    std::ofstream f(table);
    f << "# invented profile\naltitude [km], SO2 [ppm]\n0, 1\n100, 0.01\n";
  }
  const auto spec = load("species:\n  default: {initial: 2e-9}\n  SO2: {initial: {table: " + table +
                         "}}\n  CO: {initial: 1e-5}\n  N2: {fixed: true}\n");
  const Background bg = test::isothermal_column(10, 100.0e5, 250.0, 900.0, 28.0, 1e15, 1e5);
  std::vector<TransportSpecies> sp = {
      default_transport_species("SO2", 64.0, 28.0), default_transport_species("CO", 28.0, 28.0),
      default_transport_species("OH", 17.0, 28.0), default_transport_species("N2", 28.0, 28.0)};
  apply_species_settings(spec, sp);
  CHECK(sp[3].fixed);
  const auto n = initial_state(spec, bg, sp, {0.0, 0.0, 0.0, 0.78});
  for (std::size_t j = 0; j < 10; ++j) {
    const double na = bg.air_density_cm3[j];
    const double z_km = bg.grid.center_cm[j] / 1e5;
    // log-linear interpolation between 1 ppm at 0 km and 0.01 ppm at 100 km (analytic)
    CHECK(n[j * 4 + 0] / na == Approx(1e-6 * std::pow(0.01, z_km / 100.0)).epsilon(1e-12));
    CHECK(n[j * 4 + 1] / na == Approx(1e-5));
    CHECK(n[j * 4 + 2] / na == Approx(2e-9));
    CHECK(n[j * 4 + 3] / na == Approx(0.78));
  }
  // Unknown species in an injection are reported at their entry.
  const auto bad =
      load("injections:\n  - {species: SO3x, amount: 1, time: 0 s, from: 1 km, to: 2 km}\n");
  try {
    (void)resolve_injections(bad, bg, sp);
    FAIL("no error");
  } catch (const InputError& e) {
    CHECK_THAT(std::string(e.what()), Catch::Contains("SO3x") && Catch::Contains("test.yaml:2"));
  }
  const auto high =
      load("injections:\n  - {species: CO, amount: 1, time: 0 s, from: 150 km, to: 160 km}\n");
  CHECK_THROWS_WITH(resolve_injections(high, bg, sp), Catch::Contains("overlapping the column"));
}
