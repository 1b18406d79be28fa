// A live progress display for the solvers.
//
// On a terminal (stderr is a tty) one line is rewritten in place with "\r":
//   it 12/400  dtau 3.2e+04 s  |F| 4.1e-06  change 2.0e-03  elapsed 0.21 s
//   step 40  t 3.600e+04 s (41.7 %)  dt 9.0e+02 s  elapsed 0.30 s  left ~0.42 s
// (the iteration ceiling when known; for a transient with a known end, the share of model
// time done and the wall time left, extrapolated linearly in model time).
// Otherwise (a log file, a batch job) the same text goes as plain info lines through the
// spdlog::logger passed in. Both are rate-limited to one line per min_interval_s; the
// final state is always shown (finish()).
#pragma once

#include <spdlog/logger.h>

#include <chrono>
#include <cstdio>
#include <string>

#include "solve/split_integrator.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

struct ProgressOptions {
  double min_interval_s = 0.2;  ///< at most one line per interval (0: every update)
  /// Where the live line goes and whether it is a terminal; by default stderr and
  /// isatty(stderr). Tests set both.
  std::FILE* stream = nullptr;
  int terminal = -1;  ///< -1: detect, 0: no (log lines), 1: yes (live line)
  int max_iterations = 0;  ///< steady: the iteration ceiling shown as "it k/max" (0: none)
  /// Transient: model times of the start and the end; with end_s > start_s each line shows
  /// the share done and the wall time left.
  double start_s = 0.0;
  double end_s = 0.0;
};

class Progress {
 public:
  Progress(spdlog::logger& log, std::string label, ProgressOptions options = {});
  ~Progress();
  Progress(const Progress&) = delete;
  Progress& operator=(const Progress&) = delete;

  void update(const SteadyIteration& it);
  void update(const SplitStepRecord& step);
  /// Shows the last line regardless of the rate limit and ends it (newline on a terminal).
  void finish(const std::string& outcome);

  [[nodiscard]] bool on_terminal() const { return terminal_; }
  /// Lines shown so far (for tests).
  [[nodiscard]] long lines_shown() const { return shown_; }

  static std::string format(const SteadyIteration& it, int max_iterations = 0);
  /// step.wall_s counts from the model time start_s (the run's start or its checkpoint).
  static std::string format(const SplitStepRecord& step, double start_s = 0.0,
                            double end_s = 0.0);

 private:
  void show(const std::string& text, bool force);

  spdlog::logger& log_;
  std::string label_;
  ProgressOptions options_;
  std::FILE* stream_;
  bool terminal_;
  bool line_open_ = false;
  long shown_ = 0;
  std::string pending_;
  std::chrono::steady_clock::time_point last_{};
  bool any_ = false;
};

/// Progress of a batch of runs (sweep variants, ensemble members), one info line through the
/// logger per finished run, rate-limited to one per min_interval_s (the last run is always
/// shown):
///   sweep 3/8 done (37.5 %)  elapsed 12.3 s  left ~20 s
/// The time left extrapolates the mean wall time per finished run:
/// elapsed (total - done) / done.
class BatchProgress {
 public:
  BatchProgress(spdlog::logger& log, std::string label, double min_interval_s);
  /// `done` runs of `total` have finished.
  void finished(std::size_t done, std::size_t total);
  [[nodiscard]] long lines_shown() const { return shown_; }
  static std::string format(std::size_t done, std::size_t total, double elapsed_s);

 private:
  spdlog::logger& log_;
  std::string label_;
  double min_interval_s_;
  std::chrono::steady_clock::time_point start_, last_;
  bool any_ = false;
  long shown_ = 0;
};

}  // namespace colchem
