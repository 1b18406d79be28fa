// Key tables (io/key_table.hpp).
#include "io/key_table.hpp"

#include <fmt/format.h>

#include "io/config_node.hpp"

namespace colchem {

namespace {

std::string expected_text(const Key& k, bool integer) {
  if (!k.expected.empty()) return k.expected;
  if (integer)
    return fmt::format("an integer from {} to {}", static_cast<long>(k.lo),
                       static_cast<long>(k.hi));
  if (k.unit != nullptr) return std::string("a positive value such as '") + k.example + "'";
  return "a positive number";
}

void check(const ConfigNode& n, const Key& k, double v, bool integer) {
  const bool low = k.lo_open ? !(v > k.lo) : !(v >= k.lo);
  const bool high = k.hi_open ? !(v < k.hi) : !(v <= k.hi);
  if (high && !low && !k.expected_above.empty()) n.fail(k.expected_above);
  if (low || high) n.fail(expected_text(k, integer));
}

void read_key(const ConfigNode& n, const UnitSystem& units, const Key& k) {
  if (auto* b = std::get_if<bool*>(&k.target)) {
    **b = n.boolean();
    return;
  }
  if (auto* ob = std::get_if<std::optional<bool>*>(&k.target)) {
    **ob = n.boolean();
    return;
  }
  const bool real = std::holds_alternative<double*>(k.target) ||
                    std::holds_alternative<std::optional<double>*>(k.target);
  if (real) {
    const double v = k.unit != nullptr ? n.quantity(units, k.unit, k.example) : n.number();
    check(n, k, v, false);
    if (auto* d = std::get_if<double*>(&k.target)) {
      **d = v;
    } else {
      *std::get<std::optional<double>*>(k.target) = v;
    }
    return;
  }
  const long v = n.integer();
  check(n, k, static_cast<double>(v), true);
  if (auto* i = std::get_if<int*>(&k.target)) {
    **i = static_cast<int>(v);
  } else {
    *std::get<std::size_t*>(k.target) = static_cast<std::size_t>(v);
  }
}

}  // namespace

void read_keys(const ConfigNode& n, const UnitSystem& units, std::span<const Key> keys) {
  for (const Key& k : keys) {
    if (k.required) {
      read_key(n.child(k.key), units, k);
    } else if (auto v = n.find(k.key)) {
      read_key(*v, units, k);
    }
  }
}

}  // namespace colchem
