// Formula parsing: element counts and molar masses (IUPAC standard atomic weights, from memory).
#include <catch2/catch.hpp>

#include "core/composition.hpp"

using namespace colchem;

TEST_CASE("formulae give element counts and molar masses", "[composition]") {
  const auto h2so4 = parse_formula("H2SO4");
  REQUIRE(h2so4);
  CHECK(h2so4->composition.atoms == std::map<std::string, int>{{"H", 2}, {"S", 1}, {"O", 4}});
  // 2(1.008) + 32.06 + 4(15.999) = 98.072 g/mol (hand sum).
  CHECK(h2so4->composition.molar_mass_g_mol() == Approx(98.072).epsilon(1e-6));
  // CO2: 12.011 + 2(15.999) = 44.009 g/mol.
  CHECK(parse_formula("CO2")->composition.molar_mass_g_mol() == Approx(44.009).epsilon(1e-6));
  const auto group = parse_formula("Ca(OH)2");
  REQUIRE(group);
  CHECK(group->composition.atoms == std::map<std::string, int>{{"Ca", 1}, {"O", 2}, {"H", 2}});
  CHECK(parse_formula("ClCO3")->composition.atoms.at("Cl") == 1);
}

TEST_CASE("state labels share their base composition", "[composition]") {
  const auto o1d = parse_formula("O(1D)");
  REQUIRE(o1d);
  CHECK(o1d->base == "O");
  CHECK(o1d->label == "1D");
  CHECK(o1d->composition == parse_formula("O")->composition);
  const auto trip = parse_formula("SO2(a3B1)");
  REQUIRE(trip);
  CHECK(trip->label == "a3B1");
  CHECK(trip->composition == parse_formula("SO2")->composition);
}

TEST_CASE("bad formulae are rejected with a reason", "[composition]") {
  std::string why;
  CHECK_FALSE(parse_formula("Xq2", &why));
  CHECK(why == "unknown element 'Xq'");
  CHECK_FALSE(parse_formula("so2", &why));
  CHECK(why == "unexpected character 's'");
  CHECK_FALSE(parse_formula("SO2()", &why));
  CHECK(why == "empty state label '()'");
  CHECK_FALSE(parse_formula("", &why));
}

// Counts that would overflow an int are refused (the limit 9999 is colchem's own, common
// practice, no source); the largest allowed count still parses.
TEST_CASE("element counts beyond the limit are refused before they overflow", "[composition]") {
  std::string why;
  CHECK_FALSE(parse_formula("O99999999999", &why));
  CHECK(why == "a count above 9999");
  CHECK_FALSE(parse_formula("(O5000)2", &why));
  CHECK(why == "more than 9999 atoms of O");
  CHECK_FALSE(parse_formula("O5000O5000", &why));
  CHECK(why == "more than 9999 atoms of O");
  const auto big = parse_formula("C9999");
  REQUIRE(big);
  CHECK(big->composition.atoms.at("C") == 9999);
}
