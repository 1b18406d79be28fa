// The Jacobian of the column's residual, block tridiagonal in cells:
//   J = [ D_0  U_0                 ]
//       [ L_1  D_1  U_1            ]
//       [      ...  ...  ...       ]
//       [           L_{N-1} D_{N-1}]
// D_j is a dense S x S block (chemistry couples every species in a cell; transport adds to
// its diagonal); L_j and U_j are diagonal (transport couples species s in cell j only to
// species s in cells j-1 and j+1). State ordering is cell-major, species fastest:
// x[j*S + s], the ordering of a PETSc DMDA with dof = S.
#pragma once

#include <cstddef>
#include <vector>

namespace colchem {

struct BlockTridiagonal {
  std::size_t cells = 0;
  std::size_t species = 0;
  std::vector<double> diag;   ///< cells * S * S, row-major per block: diag[(j*S + r)*S + c]
  std::vector<double> lower;  ///< cells * S: d f_{j,s} / d x_{j-1,s}  (unused for j = 0)
  std::vector<double> upper;  ///< cells * S: d f_{j,s} / d x_{j+1,s}  (unused for j = N-1)

  BlockTridiagonal() = default;
  BlockTridiagonal(std::size_t n_cells, std::size_t n_species)
      : cells(n_cells),
        species(n_species),
        diag(n_cells * n_species * n_species, 0.0),
        lower(n_cells * n_species, 0.0),
        upper(n_cells * n_species, 0.0) {}

  void zero() {
    std::fill(diag.begin(), diag.end(), 0.0);
    std::fill(lower.begin(), lower.end(), 0.0);
    std::fill(upper.begin(), upper.end(), 0.0);
  }
  double& d(std::size_t j, std::size_t r, std::size_t c) {
    return diag[(j * species + r) * species + c];
  }
  [[nodiscard]] double d(std::size_t j, std::size_t r, std::size_t c) const {
    return diag[(j * species + r) * species + c];
  }
  double& l(std::size_t j, std::size_t s) { return lower[j * species + s]; }
  double& u(std::size_t j, std::size_t s) { return upper[j * species + s]; }
  [[nodiscard]] double l(std::size_t j, std::size_t s) const { return lower[j * species + s]; }
  [[nodiscard]] double u(std::size_t j, std::size_t s) const { return upper[j * species + s]; }
};

}  // namespace colchem
