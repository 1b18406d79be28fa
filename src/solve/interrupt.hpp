// Interrupts: SIGINT/SIGTERM ask a running solver to stop cleanly.
//
// main creates one InterruptGuard for the lifetime of a run. While it lives, SIGINT and
// SIGTERM only set a flag; the solvers poll stop_requested() once per iteration or step
// and return status "interrupted" with their current state, so that the caller writes a
// checkpoint and exits with ExitCode::kInterrupted. The guard restores the previous
// handlers when destroyed. A second signal while the flag is set falls through to the
// previous (default) handler, so a hung run can still be killed with a second Ctrl-C.
//
// The flag (with the saved previous handlers and the nesting depth) is the one piece of
// file-scope mutable state in the library (interrupt.cpp): a POSIX signal handler receives
// no user pointer, so the only thing it can legally touch is a static object of type
// volatile std::sig_atomic_t (or a lock-free std::atomic).
//
// Guards nest: main() holds one for the whole command, so that a signal anywhere (also
// while a file is being written) only sets the flag and every temporary file is removed on
// the normal path (StagedFile's destructor); a command's own guard inside it
// re-installs the handler (a library initialised in between, PETSc, may have replaced it)
// and keeps the flag; only the outermost guard restores the previous handlers and clears
// the flag when it goes.
#pragma once

#include <functional>

namespace colchem {

class InterruptGuard {
 public:
  InterruptGuard();
  ~InterruptGuard();
  InterruptGuard(const InterruptGuard&) = delete;
  InterruptGuard& operator=(const InterruptGuard&) = delete;

  /// True once SIGINT or SIGTERM arrived (or request() was called).
  [[nodiscard]] bool requested() const;
  /// The signal number received (0 if none, or request() was used).
  [[nodiscard]] int signal_number() const;
  /// Sets the flag as a signal would (for programmatic stops and tests).
  void request();
  /// Clears the flag (for example after a checkpoint, to continue).
  void clear();

  /// A callable for SteadyStateCallbacks::stop_requested / SplitCallbacks::stop_requested.
  [[nodiscard]] std::function<bool()> query() const {
    return [this] { return requested(); };
  }
};

}  // namespace colchem
