// The scenario's per-species column settings as typed values (built by
// io/species_section.cpp from the `species:` and `injections:` sections): initial profiles,
// boundary conditions, diffusion overrides and scheduled injections. Names are kept raw with
// the location they were written at, so that the caller can check them against the
// mechanism and report "unknown species 'X' at file:line".
//
// Injections: an amount of a species added at one instant, spread uniformly in number
// density over [bottom, top]. A global amount (molecules, or a mass converted with the
// molecule mass) is divided by the planet's surface area 4 pi R^2 to give the column amount
// (cm^-2) a one-dimensional global-mean column receives.
#pragma once

#include <limits>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/error.hpp"
#include "transport/boundary.hpp"
#include "transport/transport_species.hpp"

namespace colchem {

/// An initial mixing-ratio profile: one value, or a table interpolated log-linearly.
struct InitialProfile {
  bool from_table = false;
  double mixing_ratio = 0.0;
  ProfileSpec table;  ///< altitude_cm and mixing ratio (dimensionless)
  Extrapolation extrapolation = Extrapolation::kHoldEnds;
};

/// A species held to a mixing-ratio profile over [from, to) (cell centres) by relaxation,
/// dn/dt = -(n - x n_air)/tau there (the exchange kernel of chem/condensation.hpp); the
/// relaxation term is the supply needed to hold the profile.
struct HoldSpec {
  AltitudeValue mixing_ratio;
  double from_cm = -std::numeric_limits<double>::infinity();
  double to_cm = std::numeric_limits<double>::infinity();
  double timescale_s = 100.0;
};

struct SpeciesColumnSettings {
  std::string name;
  SourceLocation where;
  std::optional<InitialProfile> initial;
  SpeciesBoundaries boundaries;  ///< zero flux unless given
  std::optional<bool> fixed;
  std::optional<double> diffusion_A;  ///< b = A T^s, cm^-1 s^-1
  std::optional<double> diffusion_s;
  std::optional<double> thermal_diffusion;
  std::optional<HoldSpec> hold;
};

enum class InjectionAmount { kColumn, kGlobalMolecules, kGlobalMass };

struct InjectionSpec {
  std::string species;
  SourceLocation where;
  InjectionAmount amount_kind = InjectionAmount::kGlobalMolecules;
  double amount = 0.0;  ///< cm^-2 (kColumn), molecules (kGlobalMolecules) or g (kGlobalMass)
  double time_s = 0.0;
  double bottom_cm = 0.0;
  double top_cm = 0.0;
};

struct ColumnSpeciesSpec {
  InitialProfile default_initial;  ///< species not listed (mixing ratio 0 unless given)
  /// false: no molecular (or thermal) diffusion for any species but those whose own
  /// settings give a binary_diffusion (species.default.molecular_diffusion).
  bool molecular_diffusion = true;
  std::vector<SpeciesColumnSettings> species;
  std::vector<InjectionSpec> injections;

  /// The settings for `name`, or nullptr.
  [[nodiscard]] const SpeciesColumnSettings* find(const std::string& name) const;
};

/// Applies the spec's fixed/diffusion overrides to matching species (by name), after the
/// whole-run switch `molecular_diffusion` (false sets every b to 0 first).
void apply_species_settings(const ColumnSpeciesSpec& spec, std::vector<TransportSpecies>& sp);

/// Boundary conditions per species (zero flux where the spec says nothing).
std::vector<SpeciesBoundaries> boundaries_for(const ColumnSpeciesSpec& spec,
                                              const std::vector<TransportSpecies>& sp);

/// The initial state n[j*S + s] (cm^-3): fixed species at fixed_mixing_ratio[s] * n_a,
/// others from their initial profile or the default one.
/// Throws std::out_of_range if an initial table does not cover a cell centre under kForbid.
std::vector<double> initial_state(const ColumnSpeciesSpec& spec, const Background& bg,
                                  const std::vector<TransportSpecies>& sp,
                                  const std::vector<double>& fixed_mixing_ratio);

/// An injection resolved to a species index and a column amount.
struct Injection {
  std::size_t species = 0;
  double column_cm2 = 0.0;  ///< molecules per cm^2 of column
  double time_s = 0.0;
  double bottom_cm = 0.0;
  double top_cm = 0.0;
};

/// Resolves names against `sp` and converts amounts to column amounts using the planet radius
/// and the molecule mass. Throws InputError naming the entry for an unknown species or a
/// range entirely outside the column (a range partly outside is clipped: the part inside
/// receives the whole amount).
std::vector<Injection> resolve_injections(const ColumnSpeciesSpec& spec, const Background& bg,
                                          const std::vector<TransportSpecies>& sp);

/// Adds every injection whose time lies in [t_from, t_to) to n (cm^-3, n[j*S + s]): a time
/// integrator calling this once per step over contiguous intervals applies each exactly
/// once. The added column amount is exact: cell j gets column * overlap_j / (range * dz_j).
/// Returns the number applied.
std::size_t apply_injections(const std::vector<Injection>& injections, const Grid& grid,
                             std::size_t n_species, double t_from, double t_to,
                             std::span<double> n);

}  // namespace colchem
