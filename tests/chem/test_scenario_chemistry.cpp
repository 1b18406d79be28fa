// The chemistry of a scenario: load_scenario fills Scenario::chemistry, and a
// ChemistryOperator built from it and the Background runs on the column.
#include <catch2/catch.hpp>

#include "chem/chemistry_operator.hpp"
#include "io/scenario.hpp"

using namespace colchem;

TEST_CASE("scenario chemistry section builds a column chemistry operator", "[chem][scenario]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(COLCHEM_SOURCE_DIR "/tests/chem/scenario_soh.yaml", {}, units);
  REQUIRE(sc.chemistry.mechanism);
  const Mechanism& m = *sc.chemistry.mechanism;
  CHECK(sc.chemistry.modules.size() == 2);
  CHECK(sc.chemistry.parameters[*m.parameter_index("beta_h2so3")] == 0.02);  // from the file
  REQUIRE(sc.chemistry.exchanges.size() == 1);
  CHECK(sc.chemistry.exchanges[0].below_cm == Approx(70e5));
  CHECK(sc.chemistry.exchanges[0].timescale_s == Approx(86400.0));
  bool recorded = false;
  for (const auto& in : sc.inputs) recorded = recorded || in.role == "mechanism";
  CHECK(recorded);

  const Background bg = build_background(sc.background);
  ChemistryOperator op(sc.chemistry, bg);
  const std::size_t S = op.species_count(), N = op.cells();
  CHECK(N == 27);
  std::vector<double> n(N * S, 0.0);
  for (std::size_t j = 0; j < N; ++j) {
    n[j * S + *m.species_index("SO2")] = 1e-7 * bg.air_density_cm3[j];
    n[j * S + *m.species_index("H2O")] = 1e-6 * bg.air_density_cm3[j];
    n[j * S + *m.species_index("O2")] = 1e-6 * bg.air_density_cm3[j];
    n[j * S + *m.species_index("H2SO4")] = 1e10;  // supersaturated at 230 K (n_sat ~ 1e7)
  }
  op.impose_fixed(n);
  const std::size_t c = op.kinetics().channel_index("SO2_excite");
  REQUIRE(c != Kinetics::npos);
  op.set_photolysis_rates(c, std::vector<double>(N, 1e-4));
  std::vector<double> C(N * S);
  op.condensation_rates(n, C);
  const std::size_t h2so4 = *m.species_index("H2SO4");
  // Cells are 2 km thick from 58 km: centres 59 ... 69 km (6 cells) lie below the deck.
  for (std::size_t j = 0; j < N; ++j) {
    INFO("cell " << j);
    CHECK((C[j * S + h2so4] > 0.0) == (j < 6));  // analytic: deck top at 70 km
  }
  std::vector<double> R(N * op.kinetics().reaction_count());
  op.reaction_rates(n, R);
  std::vector<double> before(n);
  const bool ok = op.implicit_step(n, 0.0, 3600.0);
  const auto& st = op.integrator_stats();
  INFO("steps " << st.steps << " rejected " << st.rejected << " negative " << st.negative_rejections
       << " newton " << st.newton_failures << " last " << st.last_step);
  REQUIRE(ok);
  // Fixed CO2 is unchanged; H2SO4 below the deck relaxes (tau = 1 d) and is produced above.
  const std::size_t co2 = *m.species_index("CO2");
  CHECK(n[co2] == before[co2]);
  CHECK(n[h2so4] < before[h2so4]);
}
