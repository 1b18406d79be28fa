// SolverSpec -> solver options: see solver_options.hpp.
#include "solve/solver_options.hpp"


namespace colchem {

namespace {
ResidualScale scale_of(const SolverSpec& s) {
  ResidualScale r;
  r.reference_time_s = s.reference_time_s;
  r.absolute_density_cm3 = s.absolute_density_cm3;
  return r;
}
}  // namespace

SteadyStateOptions steady_options(const SolverSpec& spec) {
  SteadyStateOptions o;
  o.tolerance = spec.tolerance;
  o.step_tolerance = spec.step_tolerance;
  o.max_iterations = spec.max_iterations;
  o.initial_pseudo_step_s = spec.initial_pseudo_step_s;
  o.max_pseudo_step_s = spec.max_pseudo_step_s;
  o.positivity_fraction = spec.positivity_fraction;
  o.checkpoint_every = spec.checkpoint_every;
  o.scale = scale_of(spec);
  return o;
}

SplitOptions split_options(const SolverSpec& spec) {
  SplitOptions o;
  const TransientSpec& t = spec.transient;
  o.start_s = 0.0;
  o.end_s = t.end_s;
  o.step_s = t.step_s;
  o.adaptive = t.adaptive;
  o.relative_tolerance = t.relative_tolerance;
  o.min_step_s = t.min_step_s;
  o.max_step_s = t.max_step_s;
  o.output_times_s = t.output_times_s;
  o.to_steady_state = spec.method == SolverMethod::kSplitSteady;
  o.steady_tolerance = spec.tolerance;
  o.steady_check_every = t.steady_check_every;
  o.checkpoint_every = spec.checkpoint_every;
  o.scale = scale_of(spec);
  return o;
}

}  // namespace colchem
