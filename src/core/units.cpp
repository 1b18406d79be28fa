#include "core/units.hpp"

#include <udunits2.h>

#include <cctype>
#include <cmath>
#include <cstdlib>
#include <stdexcept>
#include <vector>

#include "core/error.hpp"

namespace colchem {

struct UnitSystem::Impl {
  ut_system* system = nullptr;
};

UnitSystem::UnitSystem() : impl_(std::make_unique<Impl>()) {
  // UDUNITS-2 prints its own messages to stderr by default; colchem reports errors itself.
  ut_set_error_message_handler(ut_ignore);
  impl_->system = ut_read_xml(nullptr);
  if (impl_->system == nullptr) {
    throw RunError(ExitCode::kInternal,
                   "could not read the UDUNITS-2 unit database (is libudunits2-data installed? "
                   "UDUNITS2_XML_PATH may point at udunits2.xml)");
  }
}

UnitSystem::~UnitSystem() {
  if (impl_ && impl_->system) ut_free_system(impl_->system);
}

namespace {
struct UnitDeleter {
  void operator()(ut_unit* u) const { ut_free(u); }
};
using UnitPtr = std::unique_ptr<ut_unit, UnitDeleter>;

UnitPtr parse(ut_system* sys, const std::string& text) {
  // An empty unit string means "dimensionless" (UDUNITS-2 spells it "1").
  const std::string t = text.empty() ? std::string("1") : text;
  return UnitPtr(ut_parse(sys, t.c_str(), UT_UTF8));
}
}  // namespace

bool UnitSystem::parses(const std::string& unit) const {
  return parse(impl_->system, unit) != nullptr;
}

bool UnitSystem::convertible(const std::string& a, const std::string& b) const {
  auto ua = parse(impl_->system, a);
  auto ub = parse(impl_->system, b);
  return ua && ub && ut_are_convertible(ua.get(), ub.get()) != 0;
}

std::optional<std::string> UnitSystem::case_respelling(const std::string& unit,
                                                       const std::string& target) const {
  if (convertible(unit, target)) return std::nullopt;
  std::vector<std::size_t> letters;
  for (std::size_t i = 0; i < unit.size(); ++i) {
    if (std::isalpha(static_cast<unsigned char>(unit[i]))) letters.push_back(i);
  }
  // Every case pattern of up to 8 letters (256 parses at most); longer units try all-lower
  // and all-upper only.
  const bool all_patterns = letters.size() <= 8;
  const std::size_t patterns = all_patterns ? (std::size_t{1} << letters.size()) : 2;
  std::optional<std::string> best;
  int best_changes = 0;
  for (std::size_t m = 0; m < patterns; ++m) {
    std::string cand = unit;
    int changes = 0;
    for (std::size_t b = 0; b < letters.size(); ++b) {
      const bool upper = all_patterns ? ((m >> b) & 1U) != 0 : m == 1;
      char& c = cand[letters[b]];
      const char to = static_cast<char>(upper ? std::toupper(static_cast<unsigned char>(c))
                                              : std::tolower(static_cast<unsigned char>(c)));
      changes += to != c ? 1 : 0;
      c = to;
    }
    if (changes == 0 || (best && changes >= best_changes)) continue;
    if (convertible(cand, target)) {
      best = cand;
      best_changes = changes;
    }
  }
  return best;
}

std::optional<double> UnitSystem::convert(double value, const std::string& from_unit,
                                          const std::string& to_unit) const {
  auto from = parse(impl_->system, from_unit);
  auto to = parse(impl_->system, to_unit);
  if (!from || !to || ut_are_convertible(from.get(), to.get()) == 0) return std::nullopt;
  cv_converter* conv = ut_get_converter(from.get(), to.get());
  if (conv == nullptr) return std::nullopt;
  const double out = cv_convert_double(conv, value);
  cv_free(conv);
  return out;
}

std::optional<QuantityText> split_quantity(const std::string& text) {
  const char* begin = text.c_str();
  while (*begin != '\0' && std::isspace(static_cast<unsigned char>(*begin))) ++begin;
  char* end = nullptr;
  const double v = std::strtod(begin, &end);
  if (end == begin) return std::nullopt;
  std::string unit(end);
  const auto first = unit.find_first_not_of(" \t");
  const auto last = unit.find_last_not_of(" \t");
  unit = first == std::string::npos ? std::string() : unit.substr(first, last - first + 1);
  return QuantityText{v, unit};
}

bool same_dimension(const UnitSystem& units, const std::string& unit, const std::string& ref) {
  const auto a = units.convert(1.0, unit, ref);
  const auto b = units.convert(2.0, unit, ref);
  const auto z = units.convert(0.0, unit, ref);
  if (!a || !b || !z) return false;
  return std::abs((*b - *z) - 2.0 * (*a - *z)) <= 1e-9 * std::abs(*a - *z);
}

}  // namespace colchem
