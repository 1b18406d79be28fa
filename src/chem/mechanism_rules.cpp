// Rules of a mechanism beyond its file's syntax (chem/mechanism_rules.hpp).
#include "chem/mechanism_rules.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <functional>
#include <map>

namespace colchem {

bool is_reaction_id(const std::string& id) {
  const auto allowed = [](char ch) {
    return std::isalnum(static_cast<unsigned char>(ch)) != 0 || ch == '_' || ch == '.' || ch == '-';
  };
  return !id.empty() && id.size() <= kMaxReactionIdLength &&
         std::isalpha(static_cast<unsigned char>(id[0])) != 0 &&
         std::all_of(id.begin(), id.end(), allowed);
}

std::string element_imbalance(const Mechanism& m, const Reaction& rx) {
  std::map<std::string, long long> change;  // counts <= 9999 times coefficients <= 999
  for (const auto& [side, sign] : {std::pair{&rx.reactants, -1LL}, std::pair{&rx.products, 1LL}}) {
    for (const auto& e : *side) {
      for (const auto& [el, c] : m.species[e.species].composition.atoms)
        change[el] += sign * static_cast<long long>(c) * e.count;
    }
  }
  std::string off;
  for (const auto& [el, c] : change) {
    if (c != 0) off += fmt::format("{}{} {:+d}", off.empty() ? "" : ", ", el, c);
  }
  return off;
}

std::string rate_shape_problem(const Reaction& rx) {
  const bool photolysis = rx.rate.form == RateForm::kPhotolysis;
  if (photolysis && !rx.photon) return "'hv' among the reactants of a photolysis reaction";
  if (!photolysis && rx.photon) return "a photolysis rate for a reaction with 'hv'";
  if (rx.rate.form == RateForm::kFirstOrder && rx.molecularity() != 1)
    return "exactly one reactant for a first_order rate";
  const RateLaw& shape =
      rx.rate.form == RateForm::kEquilibriumReverse ? rx.rate.forward.front() : rx.rate;
  if ((shape.form == RateForm::kFalloff || shape.form == RateForm::kTroe) && !rx.third_body)
    return "'+ M' on both sides of a reaction with a fall-off rate";
  return {};
}

std::vector<std::size_t> requirement_cycle(const Mechanism& m) {
  // Depth-first search: 0 unvisited, 1 on the current path, 2 done.
  std::vector<int> state(m.modules.size(), 0);
  std::vector<std::size_t> path, cycle;
  std::function<void(std::size_t)> visit = [&](std::size_t i) {
    state[i] = 1;
    path.push_back(i);
    for (const std::size_t r : m.modules[i].requires_modules) {
      if (!cycle.empty()) return;
      if (state[r] == 1) {
        cycle.assign(std::find(path.begin(), path.end(), r), path.end());
        cycle.push_back(r);
        return;
      }
      if (state[r] == 0) visit(r);
    }
    path.pop_back();
    state[i] = 2;
  };
  for (std::size_t i = 0; i < m.modules.size() && cycle.empty(); ++i) {
    if (state[i] == 0) visit(i);
  }
  return cycle;
}

std::optional<std::pair<std::size_t, std::size_t>> missing_requirement(
    const Mechanism& m, const std::vector<std::size_t>& active) {
  for (auto a : active) {
    for (auto r : m.modules[a].requires_modules) {
      if (std::find(active.begin(), active.end(), r) == active.end()) return std::pair{a, r};
    }
  }
  return std::nullopt;
}

}  // namespace colchem
