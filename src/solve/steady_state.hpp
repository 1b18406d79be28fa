// Coupled steady state of the column: F(x) = sum_k f_k(x) = 0 for all species and cells.
//
// Pseudo-transient continuation (Kelley and Keyes 1998, SIAM J. Numer. Anal. 35, 508):
//   (I/dtau_k - J(x_k)) dx_k = F(x_k),   x_{k+1} = x_k + lambda_k dx_k
// with switched evolution relaxation (SER; Coffey, Kelley and Keyes 2003, SIAM J. Sci.
// Comput. 25, 553) for the pseudo-time step:
//   dtau_{k+1} = dtau_k * clamp(g * ||F_{k-1}||_s / ||F_k||_s, 1/2, 10),
// g = growth_increment (> 1 so that a stalled residual still lengthens the step), and
// dtau = max_pseudo_step_s (Newton's method) once ||F||_s < newton_switch. If a Newton jump
// makes the residual grow, dtau returns to half its value before the jump.
// Positivity, per density (no global damping by default, min_damping = 1): where the linear
// update n_i + dx_i would fall below f n_i (f = positivity_fraction), the density becomes
// n_i min(f, exp(dx_i / n_i)), the step of Newton's method in ln n_i, bounded by f n_i, so
// that densities stay positive and one titrated away falls many decades in one step; a
// step that limits a density above a_s caps the next dtau at clipped_growth (default 2)
// times this one when the residual did not rise over that step, and at min_growth times
// this one when it rose: the clip bounds the growth, the residual decides it. A step that
// changed no density by more than change_target (max|dx|/(|x| + a_s)) and clipped none lets
// dtau grow by up to
// min(max_change_growth, change_target / change) even where the residual stalls (unless it
// rose by more than 1/min_growth): the early steps of a cold start and the start from an
// interpolated state change the state little while the scaled residual, set by the slowest
// cells, stays put (common practice in step-size control, no source). A non-finite
// residual after a step undoes the step and divides dtau by 10 (the fast growth then
// stops at half the undone dtau); dtau below
// min_pseudo_step_s is a failure ("pseudo-time step collapsed").
// Converged: ||F||_s < tolerance (residual_norm.hpp) AND the last step was a full Newton
// step (dtau = max_pseudo_step_s) whose relative change max|dx|/(|x| + a_s) was below
// step_tolerance, and the acceptance test of the caller (reject_reason) finds nothing wrong.
//
// Nonlocal coupling (photolysis): the system's coupling is refreshed at x_k before F and J
// are evaluated, so F(x_k) is exact, and the linear system holds the full Jacobian: J_bt +
// J_nl, solved by GMRES right-preconditioned with the LU of I/dtau - J_bt (Knoll and Keyes
// 2004, J. Comput. Phys. 193, 357; ptc_linear_solver.hpp). The GMRES tolerance is the
// forcing term eta_k = min(krylov_rtol_max, max(krylov_rtol_min, ||F_k||_s)) of an inexact
// Newton method (Dembo, Eisenstat and Steihaug 1982, SIAM J. Numer. Anal. 19, 400): with
// eta_k = O(||F_k||) the end phase converges quadratically.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "solve/column_system.hpp"
#include "solve/residual_norm.hpp"

namespace colchem {

/// kCompleted: a transient run reached its end time (no steady state asked for).
enum class SolveStatus { kConverged, kCompleted, kNotConverged, kFailed, kInterrupted };

/// "converged", "completed", "not_converged", "failed", "interrupted".
const char* to_string(SolveStatus s);

struct SteadyStateOptions {
  double tolerance = 1e-8;       ///< on ||F||_s (dimensionless)
  double step_tolerance = 1e-6;  ///< on max|dx|/(|x| + a_s) of the last step
  int max_iterations = 200;      ///< linear solves
  double initial_pseudo_step_s = 1e-6;
  double max_pseudo_step_s = 1e16;   ///< the Newton limit
  double min_pseudo_step_s = 1e-14;  ///< below this the solve fails
  double growth_increment = 2.0;     ///< g in the SER formula
  double max_growth = 10.0;
  double min_growth = 0.5;
  double newton_switch = 1e-6;       ///< ||F||_s below which dtau = max_pseudo_step_s
  double change_target = 1.0;        ///< relative change below which dtau may grow fast
  double max_change_growth = 100.0;  ///< bound of that growth per step
  double clipped_growth = 2.0;       ///< bound of dtau growth after a clipped step whose
                                     ///< residual did not rise (one that rose: min_growth)
  double positivity_fraction = 0.1;  ///< f: x_new >= f x_old
  double min_damping = 1.0;          ///< lower bound of the global damping lambda (1: none)
  double time_s = 0.0;               ///< the t handed to the operators
  int checkpoint_every = 0;          ///< iterations between checkpoint calls (0: never)
  double krylov_rtol_max = 1e-3;     ///< upper bound of the GMRES forcing term
  double krylov_rtol_min = 1e-12;    ///< lower bound of the GMRES forcing term
  ResidualScale scale;
};

struct SteadyIteration {
  int iteration = 0;
  double pseudo_step_s = 0.0;        ///< dtau of the step taken from this state (0: none)
  double residual_norm = 0.0;        ///< ||F||_s at this state
  double max_relative_change = 0.0;  ///< of the step that led here (inf for the first)
  double damping = 1.0;              ///< lambda of the step taken from this state
  double wall_s = 0.0;               ///< since the start of solve()
  std::size_t worst_cell = 0;        ///< where ||F||_s is attained
  std::size_t worst_species = 0;
  int krylov_iterations = 0;     ///< GMRES iterations of the step taken from this state
  std::size_t changed_cell = 0;  ///< where the step that led here changed most (relative)
  std::size_t changed_species = 0;
  bool clipped = false;  ///< that step hit the positivity limit for a non-negligible density
};

struct SteadyStateCallbacks {
  /// Called with the current state before each iteration (observers; the physics of the
  /// state, such as photolysis rates, is the system's NonlocalCoupling).
  std::function<void(const std::vector<double>&)> on_state;
  /// Called when the residual and step tests pass: a non-empty reason refuses to call the
  /// state converged (a mole fraction above 1, a column budget that does not close), and
  /// Newton steps go on.
  std::function<std::string(const std::vector<double>&)> reject_reason;
  /// Polled once per iteration; true stops with status kInterrupted.
  std::function<bool()> stop_requested;
  /// Called with each iteration's record before its step is taken (after the convergence
  /// test): a non-empty reason stops the solve with status kNotConverged and that reason
  /// (a caller's early give-up test, such as a stagnating residual).
  std::function<std::string(const SteadyIteration&)> give_up;
  /// Called after each residual evaluation (progress display).
  std::function<void(const SteadyIteration&)> on_iteration;
  /// Called every checkpoint_every iterations with (iteration, pseudo-time step of the step
  /// just taken, state); a restart passes that step as initial_pseudo_step_s.
  std::function<void(int, double, const std::vector<double>&)> checkpoint;
};

struct SteadyStateResult {
  SolveStatus status = SolveStatus::kFailed;
  std::string reason;          ///< why it stopped, in words
  std::vector<double> x;       ///< the final (or current) state
  int iterations = 0;          ///< linear solves performed
  int rejected_steps = 0;      ///< steps undone (non-finite residual, failed solve)
  double residual_norm = 0.0;  ///< ||F||_s of x
  double max_relative_change = 0.0;
  std::vector<SteadyIteration> history;
  double wall_s = 0.0;
  double evaluate_s = 0.0;      ///< operators' tendency + Jacobian
  double assembly_s = 0.0;      ///< PETSc matrix assembly
  double factor_solve_s = 0.0;  ///< LU factorisation + triangular solves + GMRES
  int krylov_iterations = 0;    ///< GMRES iterations over the whole solve

  [[nodiscard]] bool converged() const { return status == SolveStatus::kConverged; }
};

/// held[i] = 1 where row i is held fixed: the operators give it neither tendency (f) nor
/// Jacobian entries (jac); 0 elsewhere. held has jac's size.
void find_held_rows(const BlockTridiagonal& jac, std::span<const double> f,
                    std::vector<char>& held);

class SteadyStateSolver {
 public:
  SteadyStateSolver(ColumnSystem system, SteadyStateOptions options = {});

  /// Runs PTC from x0. Never throws for non-convergence: the status says what happened.
  /// PETSc failures other than a failed factorisation throw RunError.
  SteadyStateResult solve(std::vector<double> x0, const SteadyStateCallbacks& cb = {}) const;

  [[nodiscard]] const SteadyStateOptions& options() const { return options_; }

 private:
  ColumnSystem system_;
  SteadyStateOptions options_;
};

}  // namespace colchem
