// NetCDF output: round trip through the NetCDF-C API, CF attributes, and the write-to-temporary
// then rename rule (an unfinished writer leaves nothing under the final name).
#include <catch2/catch.hpp>

#include <filesystem>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"

using namespace colchem;
namespace fs = std::filesystem;

TEST_CASE("a scenario's background round-trips through NetCDF", "[netcdf]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(COLCHEM_SOURCE_DIR "/configs/pyrene.yaml", {}, units);
  const Background bg = build_background(sc.background);
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "roundtrip.nc";
  fs::remove(out);
  {
    NcWriter nc(out);
    write_provenance(nc, sc, "colchem_tests");
    define_background(nc, bg);
    nc.end_definitions();
    write_background_data(nc, bg);
    CHECK_FALSE(fs::exists(out));  // still under its temporary name
    nc.commit();
  }
  REQUIRE(fs::exists(out));
  const NcReader r(out);
  CHECK(r.dimension("altitude") == bg.grid.cells());
  CHECK(r.dimension("altitude_edge") == bg.grid.cells() + 1);
  const auto alt = r.read("altitude");
  const auto p = r.read("pressure");
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    CHECK(alt[j] == Approx(bg.grid.center_cm[j] / constants::kCmPerKm).epsilon(1e-15));
    CHECK(p[j] == Approx(bg.pressure_dyn_cm2[j] * 0.1).epsilon(1e-15));
  }
  CHECK(r.shape("altitude_bounds") == std::vector<std::size_t>{bg.grid.cells(), 2});
  CHECK(r.var_text("altitude", "units") == std::optional<std::string>("km"));
  CHECK(r.var_text("altitude", "positive") == std::optional<std::string>("up"));
  CHECK(r.var_text("temperature", "standard_name") == std::optional<std::string>("air_temperature"));
  CHECK(r.global_text("Conventions") == std::optional<std::string>("CF-1.10"));
  // The resolved configuration is embedded and parses back to the same scenario name.
  const auto yaml = r.global_text("colchem_scenario");
  REQUIRE(yaml.has_value());
  CHECK_THAT(*yaml, Catch::Contains("name: pyrene"));
  CHECK_THAT(*r.global_text("colchem_input_files"), Catch::Contains("temperature table"));
}

TEST_CASE("an uncommitted writer leaves no file behind", "[netcdf]") {
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "abandoned.nc";
  fs::remove(out);
  {
    NcWriter nc(out);
    nc.dimension("x", 3);
    nc.variable("v", {"x"}, {"1", "test", "", {}});
    // Destroyed without commit(), as when a run fails half-way.
  }
  CHECK_FALSE(fs::exists(out));
  for (const auto& e : fs::directory_iterator(COLCHEM_TEST_OUTPUT_DIR)) {
    CHECK_THAT(e.path().filename().string(), !Catch::StartsWith("abandoned.nc.tmp"));
  }
}

TEST_CASE("reading a file that is not NetCDF is an input error", "[netcdf]") {
  auto open = [] { const NcReader r{COLCHEM_SOURCE_DIR "/configs/pyrene.yaml"}; };
  CHECK_THROWS_AS(open(), colchem::InputError);
}
