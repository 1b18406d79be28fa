#include "io/output_claim.hpp"

#include <fcntl.h>
#include <signal.h>
#include <spdlog/spdlog.h>
#include <unistd.h>

#include <cerrno>
#include <charconv>
#include <cstring>
#include <fstream>
#include <string>
#include <system_error>

#include "core/error.hpp"

namespace colchem {

namespace {

// The PID written in a lock file, or -1 when it holds none (empty, garbage).
long read_pid(const std::filesystem::path& file) {
  std::ifstream in(file);
  std::string text;
  std::getline(in, text);
  long pid = -1;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), pid);
  if (ec != std::errc{} || pid <= 0) return -1;
  (void)end;
  return pid;
}

// Parses the PID of "NAME.tmp-PID" for a given NAME, or -1.
long temp_pid(const std::string& file_name, const std::string& prefix) {
  if (file_name.size() <= prefix.size() || file_name.compare(0, prefix.size(), prefix) != 0) {
    return -1;
  }
  const char* b = file_name.data() + prefix.size();
  const char* e = file_name.data() + file_name.size();
  long pid = -1;
  const auto [end, ec] = std::from_chars(b, e, pid);
  if (ec != std::errc{} || end != e || pid <= 0) return -1;
  return pid;
}

}  // namespace

bool process_alive(long pid) {
  if (pid <= 0) return false;
  if (::kill(static_cast<pid_t>(pid), 0) == 0) return true;
  return errno == EPERM;
}

std::filesystem::path lock_path(const std::filesystem::path& output) {
  std::filesystem::path p = output;
  p += ".lock";
  return p;
}

std::vector<std::filesystem::path> remove_stale_temporaries(const std::filesystem::path& output) {
  std::vector<std::filesystem::path> removed;
  const std::filesystem::path dir =
      output.has_parent_path() ? output.parent_path() : std::filesystem::path(".");
  const std::string prefix = output.filename().string() + ".tmp-";
  std::error_code ec;
  std::filesystem::directory_iterator it(dir, ec);
  if (ec) return removed;
  for (const auto& found : it) {
    const long pid = temp_pid(found.path().filename().string(), prefix);
    if (pid < 0 || process_alive(pid)) continue;
    // Named as the output is (no "./" for a file in the working directory).
    const std::filesystem::path entry_path =
        output.has_parent_path() ? found.path() : found.path().filename();
    std::error_code rm;
    if (std::filesystem::remove(found.path(), rm) && !rm) {
      spdlog::warn(
          "removed {}, the temporary file of an earlier run (process {}) that is no "
          "longer running",
          entry_path.string(), pid);
      removed.push_back(entry_path);
    } else {
      spdlog::warn(
          "{} is the temporary file of an earlier run (process {}) that is no longer "
          "running; it could not be removed: {}",
          entry_path.string(), pid, rm.message());
    }
  }
  return removed;
}

OutputClaim::OutputClaim(const std::filesystem::path& output) {
  if (output.empty()) return;
  const std::filesystem::path lock = lock_path(output);
  std::error_code dir_ec;
  if (std::filesystem::is_directory(output, dir_ec)) {
    throw RunError(ExitCode::kOutput, output.string() +
                                          ": '-o/--output': expected the path of an output file, "
                                          "found a directory; name a file in it, such as " +
                                          (output / "out.nc").string());
  }
  if (output.has_parent_path()) {
    std::error_code mk_ec;
    std::filesystem::create_directories(output.parent_path(), mk_ec);
    if (mk_ec) {
      // The nearest existing ancestor is what blocks: a file where a directory is needed.
      std::filesystem::path p = output.parent_path();
      std::error_code ec2;
      while (p.has_parent_path() && p != p.parent_path() && !std::filesystem::exists(p, ec2)) {
        p = p.parent_path();
      }
      const bool is_file =
          std::filesystem::exists(p, ec2) && !std::filesystem::is_directory(p, ec2);
      throw RunError(ExitCode::kOutput,
                     output.string() + ": '-o/--output': expected a directory for the output, " +
                         (is_file ? "found '" + p.string() + "', which is a file, not a directory"
                                  : "could not create '" + output.parent_path().string() +
                                        "': " + mk_ec.message()));
    }
  }
  const long me = static_cast<long>(::getpid());
  for (int attempt = 0; attempt < 2; ++attempt) {
    const int fd = ::open(lock.c_str(), O_CREAT | O_EXCL | O_WRONLY | O_CLOEXEC, 0644);
    if (fd >= 0) {
      const std::string text = std::to_string(me) + "\n";
      const bool ok = ::write(fd, text.data(), text.size()) == static_cast<ssize_t>(text.size());
      ::close(fd);
      if (!ok) {
        std::error_code ec;
        std::filesystem::remove(lock, ec);
        throw RunError(ExitCode::kOutput,
                       output.string() + ": could not write the lock file " + lock.string());
      }
      lock_ = lock;
      remove_stale_temporaries(output);
      return;
    }
    if (errno != EEXIST) {
      throw RunError(ExitCode::kOutput, output.string() + ": could not create the lock file " +
                                            lock.string() + ": " + std::strerror(errno));
    }
    const long pid = read_pid(lock);
    if (pid == me) return;  // nested claim of this process: the outer one releases it
    if (process_alive(pid)) {
      throw RunError(ExitCode::kOutput,
                     output.string() + ": another colchem run (process " + std::to_string(pid) +
                         ") is writing this file (lock " + lock.string() +
                         "); wait for it to finish or choose another output path");
    }
    spdlog::warn(
        "{}: removing the stale lock {} of an earlier run ({}) that is no longer "
        "running",
        output.string(), lock.string(),
        pid > 0 ? "process " + std::to_string(pid) : std::string("no process id"));
    std::error_code ec;
    std::filesystem::remove(lock, ec);
  }
  throw RunError(ExitCode::kOutput, output.string() + ": could not claim the lock file " +
                                        lock.string() + " (another run took it meanwhile)");
}

void OutputClaim::release() noexcept {
  if (lock_.empty()) return;
  std::error_code ec;
  std::filesystem::remove(lock_, ec);
  lock_.clear();
}

OutputClaim::~OutputClaim() {
  release();
}

OutputClaim::OutputClaim(OutputClaim&& other) noexcept : lock_(std::move(other.lock_)) {
  other.lock_.clear();
}

OutputClaim& OutputClaim::operator=(OutputClaim&& other) noexcept {
  if (this != &other) {
    release();
    lock_ = std::move(other.lock_);
    other.lock_.clear();
  }
  return *this;
}

std::vector<OutputClaim> claim_outputs(const std::vector<std::filesystem::path>& outputs) {
  std::vector<OutputClaim> claims;
  claims.reserve(outputs.size());
  for (const auto& p : outputs) {
    if (!p.empty()) claims.emplace_back(p);
  }
  return claims;
}

}  // namespace colchem
