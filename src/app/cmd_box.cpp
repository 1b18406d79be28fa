// colchem box CONFIG [-o OUT.nc] [--set key=value ...]: integrate one well-mixed cell at fixed
// T and p (box mode), write the time series as CF NetCDF and print a short summary.
#include <fmt/format.h>

#include <iostream>

#include "app/commands.hpp"
#include "chem/box_model.hpp"
#include "io/chemistry_section.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"

namespace colchem::app {

namespace {

void write_box(const BoxSpec& box, const BoxResult& res, const std::string& command_line) {
  const Mechanism& m = *box.chemistry.mechanism;
  const std::size_t S = res.species, R = res.reactions, nt = res.times_s.size();
  NcWriter nc(box.output_file);
  nc.global_text("Conventions", "CF-1.10");
  nc.global_text("title", "colchem box model: " + box.name);
  nc.global_text("history", command_line);
  nc.global_text("mechanism", m.name);
  nc.text_variable("provenance_configuration", "the box configuration after every --set (YAML)",
                   box.resolved_yaml);
  nc.text_variable("provenance_mechanism", "the mechanism file", m.text);
  nc.global_number("temperature_K", box.temperature_K);
  nc.global_number("pressure_Pa", box.pressure_dyn_cm2 * 0.1);
  nc.dimension("time", nt);
  nc.dimension("species", S);
  nc.dimension("reaction", R);
  nc.variable("time", {"time"},
              NcVarAttrs{kModelTimeUnits,
                         "model time",
                         "time",
                         {{"axis", "T"}, {"calendar", kModelTimeCalendar}}});
  nc.string_variable("species_name", "species", "species name");
  nc.string_variable("reaction_id", "reaction", "reaction id as in the mechanism");
  nc.string_variable("reaction_equation", "reaction", "reaction equation");
  nc.variable("number_density", {"time", "species"}, NcVarAttrs{"cm-3", "number density", "", {}});
  nc.variable("mole_fraction", {"time", "species"}, NcVarAttrs{"1", "mole fraction", "", {}});
  nc.variable("production", {"time", "species"},
              NcVarAttrs{"cm-3 s-1", "chemical production rate", "", {}});
  nc.variable("loss", {"time", "species"}, NcVarAttrs{"cm-3 s-1", "chemical loss rate", "", {}});
  nc.variable("reaction_rate", {"time", "reaction"},
              NcVarAttrs{"cm-3 s-1", "rate of each reaction (production of its products, loss "
                                     "of its reactants, per unit coefficient)", "", {}});
  nc.end_definitions();
  nc.put("time", res.times_s);
  std::vector<std::string> names, ids, eqs;
  for (const auto& sp : m.species) names.push_back(sp.name);
  for (auto r : res.reaction_index) ids.push_back(m.reactions[r].id);
  for (auto r : res.reaction_index) eqs.push_back(m.reactions[r].equation);
  nc.put_strings("species_name", names);
  nc.put_strings("reaction_id", ids);
  nc.put_strings("reaction_equation", eqs);
  nc.put("number_density", res.n_cm3);
  std::vector<double> x(res.n_cm3);
  for (auto& v : x) v /= box.air_cm3;
  nc.put("mole_fraction", x);
  nc.put("production", res.production);
  nc.put("loss", res.loss);
  if (R > 0) nc.put("reaction_rate", res.rates);
  nc.commit();
  (void)S;
}

}  // namespace

void add_box_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand("box", "Integrate one well-mixed cell at fixed temperature and "
                                        "pressure (box mode) and write its CF NetCDF time series.");
  auto config = std::make_shared<std::string>();
  auto sets = std::make_shared<std::vector<std::string>>();
  auto output = std::make_shared<std::string>();
  cmd->add_option("CONFIG", *config, "Box configuration (YAML)")->required()->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", *output, "Output NetCDF file (default: output.file, else NAME.nc)");
  cmd->add_option("--set", *sets, "Override a config value by its dotted key path, e.g. "
                                  "--set chemistry.parameters.beta=0.02 (repeatable)");
  out.emplace_back(cmd, [config, sets, output](Context& ctx) {
    // 1. Load and validate; 2. integrate; 3. write; 4. summarise.
    const UnitSystem units;
    BoxSpec box = load_box_config(*config, *sets, units);
    if (!output->empty()) box.output_file = *output;
    refuse_output_onto_input(box.output_file, {{"the box configuration", *config}});
    const OutputClaim claim(box.output_file);
    const BoxProblem pb = box_problem(box);
    const BoxResult res = run_box(pb);
    write_box(box, res, ctx.command_line);

    const Mechanism& m = *box.chemistry.mechanism;
    const std::size_t S = res.species, R = res.reactions, last = res.times_s.size() - 1;
    std::cout << fmt::format("box {}: T = {} K, n_air = {:.4e} cm-3, t = {:g} s ({} steps, {} rejected)\n",
                             box.name, box.temperature_K, box.air_cm3, box.duration_s,
                             res.stats.steps, res.stats.rejected);
    std::cout << "final state (number density cm-3, mole fraction):\n";
    for (std::size_t s = 0; s < S; ++s) {
      const double v = res.n_cm3[last * S + s];
      std::cout << fmt::format("  {:<14} {:12.5e} {:12.5e}\n", m.species[s].name, v, v / box.air_cm3);
    }
    if (!box.report.empty()) std::cout << "reaction rates at the end (cm-3 s-1):\n";
    for (const auto& id : box.report) {
      const std::size_t mi = *m.find_reaction(id);  // checked by the loader
      const std::string label = id + "  " + m.reactions[mi].equation;
      bool found = false;
      for (std::size_t r = 0; r < R; ++r) {
        if (res.reaction_index[r] != mi) continue;
        found = true;
        std::cout << fmt::format("  {:<48} {:12.5e}\n", label, res.rates[last * R + r]);
      }
      if (!found) std::cout << fmt::format("  {:<48} (not an active reaction)\n", label);
    }
    ctx.log->info("wrote {}", box.output_file.string());
    return 0;
  });
}

}  // namespace colchem::app
