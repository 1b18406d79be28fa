// Shared parts of the libFuzzer harnesses (tests/fuzz/README in the top README, "Fuzzing").
//
// A harness feeds its input to the same library functions the program calls. An InputError,
// or a RunError with a documented exit code other than 1, is the expected refusal of a bad
// input; any other exception escapes LLVMFuzzerTestOneInput, std::terminate aborts, and
// libFuzzer records the input as a crash (as it does sanitizer reports and leaks).
#pragma once

#include <spdlog/spdlog.h>
#include <unistd.h>

#include <cstdint>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <string_view>
#include <vector>

#include "core/error.hpp"

namespace colchem::fuzz {

/// Runs `f`; swallows the refusals colchem documents, lets everything else escape.
template <class F>
void refusals_allowed(F&& f) {
  try {
    f();
  } catch (const InputError&) {
  } catch (const RunError& e) {
    if (e.code() == ExitCode::kInternal) throw;
  }
}

/// The input split at NUL bytes (at most `max_parts` parts; the last takes the rest).
inline std::vector<std::string> split_nul(const std::uint8_t* data, std::size_t size,
                                          std::size_t max_parts) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  std::vector<std::string> parts;
  std::size_t begin = 0;
  for (std::size_t nul = in.find('\0'); nul != in.npos && parts.size() + 1 < max_parts;
       nul = in.find('\0', begin)) {
    parts.emplace_back(in.substr(begin, nul - begin));
    begin = nul + 1;
  }
  parts.emplace_back(in.substr(begin));
  return parts;
}

/// A directory under $TMPDIR (or /tmp; scripts/fuzz points TMPDIR at /dev/shm), removed with
/// everything in it when destroyed: when the input is done for one made per input, at the
/// end of the run for a function-local static (libFuzzer ends a run that is done with exit(),
/// which runs static destructors). A crash, timeout or interrupt ends the process with
/// _Exit and leaves the directory for the post-mortem; its name carries the process id.
class ScratchDir {
 public:
  ScratchDir() {
    const char* tmp = std::getenv("TMPDIR");
    std::string templ = std::string(tmp && *tmp ? tmp : "/tmp") + "/colchem-fuzz-" +
                        std::to_string(::getpid()) + "-XXXXXX";
    if (::mkdtemp(templ.data()) == nullptr) std::abort();
    path_ = templ;
  }
  ~ScratchDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  ScratchDir(const ScratchDir&) = delete;
  ScratchDir& operator=(const ScratchDir&) = delete;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }

 private:
  std::filesystem::path path_;
};

/// `bytes` written to `dir`/`name` (removed with the directory).
inline std::filesystem::path write_file(const ScratchDir& dir, const std::string& name,
                                        std::string_view bytes) {
  const std::filesystem::path path = dir.path() / name;
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
  if (!out) std::abort();
  return path;
}

/// Silences the library's log output (warnings on every other input would drown libFuzzer's).
inline void quiet_logs() {
  spdlog::set_level(spdlog::level::off);
}

}  // namespace colchem::fuzz
