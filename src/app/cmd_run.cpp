// colchem run CONFIG [-o OUT.nc] [--set key=value ...]: run a scenario, write CF NetCDF.
#include "app/commands.hpp"
#include "core/background.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"

namespace colchem::app {

void add_run_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand("run", "Run a scenario and write its CF NetCDF output.");
  auto config = std::make_shared<std::string>();
  auto sets = std::make_shared<std::vector<std::string>>();
  auto output = std::make_shared<std::string>();
  cmd->add_option("CONFIG", *config, "Scenario file (YAML)")->required()->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", *output, "Output NetCDF file (default: output.file of the "
                                          "scenario, else SCENARIO_NAME.nc)");
  cmd->add_option("--set", *sets, "Override a config value by its dotted key path, e.g. "
                                  "--set grid.cells=120 (repeatable)");
  out.emplace_back(cmd, [config, sets, output](Context& ctx) {
    const UnitSystem units;
    Scenario sc = load_scenario(*config, *sets, units);
    if (!output->empty()) sc.output.file = *output;
    ctx.log->info("scenario {} ({} cells)", sc.name, sc.background.grid.cells());
    const Background bg = build_background(sc.background);

    NcWriter nc(sc.output.file);
    write_provenance(nc, sc, ctx.command_line);
    define_background(nc, bg);
    nc.end_definitions();
    write_background_data(nc, bg);
    nc.commit();
    ctx.log->info("wrote {}", sc.output.file.string());
    return 0;
  });
}

}  // namespace colchem::app
