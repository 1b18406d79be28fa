// The whole column as the solvers see it: a list of operators (non-owning) summed into one
// right-hand side, F(x) = sum_k f_k(x), over `cells` cells of `species` species each, with
// x[j*S + s] (cell-major, species fastest; the ordering of block_tridiagonal.hpp).
#pragma once

#include <cstddef>
#include <span>
#include <vector>

#include "solve/block_tridiagonal.hpp"
#include "solve/column_operator.hpp"

namespace colchem {

struct ColumnSystem {
  std::vector<ColumnOperator*> operators;  ///< not owned; all of them make up F
  std::size_t cells = 0;
  std::size_t species = 0;

  [[nodiscard]] std::size_t size() const { return cells * species; }
};

/// F = sum_k f_k(x, t) (cm^-3 s^-1); `tendency` is overwritten.
void evaluate_tendency(const ColumnSystem& sys, std::span<const double> x, double t,
                       std::span<double> tendency);

/// J = sum_k d f_k / d x; `jac` is zeroed first (and resized if its shape differs).
void evaluate_jacobian(const ColumnSystem& sys, std::span<const double> x, double t,
                       BlockTridiagonal& jac);

}  // namespace colchem
