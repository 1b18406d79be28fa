// Benchmark of the coupled steady-state solver (speed only; not a test).
//
// A synthetic network (invented): 40 species, each lost at a first-order rate from 1e-8 to
// 1e2 s^-1 (ten decades, log-uniform) and converted by that loss into four other species
// (branching fractions summing to 0.9), 60 bimolecular reactions a + b -> c
// (k = 1e-13 to 1e-10 cm^3 s^-1), sources of five species decreasing with height, and eddy
// exchange c = 1e-4 s^-1 between neighbouring levels (K = 1e6 cm^2 s^-1, dz = 1 km).
// From a cold start (all densities zero) the solver runs to ||F||_s < 1e-8 on 60 ... 960
// levels; the cost per iteration should grow linearly with the number of levels.
//
//   build/tests/bench/bench_solve            [-colchem_pc_factor_mat_ordering_type nd ...]
#include <chrono>
#include <cmath>
#include <cstdio>
#include <random>
#include <vector>

#include "../solve/test_operators.hpp"
#include "solve/petsc_session.hpp"
#include "solve/steady_state.hpp"

namespace {

using namespace colchem;

struct Network {
  static constexpr std::size_t S = 40;
  std::vector<double> loss;                               // k_s
  std::vector<std::vector<std::pair<std::size_t, double>>> branch;  // s -> (t, fraction)
  struct Bi { std::size_t a, b, c; double k; };
  std::vector<Bi> bi;
  Network() {
    std::mt19937 rng(20261202);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    std::uniform_int_distribution<std::size_t> pick(0, S - 1);
    for (std::size_t s = 0; s < S; ++s) {
      loss.push_back(std::pow(10.0, -8.0 + 10.0 * u(rng)));
      std::vector<std::pair<std::size_t, double>> br;
      for (int k = 0; k < 4; ++k) {
        std::size_t t = pick(rng);
        if (t == s) t = (t + 1) % S;
        br.emplace_back(t, 0.9 / 4.0);
      }
      branch.push_back(br);
    }
    for (int r = 0; r < 60; ++r) {
      bi.push_back({pick(rng), pick(rng), pick(rng), std::pow(10.0, -13.0 + 3.0 * u(rng))});
    }
  }
};

class SyntheticChemistry final : public ColumnOperator {
 public:
  SyntheticChemistry(const Network& net, std::size_t cells) : net_(net), n_(cells) {}
  double source(std::size_t j, std::size_t s) const {
    return s < 5 ? std::pow(10.0, 2.0 + double(s)) * std::exp(-double(j) / double(n_) * 5.0)
                 : 0.0;
  }
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    constexpr std::size_t S = Network::S;
    for (std::size_t j = 0; j < n_; ++j) {
      const double* xc = &x[j * S];
      double* fc = &f[j * S];
      for (std::size_t s = 0; s < S; ++s) {
        const double r = net_.loss[s] * xc[s];
        fc[s] += source(j, s) - r;
        for (const auto& [t, frac] : net_.branch[s]) fc[t] += frac * r;
      }
      for (const auto& b : net_.bi) {
        const double r = b.k * xc[b.a] * xc[b.b];
        fc[b.a] -= r;
        fc[b.b] -= r;
        fc[b.c] += r;
      }
    }
  }
  void add_jacobian(std::span<const double> x, double, BlockTridiagonal& J) override {
    constexpr std::size_t S = Network::S;
    for (std::size_t j = 0; j < n_; ++j) {
      const double* xc = &x[j * S];
      for (std::size_t s = 0; s < S; ++s) {
        J.d(j, s, s) -= net_.loss[s];
        for (const auto& [t, frac] : net_.branch[s]) J.d(j, t, s) += frac * net_.loss[s];
      }
      for (const auto& b : net_.bi) {
        const double da = b.k * xc[b.b];  // d r / d x_a
        const double db = b.k * xc[b.a];
        J.d(j, b.a, b.a) -= da; J.d(j, b.a, b.b) -= db;
        J.d(j, b.b, b.a) -= da; J.d(j, b.b, b.b) -= db;
        J.d(j, b.c, b.a) += da; J.d(j, b.c, b.b) += db;
      }
    }
  }
  bool implicit_step(std::span<double>, double, double) override { return false; }

 private:
  const Network& net_;
  std::size_t n_;
};

}  // namespace

int main(int argc, char** argv) {
  colchem::PetscSession petsc(argc, argv);
  const Network net;
  std::printf("synthetic network: %zu species, 60 bimolecular reactions, loss rates "
              "1e-8..1e2 s^-1; cold start; tolerance 1e-8\n\n", Network::S);
  std::printf("%6s %6s %9s %12s %12s %12s %12s %12s %12s\n", "levels", "iters", "wall_s",
              "per_iter_ms", "eval_ms/it", "asm_ms/it", "lu_ms/it", "|F|_s", "ratio/level");
  double base = 0.0;
  for (std::size_t N : {60, 120, 240, 480, 960}) {
    SyntheticChemistry chem(net, N);
    colchem::testing::Diffusion diff(N, std::vector<double>(Network::S, 1e-4));
    ColumnSystem sys{{&diff, &chem}, N, Network::S};
    SteadyStateOptions o;
    o.max_iterations = 500;
    const auto t0 = std::chrono::steady_clock::now();
    const SteadyStateResult r =
        SteadyStateSolver(sys, o).solve(std::vector<double>(N * Network::S, 0.0));
    const double wall = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    const double it = std::max(1, r.iterations);
    const double per = wall / it;
    if (base == 0.0) base = per / double(N);
    std::printf("%6zu %6d %9.3f %12.3f %12.3f %12.3f %12.3f %12.2e %12.2f  %s\n", N,
                r.iterations, wall, 1e3 * per, 1e3 * r.evaluate_s / it, 1e3 * r.assembly_s / it,
                1e3 * r.factor_solve_s / it, r.residual_norm, per / double(N) / base,
                to_string(r.status));
  }
  std::printf("\nratio/level: (time per iteration / levels) relative to 60 levels; 1.00 is "
              "linear scaling.\n");
  return 0;
}
