// The analytic Jacobian d(P - L)/dn against central finite differences (analytic: rates are
// polynomials of degree <= 2 in n, so a central difference is exact up to round-off) over
// the sulfur-oxygen-hydrogen test network configs/mechanisms/test_soh.yaml.
#include <catch2/catch.hpp>

#include <cmath>
#include <random>
#include <set>

#include "chem/chemistry_operator.hpp"
#include "io/mechanism_loader.hpp"

#include "soh_fixture.hpp"

using namespace colchem;

namespace {

using test::kBulk;
using test::soh_spec;

}  // namespace

TEST_CASE("test_soh network loads with every rate form", "[chem][jacobian]") {
  const UnitSystem units;
  const auto spec = soh_spec(units);
  const Mechanism& m = *spec.mechanism;
  CHECK(m.species.size() == 21);
  CHECK(m.reactions.size() == 52);
  std::set<RateForm> forms;
  for (const auto& rx : m.reactions) forms.insert(rx.rate.form);
  CHECK(forms.size() == 8);  // all eight forms occur (analytic: by construction of the file)
  CHECK(m.species[*m.species_index("CO2")].fixed);
  CHECK(m.modules[1].requires_modules == std::vector<std::size_t>{0});
}

TEST_CASE("analytic Jacobian matches central finite differences on test_soh",
          "[chem][jacobian]") {
  const UnitSystem units;
  const auto spec = soh_spec(units);
  const Mechanism& m = *spec.mechanism;
  const std::size_t S = m.species.size();
  // Three cells from the lower to the upper middle atmosphere (invented conditions).
  const std::vector<double> T{300.0, 230.0, 180.0};
  const std::vector<double> air{2.4e19, 1.0e17, 3.0e14};
  ChemistryOperator op(spec, T, air, {}, kBulk);
  std::mt19937 rng(12345);
  std::uniform_real_distribution<double> logu(2.0, 15.0);
  for (std::size_t c = 0; c < op.photolysis_channels().size(); ++c) {
    for (std::size_t j = 0; j < 3; ++j) op.set_photolysis_rate(c, j, std::pow(10.0, -logu(rng) / 2));
  }
  for (int trial = 0; trial < 5; ++trial) {
    std::vector<double> n(3 * S);
    for (auto& v : n) v = std::pow(10.0, logu(rng));
    op.impose_fixed(n);
    BlockTridiagonal jac(3, S);
    op.add_jacobian(n, 0.0, jac);
    std::vector<double> gross(3 * S, 0.0), P(S), L(S), R(op.kinetics().reaction_count());
    for (std::size_t j = 0; j < 3; ++j) {
      op.kinetics().production_loss(j, n.data() + j * S, P.data(), L.data(), R.data());
      for (std::size_t s = 0; s < S; ++s) gross[j * S + s] = P[s] + L[s];
    }
    std::size_t compared = 0;
    for (std::size_t j = 0; j < 3; ++j) {
      for (std::size_t q = 0; q < S; ++q) {
        const double h = 1e-6 * n[j * S + q];
        std::vector<double> up(n), dn(n), fu(3 * S, 0.0), fd(3 * S, 0.0);
        up[j * S + q] += h;
        dn[j * S + q] -= h;
        op.add_tendency(up, 0.0, fu);
        op.add_tendency(dn, 0.0, fd);
        for (std::size_t s = 0; s < S; ++s) {
          const double fdv = (fu[j * S + s] - fd[j * S + s]) / (2 * h);
          const double an = jac.d(j, s, q);
          // Round-off floor: 1e-16 of the gross rates over the 2e-6 relative step, x100.
          const double floor = 1e-8 * gross[j * S + s] / n[j * S + q];
          INFO("cell " << j << " d f[" << m.species[s].name << "] / d n[" << m.species[q].name << "]");
          CHECK(std::abs(an - fdv) <= 1e-6 * std::abs(an) + floor);
          ++compared;
        }
      }
    }
    CHECK(compared == 3 * S * S);
  }
}

TEST_CASE("fixed species have zero tendency and zero Jacobian rows", "[chem][jacobian]") {
  const UnitSystem units;
  const auto spec = soh_spec(units);
  const std::size_t S = spec.mechanism->species.size();
  const std::vector<double> T{250.0}, air{1e18};
  ChemistryOperator op(spec, T, air, {}, kBulk);
  std::vector<double> n(S, 1e10);
  op.impose_fixed(n);
  const std::size_t co2 = *spec.mechanism->species_index("CO2");
  CHECK(n[co2] == Approx(0.965e18));  // x_bulk n_air (analytic)
  std::vector<double> f(S, 0.0);
  op.add_tendency(n, 0.0, f);
  BlockTridiagonal jac(1, S);
  op.add_jacobian(n, 0.0, jac);
  CHECK(f[co2] == 0.0);  // analytic: held fixed
  for (std::size_t q = 0; q < S; ++q) CHECK(jac.d(0, co2, q) == 0.0);
  // ...while CO2 still drives other species: d f[CO] / d n[CO2] = J_CO2 = 0 here, but the
  // quenching SO2(a3B1) + CO2 makes d f[SO2] / d n[CO2] = k n[SO2(a3B1)] (analytic).
  const std::size_t so2 = *spec.mechanism->species_index("SO2");
  CHECK(jac.d(0, so2, co2) > 0.0);
}

TEST_CASE("condensation sink enters tendency and Jacobian piecewise", "[chem][jacobian]") {
  const UnitSystem units;
  auto spec = soh_spec(units);
  const Mechanism& m = *spec.mechanism;
  const std::size_t S = m.species.size();
  const std::size_t h2so4 = *m.species_index("H2SO4");
  CondensationExchange sink;
  sink.species = h2so4;
  sink.timescale_s = 1e4;
  sink.below_cm = 70e5;
  spec.exchanges.push_back(sink);
  // Ayers et al. (1980), from memory: ln(p/atm) = -10156/T + 16.259. At 250 K:
  // p = exp(-40.624 + 16.259) atm = exp(-24.365) = 2.6207e-11 atm = 2.6554e-5 dyn cm-2,
  // n_sat = p/(k_B T) = 2.6554e-5 / 3.4516e-14 = 7.6932e8 cm-3.
  CHECK(sink.saturation_density(250.0) == Approx(7.6932e8).epsilon(1e-4));
  const std::vector<double> T{250.0, 250.0, 250.0}, air{1e18, 1e18, 1e18};
  const std::vector<double> z{60e5, 65e5, 80e5};  // two cells below the deck, one above
  ChemistryOperator op(spec, T, air, z, kBulk);
  std::vector<double> n(3 * S, 1e6);
  n[0 * S + h2so4] = 1e10;   // supersaturated, below: sink acts
  n[1 * S + h2so4] = 1e8;    // subsaturated, below: no sink
  n[2 * S + h2so4] = 1e10;   // above the deck: no sink
  std::vector<double> C(3 * S);
  op.condensation_rates(n, C);
  CHECK(C[0 * S + h2so4] == Approx((1e10 - 7.6932e8) / 1e4).epsilon(1e-4));  // analytic
  CHECK(C[1 * S + h2so4] == 0.0);
  CHECK(C[2 * S + h2so4] == 0.0);
  BlockTridiagonal with(3, S), without(3, S);
  op.add_jacobian(n, 0.0, with);
  ChemistryOperator plain(soh_spec(units), T, air, z, kBulk);
  plain.add_jacobian(n, 0.0, without);
  CHECK(with.d(0, h2so4, h2so4) - without.d(0, h2so4, h2so4) == Approx(-1e-4));  // -1/tau
  CHECK(with.d(1, h2so4, h2so4) == without.d(1, h2so4, h2so4));
  CHECK(with.d(2, h2so4, h2so4) == without.d(2, h2so4, h2so4));
}

TEST_CASE("parameter sensitivities match finite differences in the parameter",
          "[chem][jacobian]") {
  const UnitSystem units;
  const auto spec = soh_spec(units);
  const Mechanism& m = *spec.mechanism;
  const std::size_t S = m.species.size();
  const std::vector<double> T{280.0, 220.0}, air{1e19, 1e17};
  ChemistryOperator op(spec, T, air, {}, kBulk);
  std::vector<double> n(2 * S);
  for (std::size_t i = 0; i < n.size(); ++i) n[i] = 1e9 + 1e7 * static_cast<double>(i);
  op.impose_fixed(n);
  std::vector<double> sens(m.parameters.size() * 2 * S);
  op.parameter_sensitivities(n, sens);
  const double p0 = spec.parameters[0];
  const double dp = 1e-3;
  std::vector<double> fu(2 * S, 0.0), fd(2 * S, 0.0);
  op.kinetics().set_parameter(0, p0 + dp);
  op.add_tendency(n, 0.0, fu);
  op.kinetics().set_parameter(0, p0 - dp);
  op.add_tendency(n, 0.0, fd);
  op.kinetics().set_parameter(0, p0);
  const std::size_t h2so3 = *m.species_index("H2SO3");
  for (std::size_t i = 0; i < 2 * S; ++i) {
    const double fdv = (fu[i] - fd[i]) / (2 * dp);  // exact: f is linear in beta (analytic)
    CHECK(sens[i] == Approx(fdv).epsilon(1e-6).margin(1e-20 + 1e-9 * std::abs(fu[i])));
  }
  // d f[H2SO3]/d beta = k n[SO2(a3B1)] n[H2O] with k = 1.0e-12 (analytic, invented k).
  const std::size_t t3 = *m.species_index("SO2(a3B1)");
  const std::size_t h2o = *m.species_index("H2O");
  CHECK(sens[h2so3] == Approx(1.0e-12 * n[t3] * n[h2o]).epsilon(1e-12));
  // d k / d beta of the "1 - beta" channel is -k_base (analytic).
  std::vector<double> dk(m.parameters.size() * op.kinetics().reaction_count() * 2);
  op.kinetics().rate_constant_sensitivities(dk);
  double plus = 0.0, minus = 0.0;
  for (double v : dk) (v > 0 ? plus : minus) += v;
  CHECK(plus == Approx(2 * 1.0e-12));
  CHECK(minus == Approx(-2 * 1.0e-12));
}
