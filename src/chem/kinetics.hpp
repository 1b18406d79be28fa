// Chemical kinetics of a column: rate constants at every level, reaction rates,
// production and loss, and the analytic Jacobian.
//
//   R_r = k_r prod_s n_s^nu_rs                  (cm^-3 s^-1)
//   P_s = sum_r nu'_rs R_r,  L_s = sum_r nu_rs R_r,   dn_s/dt = P_s - L_s
//   d(P - L)_s / dn_q = sum_r (nu'_rs - nu_rs) dR_r/dn_q   (exact, by the product rule)
// State ordering n[j*S + s] (cell-major, species fastest) as in core/block_tridiagonal.hpp.
// Held-fixed species (bulk gases) are parameters of the network: their tendency and their
// Jacobian rows are zero, while the rates they take part in use their densities.
// k_r includes the scale (named parameters) and, for a "+ M" reaction with a non-fall-off
// law, the third-body density [M] (taken from the background, so independent of n).
#pragma once

#include <cstddef>
#include <map>
#include <memory>
#include <span>
#include <string>
#include <vector>

#include "chem/mechanism.hpp"

namespace colchem {

class Kinetics {
 public:
  /// Compiles the reactions of `modules` (indices into mech.modules, requirements already
  /// included) with parameter values `parameters` (index as mech.parameters).
  Kinetics(std::shared_ptr<const Mechanism> mech, std::span<const std::size_t> modules,
           std::span<const double> parameters);

  [[nodiscard]] const Mechanism& mechanism() const { return *mech_; }
  [[nodiscard]] std::size_t species_count() const { return S_; }
  [[nodiscard]] std::size_t reaction_count() const { return reactions_.size(); }
  [[nodiscard]] std::size_t levels() const { return levels_; }
  /// Mechanism index of active reaction r.
  [[nodiscard]] std::size_t mechanism_reaction(std::size_t r) const { return reactions_[r]; }
  [[nodiscard]] bool is_fixed(std::size_t s) const { return fixed_[s] != 0; }

  // --- Conditions ----------------------------------------------------------------------
  /// Temperature (K) and air density (cm^-3) per level and the bulk mole fractions by
  /// species name (for [M]); evaluates every rate constant.
  void set_conditions(std::span<const double> temperature_K, std::span<const double> air_cm3,
                      const std::map<std::string, double>& bulk_mole_fraction);
  void set_parameter(std::size_t parameter, double value);
  [[nodiscard]] std::span<const double> parameters() const { return params_; }

  /// Photolysis channels used by the active reactions, in first-use order.
  [[nodiscard]] const std::vector<std::string>& channels() const { return channels_; }
  /// Index of a channel, or npos when no active reaction uses it.
  [[nodiscard]] std::size_t channel_index(const std::string& name) const;
  static constexpr std::size_t npos = static_cast<std::size_t>(-1);
  /// J (s^-1) of `channel` at `level`.
  void set_photolysis_rate(std::size_t channel, std::size_t level, double J);
  /// J of `channel` at every level.
  void set_photolysis_rates(std::size_t channel, std::span<const double> J);

  /// Multiplies k (or J) of active reaction r by factor[j] at every level j, on top of its
  /// scale (an ensemble member's draw of the rate uncertainty); all ones restore it. Set
  /// after set_conditions (which resets the factors when the level count changes).
  void set_rate_factors(std::size_t r, std::span<const double> factor);

  /// k[r * levels + j] including scale and [M] where it multiplies (units by order).
  [[nodiscard]] std::span<const double> rate_constants() const { return k_; }
  /// [M] (cm^-3) of active reaction r at level j, M[r * levels + j]: the air density
  /// weighted by the reaction's third-body efficiencies over the bulk gases.
  [[nodiscard]] std::span<const double> third_body_densities() const { return M_; }
  /// d k_r / d p at every level: out[(p * R + r) * levels + j]. Only reactions whose scale
  /// names p are non-zero.
  void rate_constant_sensitivities(std::span<double> out) const;

  // --- Evaluation in one cell (n points at the cell's S densities) -------------------
  /// The mass-action kernel, the one place k prod n is formed: k prod_s n_s^nu_rs of active
  /// reaction r (left to right, k first), leaving out reactant occurrence `skip` (an index
  /// into the expanded reactant list; npos: none), which gives dR_r/dn for that occurrence.
  [[nodiscard]] double mass_action(std::size_t r, double k, const double* n,
                                   std::size_t skip = npos) const;
  /// prod_s n_s^nu_rs of active reaction r (R_r = k_r times this).
  [[nodiscard]] double rate_product(std::size_t r, const double* n) const {
    return mass_action(r, 1.0, n);
  }
  /// The chemistry channel of active reaction r (a photolysis reaction), or npos.
  [[nodiscard]] std::size_t reaction_channel(std::size_t r) const { return reaction_channel_[r]; }
  /// The scale of active reaction r at `level` (named parameters times its rate factor):
  /// k = scale J for a photolysis reaction.
  [[nodiscard]] double reaction_scale(std::size_t r, std::size_t level) const {
    return scale_[r] * factor_[r * levels_ + level];
  }
  /// R_r for every active reaction.
  void reaction_rates(std::size_t cell, const double* n, double* R) const;
  /// dR_r/dn_s (size S, overwritten) of active reaction r in `cell`: the product rule on the
  /// mass-action rate (the Jacobian's partial derivatives for one reaction).
  void rate_gradient(std::size_t cell, std::size_t r, const double* n, double* dR) const;
  /// P and L (size S) and R (size reactions); fixed species get P = L = 0.
  void production_loss(std::size_t cell, const double* n, double* P, double* L,
                       double* R) const;
  /// tendency[s] += P_s - L_s (fixed species: nothing).
  void add_tendency(std::size_t cell, const double* n, double* tendency) const;
  /// tendency[s] += sum_r nu_rs k[r] prod n: the tendency with rate constants k (one per
  /// active reaction; 0 skips it), e.g. d k / d p for parameter sensitivities.
  void add_mass_action(const double* n, std::span<const double> k, double* tendency) const;
  /// tendency[s] += d(P_s - L_s)/dJ . dJ: the photolysis reactions alone with their J
  /// replaced by dJ[channel] (the tendency is linear in J, so this is exact).
  void add_photolysis_tendency(const double* n, const double* dJ, double* tendency) const;

  // --- Jacobian -----------------------------------------------------------------------
  /// Adds d(P - L)/dn into a dense row-major S x S block.
  void add_jacobian_dense(std::size_t cell, const double* n, double* block) const;

 private:
  void rescale();
  /// The mass-action kernel: tendency += sum_r nu_r k_r prod n, k_r = k_of(r) (0 skips r).
  template <class RateConstant>
  void accumulate(const double* n, RateConstant k_of, double* tendency) const;
  double partial(std::size_t occurrence, double k, const double* n) const;

  std::shared_ptr<const Mechanism> mech_;
  std::size_t S_ = 0;
  std::size_t levels_ = 0;
  std::vector<std::size_t> reactions_;       // active -> mechanism index
  std::vector<char> fixed_;
  std::vector<double> params_;
  // Reactants, expanded by count ("2 OH" -> OH, OH): occurrences of reaction r are
  // occ_species_[occ_start_[r] .. occ_start_[r+1]).
  std::vector<std::size_t> occ_start_, occ_species_, occ_reaction_;
  // Gross products: (species, count) of reaction r in prod_[prod_start_[r] ..).
  std::vector<std::size_t> prod_start_;
  std::vector<StoichEntry> prod_;
  // Jacobian terms: block[jt_dense_[t]] += jt_coeff_[t] dR/dn_o.
  // Terms are grouped by occurrence: those of occurrence o are [jt_start_[o], jt_start_[o+1]).
  std::vector<std::size_t> jt_dense_, jt_start_;
  std::vector<double> jt_coeff_;
  // Rate constants.
  std::vector<std::string> channels_;
  std::vector<std::size_t> reaction_channel_;  // npos for thermal reactions
  std::vector<double> k_base_;                 // without scale; J for photolysis
  std::vector<double> scale_;                  // per reaction
  std::vector<double> factor_;                 // per reaction and level (ensembles, checks), else 1
  std::vector<double> k_;
  std::vector<RateLaw> laws_;        // active reactions' laws, for rate_constants()
  std::vector<double> M_;            // [M] per reaction and level
};

}  // namespace colchem
