// Fuzzes the table reader (Table::parse, which Table::read calls on a file's text) and the
// column conversions profile loaders make: every column converted to its own unit, the first
// column checked to increase. Seeds: profiles/*.csv and configs/photolysis/*.csv.
#include <string>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/table.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  const std::string text(reinterpret_cast<const char*>(data), size);
  colchem::fuzz::refusals_allowed([&] {
    const auto t =
        colchem::Table::parse(text, "fuzz.csv", colchem::ExitCode::kInputData, {"species"});
    for (const auto& name : t.names()) {
      if (name == "species") continue;
      (void)t.column(name, units, t.unit(name).empty() ? std::string("1") : t.unit(name));
    }
    if (!t.names().empty() && t.names().front() != "species")
      t.require_increasing(t.names().front());
  });
  return 0;
}
