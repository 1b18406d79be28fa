// Fuzzes the reaction-equation parser through the mechanism loader (load_mechanism_text, as
// `colchem check/run` load a mechanism file): each of the input's first two lines is the
// equation of one reaction in a mechanism that declares the species the lines name. The loader
// splits the equation into terms, reads the coefficients, looks the species up (an undeclared
// one gets a "did you mean") and, unless it refused the reaction before, balances its elements.
// Seeds: the equations of the shipped mechanisms, one per file (scripts/fuzz).
//
// The mechanism is small so that the equation is most of the work: the YAML that declares
// each species is made once, and per input only the species the lines can name are declared
// (the loader reads each declared species at about the cost of the equation).
#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <filesystem>
#include <set>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/mechanism_loader.hpp"

namespace {

// The reactions read per input. The loader stops at the first refused one, and reactions do
// not interact beyond their ids, which the harness makes unique: a second line gives a
// mechanism of more than one reaction, more would only repeat the parser (each reaction
// costs about as much as the rest of the mechanism).
constexpr std::size_t kMaxLines = 2;

/// The species the equations may name, each with the YAML flow map that declares it (made
/// once): those of the shipped mechanisms (read with the loader) and two the shipped files do
/// not have, an atom and a formula with a bracketed group.
const std::vector<std::pair<std::string, std::string>>& species_declarations(
    const colchem::UnitSystem& units) {
  static const std::vector<std::pair<std::string, std::string>> declarations = [&] {
    std::set<std::string> names = {"Ar", "ClC(O)OO"};
    std::set<std::filesystem::path> files;
    for (const auto& f : std::filesystem::directory_iterator(
             std::filesystem::path(COLCHEM_SOURCE_DIR) / "configs" / "mechanisms")) {
      if (f.path().extension() == ".yaml") files.insert(f.path());
    }
    for (const auto& f : files) {
      const auto mechanism = colchem::load_mechanism(f, units);
      for (const auto& sp : mechanism->species) names.insert(sp.name);
    }
    std::vector<std::pair<std::string, std::string>> out;
    for (const auto& name : names) {
      YAML::Emitter y;
      y << YAML::Flow << YAML::BeginMap << YAML::Key << "name" << YAML::Value << name
        << YAML::EndMap;
      out.emplace_back(name, y.c_str());
    }
    return out;
  }();
  return declarations;
}

/// Whether the parser can read `name` as a species name from `line`: whether it occurs there
/// between the separators that end a name (the line's ends, '+', a space or tab, the first
/// "->"; a name that is a species contains none of them, so this is the case exactly when
/// the parser reads it).
bool names(std::string_view line, std::string_view name) {
  const std::size_t arrow = line.find("->");
  const auto separated = [&](std::size_t at, bool before) {
    if (before ? at == 0 : at == line.size()) return true;
    const char c = before ? line[at - 1] : line[at];
    if (c == '+' || c == ' ' || c == '\t') return true;
    return arrow != std::string_view::npos && (before ? at == arrow + 2 : at == arrow);
  };
  for (std::size_t at = line.find(name); at != std::string_view::npos;
       at = line.find(name, at + 1)) {
    if (separated(at, true) && separated(at + name.size(), false)) return true;
  }
  return false;
}

/// One reaction as a block sequence item of the module's `reactions`: its id, the equation
/// (double-quoted, so that any byte reaches the loader as written) and a rate whose form
/// fits the equation, so that the loader's checks of the equation (terms, coefficients,
/// species, element balance) are what refuses it, not a rate form of the wrong kind: a
/// photolysis rate when the line mentions hv, otherwise an Arrhenius rate (any number of
/// reactants, with or without M), and `sink: true` when nothing follows the arrow.
void append_reaction(std::string& text, std::size_t i, std::string_view equation) {
  YAML::Emitter y;
  y << YAML::Flow << YAML::BeginMap << YAML::Key << "id" << YAML::Value << "r" + std::to_string(i)
    << YAML::Key << "equation" << YAML::Value << YAML::DoubleQuoted << std::string(equation)
    << YAML::Key << "rate" << YAML::Value << YAML::BeginMap;
  if (equation.find("hv") != std::string_view::npos) {
    y << YAML::Key << "photolysis" << YAML::Value << YAML::BeginMap << YAML::Key << "channel"
      << YAML::Value << "j" << YAML::EndMap;
  } else {
    y << YAML::Key << "arrhenius" << YAML::Value << YAML::BeginMap << YAML::Key << "A"
      << YAML::Value << 1.0 << YAML::EndMap;
  }
  y << YAML::EndMap;
  const std::size_t arrow = equation.find("->");
  if (arrow != std::string_view::npos &&
      equation.find_first_not_of(" \t", arrow + 2) == std::string_view::npos) {
    y << YAML::Key << "sink" << YAML::Value << true;  // no products, as the shipped sinks
  }
  y << YAML::EndMap;
  text += "      - ";
  text += y.c_str();
  text += '\n';
}

}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  std::vector<std::string_view> lines;  // as getline splits them
  for (std::size_t begin = 0; begin < input.size() && lines.size() < kMaxLines;) {
    const std::size_t end = std::min(input.find('\n', begin), input.size());
    lines.push_back(input.substr(begin, end - begin));
    begin = end + 1;
  }
  // The species the lines name: every name the parser reads from a line is declared or
  // undeclared exactly as with the whole table (only the "did you mean" candidates offered
  // for an undeclared name are fewer), at a fraction of the loader's work.
  std::string text = "mechanism: {name: fuzz}\nspecies: [";
  const char* sep = "";
  for (const auto& species : species_declarations(units)) {
    const auto named = [&](std::string_view l) { return names(l, species.first); };
    if (!std::any_of(lines.begin(), lines.end(), named)) continue;
    text += sep;
    text += species.second;
    sep = ", ";
  }
  text += "]\nmodules:\n  - name: base\n    reactions:";
  text += lines.empty() ? " []\n" : "\n";
  for (std::size_t i = 0; i < lines.size(); ++i) append_reaction(text, i, lines[i]);
  colchem::fuzz::refusals_allowed(
      [&] { (void)colchem::load_mechanism_text(text, "fuzz-mechanism.yaml", units); });
  return 0;
}
