// Natural-parameter continuation (homotopy) from a solved problem to a harder one: the
// problems F(x; s) = 0 for s from 0 (x0 solves it) to 1 are solved in turn, the step in s
// halved after a failure and doubled after a success that did not follow a failure (the
// step that just failed at twice the length would most likely fail again; common practice,
// no source) (Allgower and Georg 2003, Introduction to Numerical Continuation Methods,
// SIAM, chapter 1: the embedding and the step control).
// Each step starts from a prediction of x(s + ds) (chapter 2, predictor-corrector methods):
// along the path F(x(s); s) = 0, so J dx/ds = -dF/ds, one linear solve with the Jacobian
// the steady solver factors (path_tangent); the step is taken in ln x,
// x_i(s + ds) = x_i(s) exp(ds (dx_i/ds) / x_i(s)), which keeps densities positive (the
// exponent bounded by max_log_change). Without a tangent the step starts from x(s). The
// ensemble uses it with a member's rate factors raised to the power s, a log-linear path
// from the base network to the member.
#pragma once

#include <functional>
#include <span>
#include <string>
#include <vector>

#include "solve/column_run.hpp"

namespace colchem {

struct ContinuationOptions {
  double first_step = 0.25;      ///< the first step in s
  double min_step = 1.0 / 64.0;  ///< a step halved below this gives up
  /// Bound of |ds (dx_i/ds) / x_i| in a predicted step: a density changes by at most this
  /// factor's exponential (e^4.6 ~ 100; common practice, no source).
  double max_log_change = 4.6;
  /// Step control by the predictor (Allgower and Georg 2003, ch. 6, steplength adaptation):
  /// with a tangent, a step in s is shortened (not below min_step) so that the predicted
  /// change |ds (dx_i/ds) / x_i| of ln x stays below this bound at all but the largest 1 % of
  /// the state's entries above prediction_floor; a longer step would start the solve too far
  /// from its solution (on 40 Pyrene members at 108 cells, 63 of 87 failed attempts had
  /// predicted more than 3 there, against 39 of 108 that converged). 0: no such limit.
  double max_predicted_log_change = 0.0;
  /// Densities below this (cm^-3) do not limit the step: near-empty entries change by
  /// large factors without mattering to the solve (common practice, no source).
  double prediction_floor = 1e3;
};

struct ContinuationStep {
  double s = 0.0;
  bool converged = false;
  long iterations = 0;
};

struct ContinuationResult {
  SolveStatus status = SolveStatus::kNotConverged;  ///< kConverged when s = 1 was solved
  std::string reason;                   ///< why it stopped short of s = 1 (empty otherwise)
  double reached = 0.0;                 ///< the largest s solved (0: none)
  std::vector<double> x;                ///< the state at `reached`
  long iterations = 0;                  ///< over every attempted step
  double residual_norm = 0.0;           ///< the last solve's coupled scaled residual
  std::vector<ContinuationStep> steps;  ///< every attempt, in order
  int tangents = 0;                     ///< tangents computed (one linear solve each)
};

/// Solves the problem at s (started from x) and returns the outcome; `solve(1, x0)` is
/// the target problem.
using ContinuationSolve = std::function<RunOutcome(double s, const std::vector<double>& x)>;

/// dx/ds at a solution x of the problem at s (path_tangent); empty when it cannot be had
/// (then the step starts from x itself).
using ContinuationTangent =
    std::function<std::vector<double>(double s, const std::vector<double>& x)>;

/// The early give-up tests of one attempt's steady solve, for RunControls::give_up, called
/// with (iteration, scaled residual) once per iteration from the attempt's start; a
/// non-empty reason gives the attempt up (a shorter step in s or another start is cheaper
/// than the rest of the iteration limit):
/// - diverged: the residual has risen above `divergence` times its value at the attempt's
///   start (the divergence test of a nonlinear solver; PETSc's SNES stops so at 10^4 by
///   default, Balay et al., PETSc/TAO Users Manual, SNESSetDivergenceTolerance);
/// - stalled: its best value has not fallen below `factor` times its best value of `window`
///   iterations before (a stalled PTC iteration, common practice, no source).
/// Each call returns a fresh test (one per attempt).
std::function<std::string(long, double)> attempt_give_up(long window, double factor,
                                                         double divergence);

/// From s = 0 (x0 its solution) to s = 1 by solve(); stops early on an interrupt. With a
/// tangent, each step starts from the predicted state (one tangent per solved s).
ContinuationResult continue_to_target(std::vector<double> x0, const ContinuationSolve& solve,
                                      const ContinuationOptions& options = {},
                                      const ContinuationTangent& tangent = {});

/// The step in s to try from x (dx/ds its tangent; empty: none): `step`, shortened as
/// ContinuationOptions::max_predicted_log_change says, but not below options.min_step.
double limited_step(std::span<const double> x, std::span<const double> dx_ds, double step,
                    const ContinuationOptions& options);

/// x(s + ds) predicted from x(s) and dx/ds in ln x (see above); densities at zero move
/// linearly and stay non-negative.
std::vector<double> predict_state(std::span<const double> x, std::span<const double> dx_ds,
                                  double ds, double max_log_change);

/// The tangent of the solution path at a solution x of F(x; s) = 0: (shift I - J - J_nl)
/// dx/ds = dF/ds, shift = 1/options.max_pseudo_step_s (the Newton limit), J and J_nl the
/// system's Jacobian at x (the coupling refreshed at x first), rows that the operators
/// hold fixed (find_held_rows with `f`, F at x) unit rows with dx/ds = 0, GMRES to relative
/// tolerance krylov_rtol_min^(1/2) where F is nonlocal. False (and a reason) when the solve
/// fails.
bool path_tangent(const ColumnSystem& system, std::span<const double> x, std::span<const double> f,
                  std::span<const double> dF_ds, const SteadyStateOptions& options,
                  std::vector<double>& dx_ds, std::string& reason);

}  // namespace colchem
