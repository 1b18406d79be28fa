// Mechanism data, [M] = n_air sum_j eps_j x_j and net stoichiometry: see chem/mechanism.hpp.
#include "chem/mechanism.hpp"

#include <cmath>

#include "core/constants.hpp"

namespace colchem {

double RateUncertainty::factor(double T_K) const {
  return f298 * std::exp(std::abs(g_K * (1.0 / T_K - 1.0 / 298.0)));
}

RateUncertainty default_uncertainty(const Reaction& rx) {
  RateUncertainty u;
  std::string src = rx.source;
  for (char& c : src) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  if (src.find("invented") != std::string::npos || src.find("estimate") != std::string::npos) {
    u.f298 = 3.0;
    return u;
  }
  switch (rx.rate.form) {
    case RateForm::kPhotolysis:
      u.f298 = 1.3;
      return u;
    case RateForm::kFirstOrder:
    case RateForm::kEquilibriumReverse:
      u.f298 = 2.0;
      return u;
    case RateForm::kFalloff:
    case RateForm::kTroe:
    case RateForm::kChemicalActivation:
      u.f298 = 1.5;
      u.g_K = 100.0;
      return u;
    default:
      break;
  }
  const bool termolecular = rx.molecularity() >= 3 || rx.multiplies_third_body();
  u.f298 = termolecular ? 1.5 : 1.3;
  u.g_K = 100.0;
  return u;
}

double third_body_weight(const Mechanism& mech, const Reaction& rx,
                         const std::map<std::string, double>& bulk) {
  double eff = 0.0;
  for (const auto& [name, x] : bulk) {
    double eps = 1.0;
    for (const auto& e : rx.efficiencies) {
      if (mech.species[e.species].name == name) eps = e.eps;
    }
    eff += eps * x;
  }
  return eff;
}

std::vector<double> net_stoichiometry(const Reaction& rx, std::size_t species_count) {
  std::vector<double> nu(species_count, 0.0);
  for (const auto& e : rx.reactants) nu[e.species] -= e.count;
  for (const auto& e : rx.products) nu[e.species] += e.count;
  return nu;
}

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

std::optional<std::size_t> Mechanism::find_reaction(const std::string& ref,
                                                    std::string* why) const {
  std::vector<std::size_t> same_equation;
  for (std::size_t r = 0; r < reactions.size(); ++r) {
    if (reactions[r].id == ref) return r;
    if (reactions[r].equation == ref) same_equation.push_back(r);
  }
  if (same_equation.size() == 1) return same_equation.front();
  if (why != nullptr) {
    if (same_equation.empty()) {
      *why = "no reaction with id or equation '" + ref + "'";
    } else {
      std::string ids;
      for (const auto r : same_equation) ids += (ids.empty() ? "'" : ", '") + reactions[r].id + "'";
      *why = "'" + ref + "', the equation of " + std::to_string(same_equation.size()) +
             " reactions: give one of the ids " + ids;
    }
  }
  return std::nullopt;
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
