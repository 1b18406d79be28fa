// The shared readers of amounts: one quantity that may be given in several kinds of unit
// (a mixing ratio or a density, a mass or a number of molecules, ...) and a bulk
// composition (gas -> mole fraction). Every loader that reads such a value uses these.
#pragma once

#include <initializer_list>
#include <map>
#include <string>

#include "core/units.hpp"

namespace colchem {

class ConfigNode;

/// The kinds an amount can have, each converted to its canonical unit.
enum class AmountKind {
  kFraction,   ///< mixing ratio, dimensionless ("1e-6", "3 ppm", "1 %")
  kDensity,    ///< cm^-3
  kMass,       ///< g
  kMolecules,  ///< a number of molecules (an amount of substance times N_A)
  kColumn,     ///< cm^-2 (a column in mol cm-2 times N_A)
};

struct Amount {
  AmountKind kind;
  double value;  ///< in the kind's canonical unit
};

/// Reads "number [unit]" as the first of `kinds` whose unit it converts to; a bare number is
/// the first kind. `expected` describes the accepted forms for the error message (found: the
/// text, with "(unknown unit)" when UDUNITS-2 does not know the unit).
Amount read_amount(const ConfigNode& n, const UnitSystem& units,
                   std::initializer_list<AmountKind> kinds, const std::string& expected);

/// A mixing ratio in [0, 1]: a plain number or a dimensionless quantity such as "3 ppm".
double read_mixing_ratio(const ConfigNode& n, const UnitSystem& units);

/// `bulk_composition: {GAS: mole fraction, ...}`: at least one gas, each fraction in (0, 1],
/// summing to 1 within 0.001.
std::map<std::string, double> read_bulk_composition(const ConfigNode& n);

}  // namespace colchem
