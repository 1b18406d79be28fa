// Chemical formulae: element counts and molar mass.
//
// Notation (colchem's own): a formula in Hill-free element order with counts and
// parenthesised groups ("H2SO4", "Ca(OH)2"), optionally followed by a state or isomer label in
// parentheses that is not followed by a count: "O(1D)", "SO2(a3B1)", "HOSO(cis)". A labelled
// species shares its base formula's composition.
// Atomic weights: IUPAC conventional standard atomic weights (CIAAW 2013 table, abridged;
// values from memory, to the digits given).
#pragma once

#include <map>
#include <optional>
#include <string>

namespace colchem {

struct Composition {
  std::map<std::string, int> atoms;  ///< element symbol -> count
  [[nodiscard]] double molar_mass_g_mol() const;
  [[nodiscard]] bool operator==(const Composition&) const = default;
};

struct ParsedFormula {
  std::string base;   ///< the formula without its label ("SO2")
  std::string label;  ///< the state or isomer label without parentheses ("a3B1"), or empty
  Composition composition;
};

/// Parses a species name. On failure returns nullopt and sets *why to a short reason.
std::optional<ParsedFormula> parse_formula(const std::string& name, std::string* why = nullptr);

/// Standard atomic weight in g/mol, or nullopt for an unknown symbol.
std::optional<double> atomic_weight(const std::string& symbol);

}  // namespace colchem
