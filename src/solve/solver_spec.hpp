// The solver settings of a scenario (its `solver:` section, read by io/solver_section.cpp) (keys
// documented in README.md, section What the model computes).
//
//   solver:
//     method: steady            # steady | transient | split_steady
//     tolerance: 1e-8           # scaled coupled residual ||F||_s (dimensionless)
//     step_tolerance: 1e-6      # max |dx|/(|x| + a) of the last Newton step
//     max_iterations: 200
//     initial_pseudo_step: 1e-6 s
//     warm_pseudo_step: 1e8 s   # first step from a converged state of another grid or variant
//     max_pseudo_step: 1e16 s
//     reference_time: 1e10 s    # t_ref of the scaled norm
//     absolute_density: 1 cm-3  # a of the scaled norm and of relative changes
//     positivity_fraction: 0.1
//     checkpoint_every: 50      # iterations (steady) or accepted steps (split)
//     grid_sequencing: true     # cold steady starts solved first on coarser grids
//     coarsest_cells: 24
//     sequence_tolerance: 1e-3  # scaled residual at which a coarser level stops
//     transient:
//       end: 30 day
//       step: 1 h               # fixed step, or the first adaptive one
//       adaptive: true
//       relative_tolerance: 1e-3
//       min_step: 1e-6 s
//       max_step: 10 day
//       outputs: [1 day, 10 day]  # or "[1, 10] day", or output_count: 10
//       steady_check_every: 1
#pragma once

#include <cstddef>

#include <limits>
#include <vector>

namespace colchem {

enum class SolverMethod { kSteady, kTransient, kSplitSteady };

struct TransientSpec {
  double end_s = 30.0 * 86400.0;
  double step_s = 3600.0;
  bool adaptive = true;
  double relative_tolerance = 1e-3;
  double min_step_s = 1e-6;
  double max_step_s = std::numeric_limits<double>::infinity();
  std::vector<double> output_times_s;  ///< explicit list, or filled from output_count
  int output_count = 0;                ///< evenly spaced outputs over (0, end]
  int steady_check_every = 1;
};

struct SolverSpec {
  SolverMethod method = SolverMethod::kSteady;
  double tolerance = 1e-8;
  double step_tolerance = 1e-6;
  int max_iterations = 200;
  double initial_pseudo_step_s = 1e-6;
  /// The first pseudo-time step of a solve that starts from a converged state (a coarser
  /// level of a grid sequence, another grid's run given to --restart, a sweep's finished
  /// variant): such a state is out of balance only where the grid or the parameters
  /// differ, so the solve need not climb from the cold start's 1e-6 s.
  double warm_pseudo_step_s = 1e8;
  double max_pseudo_step_s = 1e16;
  double reference_time_s = 1e10;
  double absolute_density_cm3 = 1.0;
  double positivity_fraction = 0.1;
  double balance_tolerance = 1e-8;  ///< on the column balance B (solve/column_model.hpp)
  int checkpoint_every = 0;
  /// Grid sequencing of a steady cold start: solve first on grids of about half, a quarter,
  /// ... the cells (every other edge dropped), down to at least coarsest_cells, each level
  /// started from the one below, the finest from the last (Knoll and Keyes 2004, J. Comput.
  /// Phys. 193, 357, section 4.4, "mesh sequencing"). Not for restarts or transients.
  bool grid_sequencing = true;
  std::size_t coarsest_cells = 24;
  /// The scaled residual at which a coarser level of the sequence stops (its step and
  /// column-balance tests are waived there). A coarser level only gives the next one its
  /// start, and interpolating it to twice the cells leaves a scaled residual of order 1
  /// (the discretisation difference between the grids), so polishing it to `tolerance`
  /// buys nothing: nested iteration solves each coarse level to its discretisation error
  /// only (Briggs, Henson and McCormick 2000, A Multigrid Tutorial, 2nd ed., ch. 3, "full
  /// multigrid"). The requested grid is always solved to `tolerance`.
  double sequence_tolerance = 1e-3;
  TransientSpec transient;
};

}  // namespace colchem
