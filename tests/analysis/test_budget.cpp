// Species and element budgets on a small hand-built column (values computed by hand).
#include <catch2/catch.hpp>

#include "analysis/budget.hpp"
#include "chem/condensation.hpp"

using namespace colchem;

namespace {
// Two cells of 1 km; species O3, O, O2 (held); reactions:
//   r0: O2 + hv -> 2 O        rates [2, 4] cm-3 s-1
//   r1: O + O2 + M -> O3 + M  rates [1, 3]
//   r2: O + O3 -> 2 O2        rates [0.5, 0.5]
BudgetInputs column() {
  BudgetInputs in;
  in.edge_cm = {0.0, 1e5, 2e5};
  in.species = {"O3", "O", "O2"};
  in.equations = {"O2 + hv -> 2 O", "O + O2 + M -> O3 + M", "O + O3 -> 2 O2"};
  in.reaction_ids = {"o2_photo", "o_o2_m", "o_o3"};
  in.net_stoichiometry = {0, 2, -1, /**/ 1, -1, -1, /**/ -1, -1, 2};
  in.reaction_rate = {2, 4, /**/ 1, 3, /**/ 0.5, 0.5};
  // Transport: O3 [-0.5, -2.5] so that O3 is at steady state in both cells (by hand:
  // O3 net chem = r1 - r2 = [0.5, 2.5]); O net chem = 2 r0 - r1 - r2 = [2.5, 4.5].
  in.transport_tendency = {-0.5, -2.5, /**/ -2.5, -4.5, /**/ 0, 0};
  in.net_tendency = {0, 0, /**/ 0, 0, /**/ 0, 0};
  return in;
}
}  // namespace

TEST_CASE("a species budget lists its reactions with shares and closes", "[budget]") {
  const auto b = species_budget(column(), "O3", {0.0, 1e5, 2e5});
  // Production of O3 by r1: (1 + 3) x 1e5 = 4e5 cm-2 s-1; loss by r2: 1e5 (by hand).
  REQUIRE(b.production.size() == 1);
  CHECK(b.production[0].equation == "O + O2 + M -> O3 + M");
  CHECK(b.column_production == Approx(4e5));
  CHECK(b.column_loss == Approx(1e5));
  CHECK(b.column_transport == Approx(-3e5));
  CHECK(b.column_net == Approx(0.0).margin(1e-9));
  CHECK(b.production[0].share == Approx(1.0));
  CHECK(b.production[0].bands[1] == Approx(3e5));
  CHECK(b.closure < 1e-15);
  const auto o = species_budget(column(), "O", {});
  // O: production 2 r0 = 12e5; losses r1 4e5 (share 4/5) and r2 1e5 (1/5), sorted by size.
  CHECK(o.column_production == Approx(12e5));
  CHECK(o.loss[0].reaction == 1);
  CHECK(o.loss[0].share == Approx(0.8));
  CHECK(o.loss[1].share == Approx(0.2));
  // Rows name the reaction by id, then equation (the id of r1, as set above).
  CHECK(o.loss[0].id == "o_o2_m");
  CHECK(format_species_budget(o, 5).find("o_o2_m  O + O2 + M -> O3 + M") != std::string::npos);
}

TEST_CASE("a budget that does not add up reports its closure error", "[budget]") {
  auto in = column();
  in.net_tendency[0] = 1.0;  // the model claims O3 grows by 1 cm-3 s-1 in cell 0
  const auto b = species_budget(in, "O3", {});
  // |listed - model| = 1 against a gross of |r1| + |r2| + |T| = 1 + 0.5 + 0.5 = 2 in cell 0,
  // and 3 + 0.5 + 2.5 = 6 in cell 1; the largest gross (6) normalises: 1/6.
  CHECK(b.closure == Approx(1.0 / 6.0));
}

TEST_CASE("element budgets: balanced chemistry conserves, held species supply", "[budget]") {
  const auto in = column();
  const std::vector<std::vector<std::pair<std::string, int>>> atoms{{{"O", 3}}, {{"O", 1}}, {{"O", 2}}};
  // Boundary fluxes chosen to carry away what transport removes: O3 column transport is
  // -3e5 and O -7e5 (by hand), i.e. top fluxes 3e5 and 7e5 with zero bottom flux.
  const std::vector<double> bottom{0, 0, 0}, top{3e5, 7e5, 0};
  const auto e = element_budgets(in, atoms, {false, false, true}, bottom, top);
  REQUIRE(e.size() == 1);
  // O atoms: unknowns' chemistry 3 (4e5 - 1e5) + 1 (12e5 - 4e5 - 1e5) = 16e5;
  // held O2: 2 (-6e5 - 4e5 + 2e5) = -16e5 (supplied); sinks = 0; boundary -(3x3e5 + 7e5) = -16e5.
  CHECK(e[0].chemistry == Approx(16e5));
  CHECK(e[0].held_supply == Approx(-16e5));
  CHECK(e[0].sinks == Approx(0.0).margin(1e-6));
  CHECK(e[0].boundary_in == Approx(-16e5));
  CHECK(e[0].relative_imbalance < 1e-15);
}

TEST_CASE("element budgets count the condensed phase and held-profile supply as their own terms",
          "[budget][condensation]") {
  // Two cells of 1 km, species SO3 and H2SO4 (atoms S, O, H); pseudo-reactions as the
  // column model writes them (rate = loss from the gas, negative = supplied):
  //   r0: H2SO4 -> (condensed phase)       rates [3, -1]  (condenses in cell 0, evaporates in 1)
  //   r1: SO3 -> (held-profile supply)     rates [-2, 0]  (supplied in cell 0)
  BudgetInputs in;
  in.edge_cm = {0.0, 1e5, 2e5};
  in.species = {"SO3", "H2SO4"};
  in.equations = {std::string("H2SO4 -> ") + kCondensedPhaseMarker,
                  std::string("SO3 -> ") + kHeldProfileMarker};
  in.net_stoichiometry = {0, -1, /**/ -1, 0};
  in.reaction_rate = {3, -1, /**/ -2, 0};
  in.transport_tendency = {2, 0, /**/ -3, 1};
  in.net_tendency = {0, 0, /**/ 0, 0};
  const std::vector<std::vector<std::pair<std::string, int>>> atoms{
      {{"S", 1}, {"O", 3}}, {{"H", 2}, {"S", 1}, {"O", 4}}};
  const auto e = element_budgets(in, atoms, {false, false}, std::vector<double>{0, 0},
                                 std::vector<double>{0, 0});
  // By hand, S (one per molecule): condensed = -(3 - 1) x 1e5 = -2e5 (net condensation);
  // profile supply = +2e5; both inside the chemical term, which sums to 0.
  for (const auto& b : e) {
    if (b.element != "S") continue;
    CHECK(b.condensed == Approx(-2e5));
    CHECK(b.profile_supply == Approx(2e5));
    CHECK(b.chemistry == Approx(0.0).margin(1e-9));
  }
  // H (two per H2SO4): condensed -4e5, no profile supply (SO3 has no H).
  for (const auto& b : e) {
    if (b.element != "H") continue;
    CHECK(b.condensed == Approx(-4e5));
    CHECK(b.profile_supply == 0.0);
  }
}

TEST_CASE("a band where a loss term runs backwards is printed with a minus sign",
          "[budget][condensation]") {
  // The exchange of the case above for H2SO4: it condenses in cell 0 (rate 3, a loss of
  // 3e5 cm-2 s-1 over its 1 km band) and evaporates in cell 1 (rate -1: a gain of 1e5).
  // By hand, the loss row lists +3.000e+05 and -1.000e+05; the column 2e5.
  BudgetInputs in;
  in.edge_cm = {0.0, 1e5, 2e5};
  in.species = {"H2SO4"};
  in.equations = {std::string("H2SO4 -> ") + kCondensedPhaseMarker};
  in.net_stoichiometry = {-1};
  in.reaction_rate = {3, -1};
  in.transport_tendency = {-3, 1};
  in.net_tendency = {0, 0};
  const SpeciesBudget b = species_budget(in, "H2SO4", {0.0, 1e5, 2e5});
  const std::string text = format_species_budget(b, 5);
  INFO(text);
  CHECK_THAT(text, Catch::Contains("  3.000e+05  -1.000e+05  H2SO4 -> "));
  CHECK_THAT(text, Catch::Contains("2.0000e+05"));
}
