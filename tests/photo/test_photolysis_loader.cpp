// The photolysis section and data file: typed values and errors with file and line.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/photolysis_loader.hpp"
#include "photo_test_support.hpp"
#include "../test_support.hpp"

using namespace colchem;

namespace {

const std::string kSource = COLCHEM_SOURCE_DIR;

PhotolysisSpec load_section(const std::string& name, const std::string& yaml) {
  const UnitSystem units;
  const auto file = test::write_file(name, yaml);
  const ConfigDocument doc = ConfigDocument::load(file);
  return load_photolysis(doc.root().child("photolysis"), units);
}

std::string table_xs() {
  return "# invented test table\nwavelength [nm], cross_section [cm2]\n200, 1e-18\n210, 2e-18\n";
}

}  // namespace

TEST_CASE("the shipped data file and spectrum load", "[photo][io]") {
  const auto spec = load_section("shipped.yaml",
      "photolysis:\n"
      "  data: " + kSource + "/configs/photolysis/representative_data.yaml\n"
      "  spectrum: {table: " + kSource + "/configs/photolysis/solar_1au.csv}\n"
      "  bins: {from: 100 nm, to: 1000 nm, width: 2 nm}\n"
      "  illumination: {latitude: 30 deg, declination: -10 deg, hour_angle_points: 6}\n"
      "  slant_path: spherical\n");
  CHECK(spec.absorbers.size() == 15);  // as listed in the file
  CHECK(spec.channels.size() == 16);
  CHECK(spec.spectrum.energy);  // W m-2 nm-1 detected as an energy flux
  CHECK(spec.spectrum.table.value[0] == Approx(2e-5 * 1e3));  // W m-2 -> erg cm-2 s-1 (analytic)
  CHECK(spec.bin_edges_nm.size() == 451);
  CHECK(spec.illumination.form == IlluminationForm::kDiurnal);
  CHECK(spec.illumination.latitude_rad == Approx(constants::kPi / 6.0));
  CHECK(spec.slant_path == SlantPath::kSpherical);
  CHECK(spec.absorbers[2].cross_section.temperature_K == std::vector<double>{218.0, 295.0});
  CHECK(spec.spectrum.table.source.find("from memory") != std::string::npos);
}

TEST_CASE("Planck spectra, listed bins, bands and yields load", "[photo][io]") {
  test::write_file("xs.csv", table_xs());
  test::write_file("phi.csv", "wavelength [nm], quantum_yield [1]\n200, 1\n210, 0.5\n");
  test::write_file("data_ok.yaml",
      "absorbers:\n"
      "  - species: A\n"
      "    cross_section: xs.csv\n"
      "    bands:\n"
      "      - {label: v4, center: 740 nm, width: 2 nm, shape: lorentzian, oscillator_strength: 1e-9}\n"
      "      - {center: 600 nm, width: 100 cm-1, strength: 1e-20 cm}\n"
      "channels:\n"
      "  - {name: A_1, absorber: A, quantum_yield: {table: phi.csv}, threshold: 800 nm}\n"
      "  - {name: A_2, absorber: A, quantum_yield: {step: {below: 205 nm, value: 0.3}}, branching: 0.5}\n"
      "rayleigh: {N2: {cross_section: 4.6e-27 cm2, at: 550 nm}}\n");
  const auto spec = load_section("planck.yaml",
      "photolysis:\n"
      "  data: data_ok.yaml\n"
      "  spectrum: {planck: {temperature: 3300 K, radius: 0.3 R_sun}}\n"
      "  bins: {edges: [100 nm, 200 nm, 400 nm, 1000 nm]}\n"
      "  illumination: {zenith_angle: 48 deg, day_fraction: 0.5}\n");
  CHECK(spec.spectrum.form == SpectrumForm::kPlanck);
  CHECK(spec.spectrum.radius_cm == Approx(0.3 * 6.957e10));  // IAU nominal solar radius
  REQUIRE(spec.bin_edges_nm.size() == 4);
  CHECK(spec.bin_edges_nm[2] == Approx(400.0));
  const auto& b = spec.absorbers[0].bands;
  REQUIRE(b.size() == 2);
  // 2 nm at 740 nm is 2e-7 / (740e-7)^2 = 36.5 cm-1 (analytic).
  CHECK(b[0].fwhm_cm1 == Approx(2e-7 / std::pow(740e-7, 2)));
  CHECK(b[0].shape == BandShape::kLorentzian);
  // S = pi e^2/(m_e c^2) f (Hilborn 1982, Am. J. Phys. 50, 982; from memory).
  CHECK(b[0].strength_cm == Approx(8.853e-13 * 1e-9).epsilon(1e-3));
  CHECK(b[1].strength_cm == Approx(1e-20));
  CHECK(spec.channels[0].quantum_yield.form == YieldForm::kTable);
  CHECK(spec.channels[0].threshold_nm == Approx(800.0));
  CHECK(spec.channels[1].quantum_yield.step_nm == Approx(205.0));
  CHECK(spec.channels[1].quantum_yield.below_value == Approx(0.3));
  CHECK(spec.channels[1].branching == Approx(0.5));
  CHECK(spec.illumination.zenith_angle_rad == Approx(48.0 * constants::kPi / 180.0));
}

TEST_CASE("bad photolysis inputs are InputErrors naming file, line and key", "[photo][io]") {
  test::write_file("xs.csv", table_xs());
  auto section = [](const std::string& data) {
    return "photolysis:\n  data: " + data + "\n  spectrum: {planck: {temperature: 5772 K, radius: 1 R_sun}}\n";
  };
  SECTION("misspelt key with a suggestion") {
    test::write_file("d1.yaml", "absorbers:\n  - {species: A, cross_section: xs.csv}\n"
                                "channels:\n  - {name: A_1, absorber: A, quantum_yeild: 1}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s1.yaml", section("d1.yaml")); });
    CHECK(msg.find("d1.yaml") != std::string::npos);
    CHECK(msg.find("did you mean 'quantum_yield'") != std::string::npos);
  }
  SECTION("a channel naming an undeclared absorber") {
    test::write_file("d2.yaml", "absorbers:\n  - {species: SO2, cross_section: xs.csv}\n"
                                "channels:\n  - {name: X, absorber: SO3, quantum_yield: 1}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s2.yaml", section("d2.yaml")); });
    CHECK(msg.find("SO3") != std::string::npos);
    CHECK(msg.find("did you mean 'SO2'") != std::string::npos);
  }
  SECTION("duplicate channel names") {
    test::write_file("d3.yaml", "absorbers:\n  - {species: A, cross_section: xs.csv}\n"
                                "channels:\n  - {name: A_1, absorber: A}\n  - {name: A_1, absorber: A}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s3.yaml", section("d3.yaml")); });
    CHECK(msg.find("again") != std::string::npos);
    CHECK(msg.find("d3.yaml:5") != std::string::npos);
  }
  SECTION("a negative cross section in a table") {
    test::write_file("neg.csv", "wavelength [nm], cross_section [cm2]\n200, 1e-18\n210, -2e-18\n");
    test::write_file("d4.yaml", "absorbers:\n  - {species: A, cross_section: neg.csv}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s4.yaml", section("d4.yaml")); });
    CHECK(msg.find("neg.csv:3") != std::string::npos);
  }
  SECTION("a cross section in the wrong unit") {
    test::write_file("unit.csv", "wavelength [nm], cross_section [cm]\n200, 1e-18\n210, 2e-18\n");
    test::write_file("d5.yaml", "absorbers:\n  - {species: A, cross_section: unit.csv}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s5.yaml", section("d5.yaml")); });
    CHECK(msg.find("cm2") != std::string::npos);
  }
  SECTION("a spectrum in neither photon nor energy units") {
    test::write_file("spec.csv", "wavelength [nm], flux [K]\n200, 1\n210, 2\n");
    test::write_file("d6.yaml", "absorbers:\n  - {species: A, cross_section: xs.csv}\n");
    const auto msg = colchem_test::located_error_of([&] {
      load_section("s6.yaml", "photolysis:\n  data: d6.yaml\n  spectrum: {table: spec.csv}\n");
    });
    CHECK(msg.find("W m-2 nm-1") != std::string::npos);
  }
  SECTION("unknown key in the section") {
    test::write_file("d7.yaml", "absorbers:\n  - {species: A, cross_section: xs.csv}\n");
    const auto msg = colchem_test::located_error_of([&] {
      load_section("s7.yaml", section("d7.yaml") + "  slant_paht: spherical\n");
    });
    CHECK(msg.find("did you mean 'slant_path'") != std::string::npos);
  }
  SECTION("temperatures out of order") {
    test::write_file("d8.yaml", "absorbers:\n  - species: A\n    cross_section:\n      tables:\n"
                                "        - {temperature: 300 K, table: xs.csv}\n"
                                "        - {temperature: 200 K, table: xs.csv}\n");
    const auto msg = colchem_test::located_error_of([&] { load_section("s8.yaml", section("d8.yaml")); });
    CHECK(msg.find("increasing") != std::string::npos);
  }
}

TEST_CASE("a scenario's photolysis section reaches Scenario::photolysis", "[photo][io]") {
  const UnitSystem units;
  const auto file = test::write_file("scenario_photo.yaml",
      "scenario: {name: photo_check}\n"
      "planet: {name: invented, radius: 6000 km, surface_gravity: 9 m s-2, star_distance: 0.72 au}\n"
      "grid: {bottom: 0 km, top: 50 km, cells: 10}\n"
      "atmosphere:\n"
      "  bulk_composition: {CO2: 0.965, N2: 0.035}\n"
      "  temperature: {isothermal: 230 K}\n"
      "  pressure: {hydrostatic: {base: 1 bar}}\n"
      "  eddy_diffusion: {constant: 1e5 cm2 s-1}\n"
      "photolysis:\n"
      "  data: " + kSource + "/configs/photolysis/representative_data.yaml\n"
      "  spectrum: {table: " + kSource + "/configs/photolysis/solar_1au.csv}\n");
  const Scenario sc = load_scenario(file, {}, units);
  CHECK(sc.has_photolysis);
  CHECK(sc.photolysis.channels.size() == 16);
  // Defaults (README.md, section Configuration reference): 60 deg with a day fraction of 0.5, plane-parallel paths.
  CHECK(sc.photolysis.illumination.zenith_angle_rad == Approx(constants::kPi / 3.0));
  CHECK(sc.photolysis.illumination.day_fraction == Approx(0.5));
  // Every table read is kept for provenance: data file, 18 tables, spectrum.
  CHECK(sc.inputs.size() >= 20);
}
