// colchem compare RUN.nc OBS.csv: score a run's profiles against observed ones, print the
// per-point table and write the scores into the NetCDF (in place, or into -o OUT.nc).
#include <charconv>
#include <iostream>
#include <string>
#include <system_error>

#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "app/commands.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/sweep_file.hpp"
#include "report/score_report.hpp"

namespace colchem::app {

void add_compare_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "compare", "Score a run against an observed profile (chi-square in log and linear space).");
  struct Options {
    std::string run, obs, output;
    int fitted = 0;
    bool dry = false;
  };
  auto o = std::make_shared<Options>();
  cmd->add_option("RUN", o->run, "Run output (NetCDF written by colchem run)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("OBS", o->obs, "Observation file (CSV; README \"Observation files\")")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", o->output,
                  "Write the run plus its scores to this file instead of amending RUN");
  cmd->add_option("-p,--fitted-parameters", o->fitted,
                  "Number of fitted parameters p in the reduced chi-square chi2/(N - p)")
      ->check(CLI::Validator(
          [](std::string& text) -> std::string {
            int value = 0;
            const char* end = text.data() + text.size();
            const auto [ptr, ec] = std::from_chars(text.data(), end, value);
            if (ec != std::errc{} || ptr != end || value < 0) {
              return "expected a whole number of at least 0, found '" + text.substr(0, 40) +
                     (text.size() > 40 ? "...'" : "'");
            }
            return {};
          },
          "INT>=0", "whole number"))
      ->capture_default_str();
  cmd->add_flag("--no-write", o->dry, "Print the scores only");
  out.emplace_back(cmd, [o](Context& ctx) {
    const UnitSystem units;
    // -o may be RUN itself (amended in place), never the observation file.
    refuse_output_onto_input(o->output, {{"the observation file", o->obs}});
    const OutputClaim claim(o->output);
    const ObservationSet obs = read_observations(o->obs, units);
    ModelColumn model;
    {
      const NcReader nc(o->run);
      if (const auto why = sweep_file_instead_of_run(nc); !why.empty()) {
        throw RunError(ExitCode::kUsage, why);
      }
      model = read_model_column(nc);
      if (nc.has_variable("chi2_log") && !o->dry && o->output.empty()) {
        throw RunError(ExitCode::kOutput, o->run + " already holds scores; write the new ones to "
                                                   "another file with -o OUT.nc");
      }
    }
    const auto scores =
        score_column(model.altitude_cm, model.species, model.mole_fraction, obs, o->fitted);
    // chi2/(N - p) needs N > p for every species (else NaN or a negative count).
    for (const auto& sc : scores) {
      if (static_cast<long>(sc.n_points) > static_cast<long>(o->fitted)) continue;
      throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "-p/--fitted-parameters",
                       "fewer fitted parameters than the observation points of each species "
                       "inside the model grid (" +
                           sc.species + ": " + std::to_string(sc.n_points) + " in " + o->obs + ")",
                       std::to_string(o->fitted));
    }
    std::cout << format_scores(scores);
    if (!o->dry) {
      const std::string target = o->output.empty() ? o->run : o->output;
      Dataset ds;
      ds.global_text("colchem_observation_file", o->obs);
      ds.global_text("colchem_observations", obs.text);
      add_scores(ds, scores);
      amend_dataset(o->run, ds, target);
      ctx.log->info("wrote scores into {}", target);
    }
    return 0;
  });
}

}  // namespace colchem::app
