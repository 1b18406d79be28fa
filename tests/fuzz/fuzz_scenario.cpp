// Fuzzes the scenario loader with command-line overrides (load_scenario, as every command that
// takes a scenario calls it). The input is split at NUL bytes: the first part is the scenario
// YAML, up to four more are `--set` assignments. The scenario is written as configs/fuzz.yaml
// in a scratch directory that links configs/mechanisms, configs/photolysis and profiles/ of
// the source tree, so the shipped scenarios' relative paths resolve as they do in the tree.
// The directory is made once per process (the loader only reads files), each input
// overwrites the scenario file in it. Seeds: configs/*.yaml (scripts/fuzz).
#include <filesystem>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/scenario.hpp"

namespace {

/// The scratch tree: configs/ (with the links to the shipped mechanisms and photolysis data)
/// beside a link to profiles/; removed when the process exits normally.
class ScenarioTree {
 public:
  ScenarioTree() {
    namespace fs = std::filesystem;
    const fs::path root = COLCHEM_SOURCE_DIR;
    fs::create_directory(dir_.path() / "configs");
    fs::create_directory_symlink(root / "profiles", dir_.path() / "profiles");
    for (const char* data : {"mechanisms", "photolysis"}) {
      fs::create_directory_symlink(root / "configs" / data, dir_.path() / "configs" / data);
    }
  }
  /// `text` as the scenario file; its path.
  [[nodiscard]] std::filesystem::path scenario(const std::string& text) const {
    return colchem::fuzz::write_file(dir_, "configs/fuzz.yaml", text);
  }

 private:
  colchem::fuzz::ScratchDir dir_;
};

}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  static const ScenarioTree tree;
  const std::vector<std::string> parts = colchem::fuzz::split_nul(data, size, 5);
  const std::filesystem::path file = tree.scenario(parts.front());
  const std::vector<std::string> overrides(parts.begin() + 1, parts.end());
  colchem::fuzz::refusals_allowed([&] { (void)colchem::load_scenario(file, overrides, units); });
  return 0;
}
