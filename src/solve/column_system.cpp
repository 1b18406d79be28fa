// Sums of the column's operators: see column_system.hpp.
#include "solve/column_system.hpp"

#include <algorithm>
#include <fmt/format.h>

namespace colchem {

std::string describe_entry(const ColumnSystem& sys, std::size_t cell, std::size_t species) {
  if (species < sys.species_names.size() && cell < sys.altitude_km.size()) {
    return fmt::format("{} at {:.4g} km (cell {})", sys.species_names[species],
                       sys.altitude_km[cell], cell);
  }
  return "cell " + std::to_string(cell) + ", species " + std::to_string(species);
}

void evaluate_tendency(const ColumnSystem& sys, std::span<const double> x, double t,
                       std::span<double> tendency) {
  std::fill(tendency.begin(), tendency.end(), 0.0);
  for (ColumnOperator* op : sys.operators) op->add_tendency(x, t, tendency);
}

void evaluate_jacobian(const ColumnSystem& sys, std::span<const double> x, double t,
                       BlockTridiagonal& jac) {
  if (jac.cells != sys.cells || jac.species != sys.species) {
    jac = BlockTridiagonal(sys.cells, sys.species);
  } else {
    jac.zero();
  }
  for (ColumnOperator* op : sys.operators) op->add_jacobian(x, t, jac);
}

}  // namespace colchem
