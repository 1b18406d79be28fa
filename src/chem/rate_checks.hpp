// Physical-sense checks of a mechanism's rate constants at the conditions of a column or a
// box: every thermal rate constant finite and non-negative, and below the RateLimits
// (chem/mechanism.hpp) for its order (limits are common practice, no source).
#pragma once

#include <map>
#include <span>
#include <string>

#include "chem/mechanism.hpp"

namespace colchem {

/// Evaluates every thermal rate constant at every (T, n_air) pair with [M] from
/// `bulk_mole_fraction`; a negative, NaN or absurd value is an InputError (ExitCode::kInputData)
/// naming the mechanism file, the reaction's line and equation and the conditions.
void check_rates(const Mechanism& mech, std::span<const double> temperature_K,
                 std::span<const double> air_cm3,
                 const std::map<std::string, double>& bulk_mole_fraction,
                 const RateLimits& limits = {});

}  // namespace colchem
