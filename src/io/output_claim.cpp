// Output claims and staged files (io/output_claim.hpp).
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
#include <string_view>
#include <system_error>

#include "core/error.hpp"

namespace colchem {

namespace {

// The process id that makes up all of `text`, or -1 (empty, garbage, not positive).
long parse_pid(std::string_view text) {
  long pid = -1;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), pid);
  return ec == std::errc{} && end == text.data() + text.size() && pid > 0 ? pid : -1;
}

// The error (exit 6) for an output that cannot be written, saying why.
[[noreturn]] void refuse(const std::filesystem::path& output, const std::string& why) {
  throw RunError(ExitCode::kOutput, output.string() + ": " + why);
}

// Whether a process with this id exists (kill(pid, 0) succeeds or fails with EPERM).
bool process_alive(long pid) {
  return pid > 0 && (::kill(static_cast<pid_t>(pid), 0) == 0 || errno == EPERM);
}

// Removes the OUTPUT.tmp-PID files next to `output` whose PID is not a live process.
void remove_stale_temporaries(const std::filesystem::path& output) {
  const std::filesystem::path dir = output.has_parent_path() ? output.parent_path() : ".";
  const std::string prefix = output.filename().string() + ".tmp-";
  std::error_code ec;
  for (const auto& found : std::filesystem::directory_iterator(dir, ec)) {
    const std::string name = found.path().filename().string();
    const long pid = name.rfind(prefix, 0) == 0 ? parse_pid(name.substr(prefix.size())) : -1;
    if (pid < 0 || process_alive(pid)) continue;
    // Named as the output is (no "./" for a file in the working directory).
    const std::string shown = output.has_parent_path() ? found.path().string() : name;
    std::error_code rm;
    const bool removed = std::filesystem::remove(found.path(), rm) && !rm;
    spdlog::warn(
        "{} {}, the temporary file of an earlier run (process {}) that is no longer running{}",
        removed ? "removed" : "could not remove", shown, pid, removed ? "" : ": " + rm.message());
  }
}

// Creates the directory of `output`, or says what blocks it.
void make_directory_of(const std::filesystem::path& output) {
  if (!output.has_parent_path()) return;
  std::error_code ec;
  std::filesystem::create_directories(output.parent_path(), ec);
  if (!ec) return;
  // The nearest existing ancestor is what blocks: a file where a directory is needed.
  std::filesystem::path p = output.parent_path();
  std::error_code ignored;
  while (p.has_parent_path() && p != p.parent_path() && !std::filesystem::exists(p, ignored)) {
    p = p.parent_path();
  }
  const bool is_file =
      std::filesystem::exists(p, ignored) && !std::filesystem::is_directory(p, ignored);
  refuse(output, "'-o/--output': expected a directory for the output, " +
                     (is_file ? "found '" + p.string() + "', which is a file, not a directory"
                              : "could not create '" + output.parent_path().string() +
                                    "': " + ec.message()));
}

}  // namespace

std::filesystem::path lock_path(const std::filesystem::path& output) {
  std::filesystem::path p = output;
  p += ".lock";
  return p;
}

OutputClaim::OutputClaim(const std::filesystem::path& output) {
  if (output.empty()) return;
  std::error_code ec;
  if (std::filesystem::is_directory(output, ec)) {
    refuse(output,
           "'-o/--output': expected the path of an output file, found a directory; name a file in "
           "it, such as " +
               (output / "out.nc").string());
  }
  make_directory_of(output);
  const std::filesystem::path lock = lock_path(output);
  const long me = static_cast<long>(::getpid());
  for (int attempt = 0; attempt < 2; ++attempt) {
    const int fd = ::open(lock.c_str(), O_CREAT | O_EXCL | O_WRONLY | O_CLOEXEC, 0644);
    if (fd >= 0) {
      const std::string text = std::to_string(me) + "\n";
      const bool ok = ::write(fd, text.data(), text.size()) == static_cast<ssize_t>(text.size());
      ::close(fd);
      if (!ok) {
        std::filesystem::remove(lock, ec);
        refuse(output, "could not write the lock file " + lock.string());
      }
      lock_ = lock;
      remove_stale_temporaries(output);
      return;
    }
    if (errno != EEXIST) {
      refuse(output,
             "could not create the lock file " + lock.string() + ": " + std::strerror(errno));
    }
    std::string text;
    std::getline(std::ifstream(lock), text);
    const long pid = parse_pid(text);
    if (pid == me) return;  // nested claim of this process: the outer one releases it
    if (process_alive(pid)) {
      refuse(output, "another colchem run (process " + std::to_string(pid) +
                         ") is writing this file (lock " + lock.string() +
                         "); wait for it to finish or choose another output path");
    }
    spdlog::warn(
        "{}: removing the stale lock {} of an earlier run ({}) that is no longer "
        "running",
        output.string(), lock.string(),
        pid > 0 ? "process " + std::to_string(pid) : std::string("no process id"));
    std::filesystem::remove(lock, ec);
  }
  refuse(output,
         "could not claim the lock file " + lock.string() + " (another run took it meanwhile)");
}

OutputClaim::~OutputClaim() {
  std::error_code ec;
  if (!lock_.empty()) std::filesystem::remove(lock_, ec);
}

std::vector<OutputClaim> claim_outputs(const std::vector<std::filesystem::path>& outputs) {
  std::vector<OutputClaim> claims;
  claims.reserve(outputs.size());
  for (const auto& p : outputs) {
    if (!p.empty()) claims.emplace_back(p);
  }
  return claims;
}

StagedFile::StagedFile(const std::filesystem::path& output)
    : claim_(output), output_(output), temp_(output) {
  temp_ += ".tmp-" + std::to_string(::getpid());
}

StagedFile::~StagedFile() {
  std::error_code ec;
  if (!committed_) std::filesystem::remove(temp_, ec);
}

void StagedFile::commit() {
  std::error_code ec;
  std::filesystem::rename(temp_, output_, ec);
  if (ec) refuse(output_, "could not move the finished file into place: " + ec.message());
  committed_ = true;
}

}  // namespace colchem
