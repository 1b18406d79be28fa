// The column model: a scenario's background, chemistry, transport and photolysis assembled
// into the operators the solvers use, plus the diagnostics the outputs need.
//
//   dn/dt = f_transport(n) + f_chemistry(n; J(n))
// Transport and chemistry are ColumnOperators; photolysis is not an operator but supplies
// the J-values of the chemistry's photolysis channels from the current state
// (refresh_photolysis). In the coupled steady state J lags the state by one pseudo-time step
// (an outer iteration that converges with it); in the split integrator J is refreshed before
// every chemistry step.
#pragma once

#include <memory>
#include <span>
#include <string>
#include <vector>

#include "chem/chemistry_operator.hpp"
#include "core/background.hpp"
#include "io/scenario.hpp"
#include "photo/photolysis_model.hpp"
#include "solve/column_system.hpp"
#include "transport/column_species.hpp"
#include "transport/transport_operator.hpp"

namespace colchem {

/// Reaction-level diagnostics of one state (arrays as in io/output.hpp ReactionData).
struct ColumnDiagnostics {
  std::vector<std::string> equations;       ///< active reactions, then condensation sinks
  std::vector<double> net_stoichiometry;    ///< [r][s]
  std::vector<double> reaction_rate;        ///< [r][j]
  std::vector<double> chemical_tendency;    ///< [s][j]
  std::vector<double> transport_tendency;   ///< [s][j]
  std::vector<double> net_tendency;         ///< [s][j]
  std::vector<double> edge_flux, eddy_flux, molecular_flux;  ///< [s][e], e = 0..N
  std::vector<double> bottom_flux, top_flux;                 ///< [s]
};

class ColumnModel {
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
  /// held) onto this grid for the species both share; the others keep `n`.
  /// Returns the number of species taken from the file.
  std::size_t take_restart(const std::filesystem::path& file, std::vector<double>& n) const;
  /// Imposes the held species' densities on a state.
  void impose_held(std::span<double> n) const;

  /// Recomputes J from the state and hands them to the chemistry.
  void refresh_photolysis(std::span<const double> n);
  /// The last J computed, [c*N + j] over the photolysis model's channels.
  [[nodiscard]] const std::vector<double>& jvalues() const { return J_; }

  [[nodiscard]] ColumnDiagnostics diagnostics(std::span<const double> n, double t);

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
  std::vector<Injection> injections_;
  std::vector<std::size_t> sink_species_;  ///< species with a condensation sink
};

}  // namespace colchem
