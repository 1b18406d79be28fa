// Fuzzes the reaction-equation parser through the mechanism loader (load_mechanism_text, as
// `colchem check/run` load a mechanism file): every input line is the equation of one
// reaction in a mechanism that declares the species below. Seeds: the equations of the
// shipped mechanisms (scripts/fuzz).
#include <yaml-cpp/yaml.h>

#include <sstream>
#include <string>

#include "core/units.hpp"
#include "fuzz_support.hpp"
#include "io/mechanism_loader.hpp"

namespace {
const char* const kSpecies[] = {"CO2", "CO",  "O",         "O(1D)", "O2",       "O3",    "SO2",
                                "SO",  "SO3", "S",         "S2",    "H2O",      "H2SO4", "OCS",
                                "H",   "H2",  "OH",        "HO2",   "Cl",       "HCl",   "Cl2",
                                "ClO", "N2",  "SO2(a3B1)", "H2SO3", "ClC(O)OO", "Ar"};

std::string mechanism_text(const std::string& input) {
  YAML::Emitter y;
  y << YAML::BeginMap << YAML::Key << "mechanism" << YAML::Value << YAML::BeginMap << YAML::Key
    << "name" << YAML::Value << "fuzz" << YAML::EndMap;
  y << YAML::Key << "species" << YAML::Value << YAML::BeginSeq;
  for (const char* s : kSpecies) {
    y << YAML::Flow << YAML::BeginMap << YAML::Key << "name" << YAML::Value << s << YAML::EndMap;
  }
  y << YAML::EndSeq;
  y << YAML::Key << "modules" << YAML::Value << YAML::BeginSeq << YAML::BeginMap << YAML::Key
    << "name" << YAML::Value << "base" << YAML::Key << "reactions" << YAML::Value << YAML::BeginSeq;
  std::istringstream lines(input);
  std::string eq;
  for (int i = 0; std::getline(lines, eq); ++i) {
    // Every reaction needs its own id (README "Mechanism files"), so that the equation, not a
    // missing id, is what the loader reads and refuses.
    y << YAML::BeginMap << YAML::Key << "id" << YAML::Value << "r" + std::to_string(i);
    y << YAML::Key << "equation" << YAML::Value << YAML::DoubleQuoted << eq
      << YAML::Key << "rate" << YAML::Value << YAML::Flow << YAML::BeginMap << YAML::Key
      << "first_order" << YAML::Value << YAML::BeginMap << YAML::Key << "k" << YAML::Value << 1.0
      << YAML::EndMap << YAML::EndMap << YAML::EndMap;
  }
  y << YAML::EndSeq << YAML::EndMap << YAML::EndSeq << YAML::EndMap;
  return y.c_str();
}
}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const colchem::UnitSystem units;
  const std::string text = mechanism_text(std::string(reinterpret_cast<const char*>(data), size));
  colchem::fuzz::refusals_allowed(
      [&] { (void)colchem::load_mechanism_text(text, "fuzz-mechanism.yaml", units); });
  return 0;
}
