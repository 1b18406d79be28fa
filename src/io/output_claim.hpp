// Output safety (issue 16, README "Output safety"). A claim on OUTPUT is the lock file
// OUTPUT.lock, created with O_CREAT | O_EXCL (atomic on a local file system) and holding the
// writer's process id: a second run that finds the lock of a live process refuses (exit 6)
// before it computes anything; a lock, or an OUTPUT.tmp-PID temporary, of a process that no
// longer runs is removed with a warning (spdlog's default logger). Claims of one process
// nest (a command claims its outputs at its start, the writer of one again): only the first
// removes the lock. Destructors remove locks and unfinished temporaries on every exit path
// (SIGINT/SIGTERM only set a flag).
#pragma once

#include <filesystem>
#include <utility>
#include <vector>

namespace colchem {

class OutputClaim {
 public:
  /// Claims `output` (nothing for an empty path) and creates its directory. Throws
  /// RunError(kOutput) when another live process holds it or the lock cannot be created.
  explicit OutputClaim(const std::filesystem::path& output);
  ~OutputClaim();
  OutputClaim(OutputClaim&& other) noexcept : lock_(std::exchange(other.lock_, {})) {}

  /// The lock file, empty when this claim does not own one (nested claim, empty path).
  [[nodiscard]] const std::filesystem::path& lock_file() const { return lock_; }

 private:
  std::filesystem::path lock_;
};

/// A file written, under the claim of `output`, at temporary() (OUTPUT.tmp-PID) and renamed
/// onto `output` by commit(); destroyed uncommitted (an error, a signal), it removes the
/// temporary, so a half-written file never carries the final name.
class StagedFile {
 public:
  explicit StagedFile(const std::filesystem::path& output);
  ~StagedFile();

  [[nodiscard]] const std::filesystem::path& output() const { return output_; }
  [[nodiscard]] const std::filesystem::path& temporary() const { return temp_; }
  /// Renames the temporary onto the output; throws RunError(kOutput) when that fails.
  void commit();

 private:
  OutputClaim claim_;
  std::filesystem::path output_, temp_;
  bool committed_ = false;
};

/// Claims each non-empty path (see OutputClaim); the claims live as long as the vector.
std::vector<OutputClaim> claim_outputs(const std::vector<std::filesystem::path>& outputs);

/// The lock file of an output path: OUTPUT.lock.
std::filesystem::path lock_path(const std::filesystem::path& output);

}  // namespace colchem
