// The linear system of one pseudo-transient step, (I/dtau - J) dx = F, through PETSc.
//
// The matrix comes from a 1D DMDA with dof = S and stencil width 1, whose block fills
// declare the structure of block_tridiagonal.hpp: dense S x S diagonal blocks, diagonal
// off-diagonal blocks. Only those entries are inserted. The default solver is a direct LU
// (KSPPREONLY + PCLU, natural ordering: for a block-tridiagonal matrix the natural order
// already confines fill to the band); every KSP/PC choice can be changed at run time with
// the options prefix "colchem_" (-colchem_ksp_type gmres -colchem_pc_type ilu ...).
// Rows flagged `held` (a species held fixed: zero Jacobian row and zero tendency) get a
// unit diagonal, so that dx = 0 there even in the Newton limit dtau -> infinity.
//
// With a nonlocal coupling (column_system.hpp) the full matrix is A = shift I - J_bt - J_nl.
// solve_coupled() then runs right-preconditioned GMRES (Saad and Schultz 1986) on the rows
// scaled by the residual weights w (residual_norm.hpp), W^-1 A dx = W^-1 F, with the LU
// factors of P = shift I - J_bt as the preconditioner (applied as P^-1 W) and the product
// J_nl v supplied by the coupling: Jacobian-free Newton-Krylov with a physics-based
// preconditioner (Knoll and Keyes 2004, J. Comput. Phys. 193, 357). Right preconditioning
// keeps the residual GMRES minimises equal to the true residual of the scaled system, so
// its tolerance reads like the scaled norm's: a fraction of each equation's gross turnover.
// The outer KSP takes runtime options with the prefix "colchem_nk_".
#pragma once

#include <petscdmda.h>
#include <petscksp.h>

#include <functional>
#include <span>
#include <string>
#include <vector>

#include "core/block_tridiagonal.hpp"

namespace colchem {

class PtcLinearSolver {
 public:
  /// Requires an initialised PETSc (PetscSession).
  PtcLinearSolver(std::size_t cells, std::size_t species);
  ~PtcLinearSolver();
  PtcLinearSolver(const PtcLinearSolver&) = delete;
  PtcLinearSolver& operator=(const PtcLinearSolver&) = delete;

  /// Solves (shift I - J) dx = rhs, with unit rows where held[i] != 0. Returns false (and a
  /// reason) when the factorisation or solve fails (zero pivot, non-finite entries).
  bool solve(const BlockTridiagonal& jac, double shift, std::span<const char> held,
             std::span<const double> rhs, std::span<double> dx, std::string& reason);

  /// (v, out): out += J_nl v (the coupling's product; out arrives zeroed).
  using Product = std::function<void(std::span<const double>, std::span<double>)>;

  /// Solves (shift I - J - J_nl) dx = rhs by GMRES preconditioned with the LU of
  /// shift I - J, to ||W^-1 r||_2 <= rtol ||W^-1 rhs||_2 (w > 0 per row, `weights`). Starts
  /// from the preconditioner's own solution. Returns false (and a reason) when the
  /// factorisation fails or GMRES neither converges nor reduces the residual by 1e-2.
  bool solve_coupled(const BlockTridiagonal& jac, double shift, std::span<const char> held,
                     std::span<const double> rhs, std::span<const double> weights,
                     const Product& nonlocal, double rtol, std::span<double> dx,
                     std::string& reason);

  /// The transposed system (shift I - J - J_nl)^T y = rhs (rows of held unknowns unit
  /// rows of the untransposed matrix, as in solve()): the adjoint of a steady state
  /// (solve/adjoint.hpp). `nonlocal_transpose` (v, out): out += J_nl^T v (out arrives
  /// zeroed); null when F is local, then one transposed LU solve (MatSolveTranspose of the
  /// same factors) gives y. Otherwise right-preconditioned GMRES (restart 60) on the
  /// transposed operator with the transposed LU of shift I - J as preconditioner, to
  /// ||r||_2 <= rtol ||rhs||_2. Returns false (and a reason) on failure.
  bool solve_transposed(const BlockTridiagonal& jac, double shift, std::span<const char> held,
                        std::span<const double> rhs, const Product* nonlocal_transpose, double rtol,
                        std::span<double> y, std::string& reason);

  /// Krylov iterations of the last solve_coupled (0 after a direct solve).
  [[nodiscard]] int krylov_iterations() const { return krylov_its_; }

  /// Seconds spent assembling the PETSc matrix and in KSPSolve (factorisation + solve).
  [[nodiscard]] double assembly_seconds() const { return assembly_s_; }
  [[nodiscard]] double factor_solve_seconds() const { return solve_s_; }

 private:
  std::size_t cells_;
  std::size_t species_;
  DM da_ = nullptr;
  Mat mat_ = nullptr;
  Vec b_ = nullptr;
  Vec x_ = nullptr;
  KSP ksp_ = nullptr;
  void assemble(const BlockTridiagonal& jac, double shift, std::span<const char> held,
                std::span<const double> rhs, std::string& reason, bool& ok);
  bool direct_solve(std::span<double> dx, std::string& reason);
  /// GMRES on the transposed system with the nonlocal product, from b_ and x_ into x_.
  bool adjoint_gmres(const Product& nonlocal_transpose, double rtol, std::string& reason);
  /// out = x_ (0 in the rows zero_rows marks, when given); false when x_ is not finite.
  bool read_solution(std::span<const char> zero_rows, std::span<double> out);

  struct ShellContext {
    PtcLinearSolver* self = nullptr;
    std::span<const char> held;
    std::span<const double> weights;
    const Product* nonlocal = nullptr;
    std::vector<double> tmp;
  };
  static PetscErrorCode shell_mult(Mat A, Vec v, Vec y);
  static PetscErrorCode shell_precondition(PC pc, Vec r, Vec z);

  struct TransposeContext {
    PtcLinearSolver* self = nullptr;
    const Product* nonlocal = nullptr;
    std::vector<double> tmp;
  };
  static PetscErrorCode transpose_mult(Mat A, Vec v, Vec y);
  static PetscErrorCode transpose_precondition(PC pc, Vec r, Vec z);
  Mat shell_t_ = nullptr;
  KSP outer_t_ = nullptr;
  TransposeContext tctx_;

  Mat shell_ = nullptr;
  KSP outer_ = nullptr;
  Vec rhs_scaled_ = nullptr;
  ShellContext ctx_;
  int krylov_its_ = 0;
  std::vector<PetscInt> cols_;
  std::vector<PetscScalar> vals_;
  double assembly_s_ = 0.0;
  double solve_s_ = 0.0;
};

}  // namespace colchem
