// Two-stream diffuse fluxes, dF+/dtau = g1 F+ - g2 F- - g3 w S exp(-tau_s) and
// dF-/dtau = g2 F+ - g1 F- + g4 w S exp(-tau_s) (photons cm^-2 s^-1 per bin), solved by
// layer doubling and the interaction principle: closures, delta scaling and sources
// (Meador and Weaver 1980; Toon et al. 1989; Joseph, Wiscombe and Weinman 1976) in
// photo/two_stream.hpp.
#include "photo/two_stream.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

namespace colchem {

namespace {

constexpr double kSqrt3 = 1.7320508075688772;
/// Smallest |lambda^2 - k^2| / k^2 the particular solution is evaluated at.
constexpr double kResonanceGap = 1e-8;

void grow(std::vector<double>& v, std::size_t n) {
  if (v.size() < n) v.resize(n);
}

}  // namespace

std::string two_stream_closure_name(TwoStreamClosure c) {
  switch (c) {
    case TwoStreamClosure::kEddington:
      return "eddington";
    case TwoStreamClosure::kQuadrature:
      return "quadrature";
    case TwoStreamClosure::kHemisphericMean:
      return "hemispheric_mean";
  }
  return "quadrature";
}

namespace {

/// Table 1 of Toon et al. (1989) written out per closure, in the form
///   gamma1 = a0 - w (a1 + a2 g),  gamma2 = b0 + w (b1 - b2 g),  gamma3 = 1/2 - s g mu0,
///   gamma1 - gamma2 = cd (1 - w),  gamma1 + gamma2 = cs (1 - w g).
struct Closure {
  double a0, a1, a2, b0, b1, b2, s, cd, cs;
};

Closure closure_coefficients(TwoStreamClosure c) {
  const double h3 = 0.5 * kSqrt3;
  switch (c) {
    case TwoStreamClosure::kEddington:  // (7 - w(4 + 3g))/4, -(1 - w(4 - 3g))/4, (2 - 3 g mu0)/4
      return {1.75, 1.0, 0.75, -0.25, 1.0, 0.75, 0.75, 2.0, 1.5};
    case TwoStreamClosure::kQuadrature:  // sqrt3 (2 - w(1 + g))/2, sqrt3 w (1 - g)/2, (1 - sqrt3 g
                                         // mu0)/2
      return {kSqrt3, h3, h3, 0.0, h3, h3, h3, kSqrt3, kSqrt3};
    case TwoStreamClosure::kHemisphericMean:  // 2 - w(1 + g), w (1 - g); gamma3 as Eddington
      return {2.0, 1.0, 1.0, 0.0, 1.0, 1.0, 0.75, 2.0, 2.0};
  }
  return {kSqrt3, h3, h3, 0.0, h3, h3, h3, kSqrt3, kSqrt3};
}

TwoStreamGammas gammas(const Closure& k, double w, double g, double mu0) {
  TwoStreamGammas r;
  r.gamma1 = k.a0 - w * (k.a1 + k.a2 * g);
  r.gamma2 = k.b0 + w * (k.b1 - k.b2 * g);
  r.gamma3 = 0.5 - k.s * g * mu0;
  r.gamma4 = 1.0 - r.gamma3;
  r.gamma1_minus_gamma2 = k.cd * (1.0 - w);
  r.gamma1_plus_gamma2 = k.cs * (1.0 - w * g);
  return r;
}

}  // namespace

TwoStreamGammas two_stream_gammas(TwoStreamClosure c, double omega, double g, double mu0) {
  return gammas(closure_coefficients(c), omega, g, mu0);
}

DeltaScaled delta_scale(double dtau, double omega, double g) {
  const double f = g * g;
  const double wf = 1.0 - omega * f;
  DeltaScaled d;
  d.dtau = wf * dtau;
  d.omega = wf > 0.0 ? (1.0 - f) * omega / wf : omega;
  d.g = g / (1.0 + g);  // (g - g^2) / (1 - g^2)
  return d;
}

void two_stream_optics(const TwoStreamLayers& ly, TwoStreamOptics& o) {
  const std::size_t B = ly.columns;
  const std::size_t LB = ly.dtau.size();
  const std::size_t L = B > 0 ? LB / B : 0;
  if (B == 0 || L * B != LB || ly.omega.size() != LB || ly.g.size() != LB ||
      ly.surface_albedo.size() != B) {
    throw std::invalid_argument("two_stream_optics: array sizes do not match");
  }
  for (auto* v : {&o.w, &o.gamma1, &o.gamma2, &o.lambda2, &o.half, &o.Rh, &o.Th, &o.q, &o.R, &o.T,
                  &o.inv_rho}) {
    grow(*v, LB);
  }
  grow(o.rho, LB + B);
  // Three passes, so that the two without exp() vectorise: x = lambda h, exp(-x), the rest.
  const Closure cl = closure_coefficients(ly.closure);
  for (std::size_t i = 0; i < LB; ++i) {
    const double t = std::max(0.0, ly.dtau[i]);
    const double w = t > 0.0 ? std::clamp(ly.omega[i], 0.0, 1.0) : 0.0;
    const TwoStreamGammas gm = gammas(cl, w, ly.g[i], 1.0);
    const double lam2 = gm.gamma1_minus_gamma2 * gm.gamma1_plus_gamma2;
    o.w[i] = w;
    o.gamma1[i] = gm.gamma1;
    o.gamma2[i] = gm.gamma2;
    o.lambda2[i] = lam2;
    o.half[i] = 0.5 * t;
    o.Rh[i] = std::sqrt(std::max(0.0, lam2)) * 0.5 * t;  // x, for the next pass
  }
  for (std::size_t i = 0; i < LB; ++i) o.Th[i] = std::exp(-o.Rh[i]);
  for (std::size_t i = 0; i < LB; ++i) {
    // th = tanh(lambda h)/lambda and sech(lambda h); the series below x = 1e-3 (error x^6)
    // avoids the cancellation in 1 - exp(-2x); lambda = 0 gives th = h, sech = 1.
    const double h = o.half[i];
    const double x = o.Rh[i];
    const double ex = o.Th[i];
    const double e2 = ex * ex;
    const double x2 = x * x;
    const double lam = std::max(std::sqrt(std::max(0.0, o.lambda2[i])), 1e-300);
    const double r = 1.0 / (lam * (1.0 + e2));
    const double th = x < 1e-3 ? h * (1.0 - x2 / 3.0 + 2.0 * x2 * x2 / 15.0) : (1.0 - e2) * r;
    const double sech = 2.0 * ex * lam * r;
    const double inv_den = 1.0 / (1.0 + o.gamma1[i] * th);
    const double Rh = o.gamma2[i] * th * inv_den;
    const double Th = sech * inv_den;
    const double q = 1.0 / (1.0 - Rh * Rh);
    o.Rh[i] = Rh;
    o.Th[i] = Th;
    o.q[i] = q;
    o.R[i] = Rh + Th * Th * Rh * q;  // two halves added
    o.T[i] = Th * Th * q;
  }
  // Reflectance of everything below each edge, from the surface up.
  for (std::size_t b = 0; b < B; ++b) o.rho[L * B + b] = ly.surface_albedo[b];
  for (std::size_t n = L; n-- > 0;) {
    for (std::size_t b = 0; b < B; ++b) {
      const std::size_t i = n * B + b;
      const double below = o.rho[i + B];
      const double inv = 1.0 / (1.0 - o.R[i] * below);
      o.inv_rho[i] = inv;
      o.rho[i] = o.R[i] + o.T[i] * o.T[i] * below * inv;
    }
  }
}

namespace {

/// Step 1 of two_stream_fluxes: the beam at every edge and layer centre (ws.beam,
/// ws.beam_mid) and each layer's diffuse emission up and down, whole (ws.U, ws.D) and per
/// half (ws.Uh, ws.Dh).
void beam_sources(const TwoStreamLayers& ly, const TwoStreamOptics& o, const TwoStreamSun& sun,
                  TwoStreamWorkspace& ws) {
  const std::size_t B = ly.columns;
  const std::size_t LB = ly.dtau.size();
  const bool plane = sun.slant_tau.empty();
  const double inv_mu0 = 1.0 / sun.mu0;
  // 1. The beam's sources in every layer, as two halves added. The beam (flux normal to it)
  // at the top of each layer is carried down by the layers' own decay, so that a layer's
  // sources and the beam below it agree exactly.
  for (std::size_t b = 0; b < B; ++b) {
    ws.beam[b] = sun.incident[b] * (plane ? 1.0 : std::exp(-sun.slant_tau[b]));
  }
  const Closure cl = closure_coefficients(ly.closure);
  // The beam's decay rate k per layer (moved off the resonance), then exp(-k h) (in ws.Uh),
  // then the sources.
  for (std::size_t i = 0; i < LB; ++i) {
    const double h = o.half[i];
    double k = inv_mu0;
    if (!plane && h > 0.0) k = std::max(0.0, (sun.slant_tau[i + B] - sun.slant_tau[i]) / (2.0 * h));
    const double lam2 = o.lambda2[i];
    const double d = lam2 - k * k;
    if (o.w[i] > 0.0 && std::abs(d) < kResonanceGap * k * k) {
      k = std::sqrt(std::max(0.0, lam2 - (d < 0.0 ? -kResonanceGap : kResonanceGap) * k * k));
    }
    ws.D[i] = k;
    ws.Uh[i] = -k * h;
  }
  for (std::size_t i = 0; i < LB; ++i) ws.Uh[i] = std::exp(ws.Uh[i]);
  for (std::size_t i = 0; i < LB; ++i) {
    const double w = o.w[i];
    const double k = ws.D[i];
    const double eh = ws.Uh[i];
    const double b_top = ws.beam[i];
    const double mid = b_top * eh;
    ws.beam_mid[i] = mid;
    ws.beam[i + B] = mid * eh;
    // Half-layer sources per unit beam at its top (zero without scattering).
    const double g1 = o.gamma1[i], g2 = o.gamma2[i];
    const double g3 = gammas(cl, w, ly.g[i], sun.mu0).gamma3;
    const double g4 = 1.0 - g3;
    const double d = o.lambda2[i] - k * k;
    const double inv_d = w > 0.0 ? 1.0 / d : 0.0;
    const double P = (g3 * (g1 - k) + g2 * g4) * inv_d;
    const double M = ((g1 + k) * g4 + g2 * g3) * inv_d;
    const double Rh = o.Rh[i], Th = o.Th[i], q = o.q[i];
    const double su = w * (P - Rh * M - Th * P * eh);
    const double sd = w * (M * eh - Th * M - Rh * P * eh);
    const double su1 = b_top * su, sd1 = b_top * sd;  // upper half
    const double su2 = su1 * eh, sd2 = sd1 * eh;      // lower half, lit by the mid beam
    ws.U[i] = su1 + Th * (su2 + Rh * sd1) * q;
    ws.D[i] = sd2 + Th * (sd1 + Rh * su2) * q;
    ws.Uh[i] = su2;
    ws.Dh[i] = sd1;
  }
}

/// Steps 2 and 3 of two_stream_fluxes: the sweeps up and down through the layers' sources.
void sweep_fluxes(const TwoStreamLayers& ly, const TwoStreamOptics& o, const TwoStreamSun& sun,
                  TwoStreamWorkspace& ws, const TwoStreamFluxes& out) {
  const std::size_t B = ly.columns;
  const std::size_t LB = ly.dtau.size();
  const std::size_t L = LB / B;
  // 2. Upward sweep: F+_e = rho_e F-_e + src_e (emission of everything below e).
  for (std::size_t b = 0; b < B; ++b) {
    ws.src[LB + b] = ly.surface_albedo[b] * sun.mu0 * ws.beam[LB + b];
  }
  for (std::size_t n = L; n-- > 0;) {
    for (std::size_t b = 0; b < B; ++b) {
      const std::size_t i = n * B + b;
      ws.src[i] = ws.U[i] + o.T[i] * (ws.src[i + B] + o.rho[i + B] * ws.D[i]) * o.inv_rho[i];
    }
  }

  // 3. Downward sweep from F-_0 = 0, and the layer centres from their two halves.
  for (std::size_t b = 0; b < B; ++b) {
    out.down[b] = 0.0;
    out.up[b] = ws.src[b];
  }
  for (std::size_t i = 0; i < LB; ++i) {
    const std::size_t e = i + B;  // the edge below
    out.down[e] = (o.T[i] * out.down[i] + o.R[i] * ws.src[e] + ws.D[i]) * o.inv_rho[i];
    out.up[e] = o.rho[e] * out.down[e] + ws.src[e];
    const double Rh = o.Rh[i], Th = o.Th[i];
    const double from_below = Th * out.up[e] + ws.Uh[i];
    const double dm = (Th * out.down[i] + Rh * from_below + ws.Dh[i]) * o.q[i];
    out.down_mid[i] = dm;
    out.up_mid[i] = Rh * dm + from_below;
    if (!out.actinic_mid.empty()) out.actinic_mid[i] = ws.beam_mid[i] + 2.0 * (dm + out.up_mid[i]);
  }
}

}  // namespace

void two_stream_fluxes(const TwoStreamLayers& ly, const TwoStreamOptics& o, const TwoStreamSun& sun,
                       TwoStreamWorkspace& ws, const TwoStreamFluxes& out) {
  const std::size_t B = ly.columns;
  const std::size_t LB = ly.dtau.size();
  const std::size_t L = B > 0 ? LB / B : 0;
  const bool plane = sun.slant_tau.empty();
  if (B == 0 || L * B != LB || o.R.size() < LB || sun.incident.size() != B ||
      (!plane && sun.slant_tau.size() != LB + B) || out.up.size() != LB + B ||
      out.down.size() != LB + B || out.up_mid.size() != LB || out.down_mid.size() != LB ||
      (!out.actinic_mid.empty() && out.actinic_mid.size() != LB) || !(sun.mu0 > 0.0)) {
    throw std::invalid_argument("two_stream_fluxes: array sizes or mu0 do not match");
  }
  for (auto* v : {&ws.beam_mid, &ws.U, &ws.D, &ws.Uh, &ws.Dh}) grow(*v, LB);
  for (auto* v : {&ws.beam, &ws.src}) grow(*v, LB + B);
  beam_sources(ly, o, sun, ws);
  sweep_fluxes(ly, o, sun, ws, out);
}

void solve_two_stream(const TwoStreamColumn& col, TwoStreamWorkspace& ws,
                      const TwoStreamFluxes& out) {
  const double albedo[1] = {col.surface_albedo};
  const double incident[1] = {col.incident};
  const TwoStreamLayers layers{1, col.dtau, col.omega, col.g, albedo, col.closure};
  TwoStreamOptics optics;
  two_stream_optics(layers, optics);
  two_stream_fluxes(layers, optics, TwoStreamSun{col.mu0, incident, col.slant_tau}, ws, out);
}

}  // namespace colchem
