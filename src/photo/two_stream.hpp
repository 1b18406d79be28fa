// Two-stream radiative transfer of the diffuse field in one wavelength bin, over layers
// with absorption, scattering and a Lambertian lower boundary.
//
// Equations (Meador and Weaver 1980, J. Atmos. Sci. 37, 630; Toon et al. 1989, J. Geophys.
// Res. 94, 16287), optical depth tau increasing downward, diffuse fluxes F+ (up) and F- (down)
// on a horizontal surface, S the beam's flux normal to itself at the top of the column:
//   dF+/dtau = g1 F+ - g2 F- - g3 w S exp(-tau_s(tau))
//   dF-/dtau = g2 F+ - g1 F- + g4 w S exp(-tau_s(tau))
// with tau_s the slant optical depth of the direct beam (tau / mu0 for plane-parallel paths;
// within a layer exp(-tau_s) falls as exp(-k tau), k = (tau_s,bottom - tau_s,top) / dtau,
// which is 1 / mu0 in the plane-parallel case and the pseudo-spherical beam otherwise).
// Closures (Toon et al. 1989, Table 1; w single-scattering albedo, g asymmetry parameter):
//   Eddington:        g1 = (7 - w (4 + 3g))/4,   g2 = -(1 - w (4 - 3g))/4, g3 = (2 - 3 g mu0)/4
//   quadrature:       g1 = sqrt3 (2 - w (1 + g))/2, g2 = sqrt3 w (1 - g)/2, g3 = (1 - sqrt3 g
//   mu0)/2 hemispheric mean: g1 = 2 - w (1 + g),        g2 = w (1 - g), g3 = (2 - 3 g mu0)/4
// and g4 = 1 - g3. Toon et al. give no g3 for the hemispheric mean (they use it for thermal
// emission); ours is the fraction of the beam that the two-term phase function
// 1 + 3 g cos(Theta) scatters into the upper hemisphere, 1/2 - 3 g mu0/4 (the Eddington g3).
// Delta scaling of the forward peak (Joseph, Wiscombe and Weinman 1976, J. Atmos. Sci. 33,
// 2452): f = g^2, dtau' = (1 - w f) dtau, w' = (1 - f) w / (1 - w f), g' = (g - f)/(1 - f).
//
// Solution. Each layer is reduced to its diffuse reflectance and transmittance
//   R = g2 th / (1 + g1 th),  T = sech(lambda dtau) / (1 + g1 th),  th = tanh(lambda dtau)/lambda,
//   lambda^2 = (g1 - g2)(g1 + g2)
// (regular as lambda -> 0, i.e. conservative scattering: R + T = 1 exactly) and the diffuse
// fluxes it emits up at its top and down at its bottom when lit by the beam, from the
// particular solution F+- = w S exp(-k tau) [(g1 -+ k) g3|4 + g2 g4|3] / (lambda^2 - k^2)
// (Toon et al. 1989, eqs. 23-24). Where |lambda^2 - k^2| < 1e-8 k^2 k is moved by that much,
// an error of order 1e-8 of the layer's source. Layers are computed as two halves and
// doubled, which also gives the fluxes at the layer centre. The layers are coupled by the
// interaction principle: the block-tridiagonal system of the edge fluxes
//   F+_n = R_n F-_n + T_n F+_n+1 + U_n,  F-_n+1 = T_n F-_n + R_n F+_n+1 + D_n,
//   F-_0 = 0 (no diffuse light from above),  F+_L = A (F-_L + mu0 S exp(-tau_s,L))
// is solved by block elimination from the surface up (the reflectance of everything below
// an edge) and back down: one O(L) pass each way, every quantity positive, no pivoting.
// The layer R and T and the reflectances below the edges do not depend on the sun
// (two_stream_optics, once per state); the beam's sources and the two sweeps do
// (two_stream_fluxes, once per sun position). All bins are solved side by side.
// The actinic flux (photons per unit area from all directions) is the direct beam
// S exp(-tau_s) plus 4 pi times the diffuse mean intensity, taken as 2 (F+ + F-): exact for
// radiance that is isotropic in each hemisphere (a Lambertian surface's) and for the
// Eddington closure's linear radiance. Over a transparent atmosphere it gives the analytic
// 1 + 2 A mu0 times the beam.
// Units: fluxes in any one unit (photons cm^-2 s^-1 in colchem); optical depths are pure.
#pragma once

#include <span>
#include <string>
#include <vector>

namespace colchem {

enum class TwoStreamClosure { kEddington, kQuadrature, kHemisphericMean };

/// "eddington", "quadrature", "hemispheric_mean".
std::string two_stream_closure_name(TwoStreamClosure c);

struct TwoStreamGammas {
  double gamma1 = 0.0, gamma2 = 0.0, gamma3 = 0.0, gamma4 = 0.0;
  double gamma1_minus_gamma2 = 0.0;  ///< without the cancellation of g1 - g2 near w = 1
  double gamma1_plus_gamma2 = 0.0;
};

/// gamma1..gamma4 of a closure for single-scattering albedo w, asymmetry g and mu0.
TwoStreamGammas two_stream_gammas(TwoStreamClosure c, double omega, double g, double mu0);

struct DeltaScaled {
  double dtau = 0.0, omega = 0.0, g = 0.0;
};

/// Joseph, Wiscombe and Weinman (1976): the forward fraction f = g^2 counted as unscattered.
DeltaScaled delta_scale(double dtau, double omega, double g);

/// Many columns side by side (one per wavelength bin), layers from the top down. Per-layer
/// arrays are layer-major: layer n of column b at [n * columns + b] (L layers); per-edge
/// arrays likewise with L + 1 edges. Optical properties already delta-scaled if wanted.
struct TwoStreamLayers {
  std::size_t columns = 1;
  std::span<const double> dtau;            ///< L * columns optical thicknesses (>= 0)
  std::span<const double> omega;           ///< single-scattering albedos in [0, 1]
  std::span<const double> g;               ///< asymmetry parameters in (-1, 1)
  std::span<const double> surface_albedo;  ///< columns Lambertian albedos in [0, 1]
  TwoStreamClosure closure = TwoStreamClosure::kQuadrature;
};

/// What does not depend on the sun: half-layer and layer reflectance and transmittance, and
/// the reflectance rho of everything below each edge (computed once for all sun positions).
struct TwoStreamOptics {
  std::vector<double> w, gamma1, gamma2, lambda2, half, Rh, Th, q, R, T;  ///< [n * B + b]
  std::vector<double> rho;      ///< [e * B + b], L + 1 edges
  std::vector<double> inv_rho;  ///< [n * B + b]: 1 / (1 - R_n rho_n+1)
};

void two_stream_optics(const TwoStreamLayers& layers, TwoStreamOptics& out);

/// The sun: mu0 (> 0), the beam's flux normal to itself above layer 0 per column, and the
/// slant optical depths of the beam at the edges ((L + 1) * columns, layer-major); empty:
/// plane-parallel, tau_s = (vertical optical depth from the top) / mu0.
struct TwoStreamSun {
  double mu0 = 1.0;
  std::span<const double> incident;
  std::span<const double> slant_tau;
};

/// Results, sized by the caller, layer-major: edges (L + 1) * columns, centres L * columns.
/// Fluxes on a horizontal surface.
struct TwoStreamFluxes {
  std::span<double> up, down;          ///< diffuse F+ and F- at the edges (top edge first)
  std::span<double> up_mid, down_mid;  ///< the same at the layer centres
  /// Actinic flux at the layer centres: S exp(-tau_s,centre) + 2 (F+ + F-); empty: not wanted.
  std::span<double> actinic_mid;
};

/// Scratch space (grows to the largest problem; reuse it).
struct TwoStreamWorkspace {
  std::vector<double> beam, beam_mid, U, D, Uh, Dh, src;
};

/// The fluxes for one sun position; throws std::invalid_argument when sizes do not match.
void two_stream_fluxes(const TwoStreamLayers& layers, const TwoStreamOptics& optics,
                       const TwoStreamSun& sun, TwoStreamWorkspace& ws, const TwoStreamFluxes& out);

/// One column, layers from the top down: the convenience form of the two calls above.
struct TwoStreamColumn {
  std::span<const double> dtau;   ///< L layer optical thicknesses (>= 0)
  std::span<const double> omega;  ///< L single-scattering albedos in [0, 1]
  std::span<const double> g;      ///< L asymmetry parameters in (-1, 1)
  /// L + 1 slant optical depths of the direct beam at the layer edges; empty: plane-parallel.
  std::span<const double> slant_tau;
  double mu0 = 1.0;             ///< cosine of the solar zenith angle (> 0)
  double incident = 1.0;        ///< S: beam flux normal to the beam above layer 0
  double surface_albedo = 0.0;  ///< Lambertian, in [0, 1]
  TwoStreamClosure closure = TwoStreamClosure::kQuadrature;
};

/// Solves one column (allocates its optics; for tests and single columns).
void solve_two_stream(const TwoStreamColumn& column, TwoStreamWorkspace& ws,
                      const TwoStreamFluxes& out);

}  // namespace colchem
