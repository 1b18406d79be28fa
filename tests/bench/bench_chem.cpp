// Benchmark (not a test): rate constants, tendencies and the analytic Jacobian of the
// chemistry for 120 levels x 40 species x 150 reactions of a synthetic mechanism (random
// uni- and bimolecular reactions with Arrhenius, JPL fall-off, Troe and photolysis laws).
// Prints the time per column evaluation. Run: build/tests/bench/bench_chem
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <memory>
#include <random>

#include "chem/chemistry_operator.hpp"

using namespace colchem;

namespace {

std::shared_ptr<Mechanism> synthetic(std::size_t S, std::size_t R, std::mt19937& rng) {
  auto m = std::make_shared<Mechanism>();
  m->name = "synthetic";
  for (std::size_t s = 0; s < S; ++s) {
    Species sp;
    // append(): GCC 12 warns falsely (-Wrestrict, GCC bug 105329) on operator+.
    sp.name = std::string("X").append(std::to_string(s));
    m->species.push_back(sp);
  }
  m->modules.push_back(Module{"all", "", {}, {}, {}});
  std::uniform_int_distribution<std::size_t> pick(0, S - 1);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  for (std::size_t r = 0; r < R; ++r) {
    Reaction rx;
    const double kind = u(rng);
    rx.reactants.push_back({pick(rng), 1});
    if (kind > 0.25) rx.reactants.push_back({pick(rng), 1});
    rx.products.push_back({pick(rng), 1});
    rx.products.push_back({pick(rng), 1});
    if (kind <= 0.15) {
      rx.rate.form = RateForm::kPhotolysis;
      rx.rate.channel = std::string("J").append(std::to_string(r % 20));
      rx.photon = true;
    } else if (kind <= 0.25) {
      rx.rate.form = RateForm::kArrhenius;
      rx.rate.arrhenius = {1e-3, 0.0, 500.0};
    } else if (kind <= 0.75) {
      rx.rate.form = RateForm::kArrhenius;
      rx.rate.arrhenius = {1e-11 * u(rng), -1.0 + 2 * u(rng), 2000 * u(rng)};
    } else if (kind <= 0.92) {
      rx.rate.form = RateForm::kFalloff;
      rx.rate.k0_300 = 1e-31;
      rx.rate.n = 3.0;
      rx.rate.kinf_300 = 1e-11;
      rx.rate.m = 0.5;
      rx.third_body = true;
    } else {
      rx.rate.form = RateForm::kTroe;
      rx.rate.k0 = {1e-31, -3.0, 0.0};
      rx.rate.kinf = {1e-11, 0.0, 0.0};
      rx.rate.alpha = 0.5;
      rx.rate.T3 = 300.0;
      rx.rate.T1 = 3000.0;
      rx.third_body = true;
    }
    m->modules[0].reactions.push_back(r);
    m->reactions.push_back(rx);
  }
  return m;
}

template <class F>
double seconds_per_call(F&& f, int repeat) {
  const auto t0 = std::chrono::steady_clock::now();
  for (int i = 0; i < repeat; ++i) f();
  const auto t1 = std::chrono::steady_clock::now();
  return std::chrono::duration<double>(t1 - t0).count() / repeat;
}

}  // namespace

int main() {
  constexpr std::size_t N = 120, S = 40, R = 150;
  std::mt19937 rng(7);
  ChemistrySpec spec;
  spec.mechanism = synthetic(S, R, rng);
  spec.modules = {0};
  std::vector<double> T(N), air(N), z(N);
  for (std::size_t j = 0; j < N; ++j) {
    T[j] = 300.0 - static_cast<double>(j);
    air[j] = 2.5e19 * std::exp(-static_cast<double>(j) / 8.0);
    z[j] = 1e5 * static_cast<double>(j);
  }
  const std::map<std::string, double> bulk{{"N2", 0.78}, {"O2", 0.21}, {"Ar", 0.01}};
  ChemistryOperator op(spec, T, air, z, bulk);
  for (std::size_t c = 0; c < op.photolysis_channels().size(); ++c) {
    for (std::size_t j = 0; j < N; ++j) op.set_photolysis_rate(c, j, 1e-5);
  }
  std::vector<double> n(N * S), f(N * S);
  std::uniform_real_distribution<double> lg(3.0, 14.0);
  for (auto& v : n) v = std::pow(10.0, lg(rng));
  BlockTridiagonal jac(N, S);
  std::vector<double> rates(N * R);

  const double t_k = seconds_per_call([&] { op.kinetics().set_conditions(T, air, bulk); }, 200);
  const double t_f = seconds_per_call([&] {
    std::fill(f.begin(), f.end(), 0.0);
    op.add_tendency(n, 0.0, f);
  }, 2000);
  const double t_j = seconds_per_call([&] {
    jac.zero();
    op.add_jacobian(n, 0.0, jac);
  }, 1000);
  const double t_r = seconds_per_call([&] { op.reaction_rates(n, rates); }, 2000);
  const double t_zero = seconds_per_call([&] { jac.zero(); }, 1000);
  const auto nonzeros = static_cast<std::size_t>(
      std::count_if(jac.diag.begin(), jac.diag.begin() + static_cast<std::ptrdiff_t>(S * S),
                    [](double v) { return v != 0.0; }));
  std::printf(
      "synthetic mechanism: %zu levels x %zu species x %zu reactions, %zu Jacobian "
      "non-zeros in the first cell\n",
      N, S, R, nonzeros);
  std::printf("rate constants (all reactions, all levels): %9.1f us\n", 1e6 * t_k);
  std::printf("tendencies P - L (column):                  %9.1f us  (%.1f ns per reaction-level)\n",
              1e6 * t_f, 1e9 * t_f / (N * R));
  std::printf("reaction rates for budgets (column):        %9.1f us\n", 1e6 * t_r);
  std::printf("analytic Jacobian into dense blocks:        %9.1f us  (of which zeroing %zu "
              "blocks: %.1f us)\n", 1e6 * t_j, N, 1e6 * t_zero);
  std::printf("checksum %g %g\n", f[S + 1], jac.d(3, 1, 1));
  return 0;
}
