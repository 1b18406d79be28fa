// Backgrounds and helpers shared by the transport tests.
#pragma once

#include <cmath>
#include <functional>
#include <span>
#include <vector>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "core/column_operator.hpp"
#include "solve/column_system.hpp"
#include "solve/steady_state.hpp"
#include "transport/transport_operator.hpp"

namespace colchem::test {

/// An isothermal column with constant gravity (huge radius), built by hand so that
/// n_a = n0 exp(-z/H_a) holds exactly at centres and edges.
inline Background isothermal_column(std::size_t cells, double top_cm, double T, double g,
                                    double air_amu, double n0, double K) {
  Background bg;
  bg.grid = Grid::uniform(0.0, top_cm, cells);
  bg.planet = PlanetSpec{"test (invented)", 1e30, g, 1.0};
  bg.molecule_mass_g = air_amu * constants::kAtomicMassUnit;
  const double H = constants::kBoltzmann * T / (bg.molecule_mass_g * g);
  const auto fill = [&](const std::vector<double>& z, std::vector<double>& gv,
                        std::vector<double>& Tv, std::vector<double>& p, std::vector<double>& na,
                        std::vector<double>& Kv) {
    for (double zz : z) {
      gv.push_back(g);
      Tv.push_back(T);
      na.push_back(n0 * std::exp(-zz / H));
      p.push_back(na.back() * constants::kBoltzmann * T);
      Kv.push_back(K);
    }
  };
  fill(bg.grid.center_cm, bg.gravity_cm_s2, bg.temperature_K, bg.pressure_dyn_cm2,
       bg.air_density_cm3, bg.eddy_cm2_s);
  fill(bg.grid.edge_cm, bg.edge_gravity_cm_s2, bg.edge_temperature_K, bg.edge_pressure_dyn_cm2,
       bg.edge_air_density_cm3, bg.edge_eddy_cm2_s);
  bg.scale_height_cm.assign(cells, H);
  return bg;
}

/// A hydrostatic, non-isothermal column with inverse-square gravity (core/background),
/// temperatures and eddy profile invented.
inline Background varying_column(std::size_t cells, bool uniform_grid = true) {
  BackgroundSpec spec;
  spec.planet = PlanetSpec{"test (invented)", 3.0e8, 800.0, 1.0};
  if (uniform_grid) {
    spec.grid = Grid::uniform(0.0, 300.0e5, cells);
  } else {
    std::vector<double> e;
    for (std::size_t j = 0; j <= cells; ++j) {
      const double u = static_cast<double>(j) / static_cast<double>(cells);
      e.push_back(300.0e5 * (0.6 * u + 0.4 * u * u));  // cells widen upward
    }
    spec.grid = Grid::from_edges(e);
  }
  spec.temperature_K = ProfileSpec{{0.0, 100.0e5, 300.0e5}, {250.0, 180.0, 600.0}, "invented"};
  spec.base_pressure_dyn_cm2 = 1.0e5;
  spec.base_altitude_cm = 0.0;
  spec.bulk_mole_fraction = {{"N2", 1.0}};
  spec.mean_molecular_mass_amu = 28.0;
  spec.eddy_form = EddyForm::kDensityPower;
  spec.eddy_cm2_s = 1.0e5;
  spec.eddy_exponent = 0.5;
  return build_background(spec);
}

/// f(z) for K f'' - (K/H) f' - k f = 0 on [0, L], f(0) = f0, f'(L) = 0.
/// Derivation (analytic): steady state of dn/dt = -dPhi/dz - k n with Phi = -K n_a df/dz and
/// n_a = n0 exp(-z/H): d/dz(K n_a f') = k n_a f, and n_a' = -n_a/H gives
/// K f'' - (K/H) f' - k f = 0. Roots r = [1/H +- sqrt(1/H^2 + 4k/K)]/2;
/// f = a e^{r+ z} + b e^{r- z}, a + b = f0, a r+ e^{r+ L} + b r- e^{r- L} = 0.
struct LossColumn {
  double K, H, k, L, f0;
  [[nodiscard]] double operator()(double z) const {
    const double q = std::sqrt(1.0 / (H * H) + 4.0 * k / K);
    const double rp = 0.5 * (1.0 / H + q), rm = 0.5 * (1.0 / H - q);
    const double den = rp * std::exp(rp * L) - rm * std::exp(rm * L);
    const double a = -f0 * rm * std::exp(rm * L) / den;
    const double b = f0 * rp * std::exp(rp * L) / den;
    return a * std::exp(rp * z) + b * std::exp(rm * z);
  }
};

/// A first-order loss L (s^-1) and a production P (cm^-3 s^-1), both n[j*S+s]-ordered (empty:
/// none), as a column operator: f = P - L n, its diagonal Jacobian and its exact implicit step.
class LinearSource final : public ColumnOperator {
 public:
  LinearSource(std::span<const double> loss, std::span<const double> production, std::size_t S)
      : loss_(loss.begin(), loss.end()), production_(production.begin(), production.end()), S_(S) {}
  void add_tendency(std::span<const double> n, double, std::span<double> tendency) override {
    for (std::size_t i = 0; i < n.size(); ++i) tendency[i] += p(i) - l(i) * n[i];
  }
  void add_jacobian(std::span<const double> n, double, BlockTridiagonal& jac) override {
    for (std::size_t i = 0; i < n.size(); ++i) jac.d(i / S_, i % S_, i % S_) -= l(i);
  }
  bool implicit_step(std::span<double> n, double, double dt) override {
    for (std::size_t i = 0; i < n.size(); ++i) n[i] = (n[i] + dt * p(i)) / (1.0 + dt * l(i));
    return true;
  }

 private:
  [[nodiscard]] double l(std::size_t i) const { return loss_.empty() ? 0.0 : loss_[i]; }
  [[nodiscard]] double p(std::size_t i) const { return production_.empty() ? 0.0 : production_[i]; }
  std::vector<double> loss_, production_;
  std::size_t S_;
};

/// The steady state of transport plus a first-order loss and a production, solved by the
/// coupled steady-state solver that `colchem run` uses (SteadyStateSolver: pseudo-transient
/// continuation ending in Newton's method) from n as the start, at time t. True when it
/// converged; n then holds the state.
inline bool solve_steady(TransportOperator& op, std::vector<double>& n, double t = 0.0,
                         std::span<const double> loss = {},
                         std::span<const double> production = {}) {
  const std::size_t S = op.species_count();
  LinearSource source(loss, production, S);
  ColumnSystem sys{{&op, &source}, n.size() / S, S};
  SteadyStateOptions o;
  o.time_s = t;
  const SteadyStateResult r = SteadyStateSolver(sys, o).solve(n);
  if (!r.converged()) return false;
  n = r.x;
  return true;
}

inline double column_total(const Grid& g, std::span<const double> n, std::size_t S, std::size_t s) {
  double sum = 0.0;
  for (std::size_t j = 0; j < g.cells(); ++j) sum += n[j * S + s] * g.width_cm(j);
  return sum;
}

}  // namespace colchem::test
