// Unit strings ("92 bar", "5 km", "cm2 s-1") parsed and converted by UDUNITS-2, so configs
// and table headers may use any unit people mix (bar, mbar, Pa, m, km, ...).
#pragma once

#include <memory>
#include <optional>
#include <string>

namespace colchem {

/// Owns one UDUNITS-2 unit system (read once from the database Debian ships).
/// Not thread-safe; create one per thread if ever needed.
class UnitSystem {
 public:
  UnitSystem();
  ~UnitSystem();
  UnitSystem(const UnitSystem&) = delete;
  UnitSystem& operator=(const UnitSystem&) = delete;

  /// True if `unit` parses.
  [[nodiscard]] bool parses(const std::string& unit) const;

  /// Factor f such that value_in_target = f * value_in_unit + offset; nullopt when the units
  /// do not parse or are not convertible (different dimensions).
  [[nodiscard]] std::optional<double> convert(double value, const std::string& from_unit,
                                              const std::string& to_unit) const;

  /// True when both parse and are convertible.
  [[nodiscard]] bool convertible(const std::string& a, const std::string& b) const;

  /// A respelling of `unit` in other letter cases that UDUNITS-2 parses and converts to
  /// `target` ("AU" -> "au", "KM" -> "km", "PA" -> "Pa", "hPA" -> "hPa"), the one with the
  /// fewest changed letters; nullopt when `unit` already converts or no respelling does.
  /// Candidates are tested against the unit database itself (no table of spellings).
  [[nodiscard]] std::optional<std::string> case_respelling(const std::string& unit,
                                                           const std::string& target) const;

 private:
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

/// A number and a unit split from text such as "92 bar" or "-3.5e2 km". The unit may be
/// empty ("1.5").
struct QuantityText {
  double value = 0.0;
  std::string unit;
};

/// Splits the text; nullopt if it does not start with a number.
std::optional<QuantityText> split_quantity(const std::string& text);

/// True when `unit` converts linearly to `ref`. UDUNITS-2 also "converts" reciprocal units
/// (nm to cm-1 by inversion), which must not pass for a change of unit.
bool same_dimension(const UnitSystem& units, const std::string& unit, const std::string& ref);

}  // namespace colchem
