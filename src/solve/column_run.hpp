// Running a column to its coupled steady state or through a transient: the solver chosen
// by the scenario's `solver.method`, driven with the column model's operators, photolysis
// refreshed from the state, injections applied, progress shown, interrupts honoured.
#pragma once

#include <spdlog/logger.h>
#include <functional>
#include <string>
#include <vector>

#include "solve/solver_spec.hpp"
#include "solve/column_model.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

/// What an exact restart needs: the state and where the solver stood when it was taken.
/// Injections are not recorded: those at times before time_s (or at the start time) are in
/// x, the solver applies the others when it crosses them.
struct RunCheckpoint {
  std::string method;   ///< "steady", "transient", "split_steady"
  long iteration = 0;   ///< linear solves (steady) or accepted steps (split) so far
  double time_s = 0.0;  ///< model time of x (split; 0 for steady)
  /// Split: the next time step the integrator would try. Steady: the pseudo-time step of the
  /// last step taken (the restart's first pseudo-time step). 0: unknown (no step taken).
  double step_s = 0.0;
  std::vector<double> x;                 ///< state n[j*S + s]
  std::vector<double> snapshot_times_s;  ///< snapshots already taken (split)
  std::vector<std::vector<double>> snapshots;
};

struct RunControls {
  spdlog::logger* log = nullptr;         ///< progress lines (none when null)
  std::function<bool()> stop_requested;  ///< interrupts
  /// Periodic checkpoints (every solver.checkpoint_every iterations or steps).
  std::function<void(const RunCheckpoint&)> checkpoint;
  /// x0 is a converged state of another grid or variant: a steady solve starts with the
  /// pseudo-time step solver.warm_pseudo_step instead of solver.initial_pseudo_step.
  bool warm_start = false;
  /// Steady solves: called once per iteration with (iteration, scaled residual) before the
  /// step is taken; a non-empty reason stops the solve as not converged with that reason (an
  /// early give-up test; none when empty).
  std::function<std::string(long, double)> give_up;
  /// At most one progress line per this many seconds of wall time (0: every iteration or
  /// step; `--progress-every`).
  double progress_interval_s = 0.2;
};

/// One row of the convergence history, for either solver.
struct HistoryRow {
  long iteration = 0;
  double time_s = 0.0;         ///< model time (transient) or 0
  double step_s = 0.0;         ///< pseudo-time step (steady) or time step (transient)
  double residual_norm = 0.0;  ///< ||F||_s (NaN where not evaluated)
  double change = 0.0;         ///< max relative change of the step (steady) or error estimate
  double wall_s = 0.0;
};

/// One coarser level of a grid-sequenced cold start (solve/solver_spec.hpp).
struct SequenceLevel {
  std::size_t cells = 0;
  long iterations = 0;
  double wall_s = 0.0;
  bool converged = false;
  bool direct_beam = false;  ///< solved with the direct beam for a two-stream scenario
};

/// "27 cells 95 iterations (0.41 s), 54 cells 42 iterations (not converged) (0.52 s)"
/// (" (direct beam)" after the iterations of a level solved with the direct beam):
/// the levels of a sequence for the run summary and the run file (wall times optional).
std::string describe_sequence(const std::vector<SequenceLevel>& levels, bool with_times);

struct RunOutcome {
  SolveStatus status = SolveStatus::kFailed;
  std::string method;  ///< "steady", "transient", "split_steady"
  std::string reason;
  std::vector<double> x;  ///< final state n[j*S + s]
  double time_s = 0.0;    ///< model time of x (transient)
  double step_s = 0.0;    ///< as RunCheckpoint::step_s, for a checkpoint of x
  long iterations = 0;
  double residual_norm = 0.0;  ///< coupled scaled residual of x, always evaluated
  ColumnBalance balance;       ///< column balance of x, always evaluated
  double wall_s = 0.0;
  std::vector<HistoryRow> history;
  std::vector<SequenceLevel> sequence;  ///< coarser levels solved before this grid (if any)
  std::vector<double> snapshot_times_s;
  std::vector<std::vector<double>> snapshots;

  [[nodiscard]] bool ok() const {
    return status == SolveStatus::kConverged || status == SolveStatus::kCompleted;
  }
};

/// Solves the column from x0 with the scenario's solver settings.
RunOutcome run_column(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& controls);

/// Continues a run from its checkpoint (same column and method): the split integrator at the
/// checkpoint's model time with its step, the snapshots already taken kept; the steady
/// solver with the checkpoint's pseudo-time step as its first. Iterations and steps count
/// on from the checkpoint's, against the same limits. Throws RunError(kInternal) if the
/// checkpoint's method or state size does not fit.
RunOutcome continue_column(ColumnModel& model, const SolverSpec& solver, const RunCheckpoint& from,
                           const RunControls& controls);

/// The checkpoint of an outcome (for example an interrupted one).
RunCheckpoint checkpoint_of(const RunOutcome& outcome);

/// "steady", "transient" or "split_steady".
const char* method_name(SolverMethod method);

/// The coupled scaled residual of any state (photolysis refreshed from it first).
double coupled_residual(ColumnModel& model, const SolverSpec& solver, std::span<const double> x,
                        double t = 0.0);

}  // namespace colchem
