#include "analysis/observations.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace colchem {

std::vector<std::string> ObservationSet::species() const {
  std::vector<std::string> out;
  for (const auto& p : points) {
    if (std::find(out.begin(), out.end(), p.species) == out.end()) out.push_back(p.species);
  }
  return out;
}

void check_observations(const ObservationSet& set) {
  for (const auto& p : set.points) {
    const auto fail = [&](const char* column, const std::string& expected, double found,
                          const char* unit) {
      throw InputError(ExitCode::kInputData, SourceLocation{set.file.string(), p.line}, column,
                       expected, fmt::format("{:.6g}{}", found, unit));
    };
    if (!(p.value > 0.0)) fail("value", "a positive mole fraction", p.value, "");
    if (p.uncertainty < 0.0 || (!p.upper_limit && !(p.uncertainty > 0.0))) {
      fail("uncertainty",
           p.upper_limit ? "a non-negative uncertainty" : "a positive uncertainty for a detection",
           p.uncertainty, " (as a mole fraction)");
    }
    const double sz = p.altitude_uncertainty_cm;
    if (!(sz >= 0.0) || !std::isfinite(sz)) {
      fail("altitude_uncertainty", "a non-negative altitude uncertainty", sz / 1e5, " km");
    }
    if (p.kernel && sz > 0.0) {
      fail("altitude_uncertainty",
           "0 for a point with a kernel (the kernel carries its vertical resolution)", sz / 1e5,
           " km");
    }
  }
}

}  // namespace colchem
