// Output safety (issue 16): one live writer per output path (OUTPUT.lock with the PID),
// stale locks and OUTPUT.tmp-PID files of dead processes removed, and a temporary file
// removed when a signal arrives while it is being written (the signal only sets a flag).
#include <catch2/catch.hpp>

#include <unistd.h>

#include <csignal>
#include <filesystem>
#include <fstream>

#include "core/error.hpp"
#include "io/output_claim.hpp"
#include "solve/interrupt.hpp"

using namespace colchem;
namespace fs = std::filesystem;

namespace {
// A process id that is not running: above the kernel's pid_max (at most 2^22).
constexpr long kDeadPid = 99999999;

fs::path fresh_dir(const std::string& name) {
  const fs::path d =
      fs::temp_directory_path() / ("colchem_claim_" + name + "_" + std::to_string(::getpid()));
  fs::remove_all(d);
  fs::create_directories(d);
  return d;
}
void write(const fs::path& p, const std::string& text) {
  std::ofstream(p) << text;
}
}  // namespace

TEST_CASE("a claim creates the lock with the PID and removes it", "[io][output]") {
  const fs::path d = fresh_dir("basic");
  const fs::path out = d / "run.nc";
  {
    const OutputClaim claim(out);
    REQUIRE(fs::exists(lock_path(out)));
    std::ifstream in(lock_path(out));
    long pid = 0;
    in >> pid;
    CHECK(pid == static_cast<long>(::getpid()));
    {
      const OutputClaim nested(out);  // same process: allowed, does not own the lock
      CHECK(nested.lock_file().empty());
    }
    CHECK(fs::exists(lock_path(out)));  // the outer claim still holds it
  }
  CHECK_FALSE(fs::exists(lock_path(out)));
  fs::remove_all(d);
}

TEST_CASE("a lock held by a live process is refused with exit 6", "[io][output]") {
  const fs::path d = fresh_dir("live");
  const fs::path out = d / "run.nc";
  // The parent process (the test runner's shell or ctest) is alive.
  write(lock_path(out), std::to_string(static_cast<long>(::getppid())) + "\n");
  try {
    const OutputClaim claim(out);
    FAIL("claimed a path another live process holds");
  } catch (const RunError& e) {
    CHECK(e.code() == ExitCode::kOutput);
    const std::string msg = e.what();
    CHECK(msg.find("another colchem run (process " + std::to_string(::getppid()) + ")") !=
          std::string::npos);
    CHECK(msg.find("run.nc.lock") != std::string::npos);
  }
  CHECK(fs::exists(lock_path(out)));  // someone else's lock is left alone
  fs::remove_all(d);
}

TEST_CASE("stale locks and temporaries of dead processes are removed", "[io][output]") {
  const fs::path d = fresh_dir("stale");
  const fs::path out = d / "run.nc";
  write(lock_path(out), std::to_string(kDeadPid) + "\n");
  write(d / ("run.nc.tmp-" + std::to_string(kDeadPid)), "half a file");
  const fs::path live_tmp = d / ("run.nc.tmp-" + std::to_string(::getppid()));
  write(live_tmp, "another run's file in progress");
  write(d / "run.nc.tmp-notapid", "not ours to judge");
  {
    const OutputClaim claim(out);
    CHECK(claim.lock_file() == lock_path(out));
    CHECK_FALSE(fs::exists(d / ("run.nc.tmp-" + std::to_string(kDeadPid))));
    CHECK(fs::exists(live_tmp));
    CHECK(fs::exists(d / "run.nc.tmp-notapid"));
  }
  fs::remove_all(d);
}

TEST_CASE("a signal while a file is written leaves no temporary", "[io][output]") {
  const fs::path d = fresh_dir("signal");
  const fs::path out = d / "run.nc";
  const InterruptGuard guard;
  {
    const StagedFile file(out);
    std::ofstream(file.temporary()) << "half-written";
    std::raise(SIGTERM);  // only sets the flag: the process lives on
    CHECK(guard.requested());
    CHECK(fs::exists(d / ("run.nc.tmp-" + std::to_string(::getpid()))));
    // The file is abandoned (the command stops), as on an error path.
  }
  CHECK(guard.signal_number() == SIGTERM);
  std::size_t left = 0;
  for (const auto& e : fs::directory_iterator(d)) {
    (void)e;
    ++left;
  }
  CHECK(left == 0);  // neither the temporary nor the lock
  fs::remove_all(d);
}
