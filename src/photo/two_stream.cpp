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

TwoStreamGammas two_stream_gammas(TwoStreamClosure c, double omega, double g, double mu0) {
  TwoStreamGammas r;
  switch (c) {
    case TwoStreamClosure::kEddington:
      r.gamma1 = (7.0 - omega * (4.0 + 3.0 * g)) / 4.0;
      r.gamma2 = -(1.0 - omega * (4.0 - 3.0 * g)) / 4.0;
      r.gamma3 = (2.0 - 3.0 * g * mu0) / 4.0;
      r.gamma1_minus_gamma2 = 2.0 * (1.0 - omega);
      r.gamma1_plus_gamma2 = 1.5 * (1.0 - omega * g);
      break;
    case TwoStreamClosure::kQuadrature:
      r.gamma1 = kSqrt3 * (2.0 - omega * (1.0 + g)) / 2.0;
      r.gamma2 = kSqrt3 * omega * (1.0 - g) / 2.0;
      r.gamma3 = (1.0 - kSqrt3 * g * mu0) / 2.0;
      r.gamma1_minus_gamma2 = kSqrt3 * (1.0 - omega);
      r.gamma1_plus_gamma2 = kSqrt3 * (1.0 - omega * g);
      break;
    case TwoStreamClosure::kHemisphericMean:
      r.gamma1 = 2.0 - omega * (1.0 + g);
      r.gamma2 = omega * (1.0 - g);
      r.gamma3 = (2.0 - 3.0 * g * mu0) / 4.0;
      r.gamma1_minus_gamma2 = 2.0 * (1.0 - omega);
      r.gamma1_plus_gamma2 = 2.0 * (1.0 - omega * g);
      break;
  }
  r.gamma4 = 1.0 - r.gamma3;
  return r;
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

void solve_two_stream(const TwoStreamColumn& col, TwoStreamWorkspace& ws,
                      const TwoStreamFluxes& out) {
  const std::size_t L = col.dtau.size();
  if (col.omega.size() != L || col.g.size() != L ||
      (!col.slant_tau.empty() && col.slant_tau.size() != L + 1) || out.up.size() != L + 1 ||
      out.down.size() != L + 1 || out.up_mid.size() != L || out.down_mid.size() != L ||
      (!out.actinic_mid.empty() && out.actinic_mid.size() != L) || !(col.mu0 > 0.0)) {
    throw std::invalid_argument("solve_two_stream: span sizes or mu0 do not match");
  }
  for (auto* v : {&ws.R, &ws.T, &ws.U, &ws.D, &ws.Rh, &ws.Th, &ws.Uh, &ws.Dh, &ws.inv}) grow(*v, L);
  for (auto* v : {&ws.beam, &ws.rho, &ws.src}) grow(*v, 2 * L + 1);
  const bool plane = col.slant_tau.empty();
  const double inv_mu0 = 1.0 / col.mu0;

  // 1. Every layer as two identical halves: R, T and beam sources, doubled. The beam (flux
  // normal to it) at the top of each layer is carried down by the layers' own decay, so
  // that a layer's sources and the beam below it agree exactly.
  double* beam_mid = ws.beam.data() + L + 1;  // [n]: beam at the centre of layer n
  ws.beam[0] = col.incident * std::exp(plane ? 0.0 : -col.slant_tau[0]);
  for (std::size_t n = 0; n < L; ++n) {
    const double t = std::max(0.0, col.dtau[n]);
    const double h = 0.5 * t;
    const double w = t > 0.0 ? std::clamp(col.omega[n], 0.0, 1.0) : 0.0;
    const TwoStreamGammas gm = two_stream_gammas(col.closure, w, col.g[n], col.mu0);
    const double lam2 = gm.gamma1_minus_gamma2 * gm.gamma1_plus_gamma2;
    const double lam = std::sqrt(std::max(0.0, lam2));
    const double x = lam * h;
    // th = tanh(lambda h)/lambda and sech(lambda h); the series below x = 1e-3 (error x^6)
    // avoids the cancellation in 1 - exp(-2x).
    double th = h;
    double sech = 1.0;
    if (x > 0.0) {
      const double ex = std::exp(-x);
      const double e2 = ex * ex;
      const double x2 = x * x;
      const double r = 1.0 / (lam * (1.0 + e2));
      th = x < 1e-3 ? h * (1.0 - x2 / 3.0 + 2.0 * x2 * x2 / 15.0) : (1.0 - e2) * r;
      sech = 2.0 * ex * lam * r;
    }
    const double inv_den = 1.0 / (1.0 + gm.gamma1 * th);
    const double Rh = gm.gamma2 * th * inv_den;
    const double Th = sech * inv_den;

    double k = inv_mu0;
    if (!plane && t > 0.0) k = std::max(0.0, (col.slant_tau[n + 1] - col.slant_tau[n]) / t);
    double d = lam2 - k * k;
    if (w > 0.0 && std::abs(d) < kResonanceGap * k * k) {
      d = (d < 0.0 ? -kResonanceGap : kResonanceGap) * k * k;
      k = std::sqrt(std::max(0.0, lam2 - d));
    }
    const double eh = std::exp(-k * h);
    double su = 0.0, sd = 0.0;  // half-layer sources per unit beam at its top
    if (w > 0.0) {
      const double inv_d = 1.0 / d;
      const double P = (gm.gamma3 * (gm.gamma1 - k) + gm.gamma2 * gm.gamma4) * inv_d;
      const double M = ((gm.gamma1 + k) * gm.gamma4 + gm.gamma2 * gm.gamma3) * inv_d;
      su = w * (P - Rh * M - Th * P * eh);
      sd = w * (M * eh - Th * M - Rh * P * eh);
    }
    const double b_top = ws.beam[n];
    beam_mid[n] = b_top * eh;
    ws.beam[n + 1] = beam_mid[n] * eh;
    const double su1 = b_top * su, sd1 = b_top * sd;  // upper half
    const double su2 = su1 * eh, sd2 = sd1 * eh;      // lower half, lit by beam_mid
    const double q = 1.0 / (1.0 - Rh * Rh);
    ws.R[n] = Rh + Th * Th * Rh * q;
    ws.T[n] = Th * Th * q;
    ws.U[n] = su1 + Th * (su2 + Rh * sd1) * q;
    ws.D[n] = sd2 + Th * (sd1 + Rh * su2) * q;
    ws.Rh[n] = Rh;
    ws.Th[n] = Th;
    ws.Uh[n] = su2;
    ws.Dh[n] = sd1;
    ws.inv[n] = q;  // reused by the centre fluxes
  }

  // 2. Upward sweep: F+_e = rho_e F-_e + src_e (reflectance and emission of all below e).
  ws.rho[L] = col.surface_albedo;
  ws.src[L] = col.surface_albedo * col.mu0 * ws.beam[L];
  double* inv_rho = ws.rho.data() + L + 1;  // [n]: 1 / (1 - R_n rho_n+1)
  for (std::size_t n = L; n-- > 0;) {
    const double inv = 1.0 / (1.0 - ws.R[n] * ws.rho[n + 1]);
    inv_rho[n] = inv;
    ws.rho[n] = ws.R[n] + ws.T[n] * ws.T[n] * ws.rho[n + 1] * inv;
    ws.src[n] = ws.U[n] + ws.T[n] * (ws.src[n + 1] + ws.rho[n + 1] * ws.D[n]) * inv;
  }

  // 3. Downward sweep from F-_0 = 0, and the layer centres from their two halves.
  out.down[0] = 0.0;
  out.up[0] = ws.src[0];
  for (std::size_t n = 0; n < L; ++n) {
    out.down[n + 1] = (ws.T[n] * out.down[n] + ws.R[n] * ws.src[n + 1] + ws.D[n]) * inv_rho[n];
    out.up[n + 1] = ws.rho[n + 1] * out.down[n + 1] + ws.src[n + 1];
    const double Rh = ws.Rh[n], Th = ws.Th[n];
    const double from_below = Th * out.up[n + 1] + ws.Uh[n];
    const double dm = (Th * out.down[n] + Rh * from_below + ws.Dh[n]) * ws.inv[n];
    out.down_mid[n] = dm;
    out.up_mid[n] = Rh * dm + from_below;
    if (!out.actinic_mid.empty()) out.actinic_mid[n] = beam_mid[n] + 2.0 * (dm + out.up_mid[n]);
  }
}

}  // namespace colchem
