// Fuzzes the observation reader (read_observations, as `colchem compare` and scenarios with
// `observations:` call it) on a scratch file holding the input. Seeds:
// profiles/observed/*.csv.
#include "analysis/observations.hpp"
#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/observation_loader.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  const colchem::fuzz::ScratchDir dir;
  const auto file = colchem::fuzz::write_file(
      dir, "observations.csv", std::string_view(reinterpret_cast<const char*>(data), size));
  colchem::fuzz::refusals_allowed([&] { (void)colchem::read_observations(file, units); });
  return 0;
}
