// Mechanism files (YAML, colchem's own schema; README.md, "Mechanism files") -> Mechanism.
// Every check is an InputError (ExitCode::kInputData) naming file, line and reaction; the
// checks that need a column are check_rates' (chem/rate_checks.hpp).
#pragma once

#include <filesystem>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "chem/mechanism.hpp"
#include "chem/rate_checks.hpp"
#include "core/units.hpp"

namespace colchem {

class ConfigNode;

std::shared_ptr<Mechanism> load_mechanism(const std::filesystem::path& file,
                                          const UnitSystem& units);
/// The same from text (tests); `name` stands for the file in messages.
std::shared_ptr<Mechanism> load_mechanism_text(const std::string& text, const std::string& name,
                                               const UnitSystem& units);

/// The names of a mechanism's species, parameters or modules.
template <class T>
std::vector<std::string> names_of(const std::vector<T>& items) {
  std::vector<std::string> names;
  for (const auto& item : items) names.push_back(item.name);
  return names;
}

/// `index` when it holds one; else fails at `where` (expected, found) with a "did you mean"
/// among `names`, or `otherwise` when none is near (a generic reader config_node lacks).
std::size_t named_or_fail(const ConfigNode& where, std::optional<std::size_t> index,
                          const std::string& name, const std::vector<std::string>& names,
                          const std::string& expected, const std::string& found,
                          const std::string& otherwise = {});

}  // namespace colchem
