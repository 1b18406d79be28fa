// The column model: a scenario's background, chemistry, transport and photolysis assembled
// into the operators the solvers use, plus the diagnostics the outputs need.
//
//   dn/dt = f_transport(n) + f_chemistry(n; J(n))
// Transport and chemistry are ColumnOperators; photolysis is the column's NonlocalCoupling
// (column_system.hpp): it supplies the J-values of the chemistry's photolysis channels from
// the current state (refresh), and the product of the Jacobian's photolysis part with a
// vector (add_jacobian_product):
//   (J_nl v)_{j,s} = sum_c d f_{j,s}/dJ_c(z_j) . dJ_c(z_j)[v],
//   dJ[v] = (J(x + h v) - J(x)) / h,   h = 1e-7 / max_i |v_i| / (|x_i| + 1 cm^-3)
// a one-sided directional derivative of whatever radiative transfer computes J (each
// density moves by at most 1e-7 of itself: the truncation error is ~1e-7 relative), and the
// exact derivative of the chemistry with respect to J (linear in J). In the split integrator
// J is refreshed before every chemistry step.
#pragma once

#include <memory>
#include <span>
#include <string>
#include <vector>

#include "chem/chemistry_operator.hpp"
#include "core/background.hpp"
#include "core/model_column.hpp"
#include "solve/scenario.hpp"
#include "photo/photolysis_model.hpp"
#include "solve/column_system.hpp"
#include "transport/column_species.hpp"
#include "transport/transport_operator.hpp"

namespace colchem {

/// Reaction-level diagnostics of one state (arrays as in io/output.hpp ReactionData).
struct ColumnDiagnostics {
  std::vector<std::string> equations;       ///< active reactions, then exchange terms
  std::vector<std::string> reaction_ids;    ///< the same by id (exchange terms: exchange_X, held_X)
  std::vector<double> net_stoichiometry;    ///< [r][s]
  std::vector<double> reaction_rate;        ///< [r][j]
  std::vector<double> chemical_tendency;    ///< [s][j]
  std::vector<double> transport_tendency;   ///< [s][j]
  std::vector<double> net_tendency;         ///< [s][j]
  std::vector<double> edge_flux, eddy_flux, molecular_flux;  ///< [s][e], e = 0..N
  std::vector<double> bottom_flux, top_flux;                 ///< [s]
};

/// One exchange term at a state (chem/condensation.hpp): per cell the equilibrium density
/// n_eq (saturation, or the held profile; 0 where the term does not apply), the rate
/// constant k (s^-1) and whether a condensed reservoir is present.
struct ExchangeReport {
  std::string equation;
  std::size_t species = 0;
  bool held_profile = false;
  std::vector<double> n_eq, k;
  std::vector<int> reservoir;
  /// Cells with a reservoir, those among them with n <= 10 n_eq, and the largest n/n_eq there.
  std::size_t reservoir_cells = 0, within_10x = 0;
  double worst_ratio = 0.0;
};

/// A measure of a steady state whose meaning does not change with the grid (README, "What
/// a converged state guarantees"): per species s, the column-integrated imbalance
///   B_s = max(0, sum_j |F_js| dz_j - 1e3 eps sum_j w_js dz_j)
///         / ( sum_j (P_js + L_js + C_js) dz_j + |Phi_s,bottom| + |Phi_s,top|
///             + a_s (z_top - z_bottom) / t_ref ),
/// the absolute residual integrated over the column relative to the column's gross
/// chemical production, loss and condensation and its boundary fluxes. Unlike the scaled
/// norm it has no transport exchange K/dz^2 in its reference, so one tolerance means the
/// same balance on every grid. The subtracted term is a round-off allowance (eps = machine
/// epsilon): F is a sum of terms of size w (residual_norm.hpp), so a state in exact balance
/// still shows |F| ~ eps w; a species with neither chemistry nor boundary flux (reference
/// a_s H/t_ref) could otherwise never pass (1e3 eps: common practice, no source). Also the largest mole fraction of a free species (a state
/// above 1 is no physical steady state).
struct ColumnBalance {
  double worst = 0.0;              ///< max_s B_s
  std::size_t worst_species = 0;
  double max_mole_fraction = 0.0;  ///< of the free (not held) species
  std::size_t max_species = 0, max_cell = 0;
};

class ColumnModel : public NonlocalCoupling {
 public:
  /// Builds every part; inconsistencies between sections (a species in `species:` that the
  /// mechanism lacks, a photolysis channel without data) are InputErrors naming the entry.
  explicit ColumnModel(const Scenario& sc);

  [[nodiscard]] const Background& background() const { return bg_; }
  [[nodiscard]] const std::vector<std::string>& species() const { return names_; }
  [[nodiscard]] std::size_t cells() const { return bg_.grid.cells(); }
  [[nodiscard]] std::size_t species_count() const { return names_.size(); }
  [[nodiscard]] bool has_chemistry() const { return chemistry_ != nullptr; }
  [[nodiscard]] ChemistryOperator& chemistry() { return *chemistry_; }
  [[nodiscard]] const ChemistryOperator& chemistry() const { return *chemistry_; }
  [[nodiscard]] TransportOperator& transport() { return *transport_; }
  [[nodiscard]] const PhotolysisModel* photolysis() const { return photo_.get(); }
  [[nodiscard]] ColumnSystem system();
  [[nodiscard]] const std::vector<Injection>& injections() const { return injections_; }
  [[nodiscard]] bool held(std::size_t s) const { return held_[s]; }

  /// The scenario's initial state n[j*S + s] with the held species imposed.
  [[nodiscard]] std::vector<double> initial_state() const;
  /// Interpolates a previous run's number densities (log-linear in altitude, end values
  /// held) onto this grid for the species both share; the others keep `n`. `old` is read
  /// from the earlier run's file by io/output.hpp's read_model_column.
  /// Returns the number of species taken from it.
  std::size_t take_restart(const ModelColumn& old, std::vector<double>& n) const;
  /// Imposes the held species' densities on a state.
  void impose_held(std::span<double> n) const;

  /// Recomputes J from the state and hands them to the chemistry.
  void refresh_photolysis(std::span<const double> n);

  // --- NonlocalCoupling (photolysis) ----------------------------------------------------
  void refresh(std::span<const double> x) override { refresh_photolysis(x); }
  void add_jacobian_product(std::span<const double> x, std::span<const double> v,
                            std::span<double> out) override;
  /// The last J computed, [c*N + j] over the photolysis model's channels.
  [[nodiscard]] const std::vector<double>& jvalues() const { return J_; }

  /// B_s of the state (its J-values must be those of x: refresh first), with a_s and t_ref
  /// of the residual scale.
  [[nodiscard]] ColumnBalance column_balance(std::span<const double> x, double t,
                                             double absolute_density_cm3,
                                             double reference_time_s);

  [[nodiscard]] ColumnDiagnostics diagnostics(std::span<const double> n, double t);

  // --- Parameters and derivatives for sensitivities (solve/adjoint.hpp) ------------------
  [[nodiscard]] const std::vector<TransportSpecies>& transport_species() const {
    return transport_species_;
  }
  /// The boundary conditions the transport operator was built with (one per species).
  [[nodiscard]] const std::vector<SpeciesBoundaries>& boundaries() const { return boundaries_; }
  /// Replaces the transport operator by one on `bg` (its eddy profile; the rest of the
  /// model keeps the scenario's background) with the boundary conditions `bcs`. Systems
  /// taken from system() before hold the old operator: take them again.
  void rebuild_transport(const Background& bg, std::vector<SpeciesBoundaries> bcs);
  /// Sets named parameter q (index as Mechanism::parameters) in the rate constants and,
  /// where it acts on them, in the photolysis data (rebuilt). Refresh J before use.
  void set_parameter(std::size_t q, double value);
  /// dF/dp_q at x (cm^-3 s^-1 per unit of p, [j*S + s], overwritten): rate constants
  /// through their scales, photolysis data through dJ/dp (PhotolysisModel::
  /// parameter_derivative). J must be those of x (refresh first).
  void parameter_tendency(std::size_t q, std::span<const double> x, std::span<double> out);

  /// The photolysis part of the Jacobian in factored form, J_nl = B DJ (at x; J refreshed
  /// at x first by the caller):
  ///   B[(c*N + j)*S + s] = d f_{j,s} / d J_c(z_j)   (local: the chemistry, linear in J),
  ///   dJ[k*C*N + c*N + j] = d J_c(z_j) / d x_{columns[k]}
  /// over the free absorber unknowns (free species that attenuate the light, every cell),
  /// each column a one-sided directional derivative as in add_jacobian_product (step 1e-7
  /// (|x| + 1 cm^-3)). C counts the chemistry's channels. Empty without photolysis.
  /// With the direct beam alone (no two-stream scheme) DJ is not assembled (reverse = true):
  /// its transpose is applied exactly by add_photolysis_transpose instead.
  struct PhotolysisJacobian {
    std::size_t channels = 0;
    bool reverse = false;
    std::vector<std::size_t> columns;
    std::vector<double> B, dJ;
  };
  [[nodiscard]] PhotolysisJacobian photolysis_jacobian(std::span<const double> x);
  /// out[i] += (DJ^T u)_i for the free unknowns i (u over the chemistry's channels,
  /// [c*N + j]): PhotolysisModel::add_transpose_product (direct beam only).
  void add_photolysis_transpose(std::span<const double> x, std::span<const double> u,
                                std::span<double> out);
  /// The exchange terms at state n (empty without chemistry).
  [[nodiscard]] std::vector<ExchangeReport> exchange_report(std::span<const double> n) const;

 private:
  Background bg_;
  std::vector<std::string> names_;
  std::vector<bool> held_;
  ColumnSpeciesSpec species_setup_;
  std::vector<TransportSpecies> transport_species_;
  std::vector<double> held_mixing_ratio_;
  std::unique_ptr<ChemistryOperator> chemistry_;
  std::unique_ptr<TransportOperator> transport_;
  std::unique_ptr<PhotolysisModel> photo_;
  std::vector<std::size_t> channel_map_;  ///< chemistry channel -> photolysis channel
  std::vector<double> J_;
  std::vector<double> x_shifted_, J_shifted_, J_minus_, dJ_;  ///< workspace of add_jacobian_product
  std::vector<Injection> injections_;
  std::vector<SpeciesBoundaries> boundaries_;
  PhotolysisSpec photo_spec_;
};

}  // namespace colchem
