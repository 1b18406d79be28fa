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
#pragma once

#include <petscdmda.h>
#include <petscksp.h>

#include <span>
#include <string>
#include <vector>

#include "solve/block_tridiagonal.hpp"

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
  std::vector<PetscInt> cols_;
  std::vector<PetscScalar> vals_;
  double assembly_s_ = 0.0;
  double solve_s_ = 0.0;
};

}  // namespace colchem
