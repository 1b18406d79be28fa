// From the scenario's SolverSpec (solve/solver_spec.hpp) to the solvers' option structs.
#pragma once

#include "solve/solver_spec.hpp"
#include "solve/split_integrator.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

SteadyStateOptions steady_options(const SolverSpec& spec);
/// split_steady sets to_steady_state; transient runs to the end time.
SplitOptions split_options(const SolverSpec& spec);

}  // namespace colchem
