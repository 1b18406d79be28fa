// Slant paths: the Chapman function Ch(X, chi) = int_0^inf exp(-u) (X + u) /
// sqrt(X^2 cos^2 chi + 2 X u + u^2) du, chords through spherical shells
// sqrt(r_k+1^2 - p^2) - sqrt(r_k^2 - p^2) (cm), and the illumination average over
// mu0 = sin(lat) sin(dec) + cos(lat) cos(dec) cos(h): published sources (Chapman 1931; Smith
// and Smith 1972) in photo/slant_path.hpp.
#include "photo/slant_path.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"

namespace colchem {

void gauss_legendre(int n, std::vector<double>& x, std::vector<double>& w) {
  // Newton iteration on P_n from the Chebyshev-like first guess (Press et al., Numerical
  // Recipes, 3rd ed., sec. 4.6).
  x.assign(static_cast<std::size_t>(n), 0.0);
  w.assign(static_cast<std::size_t>(n), 0.0);
  for (int i = 0; i < n; ++i) {
    double z = std::cos(constants::kPi * (i + 0.75) / (n + 0.5));
    double dp = 1.0;
    for (int it = 0; it < 100; ++it) {
      double p1 = 1.0;
      double p2 = 0.0;
      for (int k = 1; k <= n; ++k) {
        const double p3 = p2;
        p2 = p1;
        p1 = ((2.0 * k - 1.0) * z * p2 - (k - 1.0) * p3) / k;
      }
      dp = n * (z * p1 - p2) / (z * z - 1.0);
      const double dz = p1 / dp;
      z -= dz;
      if (std::abs(dz) < 1e-15) break;
    }
    const auto idx = static_cast<std::size_t>(n - 1 - i);  // ascending order
    x[idx] = z;
    w[idx] = 2.0 / ((1.0 - z * z) * dp * dp);
  }
}

double chapman_function(double X, double chi) {
  const double c = std::cos(std::clamp(chi, 0.0, 0.5 * constants::kPi));
  // u = t^2 removes the u^-1/2 singularity at grazing incidence; the integrand changes on
  // the scale t ~ c sqrt(X/2), so the panels are graded geometrically from there.
  auto integrand = [&](double t) {
    const double u = t * t;
    return std::exp(-u) * 2.0 * t * (X + u) / std::sqrt(X * X * c * c + 2.0 * X * u + u * u);
  };
  std::vector<double> gx, gw;
  gauss_legendre(10, gx, gw);
  const double t_end = 6.5;  // exp(-42): beyond double precision of the sum
  const double t_scale = std::max(1e-8, 0.05 * c * std::sqrt(0.5 * X));
  std::vector<double> breaks{0.0};
  for (double t = std::min(t_scale, t_end); t < t_end; t *= 1.6) breaks.push_back(t);
  for (double t = breaks.back() + 0.25; t < t_end; t += 0.25) breaks.push_back(t);
  breaks.push_back(t_end);
  double sum = 0.0;
  for (std::size_t p = 0; p + 1 < breaks.size(); ++p) {
    const double a = breaks[p];
    const double b = breaks[p + 1];
    if (b <= a) continue;
    for (std::size_t q = 0; q < gx.size(); ++q) {
      sum += 0.5 * (b - a) * gw[q] * integrand(0.5 * (a + b) + 0.5 * (b - a) * gx[q]);
    }
  }
  return sum;
}

std::vector<IlluminationNode> illumination_nodes(const IlluminationSpec& s) {
  std::vector<IlluminationNode> out;
  if (s.form == IlluminationForm::kFixed) {
    const double mu = std::cos(s.zenith_angle_rad);
    if (mu > 0.0 && s.day_fraction > 0.0) out.push_back({mu, s.day_fraction});
    return out;
  }
  const double a = std::sin(s.latitude_rad) * std::sin(s.declination_rad);
  const double b = std::cos(s.latitude_rad) * std::cos(s.declination_rad);
  // Sunset hour angle: mu0(h_s) = 0; polar day (h_s = pi) and polar night (no nodes).
  double hs = constants::kPi;
  if (b > 0.0) {
    const double ch = -a / b;
    if (ch >= 1.0) return out;
    if (ch > -1.0) hs = std::acos(ch);
  } else if (a <= 0.0) {
    return out;
  }
  std::vector<double> x, w;
  gauss_legendre(s.hour_angle_points, x, w);
  for (std::size_t k = 0; k < x.size(); ++k) {
    const double h = 0.5 * hs * (x[k] + 1.0);
    const double mu = a + b * std::cos(h);
    if (mu <= 0.0) continue;
    out.push_back({mu, 0.5 * hs * w[k] / constants::kPi});
  }
  return out;
}

}  // namespace colchem
