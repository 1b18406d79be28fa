// Slant paths of the direct solar beam and the illumination average.
//
// Chapman function for an exponential atmosphere (Chapman 1931; Smith and Smith 1972,
// J. Geophys. Res. 77, 3592): the slant column from radius r0 = X H towards zenith angle
// chi, divided by the vertical column n0 H,
//   Ch(X, chi) = int_0^inf exp(-u) (X + u) / sqrt(X^2 cos^2 chi + 2 X u + u^2) du,
// u the height above r0 in scale heights. Evaluated numerically (u = t^2, composite
// Gauss-Legendre with panels graded towards t = 0); chi <= 90 deg. Ch -> sec chi for small
// chi and Ch(X, 90 deg) = sqrt(pi X / 2) (1 + 3/(8X) - 15/(128 X^2) + ...) at grazing
// incidence (the asymptotic series of X e^X K_1(X)).
//
// Spherical shells: the ray from a cell centre at radius r_j with impact parameter
// p = r_j sin chi crosses the shell [r_k, r_k+1] over sqrt(r_k+1^2 - p^2) - sqrt(r_k^2 - p^2)
// (exact geometry of the model's cells, densities constant in each cell).
//
// Illumination: mu0 = sin(lat) sin(dec) + cos(lat) cos(dec) cos(h); the daily mean of a
// rate is (1/pi) int_0^{h_s} J(mu0(h)) dh with the sunset hour angle
// cos h_s = -tan(lat) tan(dec); evaluated by Gauss-Legendre quadrature in h.
#pragma once

#include <vector>

#include "photo/photolysis_spec.hpp"

namespace colchem {

/// Ch(X, chi), chi in radians within [0, pi/2], X = (R + z) / H > 0.
double chapman_function(double X, double chi_rad);

/// Gauss-Legendre nodes and weights on [-1, 1].
void gauss_legendre(int n, std::vector<double>& nodes, std::vector<double>& weights);

/// A sun position and the weight of its rates in the average.
struct IlluminationNode {
  double mu0 = 1.0;     ///< cosine of the solar zenith angle (at the reference radius)
  double weight = 1.0;  ///< J_mean = sum_k weight_k J(mu0_k)
};

/// Nodes for the fixed or diurnal illumination; nodes with the sun below the horizon are
/// left out (twilight is not modelled).
std::vector<IlluminationNode> illumination_nodes(const IlluminationSpec& s);

}  // namespace colchem
