// Views of a column state; equations in core/column_state.hpp.
#include "core/column_state.hpp"

namespace colchem {

std::vector<double> species_major(std::span<const double> n, std::size_t S) {
  const std::size_t N = S == 0 ? 0 : n.size() / S;
  std::vector<double> out(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) out[s * N + j] = n[j * S + s];
  }
  return out;
}

std::vector<double> mole_fractions(std::span<const double> n, std::span<const double> air) {
  const std::size_t N = air.size();
  const std::size_t S = N == 0 ? 0 : n.size() / N;
  std::vector<double> f(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) f[s * N + j] = n[j * S + s] / air[j];
  }
  return f;
}

double column_density(std::span<const double> n, std::size_t S, std::size_t s, const Grid& grid) {
  double col = 0.0;
  for (std::size_t j = 0; j < grid.cells(); ++j) col += n[j * S + s] * grid.width_cm(j);
  return col;
}

std::vector<double> column_densities(std::span<const double> n, std::size_t S, const Grid& grid) {
  std::vector<double> col(S);
  for (std::size_t s = 0; s < S; ++s) col[s] = column_density(n, S, s, grid);
  return col;
}

}  // namespace colchem
