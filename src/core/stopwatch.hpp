// Wall-clock time of a phase of work (solver statistics, progress lines), in seconds on the
// steady clock: one helper instead of a copy in every solver.
#pragma once

#include <chrono>

namespace colchem {

/// Seconds of wall time since `t0` (std::chrono::steady_clock).
inline double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

}  // namespace colchem
