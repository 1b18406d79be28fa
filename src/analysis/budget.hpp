// Budgets: which reactions produce and destroy a species, and whether every element's
// column budget closes.
//
// Species budget (per cell j): dn_s/dt = sum_r nu_rs R_r(j) + T_s(j), nu_rs the net
// stoichiometric coefficient (products minus reactants), R_r the reaction rate (cm^-3 s^-1),
// T_s the transport tendency -dPhi_s/dz. Column integrals use the cell widths:
// <x> = sum_j x_j dz_j (cm^-2 s^-1).
//
// Element budget: for element E with counts a_Es, the column change
//   dN_E/dt = sum_s a_Es [ sum_r nu_rs <R_r> ]  +  sum_s a_Es (Phi_s,bottom - Phi_s,top)
// The chemical part vanishes for balanced reactions of unknown species; what remains comes
// from sinks (reactions without products, condensation) and from species held fixed (their
// chemical change is supplied from outside the model), both reported as their own terms.
// The exchange with a condensed phase ("X -> (condensed phase)", chem/condensation.hpp) and
// the supply that holds a profile ("X -> (held-profile supply)") are pseudo-reactions with
// their own terms (condensed, profile_supply: what the gas gains from each, so condensation
// is negative), also contained in `chemistry`.
// At steady state the sum is zero: the imbalance relative to the gross terms is the check.
#pragma once

#include <span>
#include <string>
#include <vector>

namespace colchem {

/// One reaction's contribution to a species' budget.
struct BudgetTerm {
  std::size_t reaction = 0;
  std::string id;
  std::string equation;
  double column = 0.0;               ///< nu <R> (cm^-2 s^-1), signed
  std::vector<double> bands;         ///< the same over each altitude band
  double share = 0.0;                ///< |column| / column total of its sign (production or loss)
};

struct SpeciesBudget {
  std::string species;
  std::vector<BudgetTerm> production;  ///< nu > 0, largest first
  std::vector<BudgetTerm> loss;        ///< nu < 0, largest magnitude first
  double column_production = 0.0;
  double column_loss = 0.0;            ///< positive number
  double column_transport = 0.0;       ///< <T_s> = Phi_bottom - Phi_top
  double column_net = 0.0;             ///< column_production - column_loss + column_transport
  double column_net_model = 0.0;       ///< the model's own net tendency, integrated
  std::vector<double> band_edges_cm;
  std::vector<double> band_production, band_loss, band_transport;
  /// |sum of listed terms + transport - model net| / gross, gross = P + L + |T|.
  double closure = 0.0;
};

/// Inputs describing a column's chemistry and transport at one state.
struct BudgetInputs {
  std::vector<double> edge_cm;                  ///< N+1 cell edges
  std::vector<std::string> species;             ///< S
  std::vector<std::string> equations;           ///< R
  std::vector<std::string> reaction_ids;        ///< R (may be empty: then no ids are shown)
  std::vector<double> net_stoichiometry;        ///< [r][s] products minus reactants
  std::vector<double> reaction_rate;            ///< [r][j] cm^-3 s^-1
  std::vector<double> transport_tendency;       ///< [s][j] cm^-3 s^-1
  std::vector<double> net_tendency;             ///< [s][j] cm^-3 s^-1 (the model's own)
};

/// The budget of one species over the column and over altitude bands (band edges in cm;
/// empty: the whole column only).
SpeciesBudget species_budget(const BudgetInputs& in, const std::string& species,
                             const std::vector<double>& band_edges_cm);

struct ElementBudget {
  std::string element;
  double boundary_in = 0.0;   ///< sum over unknown species of a (Phi_bottom - Phi_top)
  double chemistry = 0.0;     ///< sum over unknown species of a <chemical tendency>
  double held_supply = 0.0;   ///< sum over held species of a <chemical tendency> (supplied)
  double sinks = 0.0;         ///< chemistry + held_supply: what sinks remove (<= 0)
  double condensed = 0.0;     ///< gained from the condensed phase (evaporation - condensation)
  double profile_supply = 0.0;  ///< supplied to hold profiles (negative: removed)
  double imbalance = 0.0;     ///< boundary_in + chemistry: the column's change (0 at steady state)
  double gross = 0.0;         ///< sum of |column terms| of every species and reaction
  double relative_imbalance = 0.0;  ///< |imbalance| / gross
};

/// Element budgets. atoms[s] maps element -> count for species s; held[s] marks species
/// held fixed; bottom_flux/top_flux are Phi at the bottom and top edges (cm^-2 s^-1,
/// positive upward).
std::vector<ElementBudget> element_budgets(const BudgetInputs& in,
                                           const std::vector<std::vector<std::pair<std::string, int>>>& atoms,
                                           const std::vector<bool>& held,
                                           std::span<const double> bottom_flux,
                                           std::span<const double> top_flux);

/// The text table printed by `colchem budget`.
std::string format_species_budget(const SpeciesBudget& b, std::size_t top);

}  // namespace colchem
