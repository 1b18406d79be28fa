// PETSc plumbing: error codes become RunError; the PTC linear system through the DMDA.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/error.hpp"
#include "solve/petsc_session.hpp"
#include "solve/ptc_linear_solver.hpp"
#include "test_operators.hpp"

using namespace colchem;

TEST_CASE("check() turns a PETSc error code into a RunError", "[solve][petsc]") {
  try {
    check(PETSC_ERR_ARG_WRONG, "VecScale");
    FAIL("no exception");
  } catch (const RunError& e) {
    CHECK(e.code() == ExitCode::kInternal);
    CHECK_THAT(std::string(e.what()), Catch::Contains("VecScale"));
  }
  PetscSession nested;  // PETSc is already up (harness fixture): a no-op session
  CHECK_FALSE(nested.owns());
}

TEST_CASE("PtcLinearSolver solves (shift I - J) dx = F on the block-tridiagonal pattern",
          "[solve][petsc]") {
  // A random-ish block tridiagonal J (dense 3x3 blocks, diagonal off-blocks, 5 cells):
  // compare with a dense partial-pivoting solve (analytic: same linear system).
  const std::size_t N = 5, S = 3;
  BlockTridiagonal J(N, S);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t r = 0; r < S; ++r) {
      for (std::size_t c = 0; c < S; ++c) J.d(j, r, c) = std::sin(double(1 + j * 9 + r * 3 + c));
      J.d(j, r, r) -= 4.0;
      J.l(j, r) = 0.3 * std::cos(double(j + r));
      J.u(j, r) = 0.2 * std::sin(double(j * r + 1));
    }
  }
  std::vector<double> f(N * S);
  for (std::size_t i = 0; i < f.size(); ++i) f[i] = 1.0 + double(i);
  std::vector<char> held(N * S, 0);
  held[4] = 1;  // cell 1, species 1 held: dx = 0 there
  PtcLinearSolver solver(N, S);
  std::vector<double> dx(N * S);
  std::string why;
  REQUIRE(solver.solve(J, 0.5, held, f, dx, why));

  std::vector<double> A = testing::to_dense(J);
  const std::size_t n = N * S;
  for (double& v : A) v = -v;
  for (std::size_t i = 0; i < n; ++i) A[i * n + i] += 0.5;
  std::vector<double> b = f;
  for (std::size_t c = 0; c < n; ++c) A[4 * n + c] = c == 4 ? 1.0 : 0.0;
  b[4] = 0.0;
  const std::vector<double> ref = testing::dense_solve(A, b);
  for (std::size_t i = 0; i < n; ++i) CHECK(dx[i] == Approx(ref[i]).epsilon(1e-12));
  CHECK(dx[4] == 0.0);
}

TEST_CASE("PtcLinearSolver reports a zero pivot as a failed solve, not an abort",
          "[solve][petsc]") {
  // -J = [[0, -1], [-1, 0]] with no shift: natural-order LU meets a zero pivot at once.
  BlockTridiagonal J(1, 2);
  J.d(0, 0, 1) = 1.0;
  J.d(0, 1, 0) = 1.0;
  PtcLinearSolver solver(1, 2);
  std::vector<double> f = {1.0, 1.0}, dx(2);
  std::vector<char> held(2, 0);
  std::string why;
  CHECK_FALSE(solver.solve(J, 0.0, held, f, dx, why));
  CHECK_THAT(why, Catch::Contains("linear solve failed"));
}
