// NetCDF output: round trip through the NetCDF-C API, CF attributes, and the write-to-temporary
// then rename rule (an unfinished file leaves nothing under the final name).
#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/dataset.hpp"
#include "io/dataset_writer.hpp"
#include "io/netcdf_file.hpp"
#include "io/output_claim.hpp"
#include "io/scenario.hpp"
#include "report/column_report.hpp"

using namespace colchem;
namespace fs = std::filesystem;

TEST_CASE("a scenario's background round-trips through NetCDF", "[netcdf]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(COLCHEM_SOURCE_DIR "/configs/pyrene.yaml", {}, units);
  const Background bg = build_background(sc.background);
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "roundtrip.nc";
  fs::remove(out);
  {
    Dataset ds;
    add_provenance(ds, sc, "colchem_tests");
    add_background(ds, bg);
    write_dataset(ds, out);
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
  // The resolved configuration is embedded (a variable, not a global attribute, so the
  // header stays short) and parses back to the same scenario name.
  CHECK_FALSE(r.global_text("colchem_scenario").has_value());
  const auto yaml = r.text_variable("provenance_scenario");
  REQUIRE(yaml.has_value());
  CHECK_THAT(*yaml, Catch::Contains("name: pyrene"));
  CHECK_THAT(*r.text_variable("provenance_input_files"), Catch::Contains("temperature table"));
}

TEST_CASE("a staged file carries the final name only once committed", "[netcdf]") {
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "abandoned.nc";
  fs::remove(out);
  {
    const StagedFile file(out);
    std::ofstream(file.temporary()) << "half-written";
    CHECK(fs::exists(file.temporary()));
    CHECK_FALSE(fs::exists(out));  // still under its temporary name
    // Destroyed without commit(), as when a run fails half-way.
  }
  CHECK_FALSE(fs::exists(out));
  for (const auto& e : fs::directory_iterator(COLCHEM_TEST_OUTPUT_DIR)) {
    CHECK_THAT(e.path().filename().string(), !Catch::StartsWith("abandoned.nc.tmp"));
  }
  {
    StagedFile file(out);
    std::ofstream(file.temporary()) << "finished";
    file.commit();
    CHECK_FALSE(fs::exists(file.temporary()));
  }
  CHECK(fs::exists(out));
  fs::remove(out);
}

TEST_CASE("reading a file that is not NetCDF is an input error", "[netcdf]") {
  auto open = [] { const NcReader r{COLCHEM_SOURCE_DIR "/configs/pyrene.yaml"}; };
  CHECK_THROWS_AS(open(), colchem::InputError);
}

TEST_CASE("every dimension gets a numeric coordinate; names become auxiliary coordinates",
          "[netcdf]") {
  // CF-1.10 section 1.3 (a coordinate variable: one-dimensional, named as its dimension,
  // numeric) and section 5 (the `coordinates` attribute names auxiliary coordinates such as
  // labels); section 3.5 (flag_values of the variable's type, with flag_meanings).
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "coordinates.nc";
  fs::remove(out);
  Dataset ds;
  ds.dimension("species", 3);
  ds.dimension("nv", 2);
  ds.strings("species_name", "species", "species name", {"SO2", "O2", "SO"});
  ds.variable("column", {"species"}, {"cm-2", "column", "", {}}, {1.0, 2.0, 3.0});
  ds.flag("held", {"species"}, "held", "transported held", {0.0, 1.0, 0.0});
  ds.variable("bounds", {"species", "nv"}, {"1", "pairs", "", {}}, std::vector<double>(6, 0.5));
  ds.text("provenance_note", "a long text", "line 1\nline 2\n");
  write_dataset(ds, out);
  const NcReader r(out);
  REQUIRE(r.has_variable("species"));
  CHECK(r.read("species") == std::vector<double>{0.0, 1.0, 2.0});
  CHECK_FALSE(r.has_variable("nv"));  // the CF bounds dimension takes no coordinate
  CHECK(r.read_strings("species_name") == std::vector<std::string>{"SO2", "O2", "SO"});
  CHECK(r.var_text("column", "coordinates") == std::optional<std::string>("species_name"));
  CHECK(r.var_text("held", "flag_meanings") == std::optional<std::string>("transported held"));
  CHECK(r.read("held") == std::vector<double>{0.0, 1.0, 0.0});
  CHECK(r.text_variable("provenance_note") == std::optional<std::string>("line 1\nline 2\n"));
  CHECK_FALSE(r.text_variable("absent").has_value());
}

TEST_CASE("a Dataset is written once: data, flags, fills, texts and the writer's coordinates",
          "[netcdf]") {
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "dataset.nc";
  fs::remove(out);
  Dataset ds;
  ds.global_number("answer", 2.5);
  ds.dimension("x", 3);
  ds.strings("x_name", "x", "entry names", {"a", "b", "c"});
  ds.variable("v", {"x"}, {"cm-3", "values", "", {}}, {1.0, 2.0, 3.0});
  ds.variable("gap", {"x"}, {"1", "declared without data", "", {}}).nan_fill();
  ds.flag("state", {"x"}, "state of the entry", "no yes maybe", {0.0, 2.0, 1.0});
  ds.text("note", "a long text", "hello");
  write_dataset(ds, out);
  const NcReader r(out);
  CHECK(r.global_number("answer") == std::optional<double>(2.5));
  CHECK(r.read("v") == std::vector<double>{1.0, 2.0, 3.0});
  CHECK(r.var_text("v", "units") == std::optional<std::string>("cm-3"));
  for (double g : r.read("gap")) CHECK(std::isnan(g));
  CHECK(r.read("state") == std::vector<double>{0.0, 2.0, 1.0});
  CHECK(r.var_text("state", "flag_meanings") == std::optional<std::string>("no yes maybe"));
  CHECK(r.text_variable("note") == std::optional<std::string>("hello"));
  CHECK(r.read_strings("x_name") == std::vector<std::string>{"a", "b", "c"});
  // The writer's layout: an index coordinate for x and the names as auxiliary coordinates.
  CHECK(r.read("x") == std::vector<double>{0.0, 1.0, 2.0});
  CHECK(r.var_text("v", "coordinates") == std::optional<std::string>("x_name"));
}

TEST_CASE("a Dataset variable with the wrong amount of data leaves no file", "[netcdf]") {
  const fs::path out = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "dataset_short.nc";
  fs::remove(out);
  Dataset ds;
  ds.dimension("x", 3);
  ds.variable("v", {"x"}, {"1", "two values for three entries", "", {}}, {1.0, 2.0});
  CHECK_THROWS_AS(write_dataset(ds, out), RunError);
  CHECK_FALSE(fs::exists(out));
}
