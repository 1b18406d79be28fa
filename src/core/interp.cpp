#include "core/interp.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

namespace colchem {

std::optional<std::vector<double>> interpolate(std::span<const double> x,
                                               std::span<const double> y,
                                               std::span<const double> at, InterpScale scale,
                                               Extrapolation policy, std::size_t* bad_index) {
  // Callers validate their tables; an empty or mismatched one reaching here is a bug, not
  // something to read out of bounds.
  if (x.empty() || x.size() != y.size()) {
    throw std::invalid_argument("interpolate: " + std::to_string(x.size()) + " abscissae and " +
                                std::to_string(y.size()) + " values");
  }
  std::vector<double> out(at.size());
  const double tol = 1e-9 * std::max(1.0, std::abs(x.back() - x.front()));
  for (std::size_t i = 0; i < at.size(); ++i) {
    double a = at[i];
    if (a < x.front() - tol || a > x.back() + tol) {
      if (policy == Extrapolation::kForbid) {
        if (bad_index) *bad_index = i;
        return std::nullopt;
      }
    }
    a = std::clamp(a, x.front(), x.back());
    if (x.size() == 1) {
      out[i] = y[0];
      continue;
    }
    auto it = std::upper_bound(x.begin(), x.end(), a);
    std::size_t k = static_cast<std::size_t>(std::distance(x.begin(), it));
    k = std::clamp<std::size_t>(k, 1, x.size() - 1);
    const double w = (a - x[k - 1]) / (x[k] - x[k - 1]);
    if (scale == InterpScale::kLog) {
      out[i] = std::exp((1.0 - w) * std::log(y[k - 1]) + w * std::log(y[k]));
    } else {
      out[i] = (1.0 - w) * y[k - 1] + w * y[k];
    }
  }
  return out;
}

double interp_linear_hold(std::span<const double> x, std::span<const double> y, double at) {
  const double v[1] = {at};
  return (*interpolate(x, y, v, InterpScale::kLinear, Extrapolation::kHoldEnds))[0];
}

}  // namespace colchem
