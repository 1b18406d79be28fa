#include "solve/continuation.hpp"

#include <fmt/format.h>
#include <algorithm>

namespace colchem {

ContinuationResult continue_to_target(std::vector<double> x0, const ContinuationSolve& solve,
                                      const ContinuationOptions& options) {
  ContinuationResult out;
  out.x = std::move(x0);
  double step = options.first_step;
  while (out.reached < 1.0) {
    const double s = std::min(1.0, out.reached + step);
    RunOutcome r = solve(s, out.x);
    out.iterations += r.iterations;
    out.residual_norm = r.residual_norm;
    out.steps.push_back({s, r.ok(), r.iterations});
    if (r.status == SolveStatus::kInterrupted) {
      out.status = SolveStatus::kInterrupted;
      out.reason = "interrupted";
      return out;
    }
    if (r.ok()) {
      out.x = std::move(r.x);
      out.reached = s;
      step *= 2.0;
      continue;
    }
    step *= 0.5;
    if (step < options.min_step) {
      out.reason = fmt::format("continuation stalled at s = {:.4g} (step below {:.4g}; {})",
                               out.reached, options.min_step, r.reason);
      return out;
    }
  }
  out.status = SolveStatus::kConverged;
  return out;
}

}  // namespace colchem
