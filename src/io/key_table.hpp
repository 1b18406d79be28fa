// Key tables: a flat section of a configuration (solver, box, ...) read from one row per key
// (key, target field, unit, bounds, messages) instead of hand-written per-key code. A key
// left out keeps the target's initial value, so the defaults are the spec struct's own
// (solve/solver_spec.hpp, ...). Errors name file, line, key, expected and found.
#pragma once

#include <cstddef>
#include <limits>
#include <optional>
#include <span>
#include <string>
#include <utility>
#include <variant>

#include "core/units.hpp"

namespace colchem {

class ConfigNode;

struct Key {
  /// Where the value goes: a number or quantity (double, or an optional override), a count
  /// (int, size_t), a flag (bool, or an optional override).
  using Target = std::variant<double*, std::optional<double>*, int*, std::size_t*, bool*,
                              std::optional<bool>*>;
  const char* key;
  Target target;
  /// Target unit of a quantity ("92 bar"); nullptr for a bare number, a count or a flag.
  const char* unit = nullptr;
  const char* example = "";
  double lo = -std::numeric_limits<double>::infinity();
  double hi = std::numeric_limits<double>::infinity();
  bool lo_open = false;  ///< lo itself refused: (lo, hi] instead of [lo, hi]
  bool hi_open = false;  ///< hi itself refused
  /// The expected value when out of bounds. Empty: "a positive number", "a positive value
  /// such as '<example>'" or "an integer from lo to hi", from the row.
  std::string expected = {};
  /// The expected value when above hi, when it differs from `expected`.
  std::string expected_above = {};
  bool required = false;

  /// Refuses lo itself: (lo, hi] instead of [lo, hi].
  Key& above_lo() {
    lo_open = true;
    return *this;
  }
  /// Refuses hi itself.
  Key& below_hi() {
    hi_open = true;
    return *this;
  }
  /// A separate message for values above hi.
  Key& above_message(std::string text) {
    expected_above = std::move(text);
    return *this;
  }
  /// The key must be present.
  Key& needed() {
    required = true;
    return *this;
  }
};

/// Reads every row's key of `n` in table order (missing keys keep their targets' values;
/// a missing required key is an error). It does not call n.done(): the caller reads its
/// other keys first.
void read_keys(const ConfigNode& n, const UnitSystem& units, std::span<const Key> keys);

/// A quantity in `unit` within [lo, hi]; `expected` is the message when outside.
inline Key quantity(const char* key, Key::Target target, const char* unit, const char* example,
                    double lo, double hi, std::string expected) {
  return {.key = key,
          .target = target,
          .unit = unit,
          .example = example,
          .lo = lo,
          .hi = hi,
          .expected = std::move(expected)};
}

/// A bare number, or an integer, within [lo, hi], with its own message.
inline Key number(const char* key, Key::Target target, double lo, double hi,
                  std::string expected = {}) {
  return {.key = key, .target = target, .lo = lo, .hi = hi, .expected = std::move(expected)};
}

/// An integer from lo to hi (the message "an integer from lo to hi" unless given).
template <class Int>
Key count(const char* key, Int* target, double lo, double hi, std::string expected = {}) {
  return number(key, target, lo, hi, std::move(expected));
}

/// A positive quantity (0, inf) in `unit`, or a positive bare number without one.
inline Key positive(const char* key, Key::Target target, const char* unit = nullptr,
                    const char* example = "") {
  return {
      .key = key, .target = target, .unit = unit, .example = example, .lo = 0.0, .lo_open = true};
}

/// A flag (true/false).
inline Key flag(const char* key, Key::Target target) {
  return {.key = key, .target = target};
}

}  // namespace colchem
