// Running a sweep's variants across MPI ranks.
//
// Dynamic load balancing: the next variant index is a counter in an MPI one-sided window on
// rank 0 that every rank increments atomically (MPI_Fetch_and_op) when it is free, so no
// rank waits while variants remain and all ranks finish within one variant's time of each
// other. Where a variant starts is the runner's business and must not depend on the rank or
// on which variants ran before it there (the sweep and ensemble commands start every
// variant from the same base state, solved on every rank): then each outcome is a function
// of its variant alone, and results, gathered on rank 0 in variant order, are identical
// whatever the number of ranks.
#pragma once

#include <mpi.h>

#include <functional>
#include <string>
#include <vector>

#include "analysis/sweep.hpp"

namespace colchem {

/// What a sweep file holds for a variant (variable variant_state).
enum class VariantState : int { kNotRun = 0, kConverged = 1, kFailed = 2, kInterrupted = 3 };

struct VariantOutcome {
  std::size_t index = 0;
  bool converged = false;
  /// Stopped by SIGINT/SIGTERM (while running, or never started): neither converged nor
  /// failed; reason "interrupted" (or "interrupted before it started").
  bool interrupted = false;
  /// Not run by this call (outside `todo` of run_variants): the caller fills it in (a
  /// result taken from an earlier file, or "not run" in a piece of a sweep).
  bool skipped = false;
  std::string reason;          ///< why it failed, or "converged"
  int iterations = 0;
  double residual = 0.0;       ///< scaled coupled residual of the end state
  double wall_seconds = 0.0;
  int rank = 0;
  bool warm_started = false;   ///< started from a converged state (not the initial guess)
  std::vector<double> values;  ///< variant-specific numbers the caller packs (profiles, scores)
  /// For progress lines, set before `done` is called (not gathered): variants finished on
  /// every rank so far, this one included, and how many this call runs.
  std::size_t finished = 0;
  std::size_t to_run = 0;
};

/// Runs one variant. Must not throw for a variant that fails: return converged = false with
/// a reason.
using VariantRunner = std::function<VariantOutcome(const Variant& variant)>;

/// Called on the rank that finished a variant (for progress lines).
using VariantDone = std::function<void(const Variant&, const VariantOutcome&)>;

/// Runs every variant; returns all outcomes in variant order on rank 0, and an empty vector
/// on the other ranks. Collective over `comm`. When `stop_requested` (optional) turns true on
/// a rank, that rank starts no further variant; variants no rank started come back with
/// interrupted = true (the runner marks the one it was running itself). With `todo`
/// (variant indices, optional) only those variants run; the others come back with
/// skipped = true.
std::vector<VariantOutcome> run_variants(MPI_Comm comm, const std::vector<Variant>& variants,
                                         const VariantRunner& run, const VariantDone& done,
                                         const std::function<bool()>& stop_requested = {},
                                         const std::vector<std::size_t>* todo = nullptr);

}  // namespace colchem
