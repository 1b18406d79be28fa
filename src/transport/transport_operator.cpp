// Eddy and molecular diffusion, boundary terms and the TR-BDF2 step: equations, units and
// published sources in transport/transport_operator.hpp.
#include "transport/transport_operator.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>
#include <string>

#include "core/constants.hpp"
#include "core/ideal_gas.hpp"

namespace colchem {

namespace {

/// B(x) = x/(e^x - 1), with its Taylor series near 0 where the quotient loses digits.
double bernoulli(double x) {
  if (std::abs(x) < 1e-3) {
    const double x2 = x * x;
    return 1.0 - 0.5 * x + x2 / 12.0 - x2 * x2 / 720.0;
  }
  return x / std::expm1(x);
}

/// Coefficients of the upward flux between a lower and an upper point `dist` apart, through
/// an edge with eddy coefficient K, air density na_e, molecular coefficient D and drift x:
///   Phi = lower_K n_lower + upper_K n_upper   (eddy, on mixing ratio f = n/n_a)
///       + lower_D n_lower + upper_D n_upper   (molecular, exponentially fitted)
/// A ghost value on a boundary edge is a point whose air density is na_e.
struct FluxPair {
  double lower_K, upper_K, lower_D, upper_D;
};
FluxPair fitted_flux(double K, double na_e, double D, double dist, double x, double na_lower,
                     double na_upper) {
  return {K * na_e / (dist * na_lower), -K * na_e / (dist * na_upper), D / dist * bernoulli(x),
          -D / dist * bernoulli(-x)};
}

bool dirichlet(BoundaryKind k) {
  return k == BoundaryKind::kMixingRatio || k == BoundaryKind::kDensity;
}

/// A flux proportional to the density on the boundary edge, Phi = v n_edge.
bool velocity(BoundaryKind k) {
  return k == BoundaryKind::kDepositionVelocity || k == BoundaryKind::kEscapeVelocity ||
         k == BoundaryKind::kJeans || k == BoundaryKind::kDiffusionLimited;
}

// TR-BDF2 constants (Hosea and Shampine 1996): gamma = 2 - sqrt(2) makes the trapezoidal
// stage weight gamma/2 equal the BDF2 weight (1 - gamma)/(2 - gamma).
const double kGamma = 2.0 - std::sqrt(2.0);
const double kD = 0.5 * kGamma;
const double kW1 = 1.0 / (kGamma * (2.0 - kGamma));
const double kW0 = -(1.0 - kGamma) * (1.0 - kGamma) / (kGamma * (2.0 - kGamma));

/// m_i g / (k T): the gravitational part of the molecular drift per unit length (cm^-1).
double inverse_scale_height(const TransportSpecies& sp, double g, double T) {
  return sp.mass_g * g / (constants::kBoltzmann * T);
}

/// The flux coefficients over the half cell between a boundary edge and the nearest centre
/// (the ghost value of a Dirichlet boundary, or the edge density of a velocity boundary,
/// sits on the edge); the drift over that half cell uses the trapezoid rule.
FluxPair half_cell_flux(const Background& bg, const TransportSpecies& sp, std::size_t edge,
                        std::size_t cell, double& drift) {
  const auto& ze = bg.grid.edge_cm;
  const auto& zc = bg.grid.center_cm;
  const double a_T = 1.0 + sp.thermal_diffusion;
  const double T_e = bg.edge_temperature_K[edge];
  const double T_c = bg.temperature_K[cell];
  const bool ghost_below = edge == 0;
  const double h = ghost_below ? zc[cell] - ze[edge] : ze[edge] - zc[cell];
  const double x = 0.5 * h *
                       (inverse_scale_height(sp, bg.edge_gravity_cm_s2[edge], T_e) +
                        inverse_scale_height(sp, bg.gravity_cm_s2[cell], T_c)) +
                   a_T * (ghost_below ? std::log(T_c / T_e) : std::log(T_e / T_c));
  drift = x;
  const double na_e = bg.edge_air_density_cm3[edge];
  const double na_c = bg.air_density_cm3[cell];
  return fitted_flux(bg.edge_eddy_cm2_s[edge], na_e, sp.binary_diffusion(T_e) / na_e, h, x,
                     ghost_below ? na_e : na_c, ghost_below ? na_c : na_e);
}

}  // namespace

TransportOperator::TransportOperator(const Background& bg, std::vector<TransportSpecies> species,
                                     std::vector<SpeciesBoundaries> boundaries)
    : N_(bg.grid.cells()),
      S_(species.size()),
      n_air_(bg.air_density_cm3),
      edge_n_air_(bg.edge_air_density_cm3),
      species_(std::move(species)),
      bc_(std::move(boundaries)) {
  if (bc_.size() != S_) {
    throw std::invalid_argument("TransportOperator: one boundary pair per species expected");
  }
  if (N_ < 1) throw std::invalid_argument("TransportOperator: the grid has no cells");
  // 1. Geometry and storage.
  dz_.resize(N_);
  for (std::size_t j = 0; j < N_; ++j) dz_[j] = bg.grid.width_cm(j);
  coef_.assign(S_ * (N_ + 1), EdgeCoef{});
  drift_.assign(S_ * (N_ + 1), 0.0);
  top_velocity_.assign(S_, 0.0);
  half_cell_.assign(S_ * 2, HalfCell{});
  lo_.assign(S_ * N_, 0.0);
  di_.assign(S_ * N_, 0.0);
  up_.assign(S_ * N_, 0.0);
  for (auto* w : {&y_, &y0_, &yg_, &r_, &cp_}) w->assign(N_, 0.0);
  f_.assign(N_ + 1, 0.0);
  save_.assign(N_ * S_, 0.0);

  const double M_planet = planet_mass_g(bg.planet);
  for (std::size_t s = 0; s < S_; ++s) {
    check_boundary_kinds(s);
    const TransportSpecies& sp = species_[s];
    if (sp.fixed) continue;  // held at its background mixing ratio: no transport at all
    if (!(sp.mass_g > 0.0)) {
      throw std::invalid_argument("TransportOperator: species " + sp.name + " has no mass");
    }
    // 2. Eddy and molecular diffusion coefficients of the interior edges; 3. boundary
    // edges; 4. escape velocities; 5. the time-independent matrix.
    set_interior_coefficients(bg, s);
    set_boundary_coefficients(bg, s);
    set_escape_velocity(bg, s, M_planet);
    assemble_matrix(s);
  }
}

void TransportOperator::check_boundary_kinds(std::size_t s) const {
  const TransportSpecies& sp = species_[s];
  const SpeciesBoundaries& b = bc_[s];
  const auto bad_end = [&](const char* end, BoundaryKind k) {
    return std::invalid_argument("TransportOperator: species " + sp.name + ": '" +
                                 boundary_kind_name(k) + "' is not a " + end + " boundary");
  };
  switch (b.bottom.kind) {
    case BoundaryKind::kEscapeVelocity:
    case BoundaryKind::kJeans:
    case BoundaryKind::kDiffusionLimited:
      throw bad_end("bottom", b.bottom.kind);
    default:
      break;
  }
  if (b.top.kind == BoundaryKind::kDepositionVelocity) throw bad_end("top", b.top.kind);
}

void TransportOperator::set_interior_coefficients(const Background& bg, std::size_t s) {
  const TransportSpecies& sp = species_[s];
  const auto& zc = bg.grid.center_cm;
  const double a_T = 1.0 + sp.thermal_diffusion;
  for (std::size_t e = 1; e < N_; ++e) {
    EdgeCoef& c = coef_[s * (N_ + 1) + e];
    const double dze = zc[e] - zc[e - 1];
    const double T_e = bg.edge_temperature_K[e];
    const double x = dze * inverse_scale_height(sp, bg.edge_gravity_cm_s2[e], T_e) +
                     a_T * std::log(bg.temperature_K[e] / bg.temperature_K[e - 1]);
    drift_[s * (N_ + 1) + e] = x;
    const FluxPair f =
        fitted_flux(bg.edge_eddy_cm2_s[e], edge_n_air_[e],
                    sp.binary_diffusion(T_e) / edge_n_air_[e], dze, x, n_air_[e - 1], n_air_[e]);
    c.left_K = f.lower_K;
    c.right_K = f.upper_K;
    c.left_D = f.lower_D;
    c.right_D = f.upper_D;
  }
}

void TransportOperator::set_boundary_coefficients(const Background& bg, std::size_t s) {
  const TransportSpecies& sp = species_[s];
  const SpeciesBoundaries& b = bc_[s];
  double& drift_bottom = drift_[s * (N_ + 1)];
  double& drift_top = drift_[s * (N_ + 1) + N_];
  if (dirichlet(b.bottom.kind)) {
    EdgeCoef& c = coef_[s * (N_ + 1)];
    const FluxPair f = half_cell_flux(bg, sp, 0, 0, drift_bottom);
    c.ghost_K = f.lower_K;
    c.right_K = f.upper_K;
    c.ghost_D = f.lower_D;
    c.right_D = f.upper_D;
  } else if (velocity(b.bottom.kind)) {
    // Phi = v n_edge: the edge density follows from the same half-cell flux.
    const FluxPair f = half_cell_flux(bg, sp, 0, 0, drift_bottom);
    half_cell_[s * 2] = HalfCell{f.upper_K + f.upper_D, f.lower_K + f.lower_D};
  }
  if (dirichlet(b.top.kind)) {
    EdgeCoef& c = coef_[s * (N_ + 1) + N_];
    const FluxPair f = half_cell_flux(bg, sp, N_, N_ - 1, drift_top);
    c.left_K = f.lower_K;
    c.ghost_K = f.upper_K;
    c.left_D = f.lower_D;
    c.ghost_D = f.upper_D;
  } else if (velocity(b.top.kind)) {
    const FluxPair f = half_cell_flux(bg, sp, N_, N_ - 1, drift_top);
    half_cell_[s * 2 + 1] = HalfCell{f.lower_K + f.lower_D, f.upper_K + f.upper_D};
  }
}

void TransportOperator::set_escape_velocity(const Background& bg, std::size_t s, double M_planet) {
  // Escape velocities that do not change in time.
  const TransportSpecies& sp = species_[s];
  const BoundaryCondition& top = bc_[s].top;
  if (top.kind == BoundaryKind::kJeans) {
    const double T =
        top.exobase_temperature_K > 0.0 ? top.exobase_temperature_K : bg.edge_temperature_K[N_];
    top_velocity_[s] =
        jeans_velocity(sp.mass_g, T, bg.planet.radius_cm + bg.grid.edge_cm[N_], M_planet);
  } else if (top.kind == BoundaryKind::kDiffusionLimited) {
    // Phi = b f / H_a = [b / (H_a n_a)] n on the top edge.
    const double T = bg.edge_temperature_K[N_];
    const double H_a = scale_height(T, bg.molecule_mass_g, bg.edge_gravity_cm_s2[N_]);
    top_velocity_[s] = sp.binary_diffusion(T) / (H_a * edge_n_air_[N_]);
  }
}

void TransportOperator::assemble_matrix(std::size_t s) {
  // Time-independent tridiagonal part of A (velocity boundaries are added per call).
  for (std::size_t j = 0; j < N_; ++j) {
    const EdgeCoef& cb = coef(s, j);
    const EdgeCoef& ct = coef(s, j + 1);
    const double L_b = cb.left_K + cb.left_D;
    const double R_b = cb.right_K + cb.right_D;
    const double L_t = ct.left_K + ct.left_D;
    const double R_t = ct.right_K + ct.right_D;
    lo_[s * N_ + j] = j > 0 ? L_b / dz_[j] : 0.0;
    di_[s * N_ + j] = (R_b - L_t) / dz_[j];
    up_[s * N_ + j] = j + 1 < N_ ? -R_t / dz_[j] : 0.0;
  }
}

double TransportOperator::molecular_drift(std::size_t s, std::size_t e) const {
  return drift_[s * (N_ + 1) + e];
}

double TransportOperator::ghost_density(std::size_t s, bool top, double t) const {
  const BoundaryCondition& b = top ? bc_[s].top : bc_[s].bottom;
  const double na = top ? edge_n_air_[N_] : edge_n_air_[0];
  if (b.kind == BoundaryKind::kMixingRatio) return b.value.at(t) * na;
  if (b.kind == BoundaryKind::kDensity) return b.value.at(t);
  return 0.0;
}

double TransportOperator::imposed_flux(std::size_t s, bool top, double t) const {
  const BoundaryCondition& b = top ? bc_[s].top : bc_[s].bottom;
  return b.kind == BoundaryKind::kFlux ? b.value.at(t) : 0.0;
}

double TransportOperator::edge_velocity(std::size_t s, bool top, double t) const {
  const BoundaryCondition& b = top ? bc_[s].top : bc_[s].bottom;
  switch (b.kind) {
    case BoundaryKind::kDepositionVelocity:
      return -b.value.at(t);
    case BoundaryKind::kEscapeVelocity:
      return b.value.at(t);
    case BoundaryKind::kJeans:
    case BoundaryKind::kDiffusionLimited:
      return top_velocity_[s];
    default:
      return 0.0;
  }
}

double TransportOperator::boundary_velocity(std::size_t s, bool top, double t) const {
  // Phi = v n_edge and Phi = c n_cell + g n_edge (half cell) give n_edge = c n_cell/(v - g),
  // so Phi = v c/(v - g) n_cell. v - g is never 0 for v != 0: g > 0 at the bottom where
  // v <= 0, g < 0 at the top where v >= 0.
  const double v = edge_velocity(s, top, t);
  if (v == 0.0) return 0.0;
  const HalfCell& h = half_cell_[s * 2 + (top ? 1 : 0)];
  return v * h.cell / (v - h.edge);
}

TransportOperator::BoundaryTerms TransportOperator::boundary_terms(std::size_t s, double t) const {
  return {boundary_velocity(s, false, t) / dz_[0], -boundary_velocity(s, true, t) / dz_[N_ - 1]};
}

double TransportOperator::boundary_edge_density(std::span<const double> n, double t, std::size_t s,
                                                bool top) const {
  const BoundaryCondition& b = top ? bc_[s].top : bc_[s].bottom;
  const double n_cell = n[(top ? N_ - 1 : 0) * S_ + s];
  if (dirichlet(b.kind)) return ghost_density(s, top, t);
  if (!velocity(b.kind) || species_[s].fixed) return n_cell;
  const double v = edge_velocity(s, top, t);
  const HalfCell& h = half_cell_[s * 2 + (top ? 1 : 0)];
  if (v == 0.0 && h.edge == 0.0) return n_cell;
  return h.cell * n_cell / (v - h.edge);
}

void TransportOperator::source(std::size_t s, double t, std::span<double> r) const {
  std::fill(r.begin(), r.end(), 0.0);
  const EdgeCoef& cb = coef(s, 0);
  const EdgeCoef& ct = coef(s, N_);
  const double c_bottom =
      (cb.ghost_K + cb.ghost_D) * ghost_density(s, false, t) + imposed_flux(s, false, t);
  const double c_top =
      (ct.ghost_K + ct.ghost_D) * ghost_density(s, true, t) + imposed_flux(s, true, t);
  r[0] += c_bottom / dz_[0];
  r[N_ - 1] -= c_top / dz_[N_ - 1];
}

void TransportOperator::flux_of(std::span<const double> n, double t, std::size_t s,
                                std::span<double> total, std::span<double> eddy,
                                std::span<double> molecular) const {
  const bool have_parts = !eddy.empty();
  if (species_[s].fixed) {
    std::fill(total.begin(), total.end(), 0.0);
    if (have_parts) {
      std::fill(eddy.begin(), eddy.end(), 0.0);
      std::fill(molecular.begin(), molecular.end(), 0.0);
    }
    return;
  }
  const auto at = [&](std::size_t j) { return n[j * S_ + s]; };
  for (std::size_t e = 0; e <= N_; ++e) {
    const EdgeCoef& c = coef(s, e);
    double k = 0.0;
    double d = 0.0;
    double other = 0.0;
    if (e > 0) {
      k += c.left_K * at(e - 1);
      d += c.left_D * at(e - 1);
    }
    if (e < N_) {
      k += c.right_K * at(e);
      d += c.right_D * at(e);
    }
    if (e == 0 || e == N_) {
      const bool top = e == N_;
      const double g = ghost_density(s, top, t);
      k += c.ghost_K * g;
      d += c.ghost_D * g;
      const double v = boundary_velocity(s, top, t);
      other = imposed_flux(s, top, t) + v * at(top ? N_ - 1 : 0);  // Phi = v_eff n_cell
    }
    total[e] = k + d + other;
    if (have_parts) {
      eddy[e] = k;
      molecular[e] = d;
    }
  }
}

void TransportOperator::add_tendency(std::span<const double> n, double t,
                                     std::span<double> tendency) {
  for (std::size_t s = 0; s < S_; ++s) {
    if (species_[s].fixed) continue;
    flux_of(n, t, s, f_, {}, {});
    // The velocity boundary terms enter through flux_of's Phi = v_eff n_cell: divided by dz
    // here they are boundary_terms(s, t) times n_cell.
    for (std::size_t j = 0; j < N_; ++j) tendency[j * S_ + s] += (f_[j] - f_[j + 1]) / dz_[j];
  }
}

void TransportOperator::add_jacobian(std::span<const double> /*n*/, double t,
                                     BlockTridiagonal& jac) {
  for (std::size_t s = 0; s < S_; ++s) {
    if (species_[s].fixed) continue;
    for (std::size_t j = 0; j < N_; ++j) {
      jac.d(j, s, s) += di_[s * N_ + j];
      if (j > 0) jac.l(j, s) += lo_[s * N_ + j];
      if (j + 1 < N_) jac.u(j, s) += up_[s * N_ + j];
    }
    const BoundaryTerms bt = boundary_terms(s, t);
    jac.d(0, s, s) += bt.bottom;
    jac.d(N_ - 1, s, s) += bt.top;
  }
}

void TransportOperator::edge_fluxes(std::span<const double> n, double t,
                                    std::span<double> out) const {
  for (std::size_t s = 0; s < S_; ++s) {
    flux_of(n, t, s, out.subspan(s * (N_ + 1), N_ + 1), {}, {});
  }
}

EdgeFluxParts TransportOperator::edge_flux_parts(std::span<const double> n, double t,
                                                 std::size_t s) const {
  EdgeFluxParts p;
  p.total.assign(N_ + 1, 0.0);
  p.eddy.assign(N_ + 1, 0.0);
  p.molecular.assign(N_ + 1, 0.0);
  flux_of(n, t, s, p.total, p.eddy, p.molecular);
  return p;
}

std::vector<BoundaryFluxes> TransportOperator::boundary_fluxes(std::span<const double> n,
                                                               double t) const {
  std::vector<BoundaryFluxes> out(S_);
  std::vector<double> f(N_ + 1);
  for (std::size_t s = 0; s < S_; ++s) {
    flux_of(n, t, s, f, {}, {});
    out[s] = BoundaryFluxes{f.front(), f.back()};
  }
  return out;
}

void TransportOperator::apply_A(std::size_t s, std::span<const double> y,
                                std::span<double> out) const {
  // Only the time-independent part; callers add the velocity boundary terms.
  for (std::size_t j = 0; j < N_; ++j) {
    double v = di_[s * N_ + j] * y[j];
    if (j > 0) v += lo_[s * N_ + j] * y[j - 1];
    if (j + 1 < N_) v += up_[s * N_ + j] * y[j + 1];
    out[j] = v;
  }
}

namespace {
/// Thomas algorithm for a[j] y[j-1] + b[j] y[j] + c[j] y[j+1] = d[j] (no pivoting: the
/// matrices here are M-matrices, column diagonally dominant). Returns false on a zero pivot.
///
/// The steady problem inherits the conditioning of molecular diffusion: D = b/n_a grows
/// like 1/n_a upward, so with D spanning a factor R over the column the computed steady flux
/// carries a round-off error of about 1e-16 R times the largest flux term (backward stable,
/// but a tiny flux at the bottom is then poorly resolved).
template <class A, class B, class C>
bool thomas(std::size_t N, A a, B b, C c, std::span<double> d, std::span<double> cp) {
  double beta = b(0);
  const double scale = std::abs(beta) + (N > 1 ? std::abs(c(0)) : 0.0);
  if (!(std::abs(beta) > 1e-13 * scale) || !std::isfinite(beta)) return false;
  cp[0] = N > 1 ? c(0) / beta : 0.0;
  d[0] /= beta;
  for (std::size_t k = 1; k < N; ++k) {
    const double ck = k + 1 < N ? c(k) : 0.0;
    beta = b(k) - a(k) * cp[k - 1];
    const double sc = std::abs(b(k)) + std::abs(a(k)) + std::abs(ck);
    if (!(std::abs(beta) > 1e-13 * sc) || !std::isfinite(beta)) return false;
    cp[k] = ck / beta;
    d[k] = (d[k] - a(k) * d[k - 1]) / beta;
  }
  for (std::size_t k = N - 1; k-- > 0;) d[k] -= cp[k] * d[k + 1];
  return true;
}
}  // namespace

bool TransportOperator::step_species(std::size_t s, std::span<double> n, double t, double dt) {
  const std::size_t N = N_;
  const double* lo = &lo_[s * N];
  const double* di = &di_[s * N];
  const double* up = &up_[s * N];
  // Solves (I - c A(tau)) y = rhs in place.
  const auto solve = [&](double c, double tau, std::span<double> rhs) {
    const BoundaryTerms bt = boundary_terms(s, tau);
    return thomas(
        N, [&](std::size_t j) { return -c * lo[j]; },
        [&](std::size_t j) {
          double d = di[j] + (j == 0 ? bt.bottom : 0.0);
          if (j == N - 1) d += bt.top;
          return 1.0 - c * d;
        },
        [&](std::size_t j) { return -c * up[j]; }, rhs, std::span<double>(cp_));
  };
  for (std::size_t j = 0; j < N; ++j) y0_[j] = n[j * S_ + s];

  // Stage 1, trapezoidal rule over gamma dt.
  apply_A(s, y0_, yg_);
  const BoundaryTerms bt0 = boundary_terms(s, t);
  yg_[0] += bt0.bottom * y0_[0];
  yg_[N - 1] += bt0.top * y0_[N - 1];
  source(s, t, r_);
  for (std::size_t j = 0; j < N; ++j) yg_[j] = y0_[j] + kD * dt * (yg_[j] + r_[j]);
  source(s, t + kGamma * dt, r_);
  for (std::size_t j = 0; j < N; ++j) yg_[j] += kD * dt * r_[j];
  bool ok = solve(kD * dt, t + kGamma * dt, yg_);
  // Stage 2, BDF2 from t, t + gamma dt to t + dt.
  if (ok) {
    source(s, t + dt, r_);
    for (std::size_t j = 0; j < N; ++j) y_[j] = kW1 * yg_[j] + kW0 * y0_[j] + kD * dt * r_[j];
    ok = solve(kD * dt, t + dt, y_);
  }
  const bool negative = ok && std::any_of(y_.begin(), y_.end(), [](double v) { return v < 0.0; });
  if (!ok || negative) {
    // Backward Euler substeps: positivity preserving (M-matrix), first order.
    ++fallbacks_;
    const double h = dt / kPositivityFallbackSubsteps;
    std::copy(y0_.begin(), y0_.end(), y_.begin());
    for (int k = 1; k <= kPositivityFallbackSubsteps; ++k) {
      const double tau = t + h * k;
      source(s, tau, r_);
      for (std::size_t j = 0; j < N; ++j) y_[j] += h * r_[j];
      if (!solve(h, tau, y_)) return false;
    }
  }
  if (!std::all_of(y_.begin(), y_.end(), [](double v) { return std::isfinite(v); })) return false;
  for (std::size_t j = 0; j < N; ++j) n[j * S_ + s] = y_[j];
  return true;
}

bool TransportOperator::implicit_step(std::span<double> n, double t, double dt) {
  std::copy(n.begin(), n.end(), save_.begin());
  for (std::size_t s = 0; s < S_; ++s) {
    if (species_[s].fixed) continue;
    if (!step_species(s, n, t, dt)) {
      std::copy(save_.begin(), save_.end(), n.begin());
      return false;
    }
  }
  return true;
}

}  // namespace colchem
