// Spectral data onto bins, f_b = (1/dlambda_b) int f dlambda conserving integrals (nm, cm^2,
// cm^-2 s^-1 nm^-1); overtone bands in wavenumber space (cm^-1), S = 8.85e-13 f cm from an
// oscillator strength; the Planck photon flux at 1 au (Rybicki and Lightman 1979, eq. 1.51):
// equations and units in photo/spectral_binning.hpp.
#include "photo/spectral_binning.hpp"

#include <algorithm>
#include <array>
#include <cmath>

#include "core/constants.hpp"

namespace colchem {

namespace {

constexpr double kCmPerNm = 1.0e-7;

/// Integral over [a, b] of the linear function through (x0, y0), (x1, y1), times
/// (lambda)^power for power 0 or 1 (Simpson's rule is exact for these degrees).
double piece_integral(double x0, double y0, double x1, double y1, double a, double b, int power) {
  auto f = [&](double x) {
    const double y = y0 + (y1 - y0) * (x - x0) / (x1 - x0);
    return power == 0 ? y : y * x;
  };
  return (b - a) / 6.0 * (f(a) + 4.0 * f(0.5 * (a + b)) + f(b));
}

/// int_{a}^{b} table(lambda) lambda^power dlambda, zero outside the table or held at ends.
double table_integral(const TabulatedSpectrum& t, double a, double b, int power, bool hold) {
  const auto& x = t.wavelength_nm;
  const auto& y = t.value;
  double sum = 0.0;
  if (x.size() == 1) {
    if (hold) sum += piece_integral(a, y[0], b, y[0], a, b, power);
    return sum;
  }
  if (hold) {
    // Constant extensions below the first and above the last point.
    if (a < x.front()) {
      const double hi = std::min(b, x.front());
      sum += piece_integral(a, y.front(), hi, y.front(), a, hi, power);
    }
    if (b > x.back()) {
      const double lo = std::max(a, x.back());
      sum += piece_integral(lo, y.back(), b, y.back(), lo, b, power);
    }
  }
  // First segment that can overlap [a, b].
  auto it = std::upper_bound(x.begin(), x.end(), a);
  std::size_t k = it == x.begin() ? 0 : static_cast<std::size_t>(it - x.begin()) - 1;
  for (; k + 1 < x.size() && x[k] < b; ++k) {
    const double lo = std::max(a, x[k]);
    const double hi = std::min(b, x[k + 1]);
    if (hi > lo) sum += piece_integral(x[k], y[k], x[k + 1], y[k + 1], lo, hi, power);
  }
  return sum;
}

/// Cumulative distribution of the unit-area line shape at offset d (cm^-1) from centre.
double shape_cdf(BandShape shape, double fwhm_cm1, double d) {
  if (shape == BandShape::kGaussian) {
    const double s = fwhm_cm1 / (2.0 * std::sqrt(2.0 * std::log(2.0)));
    return 0.5 * (1.0 + std::erf(d / (s * std::sqrt(2.0))));
  }
  const double gamma = 0.5 * fwhm_cm1;
  return 0.5 + std::atan(d / gamma) / constants::kPi;
}

/// Antiderivative of x g(x) at offset d (cm^-1): -s^2 g(d) (Gaussian),
/// (gamma / 2 pi) ln(d^2 + gamma^2) (Lorentzian).
double shape_moment(BandShape shape, double fwhm_cm1, double d) {
  if (shape == BandShape::kGaussian) {
    const double s = fwhm_cm1 / (2.0 * std::sqrt(2.0 * std::log(2.0)));
    return -s / std::sqrt(2.0 * constants::kPi) * std::exp(-0.5 * d * d / (s * s));
  }
  const double gamma = 0.5 * fwhm_cm1;
  return gamma / (2.0 * constants::kPi) * std::log(d * d + gamma * gamma);
}

}  // namespace

std::vector<double> default_bin_edges() {
  std::vector<double> e;
  for (int l = 100; l < 350; ++l) e.push_back(l);
  for (int l = 350; l <= 1000; l += 5) e.push_back(l);
  return e;
}

std::vector<double> uniform_bin_edges(double from_nm, double to_nm, double width_nm) {
  const double count = std::round((to_nm - from_nm) / width_nm);
  if (!(count >= 1.0 && count <= 200000.0)) return {};
  if (std::abs(count * width_nm - (to_nm - from_nm)) > 1e-6 * width_nm) return {};
  const auto n = static_cast<std::size_t>(count);
  std::vector<double> e;
  for (std::size_t i = 0; i <= n; ++i)
    e.push_back(from_nm + (to_nm - from_nm) * static_cast<double>(i) / static_cast<double>(n));
  return e;
}

std::pair<std::string, std::string> bin_edges_problem(std::span<const double> e) {
  if (e.size() < 2) return {"at least two bin edges", ""};
  for (std::size_t i = 1; i < e.size(); ++i) {
    if (!(e[i] > e[i - 1]))
      return {"edges increasing strictly", "a decrease at entry " + std::to_string(i)};
  }
  if (!(e.front() > 0.0)) return {"positive wavelengths", ""};
  return {};
}

std::vector<double> bin_average(const TabulatedSpectrum& t, std::span<const double> edges) {
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    out[b] = table_integral(t, edges[b], edges[b + 1], 0, false) / (edges[b + 1] - edges[b]);
  }
  return out;
}

std::vector<double> bin_average_held(const TabulatedSpectrum& t, std::span<const double> edges) {
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    out[b] = table_integral(t, edges[b], edges[b + 1], 0, true) / (edges[b + 1] - edges[b]);
  }
  return out;
}

std::vector<double> bin_average_photons_from_energy(const TabulatedSpectrum& energy,
                                                    std::span<const double> edges) {
  // lambda in nm in the integral; h c / lambda with lambda in cm.
  const double hc = constants::kPlanck * constants::kSpeedOfLight;  // erg cm
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    const double e_lambda = table_integral(energy, edges[b], edges[b + 1], 1, false);
    out[b] = e_lambda * kCmPerNm / hc / (edges[b + 1] - edges[b]);
  }
  return out;
}

std::vector<double> band_onto_bins(const OvertoneBandSpec& band, std::span<const double> edges) {
  const double nu0 = 1.0 / (band.center_nm * kCmPerNm);
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    const double nu_hi = 1.0 / (edges[b] * kCmPerNm);  // short wavelength edge
    const double nu_lo = 1.0 / (edges[b + 1] * kCmPerNm);
    const double frac = shape_cdf(band.shape, band.fwhm_cm1, nu_hi - nu0) -
                        shape_cdf(band.shape, band.fwhm_cm1, nu_lo - nu0);
    out[b] = band.strength_cm * frac / (nu_hi - nu_lo);
  }
  return out;
}

double fraction_below(double a, double b, double threshold) {
  if (threshold <= 0.0) return 1.0;
  if (threshold >= b) return 1.0;
  if (threshold <= a) return 0.0;
  return (threshold - a) / (b - a);
}

double onset_average(double a, double b, double threshold, double onset_cm1) {
  if (threshold <= 0.0 || onset_cm1 <= 0.0) return fraction_below(a, b, threshold);
  const double nu_t = 1.0e7 / threshold;
  const double full = 1.0e7 / (nu_t + onset_cm1);  // wavelength where rho reaches 1
  // rho = 1 on [a, min(b, full)]; (1e7 / lambda - nu_t) / w on [max(a, full), min(b, threshold)].
  double sum = std::max(0.0, std::min(b, full) - a);
  const double lo = std::max(a, full);
  const double hi = std::min(b, threshold);
  if (hi > lo) sum += (1.0e7 * std::log(hi / lo) - nu_t * (hi - lo)) / onset_cm1;
  return sum / (b - a);
}

std::vector<double> band_onto_bins_above(const OvertoneBandSpec& band,
                                         std::span<const double> edges, double threshold_nm,
                                         double onset_cm1) {
  if (threshold_nm <= 0.0) return band_onto_bins(band, edges);
  const double nu0 = 1.0 / (band.center_nm * kCmPerNm);
  const double nu_t = 1.0e7 / threshold_nm;
  const double w = std::max(onset_cm1, 0.0);
  auto cdf = [&](double nu) { return shape_cdf(band.shape, band.fwhm_cm1, nu - nu0); };
  auto moment = [&](double nu) { return shape_moment(band.shape, band.fwhm_cm1, nu - nu0); };
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    const double nu_hi = 1.0 / (edges[b] * kCmPerNm);
    const double nu_lo = 1.0 / (edges[b + 1] * kCmPerNm);
    double frac = 0.0;
    // rho = 1 above nu_t + w.
    const double full = std::max(nu_lo, nu_t + w);
    if (nu_hi > full) frac += cdf(nu_hi) - cdf(full);
    // The ramp (nu - nu_t) / w on [nu_t, nu_t + w]: int (x + nu0 - nu_t) g(x) dx / w.
    if (w > 0.0) {
      const double lo = std::max(nu_lo, nu_t);
      const double hi = std::min(nu_hi, nu_t + w);
      if (hi > lo) {
        frac += (moment(hi) - moment(lo) + (nu0 - nu_t) * (cdf(hi) - cdf(lo))) / w;
      }
    }
    out[b] = band.strength_cm * frac / (nu_hi - nu_lo);
  }
  return out;
}

std::vector<double> planck_photon_flux_1au(double T, double radius_cm,
                                           std::span<const double> edges) {
  // 8-point Gauss-Legendre on [-1, 1] (Abramowitz and Stegun 1964, table 25.4).
  static constexpr std::array<double, 8> x{
      -0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498,
      0.1834346424956498,  0.5255324099163290,  0.7966664774136267,  0.9602898564975363};
  static constexpr std::array<double, 8> w{
      0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620,
      0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763};
  const double dilution = constants::kPi * std::pow(radius_cm / constants::kAstronomicalUnit, 2);
  const double c2 = constants::kPlanck * constants::kSpeedOfLight / constants::kBoltzmann;
  auto photon_flux = [&](double l_nm) {  // per nm
    const double l = l_nm * kCmPerNm;
    return dilution * 2.0 * constants::kSpeedOfLight / std::pow(l, 4) / std::expm1(c2 / (l * T)) *
           kCmPerNm;
  };
  std::vector<double> out(edges.size() - 1);
  for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
    // Sub-intervals no wider than 2 % of the wavelength keep the quadrature error far
    // below 1e-10 even for wide bins.
    const double a = edges[b];
    const double e = edges[b + 1];
    const int pieces = std::max(1, static_cast<int>(std::ceil((e - a) / (0.02 * a))));
    const double h = (e - a) / pieces;
    double sum = 0.0;
    for (int p = 0; p < pieces; ++p) {
      const double mid = a + (p + 0.5) * h;
      for (std::size_t q = 0; q < x.size(); ++q)
        sum += 0.5 * h * w[q] * photon_flux(mid + 0.5 * h * x[q]);
    }
    out[b] = sum / (e - a);
  }
  return out;
}

double band_strength_from_oscillator(double f) {
  const double e2 = constants::kElementaryCharge * constants::kElementaryCharge;
  return constants::kPi * e2 /
         (constants::kElectronMass * constants::kSpeedOfLight * constants::kSpeedOfLight) * f;
}

}  // namespace colchem
