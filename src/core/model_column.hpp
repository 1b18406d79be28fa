// The species profiles of an earlier run as read back from its file (io/output.hpp): what a
// restart, a comparison or a budget starts from.
#pragma once

#include <cstddef>
#include <limits>
#include <string>
#include <vector>

namespace colchem {

struct ModelColumn {
  std::vector<double> altitude_cm;  ///< cell centres
  std::vector<double> edge_cm;      ///< cell edges
  std::vector<std::string> species;
  std::vector<double> number_density;  ///< [s][j]
  std::vector<double> mole_fraction;   ///< [s][j]
  [[nodiscard]] std::size_t cells() const { return altitude_cm.size(); }
  /// Index of a species, or npos.
  [[nodiscard]] std::size_t index(const std::string& name) const {
    for (std::size_t s = 0; s < species.size(); ++s) {
      if (species[s] == name) return s;
    }
    return std::numeric_limits<std::size_t>::max();
  }
};

}  // namespace colchem
