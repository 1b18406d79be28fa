// The chemistry summary `colchem check` prints.
#pragma once

#include <string>

#include "chem/mechanism.hpp"

namespace colchem {

/// Modules, what each adds (species, reactions; the reactions themselves when verbose),
/// parameters, exchanges and the element-balance result.
std::string summarize_chemistry(const Mechanism& mech, const ChemistrySpec& spec, bool verbose);

}  // namespace colchem
