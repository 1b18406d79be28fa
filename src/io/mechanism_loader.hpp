// Mechanism files (YAML, colchem's own schema; README.md, section Configuration reference "Mechanism files") -> Mechanism.
//
// Every check raises an InputError (ExitCode::kInputData) naming the file, the line and the
// reaction's equation: element balance (sinks exempt; hv and M ignored), undeclared
// species, duplicate reactions without `duplicate: true`, rate units against the order,
// unknown parameter names in `scale`, parameter defaults outside [min, max], photolysis
// without hv, unknown keys. check_rates() adds the checks that need a column: negative,
// NaN or absurd rate constants at its temperatures and densities.
#pragma once

#include <filesystem>
#include <map>
#include <memory>
#include <span>
#include <string>

#include "chem/mechanism.hpp"
#include "core/units.hpp"

namespace colchem {

std::shared_ptr<Mechanism> load_mechanism(const std::filesystem::path& file,
                                          const UnitSystem& units);
/// The same from text (tests); `name` stands for the file in messages.
std::shared_ptr<Mechanism> load_mechanism_text(const std::string& text, const std::string& name,
                                               const UnitSystem& units);

/// Thresholds of "absurd" rate constants (common practice, no source).
struct RateLimits {
  double first_order_s = 1e20;         ///< s^-1
  double bimolecular_cm3_s = 1e-8;     ///< cm^3 s^-1 (also bimolecular-equivalent k)
  /// cm^6 s^-1 (k0 of fall-off forms). Not lower: SO3 + 2 H2O -> H2SO4 + H2O (Lovejoy et
  /// al. 1996), extrapolated as planetary models do to 170 K, reaches a few 1e-24 through its
  /// water-complex route.
  double termolecular_cm6_s = 1e-22;
};

/// Evaluates every thermal rate constant at every (T, n_air) pair with [M] from
/// `bulk_mole_fraction`; a negative, NaN or absurd value is an InputError (kInputData)
/// naming the mechanism file, the reaction's line and equation and the conditions.
void check_rates(const Mechanism& mech, std::span<const double> temperature_K,
                 std::span<const double> air_cm3,
                 const std::map<std::string, double>& bulk_mole_fraction,
                 const RateLimits& limits = {});

}  // namespace colchem
