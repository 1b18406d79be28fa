// Table files: formats, unit conversion and every class of table error.
#include <catch2/catch.hpp>

#include "../test_support.hpp"

#include "core/interp.hpp"
#include "io/table.hpp"

using namespace colchem;

using colchem_test::error_of;

TEST_CASE("comma and white-space tables with units in the header", "[table]") {
  const UnitSystem units;
  const auto csv = Table::parse("# source: invented\naltitude [km], pressure [mbar]\n0, 1000\n"
                                "5, 500 # trailing comment\n",
                                "a.csv");
  CHECK(csv.rows() == 2);
  CHECK(csv.column("altitude", units, "m")[1] == Approx(5000.0));
  // 1 mbar = 100 Pa (definition of the bar).
  CHECK(csv.column("pressure", units, "Pa")[1] == Approx(5e4));
  CHECK(csv.line_of_row(1) == 4);
  const auto ws = Table::parse("altitude [m] temperature [degC]\n0 15\n1000 8.5\n", "b.txt");
  // 15 degC = 288.15 K (definition of the Celsius scale).
  CHECK(ws.column("temperature", units, "K")[0] == Approx(288.15));
  CHECK(ws.column("altitude", units, "km")[1] == Approx(1.0));
}

TEST_CASE("table errors name the file, line and column", "[table]") {
  const UnitSystem units;
  CHECK(error_of([] { (void)Table::parse("a [km], b [K]\n1, 2\n3\n", "t.csv"); }) ==
        "t.csv:3: expected 2 fields (as in the header on line 1), found 1 fields");
  CHECK(error_of([] { (void)Table::parse("a [km], b [K]\n1, hot\n", "t.csv"); }) ==
        "t.csv:2: 'b': expected a finite number, found 'hot'");
  CHECK(error_of([] { (void)Table::parse("# only a comment\n", "t.csv"); }) ==
        "t.csv: expected a header line naming the columns, found an empty file");
  CHECK(error_of([] { (void)Table::parse("a [km]\n", "t.csv"); }) ==
        "t.csv:1: expected at least one data row after the header, found none");
  CHECK(error_of([] { (void)Table::parse("a [km, b\n1, 2\n", "t.csv"); }) ==
        "t.csv:1: 'header': expected 'name [unit]' for every column, found 'a [km' without ']'");
  const auto t = Table::parse("altitude [km], temperature [K]\n0, 200\n0, 210\n", "t.csv");
  CHECK(error_of([&] { (void)t.column("temperatur", units, "K"); }) ==
        "t.csv:1: 'header': expected a column named 'temperatur', found columns altitude, "
        "temperature; did you mean 'temperature'?");
  CHECK(error_of([&] { (void)t.column("temperature", units, "cm"); }) ==
        "t.csv:1: 'temperature': expected a unit convertible to 'cm', found 'K'; write the unit "
        "in brackets after the column name, e.g. 'temperature [cm]'");
  CHECK(error_of([&] { t.require_increasing("altitude"); }) ==
        "t.csv:3: 'altitude': expected values increasing down the column, found 0 after 0");
}

TEST_CASE("interpolation: linear, logarithmic, and no silent extrapolation", "[table][interp]") {
  const std::vector<double> x{0.0, 10.0, 20.0};
  const std::vector<double> y{100.0, 10.0, 1.0};
  const std::vector<double> at{5.0, 15.0};
  // Analytic: linear midpoint of 100 and 10 is 55; the log midpoint is sqrt(100*10).
  CHECK((*interpolate(x, y, at, InterpScale::kLinear, Extrapolation::kForbid))[0] == Approx(55.0));
  CHECK((*interpolate(x, y, at, InterpScale::kLog, Extrapolation::kForbid))[0] ==
        Approx(std::sqrt(1000.0)));
  const std::vector<double> outside{-1.0, 25.0};
  std::size_t bad = 99;
  CHECK_FALSE(interpolate(x, y, outside, InterpScale::kLinear, Extrapolation::kForbid, &bad));
  CHECK(bad == 0);
  const auto held = *interpolate(x, y, outside, InterpScale::kLinear, Extrapolation::kHoldEnds);
  CHECK(held[0] == 100.0);
  CHECK(held[1] == 1.0);
}
