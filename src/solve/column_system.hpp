// The whole column as the solvers see it: a list of operators (non-owning) summed into one
// right-hand side, F(x) = sum_k f_k(x), over `cells` cells of `species` species each, with
// x[j*S + s] (cell-major, species fastest; the ordering of block_tridiagonal.hpp).
//
// Some dependences of F on x reach beyond neighbouring cells and so lie outside the
// block-tridiagonal Jacobian: a photolysis rate at altitude z depends on every absorber
// overhead (and, with multiple scattering, below). A NonlocalCoupling supplies them:
//   refresh(x)                recomputes the nonlocal quantities (J-values) at x, so that
//                             the operators' tendency and Jacobian are those at x;
//   add_jacobian_product(x,v) adds (dF/dx)_nonlocal v, the part of the full Jacobian-vector
//                             product that the block-tridiagonal Jacobian omits.
// The full Jacobian is then J = J_bt + J_nl; the Newton solver applies it as an operator
// and uses J_bt as the preconditioner (Jacobian-free Newton-Krylov: Knoll and Keyes 2004,
// J. Comput. Phys. 193, 357).
#pragma once

#include <cstddef>
#include <span>
#include <string>
#include <vector>

#include "core/block_tridiagonal.hpp"
#include "core/column_operator.hpp"

namespace colchem {

class NonlocalCoupling {
 public:
  virtual ~NonlocalCoupling() = default;
  /// Recomputes the nonlocal quantities at x (called before F and J_bt are evaluated).
  virtual void refresh(std::span<const double> x) = 0;
  /// out += J_nl(x) v, at the x of the last refresh. Rows of held species stay untouched.
  virtual void add_jacobian_product(std::span<const double> x, std::span<const double> v,
                                    std::span<double> out) = 0;
};

struct ColumnSystem {
  std::vector<ColumnOperator*> operators;  ///< not owned; all of them make up F
  std::size_t cells = 0;
  std::size_t species = 0;
  NonlocalCoupling* coupling = nullptr;  ///< not owned; null when F is local
  /// Labels for messages (optional): species names and cell-centre altitudes (km).
  std::vector<std::string> species_names{};
  std::vector<double> altitude_km{};

  [[nodiscard]] std::size_t size() const { return cells * species; }
};

/// "SO2 at 72.5 km (cell 37)" where labels are known, else "cell 37, species 13".
std::string describe_entry(const ColumnSystem& sys, std::size_t cell, std::size_t species);

/// F = sum_k f_k(x, t) (cm^-3 s^-1); `tendency` is overwritten.
void evaluate_tendency(const ColumnSystem& sys, std::span<const double> x, double t,
                       std::span<double> tendency);

/// J = sum_k d f_k / d x; `jac` is zeroed first (and resized if its shape differs).
void evaluate_jacobian(const ColumnSystem& sys, std::span<const double> x, double t,
                       BlockTridiagonal& jac);

}  // namespace colchem
