// colchem budget RUN.nc --species SO2: the reactions that dominate a species' production
// and loss, column-integrated and by altitude band, with their shares, and the closure of
// reactions plus transport against the model's net tendency.
#include <fmt/format.h>

#include <iostream>

#include "analysis/budget.hpp"
#include "app/commands.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"
#include "io/sweep_file.hpp"

namespace colchem::app {

void add_budget_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "budget", "Production and loss of species by reaction (column and altitude bands).");
  struct Options {
    std::string run;
    std::vector<std::string> species;
    std::vector<double> bands_km;
    std::size_t top = 8;
  };
  auto o = std::make_shared<Options>();
  cmd->add_option("RUN", o->run, "Run output (NetCDF written by colchem run)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("-s,--species", o->species, "Species to report (repeatable)")->required();
  cmd->add_option("--bands", o->bands_km,
                  "Altitude band edges in km, increasing (e.g. --bands 60 80 100 112)");
  cmd->add_option("--top", o->top, "Reactions listed per table")->capture_default_str();
  out.emplace_back(cmd, [o](Context&) {
    const NcReader nc(o->run);
    if (const auto why = sweep_file_instead_of_run(nc); !why.empty()) {
      throw RunError(ExitCode::kUsage, why);
    }
    const BudgetInputs in = read_budget_inputs(nc);
    std::vector<double> bands;
    for (std::size_t k = 0; k < o->bands_km.size(); ++k) {
      if (k > 0 && !(o->bands_km[k] > o->bands_km[k - 1])) {
        throw InputError(ExitCode::kUsage, SourceLocation{"--bands"}, "",
                         "increasing band edges", fmt::format("{} after {}", o->bands_km[k], o->bands_km[k - 1]));
      }
      bands.push_back(o->bands_km[k] * constants::kCmPerKm);
    }
    for (const auto& s : o->species) {
      bool known = false;
      for (const auto& n : in.species) known = known || n == s;
      if (!known) {
        std::string list;
        for (const auto& n : in.species) list += (list.empty() ? "" : ", ") + n;
        throw InputError(ExitCode::kUsage, SourceLocation{"--species"}, "",
                         "a species of the run (" + list + ")", "'" + s + "'");
      }
      std::cout << format_species_budget(species_budget(in, s, bands), o->top) << "\n";
    }
    return 0;
  });
}

}  // namespace colchem::app
