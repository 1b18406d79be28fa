// PETSc assembly and direct solve of (shift I - J) dx = F: see ptc_linear_solver.hpp.
#include "solve/ptc_linear_solver.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <limits>

#include "core/error.hpp"
#include "core/stopwatch.hpp"
#include "solve/petsc_session.hpp"

namespace colchem {

namespace {

/// An outer GMRES on a shell matrix (mult) with a shell right preconditioner (apply), both
/// on ctx: restarted every `restart` iterations, the unpreconditioned residual norm, a
/// nonzero initial guess, options under `prefix`.
void create_shell_gmres(std::size_t size, void* ctx, PetscErrorCode (*mult)(Mat, Vec, Vec),
                        PetscErrorCode (*apply)(PC, Vec, Vec), const char* prefix, PetscInt restart,
                        Mat& shell, KSP& ksp) {
  const auto n = static_cast<PetscInt>(size);
  check(MatCreateShell(PETSC_COMM_SELF, n, n, n, n, ctx, &shell), "MatCreateShell");
  check(MatShellSetOperation(shell, MATOP_MULT, reinterpret_cast<void (*)(void)>(mult)),
        "MatShellSetOperation");
  check(KSPCreate(PETSC_COMM_SELF, &ksp), "KSPCreate");
  check(KSPSetOptionsPrefix(ksp, prefix), "KSPSetOptionsPrefix");
  check(KSPSetType(ksp, KSPGMRES), "KSPSetType");
  check(KSPGMRESSetRestart(ksp, restart), "KSPGMRESSetRestart");
  check(KSPSetPCSide(ksp, PC_RIGHT), "KSPSetPCSide");
  check(KSPSetNormType(ksp, KSP_NORM_UNPRECONDITIONED), "KSPSetNormType");
  PC pc = nullptr;
  check(KSPGetPC(ksp, &pc), "KSPGetPC");
  check(PCSetType(pc, PCSHELL), "PCSetType");
  check(PCShellSetContext(pc, ctx), "PCShellSetContext");
  check(PCShellSetApply(pc, apply), "PCShellSetApply");
  check(KSPSetInitialGuessNonzero(ksp, PETSC_TRUE), "KSPSetInitialGuessNonzero");
  check(KSPSetFromOptions(ksp), "KSPSetFromOptions");
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
  (void)KSPDestroy(&outer_t_);
  (void)MatDestroy(&shell_t_);
  (void)KSPDestroy(&outer_);
  (void)MatDestroy(&shell_);
  (void)VecDestroy(&rhs_scaled_);
  (void)KSPDestroy(&ksp_);
  (void)VecDestroy(&x_);
  (void)VecDestroy(&b_);
  (void)MatDestroy(&mat_);
  (void)DMDestroy(&da_);
}

void PtcLinearSolver::assemble(const BlockTridiagonal& jac, double shift,
                               std::span<const char> held, std::span<const double> rhs,
                               std::string& reason, bool& ok) {
  const auto t0 = std::chrono::steady_clock::now();
  const std::size_t S = species_;
  const std::size_t N = cells_;
  ok = true;
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
          ok = false;
          return;
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
}

bool PtcLinearSolver::direct_solve(std::span<double> dx, std::string& reason) {
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

bool PtcLinearSolver::solve(const BlockTridiagonal& jac, double shift, std::span<const char> held,
                            std::span<const double> rhs, std::span<double> dx,
                            std::string& reason) {
  krylov_its_ = 0;
  bool ok = true;
  assemble(jac, shift, held, rhs, reason, ok);
  return ok && direct_solve(dx, reason);
}

namespace {

/// y = A v (or A^T v) minus the nonlocal product of v (J_nl v, or J_nl^T v), then `combine`
/// (i, v_i, y_i, nl_i) -> y_i per unknown: the one body of both shell products.
template <class Combine>
PetscErrorCode mult_minus_nonlocal(Mat A, bool transpose, const PtcLinearSolver::Product& nonlocal,
                                   std::vector<double>& tmp, Vec v, Vec y, Combine combine) {
  PetscErrorCode ierr = transpose ? MatMultTranspose(A, v, y) : MatMult(A, v, y);
  if (ierr != 0) return ierr;
  const PetscScalar* vs = nullptr;
  PetscScalar* ys = nullptr;
  if ((ierr = VecGetArrayRead(v, &vs)) != 0) return ierr;
  if ((ierr = VecGetArray(y, &ys)) != 0) return ierr;
  const std::size_t n = tmp.size();
  std::fill(tmp.begin(), tmp.end(), 0.0);
  try {
    nonlocal(std::span<const double>(vs, n), tmp);
  } catch (...) {
    // An exception must not cross PETSc's C frames: a NaN makes GMRES stop with
    // KSP_DIVERGED_NANORINF, which the caller reports.
    std::fill(tmp.begin(), tmp.end(), std::numeric_limits<double>::quiet_NaN());
  }
  for (std::size_t i = 0; i < n; ++i) ys[i] = combine(i, vs[i], ys[i], tmp[i]);
  (void)VecRestoreArray(y, &ys);
  (void)VecRestoreArrayRead(v, &vs);
  return 0;
}

}  // namespace

// y = W^-1 (P v - J_nl v); held rows: y = v (P has unit rows there, J_nl none).
PetscErrorCode PtcLinearSolver::shell_mult(Mat A, Vec v, Vec y) {
  void* raw = nullptr;
  PetscErrorCode ierr = MatShellGetContext(A, &raw);
  if (ierr != 0) return ierr;
  auto* c = static_cast<ShellContext*>(raw);
  return mult_minus_nonlocal(c->self->mat_, false, *c->nonlocal, c->tmp, v, y,
                             [c](std::size_t i, double vi, double yi, double nl) {
                               return c->held[i] ? vi : (yi - nl) / c->weights[i];
                             });
}

// z = P^-1 W r (the LU factors of the block-tridiagonal part).
PetscErrorCode PtcLinearSolver::shell_precondition(PC pc, Vec r, Vec z) {
  void* raw = nullptr;
  PetscErrorCode ierr = PCShellGetContext(pc, &raw);
  if (ierr != 0) return ierr;
  auto* c = static_cast<ShellContext*>(raw);
  PtcLinearSolver& s = *c->self;
  const PetscScalar* rs = nullptr;
  PetscScalar* bs = nullptr;
  if ((ierr = VecGetArrayRead(r, &rs)) != 0) return ierr;
  if ((ierr = VecGetArray(s.b_, &bs)) != 0) return ierr;
  for (std::size_t i = 0; i < c->tmp.size(); ++i)
    bs[i] = c->held[i] ? rs[i] : rs[i] * c->weights[i];
  (void)VecRestoreArray(s.b_, &bs);
  (void)VecRestoreArrayRead(r, &rs);
  return KSPSolve(s.ksp_, s.b_, z);
}

bool PtcLinearSolver::solve_coupled(const BlockTridiagonal& jac, double shift,
                                    std::span<const char> held, std::span<const double> rhs,
                                    std::span<const double> weights, const Product& nonlocal,
                                    double rtol, std::span<double> dx, std::string& reason) {
  krylov_its_ = 0;
  bool ok = true;
  assemble(jac, shift, held, rhs, reason, ok);
  // The preconditioner's own step (the Newton step with lagged J_nl) starts GMRES.
  if (!ok || !direct_solve(dx, reason)) return false;

  const auto t0 = std::chrono::steady_clock::now();
  if (shell_ == nullptr) {
    // GMRES on W^-1 (P - J_nl) with the LU of P as right preconditioner.
    create_shell_gmres(cells_ * species_, &ctx_, &shell_mult, &shell_precondition, "colchem_nk_",
                       40, shell_, outer_);
    check(VecDuplicate(b_, &rhs_scaled_), "VecDuplicate");
  }
  ctx_.self = this;
  ctx_.held = held;
  ctx_.weights = weights;
  ctx_.nonlocal = &nonlocal;
  ctx_.tmp.assign(cells_ * species_, 0.0);
  check(KSPSetOperators(outer_, shell_, shell_), "KSPSetOperators");
  check(KSPSetTolerances(outer_, rtol, 0.0, 1e30, 80), "KSPSetTolerances");

  PetscScalar* b = nullptr;
  check(VecGetArray(rhs_scaled_, &b), "VecGetArray");
  double rhs_norm = 0.0;
  for (std::size_t i = 0; i < rhs.size(); ++i) {
    b[i] = held[i] ? 0.0 : rhs[i] / weights[i];
    rhs_norm += b[i] * b[i];
  }
  rhs_norm = std::sqrt(rhs_norm);
  check(VecRestoreArray(rhs_scaled_, &b), "VecRestoreArray");
  PetscScalar* xs = nullptr;
  check(VecGetArray(x_, &xs), "VecGetArray");
  for (std::size_t i = 0; i < dx.size(); ++i) xs[i] = dx[i];
  check(VecRestoreArray(x_, &xs), "VecRestoreArray");

  const PetscErrorCode ierr = KSPSolve(outer_, rhs_scaled_, x_);
  KSPConvergedReason why = KSP_CONVERGED_ITERATING;
  (void)KSPGetConvergedReason(outer_, &why);
  PetscInt its = 0;
  (void)KSPGetIterationNumber(outer_, &its);
  krylov_its_ = static_cast<int>(its);
  PetscReal rnorm = 0.0;
  (void)KSPGetResidualNorm(outer_, &rnorm);
  solve_s_ += seconds_since(t0);
  // GMRES that ran out of iterations or broke down (a Krylov space that stopped growing,
  // seen at the Newton limit where a nearly conserved mode makes the operator singular to
  // round-off) still gives an inexact Newton step when it reduced the residual 100-fold.
  const bool reduced =
      (why == KSP_DIVERGED_ITS || why == KSP_DIVERGED_BREAKDOWN) && rnorm <= 1e-2 * rhs_norm;
  if (ierr != 0 || (why < 0 && !reduced) || !std::isfinite(rnorm)) {
    reason = "Krylov solve failed (" +
             std::string(ierr != 0 ? "PETSc error " + std::to_string(static_cast<int>(ierr))
                                   : std::string(KSPConvergedReasons[why])) +
             " after " + std::to_string(its) + " iterations)";
    return false;
  }
  if (!read_solution(held, dx)) {
    reason = "Krylov solve produced non-finite values";
    return false;
  }
  return true;
}

// y = A^T v - J_nl^T v, A = shift I - J_bt with unit rows for held unknowns (mat_).
PetscErrorCode PtcLinearSolver::transpose_mult(Mat A, Vec v, Vec y) {
  void* raw = nullptr;
  PetscErrorCode ierr = MatShellGetContext(A, &raw);
  if (ierr != 0) return ierr;
  auto* c = static_cast<TransposeContext*>(raw);
  return mult_minus_nonlocal(c->self->mat_, true, *c->nonlocal, c->tmp, v, y,
                             [](std::size_t, double, double yi, double nl) { return yi - nl; });
}

// z = A^-T r with the LU factors of A (MatSolveTranspose through the direct KSP).
PetscErrorCode PtcLinearSolver::transpose_precondition(PC pc, Vec r, Vec z) {
  void* raw = nullptr;
  PetscErrorCode ierr = PCShellGetContext(pc, &raw);
  if (ierr != 0) return ierr;
  auto* c = static_cast<TransposeContext*>(raw);
  return KSPSolveTranspose(c->self->ksp_, r, z);
}

bool PtcLinearSolver::adjoint_gmres(const Product& nonlocal_transpose, double rtol,
                                    std::string& reason) {
  // b_ holds the right-hand side, x_ the transposed LU's solution, which starts GMRES.
  if (shell_t_ == nullptr) {
    // GMRES on A^T - J_nl^T with the transposed LU of A as right preconditioner.
    create_shell_gmres(cells_ * species_, &tctx_, &transpose_mult, &transpose_precondition,
                       "colchem_adjoint_", 60, shell_t_, outer_t_);
  }
  tctx_.self = this;
  tctx_.nonlocal = &nonlocal_transpose;
  tctx_.tmp.assign(cells_ * species_, 0.0);
  check(KSPSetOperators(outer_t_, shell_t_, shell_t_), "KSPSetOperators");
  check(KSPSetTolerances(outer_t_, rtol, 0.0, 1e30, 300), "KSPSetTolerances");
  Vec rhs_copy = nullptr;
  check(VecDuplicate(b_, &rhs_copy), "VecDuplicate");
  check(VecCopy(b_, rhs_copy), "VecCopy");
  Vec sol = nullptr;
  check(VecDuplicate(b_, &sol), "VecDuplicate");
  check(VecCopy(x_, sol), "VecCopy");  // the transposed LU's solution starts GMRES
  PetscReal bnorm = 0.0;
  check(VecNorm(rhs_copy, NORM_2, &bnorm), "VecNorm");
  const PetscErrorCode ierr = KSPSolve(outer_t_, rhs_copy, sol);
  KSPConvergedReason why = KSP_CONVERGED_ITERATING;
  (void)KSPGetConvergedReason(outer_t_, &why);
  PetscInt its = 0;
  (void)KSPGetIterationNumber(outer_t_, &its);
  PetscReal rnorm = 0.0;
  (void)KSPGetResidualNorm(outer_t_, &rnorm);
  krylov_its_ = static_cast<int>(its);
  if (ierr == 0) (void)VecCopy(sol, x_);
  (void)VecDestroy(&sol);
  (void)VecDestroy(&rhs_copy);
  // A solve that stalls at round-off short of rtol (breakdown or the iteration limit) is
  // accepted when it reduced the residual below 1e-10 of the right-hand side.
  const bool stalled = (why == KSP_DIVERGED_ITS || why == KSP_DIVERGED_BREAKDOWN) &&
                       std::isfinite(rnorm) && rnorm <= 1e-10 * bnorm;
  if (ierr != 0 || (why < 0 && !stalled)) {
    reason = "adjoint Krylov solve failed (" +
             std::string(ierr != 0 ? "PETSc error " + std::to_string(static_cast<int>(ierr))
                                   : std::string(KSPConvergedReasons[why])) +
             " after " + std::to_string(its) + " iterations)";
    return false;
  }
  return true;
}

bool PtcLinearSolver::read_solution(std::span<const char> zero_rows, std::span<double> out) {
  const PetscScalar* xs = nullptr;
  check(VecGetArrayRead(x_, &xs), "VecGetArrayRead");
  bool finite = true;
  for (std::size_t i = 0; i < out.size(); ++i) {
    out[i] = !zero_rows.empty() && zero_rows[i] ? 0.0 : xs[i];
    finite = finite && std::isfinite(xs[i]);
  }
  check(VecRestoreArrayRead(x_, &xs), "VecRestoreArrayRead");
  return finite;
}

bool PtcLinearSolver::solve_transposed(const BlockTridiagonal& jac, double shift,
                                       std::span<const char> held, std::span<const double> rhs,
                                       const Product* nonlocal_transpose, double rtol,
                                       std::span<double> y, std::string& reason) {
  krylov_its_ = 0;
  bool ok = true;
  assemble(jac, shift, held, rhs, reason, ok);
  if (!ok) return false;
  // The right-hand side of the transposed system keeps its held entries (assemble zeroes
  // them for the untransposed one; the callers pass zeros there).
  PetscScalar* b = nullptr;
  check(VecGetArray(b_, &b), "VecGetArray");
  for (std::size_t i = 0; i < rhs.size(); ++i) b[i] = rhs[i];
  check(VecRestoreArray(b_, &b), "VecRestoreArray");
  const auto t1 = std::chrono::steady_clock::now();
  check(KSPSetOperators(ksp_, mat_, mat_), "KSPSetOperators");
  PetscErrorCode ierr = KSPSolveTranspose(ksp_, b_, x_);
  KSPConvergedReason why = KSP_CONVERGED_ITERATING;
  (void)KSPGetConvergedReason(ksp_, &why);
  if (ierr != 0 || why < 0) {
    solve_s_ += seconds_since(t1);
    reason = "transposed LU solve failed";
    return false;
  }
  if (nonlocal_transpose != nullptr && !adjoint_gmres(*nonlocal_transpose, rtol, reason)) {
    solve_s_ += seconds_since(t1);
    return false;
  }
  solve_s_ += seconds_since(t1);
  if (!read_solution({}, y)) {
    reason = "adjoint solve produced non-finite values (singular Jacobian?)";
    return false;
  }
  return true;
}

}  // namespace colchem
