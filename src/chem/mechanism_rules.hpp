// The rules a mechanism obeys beyond the syntax of its file (README.md, "Mechanism files"):
// element balance, the shape of a rate law against its equation, reaction ids, module
// requirements. Each returns what is wrong (empty when nothing is) and leaves the message's
// place (file, line, key) to the reader that knows it.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "chem/mechanism.hpp"

namespace colchem {

/// A reaction id: a letter, then up to 31 letters, digits, '_', '.' or '-' (short enough for
/// a table column; common practice, no source).
inline constexpr std::size_t kMaxReactionIdLength = 32;
bool is_reaction_id(const std::string& id);

/// The elements rx does not balance, as "O -2, S +1" (products minus reactants; hv and M
/// carry no atoms); empty when balanced.
std::string element_imbalance(const Mechanism& m, const Reaction& rx);

/// What the rate law lacks for the equation (photolysis with hv and only then, one reactant
/// for first_order, "+ M" for a fall-off form), as the expected text; empty when it fits.
std::string rate_shape_problem(const Reaction& rx);

/// The first cycle of module requirements as module indices (first = last), empty if none.
std::vector<std::size_t> requirement_cycle(const Mechanism& m);

/// The first (module, required module) pair with the module in `active` and its requirement
/// not; nullopt when every requirement of an active module is active.
std::optional<std::pair<std::size_t, std::size_t>> missing_requirement(
    const Mechanism& m, const std::vector<std::size_t>& active);

}  // namespace colchem
