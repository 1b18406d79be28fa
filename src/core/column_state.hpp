// One view of a column state: the solver's cell-major densities n[j*S + s] (cm^-3; cell j,
// species s, species fastest, as in core/block_tridiagonal.hpp) and what outputs,
// objectives and scores read from them, the one place each is formed:
//   species-major copy  out[s*N + j] = n[j*S + s]
//   mole fraction       f[s*N + j] = n[j*S + s] / n_a,j        (n_a the air density, cm^-3)
//   column density      N_s = sum_j n[j*S + s] dz_j              (cm^-2, over the domain)
// (the column is the midpoint rule of the integral of n dz on the finite-volume grid;
// analytic).
#pragma once

#include <cstddef>
#include <span>
#include <vector>

#include "core/grid.hpp"

namespace colchem {

/// The species-major copy out[s*N + j] = n[j*S + s] of a cell-major state of S species.
std::vector<double> species_major(std::span<const double> n, std::size_t S);

/// Mole fractions f[s*N + j] = n[j*S + s] / air[j], species-major (N = air.size()).
std::vector<double> mole_fractions(std::span<const double> n, std::span<const double> air);

/// Column density sum_j n[j*S + s] dz_j (cm^-2) of species s.
double column_density(std::span<const double> n, std::size_t S, std::size_t s, const Grid& grid);

/// Column densities of every species (cm^-2).
std::vector<double> column_densities(std::span<const double> n, std::size_t S, const Grid& grid);

}  // namespace colchem
