// Natural-parameter continuation (homotopy) from a solved problem to a harder one: the
// problems F(x; s) = 0 for s from 0 (x0 solves it) to 1 are solved in turn, each started
// from the last converged x, the step in s doubled after a success and halved after a
// failure (Allgower and Georg 2003, Introduction to Numerical Continuation Methods, SIAM,
// chapter 1: the embedding and the step control). The ensemble uses it with a member's rate
// factors raised to the power s, a log-linear path from the base network to the member.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "solve/column_run.hpp"

namespace colchem {

struct ContinuationOptions {
  double first_step = 0.25;      ///< the first step in s
  double min_step = 1.0 / 64.0;  ///< a step halved below this gives up
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
};

/// Solves the problem at s (started from x) and returns the outcome; `solve(1, x0)` is
/// the target problem.
using ContinuationSolve = std::function<RunOutcome(double s, const std::vector<double>& x)>;

/// From s = 0 (x0 its solution) to s = 1 by solve(); stops early on an interrupt.
ContinuationResult continue_to_target(std::vector<double> x0, const ContinuationSolve& solve,
                                      const ContinuationOptions& options = {});

}  // namespace colchem
