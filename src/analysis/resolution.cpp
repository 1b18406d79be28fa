// Richardson extrapolation (Roache 1998) and equidistribution (de Boor 1973; Huang and
// Russell 2011); equations and units in resolution.hpp.
#include "analysis/resolution.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "analysis/score.hpp"

namespace colchem {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

bool in_range(double p, const AsymptoticRange& range) {
  return std::isfinite(p) && p >= range.low && p <= range.high;
}

/// The order used for the error estimate: the observed one when asymptotic, else formal.
double estimate_order(const RichardsonEstimate& e, const AsymptoticRange& range) {
  return e.status == ResolutionStatus::kAsymptotic ? e.order : range.formal_order;
}

/// Roache's error of the finest solution from its difference to the next coarser one.
double finest_error(double d23, double ratio, double order) {
  return d23 / (std::pow(ratio, order) - 1.0);
}
}  // namespace

std::string resolution_status_name(ResolutionStatus s) {
  switch (s) {
    case ResolutionStatus::kAsymptotic:
      return "asymptotic";
    case ResolutionStatus::kNotAsymptotic:
      return "not asymptotic";
    case ResolutionStatus::kResolved:
      return "resolved";
    case ResolutionStatus::kFailed:
      return "failed";
  }
  return "failed";
}

double observed_order(double diff_coarse, double diff_fine, double ratio) {
  return std::log(std::abs(diff_coarse) / std::abs(diff_fine)) / std::log(ratio);
}

RichardsonEstimate richardson_from_differences(double d12, double d23, double ratio,
                                               const AsymptoticRange& range) {
  RichardsonEstimate e;
  if (!std::isfinite(d12) || !std::isfinite(d23)) return e;
  if (d12 <= range.resolved_below && d23 <= range.resolved_below) {
    e.status = ResolutionStatus::kResolved;
    e.error = finest_error(d23, ratio, range.formal_order);
    return e;
  }
  e.order = observed_order(d12, d23, ratio);
  e.status = (d23 < d12 && in_range(e.order, range)) ? ResolutionStatus::kAsymptotic
                                                     : ResolutionStatus::kNotAsymptotic;
  e.error = finest_error(d23, ratio, estimate_order(e, range));
  return e;
}

RichardsonEstimate richardson_scalar(double coarse, double medium, double fine, double ratio,
                                     const AsymptoticRange& range) {
  RichardsonEstimate e;
  const double d12 = coarse - medium, d23 = medium - fine;
  if (!std::isfinite(d12) || !std::isfinite(d23)) return e;
  // A scalar of any size: the threshold is relative to it (absolute below magnitude 1).
  const double scale = std::max(1.0, std::abs(fine));
  if (std::abs(d12) <= range.resolved_below * scale &&
      std::abs(d23) <= range.resolved_below * scale) {
    e.status = ResolutionStatus::kResolved;
    e.error = finest_error(d23, ratio, range.formal_order);
    return e;
  }
  e.order = observed_order(d12, d23, ratio);
  // Oscillating differences (opposite signs) are not in the asymptotic range either.
  const bool monotone = d12 * d23 > 0.0;
  e.status = (monotone && std::abs(d23) < std::abs(d12) && in_range(e.order, range))
                 ? ResolutionStatus::kAsymptotic
                 : ResolutionStatus::kNotAsymptotic;
  e.error = finest_error(d23, ratio, estimate_order(e, range));
  return e;
}

std::vector<double> refine_edges(std::span<const double> edges_cm, std::size_t factor) {
  if (factor < 1 || edges_cm.size() < 2) throw std::invalid_argument("refine_edges: bad input");
  std::vector<double> out;
  out.reserve((edges_cm.size() - 1) * factor + 1);
  for (std::size_t j = 0; j + 1 < edges_cm.size(); ++j) {
    const double a = edges_cm[j], b = edges_cm[j + 1];
    for (std::size_t m = 0; m < factor; ++m) {
      out.push_back(a + (b - a) * static_cast<double>(m) / static_cast<double>(factor));
    }
  }
  out.push_back(edges_cm.back());
  return out;
}

std::vector<double> profile_at(std::span<const double> altitude_cm, std::span<const double> f,
                               std::span<const double> at_cm) {
  std::vector<double> out(at_cm.size());
  for (std::size_t k = 0; k < at_cm.size(); ++k) {
    out[k] = interpolate_log_profile(altitude_cm, f, at_cm[k]);
  }
  return out;
}

DifferenceNorms difference_norms(std::span<const double> a, std::span<const double> b,
                                 const std::vector<bool>& use) {
  DifferenceNorms d;
  double sum2 = 0.0;
  for (std::size_t k = 0; k < a.size(); ++k) {
    if (!use[k] || !std::isfinite(a[k]) || !std::isfinite(b[k])) continue;
    const double x = std::abs(a[k] - b[k]);
    d.max = std::max(d.max, x);
    sum2 += x * x;
    ++d.points;
  }
  d.rms = d.points > 0 ? std::sqrt(sum2 / static_cast<double>(d.points)) : kNaN;
  if (d.points == 0) d.max = kNaN;
  return d;
}

SpeciesResolution compare_species(const std::string& name,
                                  const std::vector<std::vector<double>>& altitude_cm,
                                  const std::vector<std::vector<double>>& f, double ratio,
                                  const ResolutionOptions& options) {
  const std::size_t L = altitude_cm.size();
  if (L < 3 || f.size() != L) throw std::invalid_argument("compare_species: three levels or more");
  SpeciesResolution r;
  r.species = name;
  const std::vector<double>& at = altitude_cm.front();
  const std::size_t K = at.size();
  bool failed = false;
  double peak = 0.0;
  std::vector<std::vector<double>> value(L);
  for (std::size_t l = 0; l < L; ++l) {
    if (f[l].empty()) {
      failed = true;
      value[l].assign(K, kNaN);
      continue;
    }
    value[l] = profile_at(altitude_cm[l], f[l], at);
    for (double v : f[l]) peak = std::max(peak, v);
  }
  r.compared.assign(K, peak > 0.0);
  r.log10_f.assign(L, std::vector<double>(K, kNaN));
  for (std::size_t l = 0; l < L; ++l) {
    if (f[l].empty()) continue;  // a failed level: the others are still compared pairwise
    for (std::size_t k = 0; k < K; ++k) {
      const double v = value[l][k];
      if (std::isfinite(v) && v > 0.0) r.log10_f[l][k] = std::log10(v);
      if (!(v >= options.relative_floor * peak)) r.compared[k] = false;
    }
  }
  for (std::size_t l = 0; l + 1 < L; ++l) {
    r.differences.push_back(difference_norms(r.log10_f[l], r.log10_f[l + 1], r.compared));
  }
  for (std::size_t l = 0; l + 2 < L; ++l) {
    r.order_rms.push_back(observed_order(r.differences[l].rms, r.differences[l + 1].rms, ratio));
    r.order_max.push_back(observed_order(r.differences[l].max, r.differences[l + 1].max, ratio));
  }
  r.error_log10.assign(K, kNaN);
  const std::size_t c = L - 3;  // the finest triple
  if (failed || r.differences[c].points == 0) return r;
  const auto& range = options.range;
  r.by_rms =
      richardson_from_differences(r.differences[c].rms, r.differences[c + 1].rms, ratio, range);
  r.by_max =
      richardson_from_differences(r.differences[c].max, r.differences[c + 1].max, ratio, range);
  // Both norms must agree: a profile is asymptotic only if both orders are, resolved only if
  // both differences are negligible.
  const auto a = r.by_rms.status, b = r.by_max.status;
  if (a == ResolutionStatus::kResolved && b == ResolutionStatus::kResolved) {
    r.status = ResolutionStatus::kResolved;
  } else if (a == ResolutionStatus::kAsymptotic && b == ResolutionStatus::kAsymptotic) {
    r.status = ResolutionStatus::kAsymptotic;
  } else {
    r.status = ResolutionStatus::kNotAsymptotic;
  }
  const double q = r.status == ResolutionStatus::kAsymptotic ? r.by_rms.order : range.formal_order;
  double emax = 0.0, sum2 = 0.0;
  std::size_t n = 0;
  for (std::size_t k = 0; k < K; ++k) {
    if (!r.compared[k]) continue;
    const double e = finest_error(r.log10_f[L - 2][k] - r.log10_f[L - 1][k], ratio, q);
    r.error_log10[k] = e;
    emax = std::max(emax, std::abs(e));
    sum2 += e * e;
    ++n;
  }
  r.error_max = emax;
  r.error_rms = std::sqrt(sum2 / static_cast<double>(n));
  return r;
}

std::vector<double> curvature_indicator(const Grid& grid, std::span<const double> f,
                                        std::size_t species, const std::vector<bool>& use,
                                        double relative_floor) {
  const std::size_t N = grid.cells();
  std::vector<double> c(N, 0.0);
  if (N < 3) return c;
  const auto& z = grid.center_cm;
  std::vector<double> u(N), cs(N);
  for (std::size_t s = 0; s < species; ++s) {
    if (!use[s]) continue;
    const auto fs = f.subspan(s * N, N);
    const double peak = *std::max_element(fs.begin(), fs.end());
    if (!(peak > 0.0)) continue;
    const double floor = relative_floor * peak;
    for (std::size_t j = 0; j < N; ++j) u[j] = std::log(std::max(fs[j], floor));
    for (std::size_t j = 1; j + 1 < N; ++j) {
      const double hm = z[j] - z[j - 1], hp = z[j + 1] - z[j];
      const double dm = (u[j] - u[j - 1]) / hm, dp = (u[j + 1] - u[j]) / hp;
      const double d1 = (hm * dp + hp * dm) / (hm + hp);  // exact for quadratic u
      const double d2 = 2.0 * (dp - dm) / (hp + hm);
      cs[j] = std::abs(d2) + d1 * d1;
    }
    cs[0] = cs[1];
    cs[N - 1] = cs[N - 2];
    for (std::size_t j = 0; j < N; ++j) c[j] = std::max(c[j], cs[j]);
  }
  return c;
}

std::vector<double> monitor_from_indicator(const Grid& grid, std::span<const double> c,
                                           int smoothing_passes, double uniform_share) {
  if (!(uniform_share > 0.0 && uniform_share < 1.0)) {
    throw std::invalid_argument("monitor_from_indicator: uniform share outside (0, 1)");
  }
  const std::size_t N = grid.cells();
  double sum = 0.0, span = 0.0;
  for (std::size_t j = 0; j < N; ++j) {
    sum += grid.width_cm(j) * std::sqrt(c[j]);
    span += grid.width_cm(j);
  }
  const double w = (sum / span) * uniform_share / (1.0 - uniform_share);
  const double alpha = w * w;
  std::vector<double> M(N, 1.0);
  if (alpha > 0.0) {
    for (std::size_t j = 0; j < N; ++j) M[j] = std::sqrt(1.0 + c[j] / alpha);
  }
  for (int pass = 0; pass < smoothing_passes && N > 1; ++pass) {
    std::vector<double> s(N);
    for (std::size_t j = 0; j < N; ++j) {
      const double lo = M[j > 0 ? j - 1 : 0], hi = M[j + 1 < N ? j + 1 : N - 1];
      s[j] = 0.25 * lo + 0.5 * M[j] + 0.25 * hi;
    }
    M = std::move(s);
  }
  return M;
}

SampledMonitor gradient_limited_monitor(const Grid& grid, std::span<const double> M,
                                        std::size_t cells, double r, std::size_t subcells) {
  const std::size_t N = grid.cells();
  if (M.size() != N || cells < 1 || subcells < 1 || !(r >= 1.0)) {
    throw std::invalid_argument("gradient_limited_monitor: bad input");
  }
  SampledMonitor out;
  out.edges_cm = refine_edges(grid.edge_cm, subcells);
  const std::size_t K = out.edges_cm.size() - 1;
  // w = 1/M, linear between the old centres (held beyond the end centres).
  std::vector<double> zs(K), w(K);
  const auto& zc = grid.center_cm;
  std::size_t j = 0;
  for (std::size_t k = 0; k < K; ++k) {
    zs[k] = 0.5 * (out.edges_cm[k] + out.edges_cm[k + 1]);
    while (j + 1 < N && zc[j + 1] <= zs[k]) ++j;
    if (zs[k] <= zc.front() || j + 1 >= N) {
      w[k] = 1.0 / M[zs[k] <= zc.front() ? 0 : N - 1];
    } else {
      const double t = (zs[k] - zc[j]) / (zc[j + 1] - zc[j]);
      w[k] = (1.0 - t) / M[j] + t / M[j + 1];
    }
  }
  // The widths h = C w, C = (int dz/w)/cells, limited to slope g: h_k <= h_i + g |z_k - z_i|,
  // i.e. w_k <= w_i + (g/C) |z_k - z_i| (a forward and a backward sweep give the envelope).
  // Limiting lowers w and so raises C: repeat with the new C until it settles.
  const double g = 2.0 * (r - 1.0) / (r + 1.0);
  std::vector<double> lim(w);
  double C = 0.0;
  for (int it = 0; it < 100; ++it) {
    double I = 0.0;
    for (std::size_t k = 0; k < K; ++k) I += (out.edges_cm[k + 1] - out.edges_cm[k]) / lim[k];
    const double C_new = I / static_cast<double>(cells);
    if (it > 0 && std::abs(C_new - C) <= 1e-6 * C) break;
    C = C_new;
    const double slope = g / C;
    lim = w;
    for (std::size_t k = 1; k < K; ++k) {
      lim[k] = std::min(lim[k], lim[k - 1] + slope * (zs[k] - zs[k - 1]));
    }
    for (std::size_t k = K - 1; k-- > 0;) {
      lim[k] = std::min(lim[k], lim[k + 1] + slope * (zs[k + 1] - zs[k]));
    }
  }
  out.M.resize(K);
  for (std::size_t k = 0; k < K; ++k) out.M[k] = 1.0 / lim[k];
  return out;
}

std::vector<double> equidistribute(std::span<const double> edges_cm, std::span<const double> M,
                                   std::size_t cells) {
  const std::size_t N = M.size();
  if (edges_cm.size() != N + 1 || cells < 1) throw std::invalid_argument("equidistribute: sizes");
  std::vector<double> I(N + 1, 0.0);  // cumulative integral of M at the old edges
  for (std::size_t i = 0; i < N; ++i) I[i + 1] = I[i] + M[i] * (edges_cm[i + 1] - edges_cm[i]);
  std::vector<double> out(cells + 1);
  out.front() = edges_cm.front();
  out.back() = edges_cm.back();
  std::size_t i = 0;
  for (std::size_t k = 1; k < cells; ++k) {
    const double target = I[N] * static_cast<double>(k) / static_cast<double>(cells);
    while (i + 1 < N && I[i + 1] <= target) ++i;
    out[k] = edges_cm[i] + (target - I[i]) / M[i];
  }
  return out;
}

std::vector<double> limit_neighbour_ratio(std::span<const double> edges_cm, double r) {
  const std::size_t N = edges_cm.size() - 1;
  std::vector<double> h(N);
  for (std::size_t j = 0; j < N; ++j) h[j] = edges_cm[j + 1] - edges_cm[j];
  // Forward then backward: after both, h_j <= r h_{j-1} and h_j <= r h_{j+1} for every j
  // (a backward cut never breaks a forward bound since r >= 1); a common stretch keeps both.
  for (std::size_t j = 1; j < N; ++j) h[j] = std::min(h[j], r * h[j - 1]);
  for (std::size_t j = N - 1; j-- > 0;) h[j] = std::min(h[j], r * h[j + 1]);
  double total = 0.0;
  for (double x : h) total += x;
  const double stretch = (edges_cm.back() - edges_cm.front()) / total;
  std::vector<double> out(N + 1);
  out[0] = edges_cm.front();
  for (std::size_t j = 0; j < N; ++j) out[j + 1] = out[j] + h[j] * stretch;
  out[N] = edges_cm.back();
  return out;
}

std::vector<double> equidistributed_edges(const Grid& grid, std::span<const double> f,
                                          std::size_t species, const std::vector<bool>& use,
                                          std::size_t cells,
                                          const EquidistributionOptions& options) {
  const auto c = curvature_indicator(grid, f, species, use, options.relative_floor);
  const auto M = monitor_from_indicator(grid, c, options.smoothing_passes, options.uniform_share);
  const SampledMonitor sm = gradient_limited_monitor(grid, M, cells, options.max_neighbour_ratio);
  return limit_neighbour_ratio(equidistribute(sm.edges_cm, sm.M, cells),
                               options.max_neighbour_ratio);
}

}  // namespace colchem
