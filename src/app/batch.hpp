// What the commands that share out a batch of solves over MPI ranks have in common (sweep
// variants, ensemble members, fits of module sets): the ranks, the batch run with its
// progress lines, and rank 0's exit code on every rank.
#pragma once

#include <spdlog/logger.h>

#include <cstddef>
#include <functional>
#include <string>
#include <vector>

#include "analysis/sweep_runner.hpp"

namespace colchem::app {

/// This process's rank in MPI_COMM_WORLD and the number of ranks.
struct WorldRanks {
  int rank = 0;
  int size = 1;
};
WorldRanks world_ranks();

/// "s" for a count other than one (log lines: "1 rank", "2 ranks").
inline const char* plural(std::size_t n) {
  return n == 1 ? "" : "s";
}

/// How a batch reports: at most one progress line per `progress_every` seconds through
/// `log` (solve/progress.hpp, BatchProgress, labelled `label`), then `line` for each
/// finished variant on the rank that ran it (may be empty).
struct BatchReport {
  spdlog::logger& log;
  std::string label;
  double progress_every = 0.2;
  VariantDone line;
};

/// Runs the variants over the ranks of MPI_COMM_WORLD (analysis/sweep_runner.hpp,
/// run_variants: the outcomes on rank 0, in variant order) with the batch's progress lines.
std::vector<VariantOutcome> run_batch(const std::vector<Variant>& variants,
                                      const VariantRunner& runner, const BatchReport& report,
                                      const std::function<bool()>& stop_requested = {},
                                      const std::vector<std::size_t>* todo = nullptr);

/// Rank 0's exit code on every rank (collective over MPI_COMM_WORLD): the other ranks wait
/// for it, so that none exits (and mpirun aborts the job, killing rank 0) before rank 0
/// has written its files. Rank 0 passes its code; the others' `code` is ignored.
int exit_code_of_rank0(int code);

}  // namespace colchem::app
