#include "core/composition.hpp"

#include <array>
#include <cctype>
#include <utility>

namespace colchem {

namespace {
struct ElementEntry {
  const char* symbol;
  double weight;
};
// IUPAC conventional standard atomic weights (from memory; abridged to the elements that
// occur in planetary atmospheres). D is deuterium (2H).
constexpr std::array<ElementEntry, 26> kElements{{
    {"H", 1.008},     {"D", 2.01410},   {"He", 4.002602}, {"C", 12.011},    {"N", 14.007},
    {"O", 15.999},    {"F", 18.998403}, {"Ne", 20.1797},  {"Na", 22.989769}, {"Mg", 24.305},
    {"Al", 26.981538}, {"Si", 28.085},  {"P", 30.973762}, {"S", 32.06},     {"Cl", 35.45},
    {"Ar", 39.948},   {"K", 39.0983},   {"Ca", 40.078},   {"Ti", 47.867},   {"Fe", 55.845},
    {"Ni", 58.6934},  {"Br", 79.904},   {"Kr", 83.798},   {"I", 126.90447}, {"Xe", 131.293},
    {"Hg", 200.592},
}};

// The largest atom count of one element in a formula (larger is a typo, not a molecule;
// common practice, no source).
constexpr int kMaxCount = 9999;

class Parser {
 public:
  explicit Parser(const std::string& s) : s_(s) {}

  bool parse_group(Composition& out, std::string* why, bool nested) {
    while (pos_ < s_.size()) {
      const char c = s_[pos_];
      if (c == ')') {
        if (nested) return true;
        return fail(why, "unbalanced ')'");
      }
      if (c == '(') {
        const std::size_t open = pos_;
        ++pos_;
        Composition inner;
        if (!parse_group(inner, why, true)) return false;
        if (pos_ >= s_.size() || s_[pos_] != ')') return fail(why, "missing ')'");
        ++pos_;
        int mult = 1;
        if (!read_count(mult, why)) return false;
        for (const auto& [el, n] : inner.atoms) {
          const long total = static_cast<long>(out.atoms[el]) + static_cast<long>(n) * mult;
          if (total > kMaxCount)
            return fail(why, "more than " + std::to_string(kMaxCount) + " atoms of " + el);
          out.atoms[el] = static_cast<int>(total);
        }
        (void)open;
        continue;
      }
      if (std::isupper(static_cast<unsigned char>(c)) == 0) {
        return fail(why, std::string("unexpected character '") + c + "'");
      }
      std::string sym(1, c);
      ++pos_;
      std::string two;
      if (pos_ < s_.size() && std::islower(static_cast<unsigned char>(s_[pos_])) != 0) {
        two = sym + s_[pos_];
        if (atomic_weight(two)) {
          sym = two;
          ++pos_;
        }
      }
      if (!atomic_weight(sym)) {
        return fail(why, "unknown element '" + (two.empty() ? sym : two) + "'");
      }
      int count = 1;
      if (!read_count(count, why)) return false;
      if (out.atoms[sym] + count > kMaxCount) {
        return fail(why, "more than " + std::to_string(kMaxCount) + " atoms of " + sym);
      }
      out.atoms[sym] += count;
    }
    return true;
  }

 private:
  // A count after an element or a group (1 when absent); more than kMaxCount is refused
  // before it can overflow.
  bool read_count(int& n, std::string* why) {
    n = 0;
    bool any = false;
    while (pos_ < s_.size() && std::isdigit(static_cast<unsigned char>(s_[pos_])) != 0) {
      n = 10 * n + (s_[pos_] - '0');
      ++pos_;
      any = true;
      if (n > kMaxCount) return fail(why, "a count above " + std::to_string(kMaxCount));
    }
    if (!any) n = 1;
    return true;
  }
  static bool fail(std::string* why, const std::string& msg) {
    if (why) *why = msg;
    return false;
  }
  const std::string& s_;
  std::size_t pos_ = 0;
};
}  // namespace

std::optional<double> atomic_weight(const std::string& symbol) {
  for (const auto& e : kElements) {
    if (symbol == e.symbol) return e.weight;
  }
  return std::nullopt;
}

double Composition::molar_mass_g_mol() const {
  double m = 0.0;
  for (const auto& [el, n] : atoms) m += n * *atomic_weight(el);
  return m;
}

std::optional<ParsedFormula> parse_formula(const std::string& name, std::string* why) {
  if (name.empty()) {
    if (why) *why = "empty name";
    return std::nullopt;
  }
  ParsedFormula out;
  out.base = name;
  // A trailing "(...)" with no count after it is a state or isomer label.
  if (name.back() == ')') {
    int depth = 0;
    std::size_t open = std::string::npos;
    for (std::size_t i = name.size(); i-- > 0;) {
      if (name[i] == ')') ++depth;
      if (name[i] == '(' && --depth == 0) {
        open = i;
        break;
      }
    }
    if (open == std::string::npos || open == 0) {
      if (why) *why = "unbalanced parentheses";
      return std::nullopt;
    }
    out.base = name.substr(0, open);
    out.label = name.substr(open + 1, name.size() - open - 2);
    if (out.label.empty()) {
      if (why) *why = "empty state label '()'";
      return std::nullopt;
    }
  }
  Parser p(out.base);
  if (!p.parse_group(out.composition, why, false)) return std::nullopt;
  if (out.composition.atoms.empty()) {
    if (why) *why = "no elements";
    return std::nullopt;
  }
  return out;
}

}  // namespace colchem
