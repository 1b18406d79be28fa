#include "analysis/attribution.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <stdexcept>

namespace colchem {

AttributionTerms first_order_attribution(std::span<const double> dG_profile, double G,
                                         std::span<const double> sigma, std::size_t reactions,
                                         std::size_t cells) {
  if (dG_profile.size() != reactions * cells || sigma.size() != reactions * cells) {
    throw std::invalid_argument("first_order_attribution: profile sizes differ");
  }
  if (!(G > 0.0)) throw std::invalid_argument("first_order_attribution: G must be positive");
  AttributionTerms t;
  t.log_sensitivity.assign(reactions, 0.0);
  t.scaled.assign(reactions, 0.0);
  t.share.assign(reactions, 0.0);
  for (std::size_t r = 0; r < reactions; ++r) {
    for (std::size_t j = 0; j < cells; ++j) {
      const double S = dG_profile[r * cells + j] / G;
      t.log_sensitivity[r] += S;
      t.scaled[r] += S * sigma[r * cells + j];
    }
    t.variance += t.scaled[r] * t.scaled[r];
    t.largest_scaled = std::max(t.largest_scaled, std::abs(t.scaled[r]));
  }
  if (t.variance > 0.0) {
    for (std::size_t r = 0; r < reactions; ++r) t.share[r] = t.scaled[r] * t.scaled[r] / t.variance;
  }
  return t;
}

double sample_variance(std::span<const double> values) {
  const std::size_t n = values.size();
  if (n < 2) return std::numeric_limits<double>::quiet_NaN();
  double mean = 0.0;
  for (double v : values) mean += v;
  mean /= static_cast<double>(n);
  double ss = 0.0;
  for (double v : values) ss += (v - mean) * (v - mean);
  return ss / static_cast<double>(n - 1);
}

bool attribution_agrees(double first_order, double ensemble, double tolerance) {
  if (!std::isfinite(first_order) || !std::isfinite(ensemble) || !(ensemble > 0.0)) return false;
  return std::abs(first_order / ensemble - 1.0) <= tolerance;
}

}  // namespace colchem
