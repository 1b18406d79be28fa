// Spectral data onto the model's wavelength bins, conserving integrals exactly.
//
//   f_b = (1 / dlambda_b) int_{lambda_b}^{lambda_b+1} f(lambda) dlambda
// with f piecewise linear between table points and zero outside the table, so that
// sum_b f_b dlambda_b equals the integral of the table over the bins it overlaps.
// Overtone bands are placed in wavenumber space, where their strength is defined:
//   sigma_b = (1 / dnu~_b) int_{bin} S g(nu~ - nu~0) dnu~,   so sum_b sigma_b dnu~_b = S
// (g: unit-area Gaussian or Lorentzian of the given FWHM; closed-form erf / arctan).
// A photolysis channel with a threshold nu~_t and onset width w takes of a band
//   int S g(nu~ - nu~0) rho(nu~) dnu~,  rho = 0 below nu~_t, (nu~ - nu~_t)/w up to nu~_t + w, 1
//   above,
// with the first moments int x g dx = -s^2 g(x) (Gaussian, standard deviation s) and
// (gamma / 2 pi) ln(x^2 + gamma^2) (Lorentzian, half width gamma), so the cut is exact.
// Planck photon flux at 1 au (Rybicki and Lightman 1979, eq. 1.51, divided by h c/lambda):
//   F_lambda = pi (R_star / 1 au)^2 2 c / lambda^4 / (exp(h c / (lambda k T)) - 1)
// integrated over each bin by 8-point Gauss-Legendre quadrature on sub-intervals.
// Units: nm for wavelength, cm^-1 for wavenumber, cm^2, cm^-2 s^-1 nm^-1.
#pragma once

#include <span>
#include <vector>

#include "photo/photolysis_spec.hpp"

namespace colchem {

/// Bin averages of a piecewise-linear table (zero outside it).
std::vector<double> bin_average(const TabulatedSpectrum& t, std::span<const double> edges_nm);

/// Bin averages of a table held at its end values outside its range (quantum yields).
std::vector<double> bin_average_held(const TabulatedSpectrum& t, std::span<const double> edges_nm);

/// Bin averages of E(lambda) lambda / (h c) for an energy-flux table E (erg cm^-2 s^-1
/// nm^-1): the photon flux, with the product of the linear pieces integrated exactly.
std::vector<double> bin_average_photons_from_energy(const TabulatedSpectrum& energy,
                                                    std::span<const double> edges_nm);

/// Wavenumber-conserving bin values of an overtone band (cm^2).
std::vector<double> band_onto_bins(const OvertoneBandSpec& band, std::span<const double> edges_nm);

/// Fraction of a bin [a, b] that lies short of `threshold_nm` (0 = no threshold: 1).
double fraction_below(double a_nm, double b_nm, double threshold_nm);

/// Bin average over wavelength of the near-threshold onset rho(lambda) = min(1, max(0,
/// (nu~ - nu~_t) / w)), nu~ = 1e7 / lambda, nu~_t = 1e7 / threshold_nm, w = onset_cm1
/// (w = 0: fraction_below; threshold_nm = 0: 1).
double onset_average(double a_nm, double b_nm, double threshold_nm, double onset_cm1);

/// An overtone band's cross section times the onset, per bin (cm^2):
///   (1 / dnu~_b) int_bin S g(nu~ - nu~0) rho(nu~) dnu~
/// integrated in closed form on the energetically allowed side of the threshold only
/// (nothing from the wing longward of it). threshold_nm = 0: band_onto_bins().
std::vector<double> band_onto_bins_above(const OvertoneBandSpec& band,
                                         std::span<const double> edges_nm, double threshold_nm,
                                         double onset_cm1);

/// Planck photon flux at 1 au averaged over each bin (cm^-2 s^-1 nm^-1).
std::vector<double> planck_photon_flux_1au(double temperature_K, double radius_cm,
                                           std::span<const double> edges_nm);

/// S = (pi e^2 / (m_e c^2)) f = 8.85e-13 f cm: band strength from an oscillator strength.
double band_strength_from_oscillator(double f);

}  // namespace colchem
