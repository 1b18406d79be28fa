// Box mode against analytic solutions: first-order decay, an association equilibrium set
// by K(T), the Bateman chain A -> B -> C -> D, and positivity on a stiff network.
#include <catch2/catch.hpp>

#include <cmath>

#include "chem/box_model.hpp"
#include "chem/chemistry_operator.hpp"
#include "io/mechanism_loader.hpp"

using namespace colchem;

namespace {

BoxProblem problem(const std::string& text, const UnitSystem& units, double T, double air) {
  BoxProblem pb;
  pb.chemistry.mechanism = load_mechanism_text(text, "box-test.yaml", units);
  for (std::size_t i = 0; i < pb.chemistry.mechanism->modules.size(); ++i) pb.chemistry.modules.push_back(i);
  pb.chemistry.parameters = pb.chemistry.mechanism->default_parameters();
  pb.temperature_K = T;
  pb.air_cm3 = air;
  pb.bulk_mole_fraction = {{"N2", 1.0}};
  pb.initial_cm3.assign(pb.chemistry.mechanism->species.size(), 0.0);
  pb.solver.rtol = 1e-6;
  pb.solver.atol = 1e-6;
  return pb;
}

std::size_t idx(const BoxProblem& pb, const std::string& name) {
  return *pb.chemistry.mechanism->species_index(name);
}

}  // namespace

TEST_CASE("box: first-order decay follows exp(-k t)", "[chem][box]") {
  const UnitSystem units;
  auto pb = problem(R"(
mechanism: {name: decay}
species: [{name: O(1D)}, {name: O}]
modules:
  - name: m
    reactions:
      - {id: o1d, equation: O(1D) -> O, rate: {first_order: {k: 0.01}}}
)", units, 250.0, 1e18);
  pb.initial_cm3[idx(pb, "O(1D)")] = 1e10;
  pb.times_s = box_output_times(500.0, 20, false, 0.0);
  const BoxResult r = run_box(pb);
  const std::size_t S = r.species;
  for (std::size_t i = 0; i < r.times_s.size(); ++i) {
    const double exact = 1e10 * std::exp(-0.01 * r.times_s[i]);  // analytic
    CHECK(r.n_cm3[i * S + idx(pb, "O(1D)")] == Approx(exact).epsilon(1e-4));
    CHECK(r.n_cm3[i * S + idx(pb, "O")] == Approx(1e10 - exact).epsilon(1e-4).margin(1e-2));
  }
}

TEST_CASE("box: A + B <=> C reaches the equilibrium set by K(T)", "[chem][box]") {
  const UnitSystem units;
  // kf = 1e-13 cm3 s-1; K = 1e-20 exp(2000/T) cm3 (invented), reverse k = kf / K.
  auto pb = problem(R"(
mechanism: {name: equilibrium}
species: [{name: ClO}, {name: NO2}, {name: ClONO2}]
modules:
  - name: m
    reactions:
      - {id: clo_no2, equation: ClO + NO2 -> ClONO2, rate: {constant: {k: 1.0e-13}}}
      - id: clono2
        equation: ClONO2 -> ClO + NO2
        rate: {equilibrium_reverse: {forward: {constant: {k: 1.0e-13}}, A: 1.0e-20, B: 2000}}
)", units, 250.0, 1e18);
  const double a0 = 2e12, b0 = 1e12;
  pb.initial_cm3[idx(pb, "ClO")] = a0;
  pb.initial_cm3[idx(pb, "NO2")] = b0;
  pb.times_s = box_output_times(1e5, 10, true, 1.0);
  const BoxResult r = run_box(pb);
  const std::size_t S = r.species, last = r.times_s.size() - 1;
  // K(250) = 1e-20 exp(8) = 2.98096e-17 cm3. At equilibrium x = [C] solves
  // K (a0 - x)(b0 - x) = x: x = ((a0 + b0 + 1/K) - sqrt((a0 + b0 + 1/K)^2 - 4 a0 b0)) / 2.
  const double K = 1e-20 * std::exp(2000.0 / 250.0);
  const double s = a0 + b0 + 1.0 / K;
  const double x = 0.5 * (s - std::sqrt(s * s - 4 * a0 * b0));  // analytic
  CHECK(r.n_cm3[last * S + idx(pb, "ClONO2")] == Approx(x).epsilon(1e-4));
  CHECK(r.n_cm3[last * S + idx(pb, "ClO")] == Approx(a0 - x).epsilon(1e-4));
  const double ratio = r.n_cm3[last * S + idx(pb, "ClONO2")] /
                       (r.n_cm3[last * S + idx(pb, "ClO")] * r.n_cm3[last * S + idx(pb, "NO2")]);
  CHECK(ratio == Approx(K).epsilon(1e-3));  // [C]/([A][B]) = K (analytic)
}

TEST_CASE("box: Bateman chain A -> B -> C -> D", "[chem][box]") {
  const UnitSystem units;
  auto pb = problem(R"(
mechanism: {name: chain}
species: [{name: O3(a)}, {name: O3(b)}, {name: O3(c)}, {name: O3}]
modules:
  - name: m
    reactions:
      - {id: o3a, equation: O3(a) -> O3(b), rate: {first_order: {k: 1.0}}}
      - {id: o3b, equation: O3(b) -> O3(c), rate: {first_order: {k: 0.1}}}
      - {id: o3c, equation: O3(c) -> O3, rate: {first_order: {k: 0.01}}}
)", units, 250.0, 1e18);
  const double A0 = 1e12, k1 = 1.0, k2 = 0.1, k3 = 0.01;
  pb.initial_cm3[idx(pb, "O3(a)")] = A0;
  pb.times_s = box_output_times(600.0, 30, true, 0.01);
  const BoxResult r = run_box(pb);
  const std::size_t S = r.species;
  for (std::size_t i = 1; i < r.times_s.size(); ++i) {
    const double t = r.times_s[i];
    // Bateman (1910) solution of the chain (analytic).
    const double a = A0 * std::exp(-k1 * t);
    const double b = A0 * k1 / (k2 - k1) * (std::exp(-k1 * t) - std::exp(-k2 * t));
    const double c = A0 * k1 * k2 *
                     (std::exp(-k1 * t) / ((k2 - k1) * (k3 - k1)) +
                      std::exp(-k2 * t) / ((k1 - k2) * (k3 - k2)) +
                      std::exp(-k3 * t) / ((k1 - k3) * (k2 - k3)));
    const double d = A0 - a - b - c;
    INFO("t = " << t);
    const double tol = 2e-4 * A0;  // absolute: the chain's members pass through zero
    CHECK(std::abs(r.n_cm3[i * S + 0] - a) <= tol);
    CHECK(std::abs(r.n_cm3[i * S + 1] - b) <= tol);
    CHECK(std::abs(r.n_cm3[i * S + 2] - c) <= tol);
    CHECK(std::abs(r.n_cm3[i * S + 3] - d) <= tol);
  }
}

TEST_CASE("box: stiff oxygen network stays non-negative and conserves oxygen",
          "[chem][box]") {
  const UnitSystem units;
  // First-order rates from 1e-3 s-1 (photolysis) to 1e9 s-1 (radiative decay); invented.
  auto pb = problem(R"(
mechanism: {name: stiff}
species: [{name: O}, {name: O(1D)}, {name: O2}, {name: O3}, {name: N2, fixed: true}]
modules:
  - name: m
    reactions:
      - {id: o3_photo, equation: O3 + hv -> O(1D) + O2, rate: {photolysis: {channel: O3}}}
      - {id: o2_photo, equation: O2 + hv -> 2 O, rate: {photolysis: {channel: O2}}}
      - {id: o1d_2, equation: O(1D) -> O, rate: {first_order: {k: 1.0e9}}}
      - {id: o1d_n2, equation: O(1D) + N2 -> O + N2, rate: {arrhenius: {A: 2.15e-11, E: -110}}}
      - {id: o_o2_m, equation: O + O2 + M -> O3 + M, rate: {falloff: {k0_300: 6.1e-34, n: 2.4, kinf_300: 0, m: 0}}}
      - {id: o_o3, equation: O + O3 -> 2 O2, rate: {arrhenius: {A: 8.0e-12, E: 2060}}}
      - {id: o_o_m, equation: O + O + M -> O2 + M, rate: {arrhenius: {A: 4.8e-33, b: -2}}}
)", units, 250.0, 2.9e19);
  pb.bulk_mole_fraction = {{"N2", 0.79}, {"O2", 0.21}};
  pb.initial_cm3[idx(pb, "O2")] = 0.21 * 2.9e19;
  pb.initial_cm3[idx(pb, "N2")] = 0.79 * 2.9e19;
  pb.initial_cm3[idx(pb, "O")] = 1e12;  // far from steady state: a fast transient
  pb.photolysis = {{"O3", 1e-3}, {"O2", 1e-9}};
  pb.times_s = box_output_times(1e6, 40, true, 1e-9);
  pb.solver.atol = 1.0;
  const BoxResult r = run_box(pb);
  const std::size_t S = r.species;
  const auto oxygen = [&](std::size_t i) {
    return r.n_cm3[i * S + idx(pb, "O")] + r.n_cm3[i * S + idx(pb, "O(1D)")] +
           2 * r.n_cm3[i * S + idx(pb, "O2")] + 3 * r.n_cm3[i * S + idx(pb, "O3")];
  };
  for (std::size_t i = 0; i < r.times_s.size(); ++i) {
    // Backward Euler conserves linear invariants up to the Newton tolerance (analytic).
    CHECK(oxygen(i) == Approx(oxygen(0)).epsilon(1e-6));
  }
  // Ozone builds up from the O atoms: k(O + O2 + M) [O2][M] ~ 1e5 s-1 turns O into O3 fast.
  CHECK(r.n_cm3[r.times_s.size() / 2 * S + idx(pb, "O3")] > 1e11);
  CHECK(r.n_cm3[(r.times_s.size() - 1) * S + idx(pb, "N2")] == 0.79 * 2.9e19);  // fixed
}

TEST_CASE("ChemistryOperator::implicit_step integrates each cell with its own k(T)",
          "[chem][box]") {
  const UnitSystem units;
  ChemistrySpec spec;
  spec.mechanism = load_mechanism_text(R"(
mechanism: {name: column-decay}
species: [{name: O(1D)}, {name: O}]
modules:
  - name: m
    reactions:
      - {id: o1d_3, equation: O(1D) -> O, rate: {arrhenius: {A: 1.0, E: 300}}}
)", "column.yaml", units);
  spec.modules = {0};
  const std::vector<double> T{150.0, 300.0, 600.0}, air{1e18, 1e17, 1e16};
  StiffOptions opt;
  opt.rtol = 1e-7;
  opt.atol = 1e-6;
  ChemistryOperator op(spec, T, air, {}, {{"N2", 1.0}}, opt);
  std::vector<double> n{1e8, 0.0, 1e8, 0.0, 1e8, 0.0};
  REQUIRE(op.implicit_step(n, 0.0, 2.0));
  for (std::size_t j = 0; j < 3; ++j) {
    const double k = std::exp(-300.0 / T[j]);  // k = A exp(-E/T) (analytic)
    CHECK(n[2 * j] == Approx(1e8 * std::exp(-k * 2.0)).epsilon(1e-5));
    CHECK(n[2 * j] + n[2 * j + 1] == Approx(1e8).epsilon(1e-9));
  }
}
