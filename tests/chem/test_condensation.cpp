// Exchange with a condensed phase (chem/condensation.hpp) through the chemistry operator:
// relaxation to saturation against the closed form, evaporation only over a reservoir, the
// Jacobian against finite differences, the kinetic law and the saturation formulae.
#include <catch2/catch.hpp>

#include <cmath>

#include "chem/chemistry_operator.hpp"
#include "chem/condensation.hpp"
#include "core/constants.hpp"
#include "io/mechanism_loader.hpp"

#include "soh_fixture.hpp"

using namespace colchem;

namespace {

using test::kBulk;
using test::soh_spec;

// The test network removes H2SO4 by the first-order sink "H2SO4 ->" with k = 1e-6 s^-1
// (configs/mechanisms/test_soh.yaml); with every other species at zero and J = 0 nothing
// else changes H2SO4, so dn/dt = -lambda n - k (n - n_sat) on the active branch.
constexpr double kLambda = 1.0e-6;

CondensationExchange exchange(std::size_t species, double tau_s) {
  CondensationExchange x;
  x.species = species;
  x.saturation = CondensationExchange::Saturation::kH2SO4Ayers1980;
  x.rate = CondensationExchange::Rate::kTimescale;
  x.timescale_s = tau_s;
  return x;
}

ProfileSpec everywhere(double value) {
  ProfileSpec p;
  p.altitude_cm = {0.0, 200e5};
  p.value = {value, value};
  return p;
}

/// Integrates one cell from n0 over [0, t] in steps of dt with the operator's implicit step.
double evolve(ChemistryOperator& op, std::size_t S, std::size_t s, double n0, double t, double dt) {
  std::vector<double> n(S, 0.0);
  n[s] = n0;
  for (double now = 0.0; now < t - 0.5 * dt; now += dt) REQUIRE(op.implicit_step(n, now, dt));
  return n[s];
}

}  // namespace

TEST_CASE("two-way exchange relaxes to saturation as the closed form", "[chem][condensation]") {
  const UnitSystem units;
  auto spec = soh_spec(units);
  const std::size_t S = spec.mechanism->species.size();
  const std::size_t h2so4 = *spec.mechanism->species_index("H2SO4");
  const double tau = 1.0e3, k = 1.0 / tau;
  auto x = exchange(h2so4, tau);
  x.has_condensed = true;
  x.condensed.table = everywhere(1.0);  // condensed acid present in the cell
  spec.exchanges.push_back(x);
  const std::vector<double> T{230.0}, air{1e18}, z{80e5};
  ChemistryOperator op(spec, T, air, z, kBulk);
  const double n_sat = x.saturation_density(230.0);
  // Analytic: n(t) = n_inf + (n0 - n_inf) exp(-(k + lambda) t), n_inf = k n_sat / (k + lambda).
  const double n_inf = k * n_sat / (k + kLambda);
  for (const double n0 : {20.0 * n_sat, 0.05 * n_sat}) {  // condensation, then evaporation
    for (const double t : {0.5 * tau, 2.0 * tau, 6.0 * tau}) {
      const double expected = n_inf + (n0 - n_inf) * std::exp(-(k + kLambda) * t);
      CHECK(evolve(op, S, h2so4, n0, t, t) == Approx(expected).epsilon(1e-4));  // analytic
    }
  }
  // At saturation the exchange is zero (analytic).
  std::vector<double> n(S, 0.0), C(S, 0.0);
  n[h2so4] = n_sat;
  op.condensation_rates(n, C);
  CHECK(C[h2so4] == 0.0);
}

TEST_CASE("without a condensed reservoir the vapour does not evaporate", "[chem][condensation]") {
  const UnitSystem units;
  auto spec = soh_spec(units);
  const std::size_t S = spec.mechanism->species.size();
  const std::size_t h2so4 = *spec.mechanism->species_index("H2SO4");
  const double tau = 1.0e3, k = 1.0 / tau;
  auto x = exchange(h2so4, tau);
  x.has_condensed = true;
  x.condensed.table.altitude_cm = {0.0, 70e5, 71e5, 200e5};
  x.condensed.table.value = {1.0, 1.0, 0.0, 0.0};  // condensed acid only below ~70 km
  spec.exchanges.push_back(x);
  const std::vector<double> T{230.0}, air{1e18}, z{90e5};  // a cell above the reservoir
  ChemistryOperator op(spec, T, air, z, kBulk);
  const double n_sat = x.saturation_density(230.0);
  const double t = 3.0 * tau;
  // Subsaturated, no reservoir: only the first-order sink acts (analytic: n0 e^{-lambda t}).
  const double n0 = 0.1 * n_sat;
  CHECK(evolve(op, S, h2so4, n0, t, t) == Approx(n0 * std::exp(-kLambda * t)).epsilon(1e-5));
  // Supersaturated: condensation acts until saturation (analytic, the closed form while
  // n > n_sat); afterwards only the sink acts, so n stays between n_sat e^{-lambda t} and
  // n_sat (no evaporation brings it back up).
  const double n1 = 3.0 * n_sat, n_inf = k * n_sat / (k + kLambda);
  const double t1 = 0.5 * tau;
  CHECK(evolve(op, S, h2so4, n1, t1, t1) ==
        Approx(n_inf + (n1 - n_inf) * std::exp(-(k + kLambda) * t1)).epsilon(1e-4));
  const double late = evolve(op, S, h2so4, n1, 30.0 * tau, 3.0 * tau);
  CHECK(late <= n_sat * (1.0 + 1e-4));
  CHECK(late >= n_sat * std::exp(-kLambda * 30.0 * tau) * (1.0 - 1e-4));
}

TEST_CASE("exchange Jacobian matches finite differences on both branches",
          "[chem][condensation][jacobian]") {
  const UnitSystem units;
  auto spec = soh_spec(units);
  const std::size_t S = spec.mechanism->species.size();
  const std::size_t h2so4 = *spec.mechanism->species_index("H2SO4");
  auto with_reservoir = exchange(h2so4, 3.0e3);
  with_reservoir.has_condensed = true;
  with_reservoir.condensed.table = everywhere(1.0);
  with_reservoir.below_cm = 75e5;
  auto kinetic = exchange(h2so4, 0.0);
  kinetic.rate = CondensationExchange::Rate::kKinetic;
  kinetic.accommodation = 0.5;
  kinetic.surface_area_cm2_cm3.table = everywhere(2e-7);
  kinetic.saturation = CondensationExchange::Saturation::kH2SO4Aqueous;
  kinetic.weight_fraction.constant = 0.8;
  kinetic.above_cm = 75e5;
  spec.exchanges = {with_reservoir, kinetic};
  const std::vector<double> T{230.0, 230.0, 200.0, 200.0}, air{1e18, 1e18, 1e17, 1e17};
  const std::vector<double> z{60e5, 70e5, 80e5, 90e5};
  ChemistryOperator op(spec, T, air, z, kBulk);
  const double sat0 = with_reservoir.saturation_density(230.0);
  const double sat2 = kinetic.saturation_density(200.0, 0.8);
  std::vector<double> n(4 * S, 1e5);
  n[0 * S + h2so4] = 5.0 * sat0;  // condensing
  n[1 * S + h2so4] = 0.2 * sat0;  // evaporating over the reservoir
  n[2 * S + h2so4] = 4.0 * sat2;  // condensing on the aerosol surface
  n[3 * S + h2so4] = 0.3 * sat2;  // evaporating from it
  BlockTridiagonal jac(4, S);
  op.add_jacobian(n, 0.0, jac);
  for (std::size_t j = 0; j < 4; ++j) {
    const double h = 1e-6 * n[j * S + h2so4];
    std::vector<double> up(n), dn(n), fu(4 * S, 0.0), fd(4 * S, 0.0);
    up[j * S + h2so4] += h;
    dn[j * S + h2so4] -= h;
    op.add_tendency(up, 0.0, fu);
    op.add_tendency(dn, 0.0, fd);
    const double fdiff = (fu[j * S + h2so4] - fd[j * S + h2so4]) / (2.0 * h);
    // Analytic: central differences are exact for a function linear on each branch.
    CHECK(jac.d(j, h2so4, h2so4) == Approx(fdiff).epsilon(1e-6));
  }
  // Kinetic law (analytic): k = alpha vbar A / 4 with vbar = sqrt(8 k_B T / (pi m)); for
  // H2SO4 (98.08 g mol-1) at 200 K, m = 1.6287e-22 g, vbar = sqrt(8 * 1.380649e-16 * 200 /
  // (pi * 1.6287e-22)) = 2.0778e4 cm s-1, so k = 0.5 * 2.0778e4 * 2e-7 / 4 = 5.1946e-4 s-1.
  double k_cell = 0.0;
  for (const auto& c : op.exchange_cells()) {
    if (c.cell == 2) k_cell = c.k;
  }
  CHECK(k_cell == Approx(5.1946e-4).epsilon(1e-3));
}

TEST_CASE("saturation over aqueous sulfuric acid", "[chem][condensation]") {
  // Kulmala and Laaksonen (1990) reduce to the Ayers et al. (1980) fit at T0 = 360.15 K and
  // share its slope there, d ln p / d(1/T) = -10156 K (analytic, from the formula; both
  // from memory).
  CHECK(h2so4_pure_pressure_atm(360.15) ==
        Approx(h2so4_pure_pressure_ayers_atm(360.15)).epsilon(1e-12));
  const double h = 1e-3;
  const double slope = (std::log(h2so4_pure_pressure_atm(360.15 + h)) -
                        std::log(h2so4_pure_pressure_atm(360.15 - h))) /
                       (1.0 / (360.15 + h) - 1.0 / (360.15 - h));
  CHECK(slope == Approx(-10156.0).epsilon(1e-6));
  // Ayers et al. (1980), from memory: ln(p/atm) = -10156/T + 16.259; at 300 K:
  // p = exp(-33.8533 + 16.259) = exp(-17.5943) = 2.2850e-8 atm.
  CHECK(h2so4_pure_pressure_ayers_atm(300.0) == Approx(2.2850e-8).epsilon(1e-4));
  // The extension bends below the fit at low T (the heat capacity term 0.38/(Tc - T0)
  // (1 + ln(T0/T) - T0/T) is negative for T != T0; analytic).
  CHECK(h2so4_pure_pressure_atm(200.0) < h2so4_pure_pressure_ayers_atm(200.0));
  // Pure acid has activity 1 at any T (analytic); more dilute acid holds H2SO4 more
  // strongly (the activity increases with the weight fraction; Giauque et al. 1960, from
  // memory).
  CHECK(h2so4_activity(1.0, 250.0) == Approx(1.0));
  double prev = 0.0;
  for (double w = 0.4; w <= 1.0 + 1e-12; w += 0.05) {
    const double a = h2so4_activity(std::min(w, 1.0), 250.0);
    CHECK(a > prev);
    prev = a;
  }
  // Ln a scales as 1/T (common practice, no source): a(w, T)^T is independent of T.
  CHECK(std::log(h2so4_activity(0.75, 200.0)) * 200.0 ==
        Approx(std::log(h2so4_activity(0.75, 298.15)) * 298.15).epsilon(1e-12));
  CondensationExchange x;
  x.saturation = CondensationExchange::Saturation::kH2SO4Aqueous;
  // n_sat = a p_pure / (k_B T) (analytic).
  CHECK(x.saturation_density(220.0, 0.8) ==
        Approx(h2so4_activity(0.8, 220.0) * h2so4_pure_pressure_atm(220.0) * 1.01325e6 /
               (constants::kBoltzmann * 220.0))
            .epsilon(1e-12));
}
