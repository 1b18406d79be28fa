// Fuzzes the scenario loader with command-line overrides (load_scenario, as every command that
// takes a scenario calls it). The input is split at NUL bytes: the first part is the scenario
// YAML, up to four more are `--set` assignments. The scenario is written as configs/fuzz.yaml
// in a scratch directory that links configs/mechanisms, configs/photolysis and profiles/ of
// the source tree, so the shipped scenarios' relative paths resolve as they do in the tree.
// Seeds: configs/*.yaml (scripts/fuzz).
#include <string>
#include <vector>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/scenario.hpp"

namespace {
std::filesystem::path configs_dir() {
  namespace fs = std::filesystem;
  static const fs::path dir = [] {
    const fs::path root = COLCHEM_SOURCE_DIR;
    const fs::path base = colchem::fuzz::scratch_dir();
    fs::create_directories(base / "configs");
    fs::create_directory_symlink(root / "profiles", base / "profiles");
    fs::create_directory_symlink(root / "configs" / "mechanisms", base / "configs" / "mechanisms");
    fs::create_directory_symlink(root / "configs" / "photolysis", base / "configs" / "photolysis");
    return base / "configs";
  }();
  return dir;
}
}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  (void)configs_dir();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  std::vector<std::string> parts = colchem::fuzz::split_nul(data, size, 5);
  const colchem::fuzz::ScratchFile file("fuzz.yaml", parts.front(), configs_dir());
  const std::vector<std::string> overrides(parts.begin() + 1, parts.end());
  colchem::fuzz::refusals_allowed(
      [&] { (void)colchem::load_scenario(file.path(), overrides, units); });
  return 0;
}
