#include "chem/mechanism.hpp"

#include <cmath>

#include "core/constants.hpp"

namespace colchem {

int Reaction::molecularity() const {
  int n = 0;
  for (const auto& e : reactants) n += e.count;
  return n;
}

namespace {
template <class T>
std::optional<std::size_t> find_named(const std::vector<T>& v, const std::string& name) {
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (v[i].name == name) return i;
  }
  return std::nullopt;
}
}  // namespace

std::optional<std::size_t> Mechanism::species_index(const std::string& n) const {
  return find_named(species, n);
}
std::optional<std::size_t> Mechanism::parameter_index(const std::string& n) const {
  return find_named(parameters, n);
}
std::optional<std::size_t> Mechanism::module_index(const std::string& n) const {
  return find_named(modules, n);
}

std::vector<double> Mechanism::default_parameters() const {
  std::vector<double> v;
  v.reserve(parameters.size());
  for (const auto& p : parameters) v.push_back(p.default_value);
  return v;
}

std::string Mechanism::equation_text(std::size_t r) const {
  const Reaction& rx = reactions[r];
  auto side = [&](const std::vector<StoichEntry>& list, bool photon) {
    std::string s;
    for (const auto& e : list) {
      if (!s.empty()) s += " + ";
      if (e.count != 1) s += std::to_string(e.count) + " ";
      s += species[e.species].name;
    }
    if (photon) s += s.empty() ? "hv" : " + hv";
    if (rx.third_body) s += s.empty() ? "M" : " + M";
    return s;
  };
  return side(rx.reactants, rx.photon) + " -> " + side(rx.products, false);
}

}  // namespace colchem
