#include "analysis/ensemble.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>
#include <random>
#include <stdexcept>

namespace colchem {

namespace {

/// A uniform in the open interval (0, 1) from the top 53 bits of one draw.
double open_uniform(std::mt19937_64& g) {
  return (static_cast<double>(g() >> 11) + 0.5) * 0x1.0p-53;
}

/// An integer in [0, n) (n >= 1) from one draw (multiply-shift; bias below 2^-11 relative).
std::size_t below(std::mt19937_64& g, std::size_t n) {
  return static_cast<std::size_t>(static_cast<double>(g() >> 11) * 0x1.0p-53 *
                                  static_cast<double>(n));
}

double standard_normal_cdf(double x) {
  return 0.5 * std::erfc(-x / std::numbers::sqrt2);
}

}  // namespace

const char* sampling_name(EnsembleSampling s) {
  return s == EnsembleSampling::kLatinHypercube ? "latin_hypercube" : "random";
}

double standard_normal_quantile(double u) {
  if (!(u > 0.0 && u < 1.0)) {
    throw std::invalid_argument("standard_normal_quantile: u must lie in (0, 1)");
  }
  // Phi is monotone: bisection on [-40, 40] to a bracket of ~1e-12, then Newton steps,
  // which converge quadratically from there.
  double lo = -40.0, hi = 40.0;
  for (int i = 0; i < 50; ++i) {
    const double mid = 0.5 * (lo + hi);
    (standard_normal_cdf(mid) < u ? lo : hi) = mid;
  }
  double x = 0.5 * (lo + hi);
  for (int i = 0; i < 3; ++i) {
    const double pdf = std::exp(-0.5 * x * x) / std::sqrt(2.0 * std::numbers::pi);
    if (!(pdf > 0.0)) break;
    x -= (standard_normal_cdf(x) - u) / pdf;
  }
  return x;
}

std::vector<double> draw_standard_normals(std::size_t members, std::size_t reactions,
                                          std::uint64_t seed, EnsembleSampling sampling) {
  std::vector<double> z(members * reactions);
  std::mt19937_64 g(seed);
  std::vector<std::size_t> stratum(members);
  for (std::size_t r = 0; r < reactions; ++r) {
    for (std::size_t m = 0; m < members; ++m) stratum[m] = m;
    if (sampling == EnsembleSampling::kLatinHypercube) {
      // Fisher-Yates: a random order of the strata for this reaction.
      for (std::size_t i = members; i > 1; --i) std::swap(stratum[i - 1], stratum[below(g, i)]);
    }
    for (std::size_t m = 0; m < members; ++m) {
      const double u =
          sampling == EnsembleSampling::kLatinHypercube
              ? (static_cast<double>(stratum[m]) + open_uniform(g)) / static_cast<double>(members)
              : open_uniform(g);
      z[m * reactions + r] = standard_normal_quantile(std::clamp(u, 1e-300, 1.0 - 0x1.0p-53));
    }
  }
  return z;
}

namespace {
/// Definition 7 of Hyndman and Fan (1996) on sorted values.
double quantile_of_sorted(const std::vector<double>& v, double q) {
  const double h = q * static_cast<double>(v.size() - 1);
  const auto i = static_cast<std::size_t>(std::floor(h));
  if (i + 1 >= v.size()) return v.back();
  return v[i] + (h - static_cast<double>(i)) * (v[i + 1] - v[i]);
}
}  // namespace

double sample_quantile(std::vector<double> values, double q) {
  if (values.empty()) return std::numeric_limits<double>::quiet_NaN();
  std::sort(values.begin(), values.end());
  return quantile_of_sorted(values, q);
}

}  // namespace colchem

namespace colchem {

std::vector<std::vector<double>> ensemble_percentiles(
    const std::vector<std::vector<double>>& member_values) {
  constexpr std::size_t P = std::size(kEnsemblePercentiles);
  std::vector<const std::vector<double>*> ok;
  for (const auto& v : member_values) {
    if (!v.empty()) ok.push_back(&v);
  }
  std::vector<std::vector<double>> out(P);
  if (ok.empty()) return out;
  const std::size_t n = ok.front()->size();
  for (auto& o : out) o.resize(n);
  std::vector<double> column(ok.size());
  for (std::size_t i = 0; i < n; ++i) {
    for (std::size_t m = 0; m < ok.size(); ++m) column[m] = (*ok[m])[i];
    std::sort(column.begin(), column.end());
    for (std::size_t p = 0; p < P; ++p) {
      out[p][i] = quantile_of_sorted(column, kEnsemblePercentiles[p] / 100.0);
    }
  }
  return out;
}

double ensemble_log_sigma(const RateUncertainty& u, double T_K, double sigmas) {
  return std::log(u.factor(T_K)) / sigmas;
}

double ensemble_rate_factor(double z, const RateUncertainty& u, double T_K, double sigmas) {
  return std::exp(z * ensemble_log_sigma(u, T_K, sigmas));
}

}  // namespace colchem
