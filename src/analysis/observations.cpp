#include "analysis/observations.hpp"

#include <algorithm>

namespace colchem {

std::vector<std::string> ObservationSet::species() const {
  std::vector<std::string> out;
  for (const auto& p : points) {
    if (std::find(out.begin(), out.end(), p.species) == out.end()) out.push_back(p.species);
  }
  return out;
}

}  // namespace colchem
