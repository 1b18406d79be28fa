// Reader of the scenario's `solver:` section into SolverSpec (solve/solver_spec.hpp); its keys
// are the key table in solver_section.cpp.
#pragma once

#include "core/units.hpp"
#include "solve/solver_spec.hpp"

namespace colchem {

class ConfigNode;

/// Reads `solver:`; every bad value is an InputError naming file, line and key.
SolverSpec load_solver_section(const ConfigNode& n, const UnitSystem& units);

}  // namespace colchem
