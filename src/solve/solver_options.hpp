// From the scenario's SolverSpec (io/solver_section.hpp) to the solvers' option structs.
#pragma once

#include "io/solver_section.hpp"
#include "solve/split_integrator.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

SteadyStateOptions steady_options(const SolverSpec& spec);
/// split_steady sets to_steady_state; transient runs to the end time.
SplitOptions split_options(const SolverSpec& spec);

}  // namespace colchem
