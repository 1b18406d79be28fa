// Mechanism files (YAML, colchem's own schema; README.md, section Configuration reference
// "Mechanism files") -> Mechanism.
//
// Every check raises an InputError (ExitCode::kInputData) naming the file, the line and the
// reaction's equation: element balance (sinks exempt; hv and M ignored), undeclared
// species, reaction ids (required, a short word, unique), rate units against the order,
// unknown parameter names in `scale`, parameter defaults outside [min, max], photolysis
// without hv, unknown keys and the renamed keys of earlier schemas (`duplicate`,
// `efficiencies`). check_rates() (chem/rate_checks.hpp) adds the checks that need a column: negative,
// NaN or absurd rate constants at its temperatures and densities (limits: RateLimits,
// chem/mechanism.hpp, widened in a scenario's or box's `chemistry.rate_limits`).
#pragma once

#include <filesystem>
#include <map>
#include <memory>
#include <span>
#include <string>

#include "chem/mechanism.hpp"
#include "chem/rate_checks.hpp"
#include "core/units.hpp"

namespace colchem {

std::shared_ptr<Mechanism> load_mechanism(const std::filesystem::path& file,
                                          const UnitSystem& units);
/// The same from text (tests); `name` stands for the file in messages.
std::shared_ptr<Mechanism> load_mechanism_text(const std::string& text, const std::string& name,
                                               const UnitSystem& units);

}  // namespace colchem
