// Speed of the transport operator: tendency, Jacobian and TR-BDF2 step on an invented column
// (200 cells, 80 species). Not a test; run by hand: build/tests/bench/bench_transport
#include <chrono>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "transport/transport_operator.hpp"

using namespace colchem;

namespace {
template <class F>
double seconds_per_call(int calls, F&& f) {
  const auto t0 = std::chrono::steady_clock::now();
  for (int i = 0; i < calls; ++i) f(i);
  const auto t1 = std::chrono::steady_clock::now();
  return std::chrono::duration<double>(t1 - t0).count() / calls;
}
}  // namespace

int main() {
  const std::size_t N = 200, S = 80;
  BackgroundSpec spec;
  spec.planet = PlanetSpec{"bench (invented)", 6.0e8, 900.0, 1.0};
  spec.grid = Grid::uniform(0.0, 200.0e5, N);
  spec.temperature_K = ProfileSpec{{0.0, 200.0e5}, {250.0, 400.0}, "invented"};
  spec.base_pressure_dyn_cm2 = 1.0e5;
  spec.mean_molecular_mass_amu = 28.0;
  spec.eddy_form = EddyForm::kConstant;
  spec.eddy_cm2_s = 1.0e6;
  const Background bg = build_background(spec);
  std::vector<TransportSpecies> sp;
  std::vector<SpeciesBoundaries> bc(S);
  for (std::size_t s = 0; s < S; ++s) {
    std::string name = std::to_string(s);  // (not "X" + ...: GCC 12 -Wrestrict false positive)
    name.insert(0, 1, 'X');
    sp.push_back(default_transport_species(name, 2.0 + static_cast<double>(s), 28.0));
    bc[s].bottom = BoundaryCondition::of(BoundaryKind::kMixingRatio, 1e-6);
  }
  TransportOperator op(bg, sp, bc);
  std::vector<double> n(N * S), f(N * S);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t s = 0; s < S; ++s) n[j * S + s] = 1e-6 * bg.air_density_cm3[j];
  }
  BlockTridiagonal jac(N, S);
  const double t_tend = seconds_per_call(2000, [&](int) { op.add_tendency(n, 0.0, f); });
  const double t_jac = seconds_per_call(2000, [&](int) { op.add_jacobian(n, 0.0, jac); });
  const double t_step =
      seconds_per_call(500, [&](int i) { (void)op.implicit_step(n, 100.0 * i, 100.0); });
  std::printf("transport, %zu cells x %zu species\n", N, S);
  std::printf("  add_tendency   %9.2f us\n", 1e6 * t_tend);
  std::printf("  add_jacobian   %9.2f us\n", 1e6 * t_jac);
  std::printf("  implicit_step  %9.2f us  (TR-BDF2; positivity fallbacks: %zu)\n", 1e6 * t_step,
              op.positivity_fallbacks());
  return 0;
}
