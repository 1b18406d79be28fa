// Output safety for files written by a run (issue 16): one live writer per output path, and
// no temporary files left behind by earlier runs that were killed.
//
// A claim on OUTPUT is the lock file OUTPUT.lock, created with O_CREAT | O_EXCL (atomic on a
// local file system) and holding the writer's process id. A second run that finds the lock
// with the id of a live process refuses (exit 6) before it computes anything; a lock whose
// process is gone (killed with SIGKILL, a crash) is stale: it is removed, with a warning,
// and claimed afresh. Claims of one process nest (a command claims its outputs at the start,
// the NcWriter that writes one claims it again): only the first removes the lock. The lock
// is removed on every normal path (destructor); SIGINT/SIGTERM only set a flag (main holds
// an InterruptGuard for the whole command), so destructors run on those too.
//
// Writers name their temporaries OUTPUT.tmp-PID; claiming OUTPUT also removes any such file
// whose PID is no live process (a run killed while writing), with a warning naming it.
// Warnings go to spdlog's default logger (main() makes it the command's logger).
#pragma once

#include <filesystem>
#include <vector>

namespace colchem {

class OutputClaim {
 public:
  OutputClaim() = default;
  /// Claims `output` (nothing for an empty path). Throws RunError(kOutput) when another live
  /// process holds it or the lock cannot be created.
  explicit OutputClaim(const std::filesystem::path& output);
  ~OutputClaim();
  OutputClaim(OutputClaim&& other) noexcept;
  OutputClaim& operator=(OutputClaim&& other) noexcept;
  OutputClaim(const OutputClaim&) = delete;
  OutputClaim& operator=(const OutputClaim&) = delete;

  /// The lock file, empty when this claim does not own one (nested claim, empty path).
  [[nodiscard]] const std::filesystem::path& lock_file() const { return lock_; }

 private:
  void release() noexcept;
  std::filesystem::path lock_;
};

/// Claims each non-empty path (see OutputClaim); the claims live as long as the vector.
std::vector<OutputClaim> claim_outputs(const std::vector<std::filesystem::path>& outputs);

/// Removes OUTPUT.tmp-PID files next to `output` whose PID is not a live process; returns
/// the files removed.
std::vector<std::filesystem::path> remove_stale_temporaries(const std::filesystem::path& output);

/// The lock file of an output path: OUTPUT.lock.
std::filesystem::path lock_path(const std::filesystem::path& output);

/// Whether a process with this id exists (kill(pid, 0) succeeds or fails with EPERM).
bool process_alive(long pid);

}  // namespace colchem
