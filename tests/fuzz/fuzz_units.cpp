// Fuzzes the unit handling every config value and table header goes through (UnitSystem,
// split_quantity): the first input line is a quantity or unit ("92 bar"), the second a target
// unit. Seeds: units of the shipped tables and configs (scripts/fuzz).
#include <string>

#include "core/units.hpp"
#include "fuzz_support.hpp"

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  const std::string in(reinterpret_cast<const char*>(data), size);
  const auto nl = in.find('\n');
  const std::string first = in.substr(0, nl);
  const std::string second = nl == std::string::npos ? std::string("1") : in.substr(nl + 1);
  colchem::fuzz::refusals_allowed([&] {
    (void)units.parses(first);
    (void)units.convertible(first, second);
    (void)units.convert(1.5, first, second);
    if (const auto q = colchem::split_quantity(first)) {
      (void)units.convert(q->value, q->unit.empty() ? std::string("1") : q->unit, second);
    }
  });
  return 0;
}
