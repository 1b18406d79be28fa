// The box model's time series as a Dataset (report/box_report.hpp).
#include "report/box_report.hpp"

#include <vector>

#include "core/constants.hpp"

namespace colchem {

Dataset box_dataset(const BoxFileHeader& box, const Mechanism& m, const BoxResult& res,
                    const std::string& command_line) {
  Dataset ds;
  ds.global_text("Conventions", "CF-1.10");
  ds.global_text("title", "colchem box model: " + box.name);
  ds.global_text("history", command_line);
  ds.global_text("mechanism", m.name);
  ds.text("provenance_configuration", "the box configuration after every --set (YAML)",
          box.configuration_yaml);
  ds.text("provenance_mechanism", "the mechanism file", m.text);
  ds.global_number("temperature_K", box.temperature_K);
  ds.global_number("pressure_Pa", box.pressure_dyn_cm2 * constants::kPaPerBarye);
  ds.dimension("time", res.times_s.size());
  ds.dimension("species", res.species);
  ds.dimension("reaction", res.reactions);
  ds.variable(
      "time", {"time"},
      {kModelTimeUnits, "model time", "time", {{"axis", "T"}, {"calendar", kModelTimeCalendar}}},
      res.times_s);
  std::vector<std::string> names, ids, eqs;
  for (const auto& sp : m.species) names.push_back(sp.name);
  for (auto r : res.reaction_index) ids.push_back(m.reactions[r].id);
  for (auto r : res.reaction_index) eqs.push_back(m.reactions[r].equation);
  ds.strings("species_name", "species", "species name", names);
  ds.strings("reaction_id", "reaction", "reaction id as in the mechanism", ids);
  ds.strings("reaction_equation", "reaction", "reaction equation", eqs);
  std::vector<double> x(res.n_cm3);
  for (auto& v : x) v /= box.air_cm3;
  ds.variable("number_density", {"time", "species"}, {"cm-3", "number density", "", {}}, res.n_cm3);
  ds.variable("mole_fraction", {"time", "species"}, {"1", "mole fraction", "", {}}, x);
  ds.variable("production", {"time", "species"}, {"cm-3 s-1", "chemical production rate", "", {}},
              res.production);
  ds.variable("loss", {"time", "species"}, {"cm-3 s-1", "chemical loss rate", "", {}}, res.loss);
  ds.variable("reaction_rate", {"time", "reaction"},
              {"cm-3 s-1",
               "rate of each reaction (production of its products, loss of its reactants, per "
               "unit coefficient)",
               "",
               {}},
              res.reactions > 0 ? res.rates : std::vector<double>{});
  return ds;
}

}  // namespace colchem
