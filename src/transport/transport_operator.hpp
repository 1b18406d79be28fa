// Vertical transport of every species: eddy and molecular diffusion on a finite-volume grid.
//
//   dn_i/dt = -dPhi_i/dz,   tendency_j = -(Phi_{j+1/2} - Phi_{j-1/2}) / dz_j   (cm^-3 s^-1)
//   Phi_i = -K [dn_i/dz + n_i/H_a + (n_i/T) dT/dz]
//           -D_i [dn_i/dz + n_i/H_i + (1 + alpha_T,i)(n_i/T) dT/dz]          (cm^-2 s^-1, up)
//   D_i = b_i(T)/n_a, H_i = k T/(m_i g), H_a = k T/(m g)
// (Chamberlain and Hunten 1987, Theory of Planetary Atmospheres; Yung and DeMore 1999).
//
// Discretisation at an interior edge e between centres j and j+1 (dz_e = z_{j+1} - z_j):
//   eddy:      Phi_K = -K_e n_a,e (f_{j+1} - f_j)/dz_e,  f = n/n_a  (mixes to uniform f exactly;
//              equals the continuous eddy term because n_a is hydrostatic)
//   molecular: Phi_D = (D_e/dz_e) [B(x_e) n_j - B(-x_e) n_{j+1}],  B(x) = x/(e^x - 1)
//              x_e = dz_e m_i g_e/(k T_e) + (1 + alpha) ln(T_{j+1}/T_j)
//              (exponential fitting: Scharfetter and Gummel 1969, Il'in 1969, Allen and
//              Southwell 1955). Phi_D vanishes to round-off on n_{j+1}/n_j = exp(-x_e), the
//              discrete diffusive equilibrium, and is second order in dz on smooth problems.
// Boundary edges with a Dirichlet value use the half-cell distance to the first/last centre
// (x from the trapezoid rule of m g/(kT) over the half cell). A velocity condition
// (deposition, escape, Jeans, diffusion-limited) holds on the boundary edge, Phi = v n_edge:
// with the same half-cell flux Phi = c n_cell + g n_edge, n_edge = c n_cell/(v - g) and
//   Phi = v_eff n_cell,  v_eff = v c/(v - g)
// (for eddy mixing alone |v_eff| = (n_a,edge/n_a,cell)/(1/|v| + h/K), h the half cell: the
// velocity and the half cell's transfer resistance h/K in series). Taking n_cell itself for
// n_edge would be an O(dz) error in the boundary flux: first order in the grid.
//
// The operator is affine in n and species decouple: per species a tridiagonal matrix A and a
// (time-dependent, boundary-value) source r, f = A n + r. implicit_step uses TR-BDF2
// (gamma = 2 - sqrt(2); Hosea and Shampine 1996; Hundsdorfer and Verwer 2003, ch. II.7),
// L-stable and second order; both stages share the matrix I - (gamma/2) dt A. If a TR-BDF2
// step makes a density negative, that species' step is redone with backward-Euler substeps
// (I - dt A is an M-matrix, so backward Euler keeps n >= 0 for non-negative boundary inputs),
// at first-order accuracy for that step.
#pragma once

#include <span>
#include <vector>

#include "core/background.hpp"
#include "core/column_operator.hpp"
#include "transport/boundary.hpp"
#include "transport/transport_species.hpp"

namespace colchem {

/// Fluxes through the N+1 edges of one species, split into parts (cm^-2 s^-1, upward).
/// At a boundary edge with an imposed flux or velocity the eddy and molecular parts are 0 and
/// `total` holds the imposed flux.
struct EdgeFluxParts {
  std::vector<double> total, eddy, molecular;
};

struct BoundaryFluxes {
  double bottom = 0.0;  ///< upward flux through the bottom edge (positive = into the column)
  double top = 0.0;     ///< upward flux through the top edge (positive = out of the column)
};

/// Backward-Euler substeps used for one species' step when TR-BDF2 would go negative.
inline constexpr int kPositivityFallbackSubsteps = 4;

class TransportOperator final : public ColumnOperator {
 public:
  /// `boundaries` has one entry per species. Throws std::invalid_argument for sizes that do
  /// not match or for a boundary kind used at the wrong end.
  TransportOperator(const Background& bg, std::vector<TransportSpecies> species,
                    std::vector<SpeciesBoundaries> boundaries);

  void add_tendency(std::span<const double> n, double t, std::span<double> tendency) override;
  void add_jacobian(std::span<const double> n, double t, BlockTridiagonal& jac) override;
  bool implicit_step(std::span<double> n, double t, double dt) override;

  /// Fluxes through all N+1 edges, out[s*(N+1) + e], edge e = 0 the bottom (cm^-2 s^-1).
  void edge_fluxes(std::span<const double> n, double t, std::span<double> out) const;
  /// Fluxes of species s split into eddy and molecular parts.
  [[nodiscard]] EdgeFluxParts edge_flux_parts(std::span<const double> n, double t,
                                              std::size_t s) const;
  /// Bottom and top fluxes of every species.
  [[nodiscard]] std::vector<BoundaryFluxes> boundary_fluxes(std::span<const double> n,
                                                            double t) const;

  /// The molecular drift x_e over interior edge e (1..N-1) for species s: the discrete
  /// diffusive equilibrium is n_e/n_{e-1} = exp(-x_e).
  [[nodiscard]] double molecular_drift(std::size_t s, std::size_t e) const;
  /// The resolved escape velocity v at the top edge (jeans, diffusion_limited) or 0.
  [[nodiscard]] double top_velocity(std::size_t s) const { return top_velocity_[s]; }
  /// The density on the bottom (top = false) or top boundary edge: the Dirichlet value, or for
  /// a velocity condition the edge density n_edge = c n_cell/(v - g) of its half cell;
  /// otherwise the boundary cell's density.
  [[nodiscard]] double boundary_edge_density(std::span<const double> n, double t, std::size_t s,
                                             bool top) const;

  /// Species steps redone with backward Euler since construction (for diagnostics).
  [[nodiscard]] std::size_t positivity_fallbacks() const { return fallbacks_; }

  [[nodiscard]] std::size_t cells() const { return N_; }
  [[nodiscard]] std::size_t species_count() const { return S_; }
  [[nodiscard]] const std::vector<TransportSpecies>& species() const { return species_; }

 private:
  // Edge flux of species s at edge e: Phi = left*n_{e-1} + right*n_e + ghost*n_ghost(t)
  // (+ imposed flux + boundary velocity * n, added per call since they may follow a schedule),
  // split into eddy (K) and molecular (D) coefficients.
  struct EdgeCoef {
    double left_K = 0, right_K = 0, ghost_K = 0;
    double left_D = 0, right_D = 0, ghost_D = 0;
  };
  [[nodiscard]] const EdgeCoef& coef(std::size_t s, std::size_t e) const {
    return coef_[s * (N_ + 1) + e];
  }
  // Construction steps for species s, in the order the constructor takes them.
  void check_boundary_kinds(std::size_t s) const;
  void set_interior_coefficients(const Background& bg, std::size_t s);
  void set_boundary_coefficients(const Background& bg, std::size_t s);
  void set_escape_velocity(const Background& bg, std::size_t s, double M_planet);
  void assemble_matrix(std::size_t s);
  /// Ghost density (Dirichlet) or imposed flux at the boundary at time t.
  [[nodiscard]] double ghost_density(std::size_t s, bool top, double t) const;
  [[nodiscard]] double imposed_flux(std::size_t s, bool top, double t) const;
  /// The velocity v of Phi = v n_edge at time t (bottom: -v_d; top: v_e), 0 for other kinds.
  [[nodiscard]] double edge_velocity(std::size_t s, bool top, double t) const;
  /// The velocity that multiplies the boundary cell's density: Phi = v_eff n_cell.
  [[nodiscard]] double boundary_velocity(std::size_t s, bool top, double t) const;
  /// The velocity boundary terms of A's diagonal at time t, the one place v_eff/dz is
  /// formed (tendency, Jacobian, implicit step and steady solve all take it from here):
  /// d(dn_0/dt)/dn_0 += bottom = v_eff,bottom/dz_0 and
  /// d(dn_{N-1}/dt)/dn_{N-1} += top = -v_eff,top/dz_{N-1}.
  struct BoundaryTerms {
    double bottom = 0.0, top = 0.0;
  };
  [[nodiscard]] BoundaryTerms boundary_terms(std::size_t s, double t) const;
  /// The boundary-value part r of f = A n + r for species s at time t.
  void source(std::size_t s, double t, std::span<double> r) const;
  void flux_of(std::span<const double> n, double t, std::size_t s, std::span<double> total,
               std::span<double> eddy, std::span<double> molecular) const;
  void apply_A(std::size_t s, std::span<const double> y, std::span<double> out) const;
  bool step_species(std::size_t s, std::span<double> n, double t, double dt);

  std::size_t N_ = 0, S_ = 0;
  std::vector<double> dz_;  // cell widths
  std::vector<double> n_air_;
  std::vector<double> edge_n_air_;
  std::vector<TransportSpecies> species_;
  std::vector<SpeciesBoundaries> bc_;
  std::vector<EdgeCoef> coef_;
  std::vector<double> top_velocity_;
  // Half-cell flux Phi = cell n_cell + edge n_edge at a velocity boundary, s*2 + (top ? 1 : 0).
  struct HalfCell {
    double cell = 0, edge = 0;
  };
  std::vector<HalfCell> half_cell_;
  std::vector<double> drift_;         // s*(N+1) + e
  std::vector<double> lo_, di_, up_;  // A per species: s*N + j
  // Work arrays (sized N), so that steps do not allocate.
  std::vector<double> y_, y0_, yg_, r_, f_, cp_, save_;
  std::size_t fallbacks_ = 0;
};

}  // namespace colchem
