// Text summary of a scenario's chemistry (chem/chemistry_summary.hpp).
#include "chem/chemistry_summary.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <set>

#include "core/constants.hpp"

namespace colchem {

std::string summarize_chemistry(const Mechanism& mech, const ChemistrySpec& spec, bool verbose) {
  std::string out =
      fmt::format("chemistry  mechanism {} ({} species, {} fixed; {} reactions in {} modules)\n",
                  mech.name, mech.species.size(),
                  std::count_if(mech.species.begin(), mech.species.end(),
                                [](const Species& s) { return s.fixed; }),
                  mech.reactions.size(), mech.modules.size());
  std::set<std::size_t> seen;
  std::size_t balanced = 0, sinks = 0, active_reactions = 0;
  for (std::size_t i = 0; i < mech.modules.size(); ++i) {
    const Module& md = mech.modules[i];
    const bool on = std::find(spec.modules.begin(), spec.modules.end(), i) != spec.modules.end();
    std::vector<std::string> added;
    for (auto r : md.reactions) {
      const Reaction& rx = mech.reactions[r];
      for (const auto* side : {&rx.reactants, &rx.products}) {
        for (const auto& e : *side) {
          if (seen.insert(e.species).second) added.push_back(mech.species[e.species].name);
        }
      }
      if (on) {
        ++active_reactions;
        (rx.sink ? sinks : balanced)++;
      }
    }
    out += fmt::format("  module {:<12} {:<8} {} reactions, adds {} species{}{}\n", md.name,
                       on ? "active" : "off", md.reactions.size(), added.size(),
                       added.empty() ? "" : ": ", fmt::join(added, " "));
    if (verbose) {
      for (auto r : md.reactions) {
        const Reaction& rx = mech.reactions[r];
        out += fmt::format("      {:<20} {:<40} {}{}\n", rx.id, rx.equation,
                           rate_form_name(rx.rate.form),
                           rx.source.empty() ? "" : "  [" + rx.source + "]");
      }
    }
  }
  for (std::size_t p = 0; p < mech.parameters.size(); ++p) {
    out +=
        fmt::format("  parameter {} = {} (default {}, range [{}, {}])\n", mech.parameters[p].name,
                    spec.parameters.at(p), mech.parameters[p].default_value, mech.parameters[p].min,
                    mech.parameters[p].max);
  }
  for (const auto& s : spec.exchanges) {
    const bool two_way = s.has_condensed || s.rate == CondensationExchange::Rate::kKinetic;
    std::string range;
    if (std::isfinite(s.above_cm))
      range += fmt::format(" from {} km", s.above_cm / constants::kCmPerKm);
    if (std::isfinite(s.below_cm))
      range += fmt::format(" below {} km", s.below_cm / constants::kCmPerKm);
    const std::string rate = s.rate == CondensationExchange::Rate::kKinetic
                                 ? fmt::format("kinetic, accommodation {:g}", s.accommodation)
                                 : (s.timescale_table.altitude_cm.empty()
                                        ? fmt::format("timescale {:g} s", s.timescale_s)
                                        : std::string("timescale profile"));
    out += fmt::format("  condensation of {}{} ({}, {})\n", mech.species[s.species].name, range,
                       two_way ? "condensation and evaporation" : "condensation only", rate);
  }
  out += fmt::format(
      "  {} of {} active reactions balanced in every element; {} sinks (no "
      "products) exempt\n",
      balanced, active_reactions, sinks);
  return out;
}

}  // namespace colchem
