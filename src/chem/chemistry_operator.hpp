// The chemistry of a column as a ColumnOperator (core/column_operator.hpp):
//
//   f_{j,s}(n) = P_{j,s}(n) - L_{j,s}(n) - C_{j,s}(n)
//
// P, L from the active reactions (chem/kinetics.hpp); C the exchanges with a condensed phase
// and the held profiles, C = k (n - n_eq) on the active branch (chem/condensation.hpp, the
// one kernel exchange_tendency(), with its exact piecewise derivative). Cells are
// independent: the Jacobian is block diagonal, and implicit_step integrates each cell with
// chem/stiff_integrator.hpp.
// Held-fixed species keep their background density n = x_bulk n_air (fixed_densities()).
#pragma once

#include <memory>
#include <span>
#include <string>
#include <vector>

#include "chem/condensation.hpp"
#include "chem/kinetics.hpp"
#include "chem/stiff_integrator.hpp"
#include "core/background.hpp"
#include "core/column_operator.hpp"

namespace colchem {

class ChemistryOperator : public ColumnOperator {
 public:
  /// Compiles spec.mechanism (spec.modules, spec.parameters) on the background's cells.
  ChemistryOperator(const ChemistrySpec& spec, const Background& background,
                    StiffOptions options = {});
  /// Same for a column given by T and n_air per cell (box mode: one cell); sinks apply to
  /// cells whose altitude (altitude_cm, may be empty = none below any deck) is below.
  ChemistryOperator(const ChemistrySpec& spec, std::span<const double> temperature_K,
                    std::span<const double> air_cm3, std::span<const double> altitude_cm,
                    const std::map<std::string, double>& bulk_mole_fraction,
                    StiffOptions options = {});

  [[nodiscard]] Kinetics& kinetics() { return kin_; }
  [[nodiscard]] const Kinetics& kinetics() const { return kin_; }
  [[nodiscard]] std::size_t species_count() const { return kin_.species_count(); }
  [[nodiscard]] std::size_t cells() const { return kin_.levels(); }

  // --- Photolysis coupling --------------------------------------------------------------
  [[nodiscard]] const std::vector<std::string>& photolysis_channels() const {
    return kin_.channels();
  }
  void set_photolysis_rate(std::size_t channel, std::size_t level, double J) {
    kin_.set_photolysis_rate(channel, level, J);
  }
  void set_photolysis_rates(std::size_t channel, std::span<const double> J) {
    kin_.set_photolysis_rates(channel, J);
  }

  /// Densities (cm^-3) of the held-fixed species per cell (x_bulk n_air; 0 for a fixed
  /// species absent from the bulk composition), index [j*S + s]; free species are 0.
  [[nodiscard]] const std::vector<double>& fixed_densities() const { return fixed_n_; }
  /// Copies the fixed species' densities into a state vector.
  void impose_fixed(std::span<double> n) const;

  /// out[j*S + s] += sum_c d f_{j,s}/dJ_c dJ[c*N + j] over the chemistry's channels (the
  /// photolysis reactions with J replaced by dJ; exact, the tendency being linear in J).
  void add_photolysis_tendency(std::span<const double> n, std::span<const double> dJ,
                               std::span<double> out) const;

  // --- ColumnOperator -------------------------------------------------------------------
  void add_tendency(std::span<const double> n, double t, std::span<double> tendency) override;
  void add_jacobian(std::span<const double> n, double t, BlockTridiagonal& jac) override;
  bool implicit_step(std::span<double> n, double t, double dt) override;

  // --- Diagnostics ------------------------------------------------------------------------
  /// Per-reaction rates R[j * R + r] (cm^-3 s^-1) for budgets; r indexes the active
  /// reactions (kinetics().mechanism_reaction(r) gives the mechanism's index).
  void reaction_rates(std::span<const double> n, std::span<double> R) const;
  /// Exchange loss rate C[j * S + s] (cm^-3 s^-1; negative where the gas is supplied),
  /// summed over the exchange terms of each species.
  void condensation_rates(std::span<const double> n, std::span<double> C) const;
  /// The exchange terms (ChemistrySpec::exchanges order): species and saturation law.
  [[nodiscard]] const std::vector<CondensationExchange>& exchanges() const { return exchanges_; }
  /// Loss rate of each term per cell, out[k * cells + j] (cm^-3 s^-1, negative = supply).
  void exchange_rates(std::span<const double> n, std::span<double> out) const;
  /// The exchange cells (for diagnostics: n_eq, k, reservoir per cell).
  [[nodiscard]] const std::vector<ExchangeCell>& exchange_cells() const { return cells_x_; }
  /// Whether species s has a held profile (species.NAME.hold).
  [[nodiscard]] bool has_held_profile(std::size_t s) const;
  /// Holds species s's profiles at `factor` times the scenario's mixing ratio (n_eq of its
  /// held-profile cells; 1 restores the scenario's). For fits of a held profile's scale.
  void scale_held_profile(std::size_t s, double factor);
  /// d f / d factor of scale_held_profile at state n, added to out[j * S + s]: the kernel's
  /// f depends on n - n_eq, so d f / d n_eq = -d f / d n, times the scenario's n_eq.
  void add_held_profile_derivative(std::size_t s, std::span<const double> n,
                                   std::span<double> out) const;
  /// d f_{j,s} / d p_q at state n: out[(q * cells + j) * S + s], through d k / d p.
  void parameter_sensitivities(std::span<const double> n, std::span<double> out) const;
  [[nodiscard]] const StiffStats& integrator_stats() const { return integrator_.stats(); }

 private:
  void init(const ChemistrySpec& spec, std::span<const double> T, std::span<const double> air,
            std::span<const double> z, const std::map<std::string, double>& bulk);
  void cell_rhs(std::size_t j, const double* n, double* f) const;
  void cell_jacobian(std::size_t j, const double* n, double* block) const;

  Kinetics kin_;
  std::vector<CondensationExchange> exchanges_;
  std::vector<ExchangeCell> cells_x_;    ///< ordered by cell
  std::vector<double> base_n_eq_;        ///< the scenario's n_eq of each of cells_x_
  std::vector<std::size_t> cell_first_;  ///< cells_x_ of cell j: [cell_first_[j], cell_first_[j+1])
  std::vector<double> fixed_n_;
  std::vector<double> fixed_mask_;
  StiffIntegrator integrator_;
  std::vector<double> work_;  // one cell's S values
};

}  // namespace colchem
