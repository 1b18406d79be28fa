// Operator-split time integration of dn/dt = A(n) + B(n), A = transport, B = chemistry.
//
// Strang splitting (Strang 1968; Hundsdorfer and Verwer 2003, ch. IV):
//   n(t + dt) ~ S_A(dt/2) S_B(dt) S_A(dt/2) n(t),
// each sub-step by the operator's own ColumnOperator::implicit_step; photolysis is refreshed
// (callback) from the state entering the chemistry step. The scheme is second order in dt;
// its local error is O(dt^3), and its fixed point (a split "steady state") differs from the
// coupled steady state by O(dt^2). The result therefore always carries the coupled scaled
// residual ||F||_s (residual_norm.hpp) of the end state.
//
// Step size: fixed, or adaptive by step doubling: one step of dt against two of dt/2, error
// e = max_i |n2_i - n1_i| / (rtol (|n2_i| + a_s)); accept n2 when e <= 1, next
// dt = dt * clamp(0.9 e^(-1/3), 0.2, 5) (local error ~ dt^3; common practice, no source).
// A rejected step (e > 1, or an implicit_step that fails) is retried at dt/2. Steps are
// shortened to land exactly on output times and breakpoints (for example injection times).
#pragma once

#include <functional>
#include <limits>
#include <string>
#include <vector>

#include "solve/column_system.hpp"
#include "solve/residual_norm.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

struct SplitSnapshot {
  double time_s = 0.0;
  std::vector<double> x;
};

struct SplitOptions {
  double start_s = 0.0;
  double end_s = 0.0;
  double step_s = 3600.0;            ///< fixed step, or the first adaptive step
  bool adaptive = true;
  double relative_tolerance = 1e-3;  ///< rtol of the step-doubling estimate
  double min_step_s = 1e-6;          ///< below this a run fails
  double max_step_s = std::numeric_limits<double>::infinity();
  std::vector<double> output_times_s;  ///< snapshots, hit exactly
  std::vector<double> breakpoints_s;   ///< hit exactly, no snapshot (injection times)
  bool to_steady_state = false;        ///< stop when ||F||_s < steady_tolerance
  double steady_tolerance = 1e-8;
  int steady_check_every = 1;          ///< accepted steps between residual checks
  long max_steps = 10000000;           ///< on the step count, steps_before included
  int checkpoint_every = 0;            ///< accepted steps between checkpoints (0: never)
  long steps_before = 0;               ///< accepted steps of the run this one continues
  std::vector<SplitSnapshot> snapshots_before;  ///< its snapshots (kept in the result)
  ResidualScale scale;
};

struct SplitStepRecord {
  long step = 0;              ///< accepted steps so far
  double time_s = 0.0;        ///< after the step
  double step_s = 0.0;        ///< dt of the step
  double error = 0.0;         ///< step-doubling estimate e (0 for fixed steps)
  double residual_norm = std::numeric_limits<double>::quiet_NaN();  ///< when checked
  double wall_s = 0.0;
};

struct SplitResult;

struct SplitCallbacks {
  /// Called with (state, time) before each chemistry sub-step (photolysis rates).
  std::function<void(const std::vector<double>&, double)> refresh;
  /// Polled once per step; true stops with status kInterrupted.
  std::function<bool()> stop_requested;
  /// Called after each accepted step with (t_from, t_to, state); the state may be changed
  /// (an injection scheduled at t_inj is applied when t_from < t_inj <= t_to: once).
  std::function<void(double, double, std::vector<double>&)> on_time_crossed;
  /// Called after each accepted step (progress display).
  std::function<void(const SplitStepRecord&)> on_step;
  /// Called every checkpoint_every accepted steps with the run so far (steps, time_s, x,
  /// snapshots; status and residual not yet set) and the next step the integrator will try.
  std::function<void(const SplitResult&, double)> checkpoint;
};

struct SplitResult {
  SolveStatus status = SolveStatus::kFailed;
  std::string reason;
  std::vector<double> x;          ///< state at time_s
  double time_s = 0.0;
  long steps = 0;                 ///< accepted (steps_before included)
  long rejected_steps = 0;
  double next_step_s = 0.0;       ///< the step the integrator would try next (a restart's)
  double residual_norm = 0.0;     ///< coupled ||F||_s of x, always evaluated
  std::vector<SplitSnapshot> snapshots;
  std::vector<SplitStepRecord> history;
  double wall_s = 0.0;
};

class SplitIntegrator {
 public:
  /// `transport` and `chemistry` are not owned; together they are the whole right-hand side.
  SplitIntegrator(ColumnOperator& transport, ColumnOperator& chemistry, std::size_t cells,
                  std::size_t species, SplitOptions options);

  /// Integrates from x0 at options.start_s. Never throws for a failed or interrupted run.
  SplitResult run(std::vector<double> x0, const SplitCallbacks& cb = {}) const;

  /// One Strang step of dt from t (false if a sub-step failed; x is then unspecified).
  bool strang_step(std::vector<double>& x, double t, double dt, const SplitCallbacks& cb) const;

  [[nodiscard]] const ColumnSystem& system() const { return system_; }

 private:
  /// One attempt at a step of dt from x: x1 gets the result; with adaptive steps x2 the
  /// two half steps, err the step-doubling estimate, and the attempt fails where err > 1
  /// (on success x1 holds the two half steps).
  bool try_step(const std::vector<double>& x, double t, double dt, const SplitCallbacks& cb,
                std::vector<double>& x1, std::vector<double>& x2, double& err) const;
  ColumnOperator& transport_;
  ColumnOperator& chemistry_;
  ColumnSystem system_;
  SplitOptions options_;
};

}  // namespace colchem
