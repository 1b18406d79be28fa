// PETSc assembly and direct solve of (shift I - J) dx = F: see ptc_linear_solver.hpp.
#include "solve/ptc_linear_solver.hpp"

#include <chrono>
#include <cmath>

#include "core/error.hpp"
#include "solve/petsc_session.hpp"

namespace colchem {

namespace {
double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}
}  // namespace

PtcLinearSolver::PtcLinearSolver(std::size_t cells, std::size_t species)
    : cells_(cells), species_(species) {
  if (cells == 0 || species == 0) {
    throw RunError(ExitCode::kInternal, "PtcLinearSolver: empty column");
  }
  const auto N = static_cast<PetscInt>(cells);
  const auto S = static_cast<PetscInt>(species);
  check(DMDACreate1d(PETSC_COMM_SELF, DM_BOUNDARY_NONE, N, S, cells > 1 ? 1 : 0, nullptr, &da_),
        "DMDACreate1d");
  check(DMSetUp(da_), "DMSetUp");
  // Block fills: dense within a cell, species s to species s only between cells.
  std::vector<PetscInt> dfill(species * species, 1);
  std::vector<PetscInt> ofill(species * species, 0);
  for (std::size_t s = 0; s < species; ++s) ofill[s * species + s] = 1;
  check(DMDASetBlockFills(da_, dfill.data(), ofill.data()), "DMDASetBlockFills");
  check(DMCreateMatrix(da_, &mat_), "DMCreateMatrix");
  check(MatSetOption(mat_, MAT_NEW_NONZERO_ALLOCATION_ERR, PETSC_TRUE), "MatSetOption");
  check(DMCreateGlobalVector(da_, &b_), "DMCreateGlobalVector");
  check(VecDuplicate(b_, &x_), "VecDuplicate");

  check(KSPCreate(PETSC_COMM_SELF, &ksp_), "KSPCreate");
  check(KSPSetOptionsPrefix(ksp_, "colchem_"), "KSPSetOptionsPrefix");
  check(KSPSetType(ksp_, KSPPREONLY), "KSPSetType");
  PC pc = nullptr;
  check(KSPGetPC(ksp_, &pc), "KSPGetPC");
  check(PCSetType(pc, PCLU), "PCSetType");
  check(PCFactorSetMatOrderingType(pc, MATORDERINGNATURAL), "PCFactorSetMatOrderingType");
  check(KSPSetFromOptions(ksp_), "KSPSetFromOptions");
  cols_.resize(species + 2);
  vals_.resize(species + 2);
}

PtcLinearSolver::~PtcLinearSolver() {
  (void)KSPDestroy(&ksp_);
  (void)VecDestroy(&x_);
  (void)VecDestroy(&b_);
  (void)MatDestroy(&mat_);
  (void)DMDestroy(&da_);
}

bool PtcLinearSolver::solve(const BlockTridiagonal& jac, double shift, std::span<const char> held,
                            std::span<const double> rhs, std::span<double> dx,
                            std::string& reason) {
  const auto t0 = std::chrono::steady_clock::now();
  const std::size_t S = species_;
  const std::size_t N = cells_;
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t r = 0; r < S; ++r) {
      const std::size_t i = j * S + r;
      const auto row = static_cast<PetscInt>(i);
      PetscInt n = 0;
      // Columns in increasing order: (j-1, r), (j, 0..S-1), (j+1, r).
      if (j > 0) {
        cols_[n] = static_cast<PetscInt>(i - S);
        vals_[n++] = held[i] ? 0.0 : -jac.l(j, r);
      }
      for (std::size_t c = 0; c < S; ++c) {
        cols_[n] = static_cast<PetscInt>(j * S + c);
        double v = -jac.d(j, r, c);
        if (c == r) v += shift;
        if (held[i]) v = (c == r) ? 1.0 : 0.0;
        vals_[n++] = v;
      }
      if (j + 1 < N) {
        cols_[n] = static_cast<PetscInt>(i + S);
        vals_[n++] = held[i] ? 0.0 : -jac.u(j, r);
      }
      for (PetscInt k = 0; k < n; ++k) {
        if (!std::isfinite(vals_[k])) {
          reason = "non-finite Jacobian entry at cell " + std::to_string(j) + ", species " +
                   std::to_string(r);
          return false;
        }
      }
      check(MatSetValues(mat_, 1, &row, n, cols_.data(), vals_.data(), INSERT_VALUES),
            "MatSetValues");
    }
  }
  check(MatAssemblyBegin(mat_, MAT_FINAL_ASSEMBLY), "MatAssemblyBegin");
  check(MatAssemblyEnd(mat_, MAT_FINAL_ASSEMBLY), "MatAssemblyEnd");
  PetscScalar* b = nullptr;
  check(VecGetArray(b_, &b), "VecGetArray");
  for (std::size_t i = 0; i < rhs.size(); ++i) b[i] = held[i] ? 0.0 : rhs[i];
  check(VecRestoreArray(b_, &b), "VecRestoreArray");
  assembly_s_ += seconds_since(t0);

  const auto t1 = std::chrono::steady_clock::now();
  check(KSPSetOperators(ksp_, mat_, mat_), "KSPSetOperators");
  // A failed factorisation (zero pivot) is a solver outcome, not a program error: report it
  // so that the caller can shorten the pseudo-time step.
  const PetscErrorCode ierr = KSPSolve(ksp_, b_, x_);
  KSPConvergedReason why = KSP_CONVERGED_ITERATING;
  (void)KSPGetConvergedReason(ksp_, &why);
  solve_s_ += seconds_since(t1);
  if (ierr != 0 || why < 0) {
    reason = "linear solve failed (" +
             std::string(ierr != 0 ? "PETSc error " + std::to_string(static_cast<int>(ierr))
                                   : std::string(KSPConvergedReasons[why])) +
             ")";
    return false;
  }
  const PetscScalar* xs = nullptr;
  check(VecGetArrayRead(x_, &xs), "VecGetArrayRead");
  bool finite = true;
  for (std::size_t i = 0; i < dx.size(); ++i) {
    dx[i] = xs[i];
    finite = finite && std::isfinite(xs[i]);
  }
  check(VecRestoreArrayRead(x_, &xs), "VecRestoreArrayRead");
  if (!finite) {
    reason = "linear solve produced non-finite values (singular matrix?)";
    return false;
  }
  return true;
}

}  // namespace colchem
