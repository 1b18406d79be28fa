// Validation case validation/solve/ptc_convergence: the convergence history of PTC on a
// stiff oxygen-like cycle in a diffusing column, written as CSV for inspection.
#include <catch2/catch.hpp>

#include <cmath>
#include <fstream>

#include "solve/steady_state.hpp"
#include "test_operators.hpp"

using namespace colchem;
using namespace colchem::testing;

TEST_CASE("PTC convergence history: stiff oxygen-like cycle with diffusion",
          "[solve][validation]") {
  const std::size_t N = 20;
  std::vector<OxygenCycle::Cell> cells;
  for (std::size_t j = 0; j < N; ++j) {
    // Invented: photolysis growing upward over four decades, as under an absorbing column.
    const double up = double(j) / double(N - 1);
    cells.push_back({1e-13 * std::pow(10.0, 4.0 * up), 6e-17, 1e-3 * std::pow(10.0, up), 8e-15});
  }
  OxygenCycle chem(cells);
  Diffusion diff(N, {0.0, 1e-4, 1e-4});  // O2 is held by zero rows; O and O3 are mixed
  ColumnSystem sys{{&diff, &chem}, N, 3};
  std::vector<double> x0(3 * N, 0.0);
  for (std::size_t j = 0; j < N; ++j) x0[3 * j] = 2e16;
  const SteadyStateResult r = SteadyStateSolver(sys).solve(x0);
  INFO(r.reason);
  REQUIRE(r.converged());

  std::ofstream csv(std::string(COLCHEM_TEST_OUTPUT_DIR) + "/ptc_convergence.csv");
  csv << "iteration,pseudo_step_s,scaled_residual,max_relative_change,damping\n";
  for (const auto& h : r.history) {
    csv << h.iteration << ',' << h.pseudo_step_s << ',' << h.residual_norm << ','
        << h.max_relative_change << ',' << h.damping << '\n';
  }
  // Kelley and Keyes (1998): PTC ends in Newton's method, which converges quadratically;
  // a Newton step from a residual of about 1e-8 must cut it by far more than a linear rate
  // would (to about its square); the last record is at round-off and shows nothing.
  const std::size_t n = r.history.size();
  REQUIRE(n >= 4);
  CHECK(r.history[n - 1].residual_norm < 1e-8);
  CHECK(r.history[n - 3].pseudo_step_s == SteadyStateOptions{}.max_pseudo_step_s);
  CHECK(r.history[n - 2].residual_norm < 1e-4 * r.history[n - 3].residual_norm);
}
