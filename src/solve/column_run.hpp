// Running a column to its coupled steady state or through a transient: the solver chosen
// by the scenario's `solver.method`, driven with the column model's operators, photolysis
// refreshed from the state, injections applied, progress shown, interrupts honoured.
#pragma once

#include <functional>
#include <spdlog/logger.h>
#include <string>
#include <vector>

#include "io/solver_section.hpp"
#include "solve/column_model.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

struct RunControls {
  spdlog::logger* log = nullptr;        ///< progress lines (none when null)
  std::function<bool()> stop_requested;  ///< interrupts
  /// Periodic checkpoints: (iteration or step, time, state).
  std::function<void(long, double, const std::vector<double>&)> checkpoint;
};

/// One row of the convergence history, for either solver.
struct HistoryRow {
  long iteration = 0;
  double time_s = 0.0;          ///< model time (transient) or 0
  double step_s = 0.0;          ///< pseudo-time step (steady) or time step (transient)
  double residual_norm = 0.0;   ///< ||F||_s (NaN where not evaluated)
  double change = 0.0;          ///< max relative change of the step (steady) or error estimate
  double wall_s = 0.0;
};

struct RunOutcome {
  SolveStatus status = SolveStatus::kFailed;
  std::string method;            ///< "steady", "transient", "split_steady"
  std::string reason;
  std::vector<double> x;         ///< final state n[j*S + s]
  double time_s = 0.0;           ///< model time of x (transient)
  long iterations = 0;
  double residual_norm = 0.0;    ///< coupled scaled residual of x, always evaluated
  ColumnBalance balance;         ///< column balance of x, always evaluated
  double wall_s = 0.0;
  std::vector<HistoryRow> history;
  std::vector<double> snapshot_times_s;
  std::vector<std::vector<double>> snapshots;

  [[nodiscard]] bool ok() const {
    return status == SolveStatus::kConverged || status == SolveStatus::kCompleted;
  }
};

/// Solves the column from x0 with the scenario's solver settings.
RunOutcome run_column(ColumnModel& model, const SolverSpec& solver, std::vector<double> x0,
                      const RunControls& controls);

/// The coupled scaled residual of any state (photolysis refreshed from it first).
double coupled_residual(ColumnModel& model, const SolverSpec& solver, std::span<const double> x,
                        double t = 0.0);

}  // namespace colchem
