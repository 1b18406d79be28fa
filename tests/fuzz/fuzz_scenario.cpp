// Fuzzes the scenario loader with command-line overrides (load_scenario, as every command that
// takes a scenario calls it). The input is split at NUL bytes: the first part is the scenario
// YAML, up to four more are `--set` assignments. The scenario is written as configs/fuzz.yaml
// in a scratch directory (one per input) that links configs/mechanisms, configs/photolysis
// and profiles/ of the source tree, so the shipped scenarios' relative paths resolve as they do in
// the tree. Seeds: configs/*.yaml (scripts/fuzz).
#include <string>
#include <vector>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/scenario.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  std::vector<std::string> parts = colchem::fuzz::split_nul(data, size, 5);
  namespace fs = std::filesystem;
  const fs::path root = COLCHEM_SOURCE_DIR;
  const colchem::fuzz::ScratchDir dir;
  fs::create_directory(dir.path() / "configs");
  fs::create_directory_symlink(root / "profiles", dir.path() / "profiles");
  fs::create_directory_symlink(root / "configs" / "mechanisms",
                               dir.path() / "configs" / "mechanisms");
  fs::create_directory_symlink(root / "configs" / "photolysis",
                               dir.path() / "configs" / "photolysis");
  const fs::path file = colchem::fuzz::write_file(dir, "configs/fuzz.yaml", parts.front());
  const std::vector<std::string> overrides(parts.begin() + 1, parts.end());
  colchem::fuzz::refusals_allowed([&] { (void)colchem::load_scenario(file, overrides, units); });
  return 0;
}
