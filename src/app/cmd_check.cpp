// colchem check CONFIG: load and validate a scenario, print a summary of its column.
#include <fmt/format.h>

#include <algorithm>
#include <iostream>

#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "app/commands.hpp"
#include "app/summary.hpp"
#include "chem/chemistry_summary.hpp"
#include "core/background.hpp"
#include "io/chemistry_section.hpp"
#include "io/observation_loader.hpp"
#include "io/scenario.hpp"
#include "solve/column_model.hpp"

namespace colchem::app {

void add_check_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand("check", "Load and validate a scenario; print a summary of the "
                                          "column, species and modules.");
  auto config = std::make_shared<std::string>();
  auto sets = std::make_shared<std::vector<std::string>>();
  cmd->add_option("CONFIG", *config, "Scenario file (YAML)")->required()->check(CLI::ExistingFile);
  cmd->add_option("--set", *sets, "Override a config value by its dotted key path, e.g. "
                                  "--set grid.cells=120 (repeatable)");
  auto verbose = std::make_shared<bool>(false);
  cmd->add_flag("-v,--verbose", *verbose, "List every reaction of every module");
  out.emplace_back(cmd, [config, sets, verbose](Context& ctx) {
    const UnitSystem units;
    const Scenario sc = load_scenario(*config, *sets, units);
    const Background bg = build_background(sc.background);
    std::cout << summarize_scenario(sc, bg);
    if (sc.chemistry.mechanism) {
      std::cout << summarize_chemistry(*sc.chemistry.mechanism, sc.chemistry, *verbose);
    }
    // Everything `run` builds before it solves, so that check refuses what run refuses at
    // load: the column model (species settings against the mechanism, injections,
    // photolysis channels against their data) and the observations.
    const ColumnModel model(sc);
    if (!sc.observations.empty()) {
      require_observed_species(read_observations(sc.observations, units), model.species());
    }
    ctx.log->info("{}: valid", *config);
    return 0;
  });
}

}  // namespace colchem::app
