// The launcher's decision and the hand-over to colchem-full: see launcher.hpp.
#include "app/launcher.hpp"

#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <iostream>
#include <string_view>

#include "core/error.hpp"

namespace colchem::app {

bool launcher_runs(int argc, char** argv) {
  for (int i = 1; i < argc; ++i) {
    const std::string_view a = argv[i];
    if (a == "--log-level") {
      ++i;  // its value
      continue;
    }
    if (a.starts_with("--log-level=")) continue;
    for (const char* light : {"check", "compare", "budget", "photo", "box", "rates"}) {
      if (a == light) return true;
    }
    return false;  // run, sweep, --help, --version, a typo: the full program
  }
  return false;
}

int exec_full_program(char** argv) {
  std::error_code ec;
  const auto self = std::filesystem::read_symlink("/proc/self/exe", ec);
  const auto full = (ec ? std::filesystem::path(argv[0]) : self).parent_path() / "colchem-full";
  execv(full.c_str(), argv);
  std::cerr << "colchem: cannot start " << full.string() << " (" << std::strerror(errno)
            << "); it is built and installed next to colchem\n";
  return static_cast<int>(ExitCode::kInternal);
}

}  // namespace colchem::app
