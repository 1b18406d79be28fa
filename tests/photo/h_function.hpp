// Chandrasekhar's H-function of isotropic scattering, the exact reference of the two-stream
// tests (test_two_stream.cpp, test_two_stream_doubling.cpp).
#pragma once

#include <algorithm>
#include <cmath>
#include <vector>

#include "photo/slant_path.hpp"

namespace colchem::test {

/// Chandrasekhar's H-function of isotropic scattering with albedo w (Radiative Transfer,
/// 1960, ch. V): 1/H(mu) = sqrt(1 - w) + (w/2) int_0^1 mu' H(mu') / (mu + mu') dmu',
/// iterated to a fixed point on 96 Gauss-Legendre nodes; evaluated anywhere by the same sum.
/// The exact plane albedo of a semi-infinite atmosphere is r(mu0) = 1 - H(mu0) sqrt(1 - w).
struct HFunction {
  double w = 0.0;
  std::vector<double> mu, weight, H;
  explicit HFunction(double albedo) : w(albedo) {
    gauss_legendre(96, mu, weight);
    for (std::size_t i = 0; i < mu.size(); ++i) {
      mu[i] = 0.5 * (mu[i] + 1.0);
      weight[i] *= 0.5;
    }
    H.assign(mu.size(), 1.0);
    for (int it = 0; it < 5000; ++it) {
      std::vector<double> next(mu.size());
      double change = 0.0;
      for (std::size_t i = 0; i < mu.size(); ++i) {
        next[i] = (*this)(mu[i]);
        change = std::max(change, std::abs(next[i] - H[i]));
      }
      H = next;
      if (change < 1e-15) break;
    }
  }
  double operator()(double at) const {
    double s = 0.0;
    for (std::size_t i = 0; i < mu.size(); ++i) s += weight[i] * mu[i] * H[i] / (at + mu[i]);
    return 1.0 / (std::sqrt(1.0 - w) + 0.5 * w * s);
  }
};

}  // namespace colchem::test
