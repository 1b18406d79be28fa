// The shared amount readers (io/amount.hpp).
#include "io/amount.hpp"

#include <fmt/format.h>

#include <cmath>
#include <vector>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/config_node.hpp"

namespace colchem {

namespace {

/// The units each kind accepts, in order, and the factor to the kind's canonical unit.
struct KindUnit {
  AmountKind kind;
  const char* unit;
  double factor;
};
const KindUnit kKindUnits[] = {
    {AmountKind::kFraction, "1", 1.0},
    {AmountKind::kDensity, "cm-3", 1.0},
    {AmountKind::kMass, "g", 1.0},
    {AmountKind::kMolecules, "mol", constants::kAvogadro},
    {AmountKind::kColumn, "mol cm-2", constants::kAvogadro},
    {AmountKind::kColumn, "cm-2", 1.0},
};
const char* const kKindNames[] = {"dimensionless", "a density", "a mass", "an amount of substance",
                                  "a column"};

/// The value of q in the kind's canonical unit, when its unit fits the kind.
std::optional<double> as_kind(const QuantityText& q, AmountKind kind, const UnitSystem& units) {
  for (const KindUnit& k : kKindUnits) {
    if (k.kind != kind) continue;
    if (auto v = units.convert(q.value, q.unit, k.unit)) return *v * k.factor;
  }
  return std::nullopt;
}

/// Why a unit fits none of the kinds: "(unknown unit)", "(not dimensionless)", "(none of:
/// dimensionless, a density)".
std::string mismatch(const UnitSystem& units, const std::string& unit,
                     std::initializer_list<AmountKind> kinds) {
  if (!units.parses(unit)) return "(unknown unit)";
  std::vector<std::string> names;
  for (const AmountKind k : kinds) names.emplace_back(kKindNames[static_cast<int>(k)]);
  if (kinds.size() == 1) return "(not " + names[0] + ")";
  return fmt::format("(none of: {})", fmt::join(names, ", "));
}

}  // namespace

Amount read_amount(const ConfigNode& n, const UnitSystem& units,
                   std::initializer_list<AmountKind> kinds, const std::string& expected) {
  const std::string s = n.text();
  const auto q = split_quantity(s);
  if (!q) n.fail(expected);
  if (q->unit.empty()) return Amount{*kinds.begin(), q->value};
  for (const AmountKind k : kinds) {
    if (auto v = as_kind(*q, k, units)) return Amount{k, *v};
  }
  n.fail(expected, "'" + s + "' " + mismatch(units, q->unit, kinds));
}

double read_mixing_ratio(const ConfigNode& n, const UnitSystem& units) {
  const std::string s = n.text();
  if (!split_quantity(s))
    n.fail("a mixing ratio: a number from 0 to 1 or a quantity such as '3 ppm'");
  const double v = read_amount(n, units, {AmountKind::kFraction},
                               "a dimensionless mixing ratio such as '3 ppm' or '1e-6'")
                       .value;
  if (!(v >= 0.0 && v <= 1.0)) n.fail("a mixing ratio from 0 to 1", "'" + s + "'");
  return v;
}

std::map<std::string, double> read_bulk_composition(const ConfigNode& n) {
  std::map<std::string, double> out;
  double sum = 0.0;
  for (const auto& [gas, value] : n.entries()) {
    const double x = value.number();
    if (!(x > 0.0 && x <= 1.0)) value.fail("a mole fraction in (0, 1]");
    out[gas] = x;
    sum += x;
  }
  if (out.empty()) n.fail("at least one bulk gas with its mole fraction");
  if (std::abs(sum - 1.0) > 1e-3) {
    n.fail("mole fractions summing to 1 (within 0.001)", "a sum of " + message_number(sum));
  }
  return out;
}

}  // namespace colchem
