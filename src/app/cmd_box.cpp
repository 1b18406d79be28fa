// colchem box CONFIG [-o OUT.nc] [--set key=value ...]: integrate one well-mixed cell at fixed
// T and p (box mode), write the time series as CF NetCDF and print a short summary.
#include <fmt/format.h>

#include <iostream>

#include "app/commands.hpp"
#include "chem/box_model.hpp"
#include "io/chemistry_section.hpp"
#include "io/dataset_writer.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "report/box_report.hpp"

namespace colchem::app {

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
    const BoxFileHeader header{box.name, box.resolved_yaml, box.temperature_K,
                               box.pressure_dyn_cm2, box.air_cm3};
    write_dataset(box_dataset(header, *box.chemistry.mechanism, res, ctx.command_line),
                  box.output_file);

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
