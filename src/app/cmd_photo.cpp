// colchem photo CONFIG [--from RUN.nc] [-o OUT.nc] [--spectrum]: the J-values of a scenario's
// photolysis channels at every level, for its initial state or a run's final state, without
// solving anything; with the two-stream scheme also their enhancement over the direct beam.
#include <iostream>

#include "app/commands.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/scenario.hpp"
#include "photo/photolysis_output.hpp"
#include "report/column_report.hpp"
#include "report/photolysis_report.hpp"
#include "solve/column_model.hpp"

namespace colchem::app {

void add_photo_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "photo", "Print (and optionally write) the J-values of a scenario without solving.");
  struct Options {
    std::string config, from, output;
    std::vector<std::string> sets;
    bool spectrum = false;
  };
  auto o = std::make_shared<Options>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--from", o->from, "Take the absorbers' densities from a run output")
      ->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", o->output, "Write J-values (and the spectrum) to NetCDF");
  cmd->add_flag("--spectrum", o->spectrum, "Also write the actinic flux spectrum (with -o)");
  cmd->add_option("--set", o->sets, "Override a config value by its dotted key path");
  out.emplace_back(cmd, [o](Context& ctx) {
    const UnitSystem units;
    const Scenario sc = load_scenario(o->config, o->sets, units);
    refuse_output_onto_input(o->output,
                             {{"the scenario file", o->config}, {"the run file", o->from}});
    const OutputClaim claim(o->output);
    ColumnModel model(sc);
    if (!model.photolysis()) {
      throw InputError(ExitCode::kConfig, SourceLocation{sc.file.string()}, "photolysis",
                       "a scenario with photolysis channels", "none");
    }
    std::vector<double> n = model.initial_state();
    if (!o->from.empty()) model.take_restart(read_model_column(o->from), n);
    const PhotolysisModel& photo = *model.photolysis();
    std::vector<double> J(photo.channels().size() * model.cells());
    std::vector<double> F(o->spectrum ? model.cells() * photo.bins() : 0);
    // A model of our own (not the column model's) so that the spectrum can be asked for.
    PhotolysisModel local(sc.photolysis, model.background(), model.species(),
                          sc.chemistry.parameters);
    local.compute(n, J, F);
    std::cout << format_jvalue_table(local, J, model.background().grid);
    // With the two-stream scheme: the same state under the direct beam alone, and the
    // enhancement factor of every channel's J over it.
    std::vector<double> J_direct;
    if (local.two_stream()) {
      PhotolysisSpec direct_spec = sc.photolysis;
      direct_spec.radiative_transfer = RadiativeTransferSpec{};
      PhotolysisModel direct(direct_spec, model.background(), model.species(),
                             sc.chemistry.parameters);
      J_direct.resize(J.size());
      direct.compute(n, J_direct);
      std::cout << "\nenhancement of J over the direct beam (two-stream / direct-beam)\n"
                << format_jvalue_table(local, enhancement_factors(J, J_direct),
                                       model.background().grid, "[1]");
    }
    if (!o->output.empty()) {
      Dataset ds;
      add_provenance(ds, sc, ctx.command_line);
      add_background(ds, model.background());
      add_photolysis(ds, local, {J, F, J_direct, o->spectrum});
      write_dataset(ds, o->output);
      ctx.log->info("wrote {}", o->output);
    }
    return 0;
  });
}

}  // namespace colchem::app
