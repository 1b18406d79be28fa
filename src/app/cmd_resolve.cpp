// colchem resolve CONFIG [-o OUT.nc] [--set key=value ...] [--cells N] [--levels 3]
//                 [--ratio 2] [--equidistribute N [--passes 2] [--max-ratio 1.2]
//                 [--grid-out GRID.yaml]]
// Resolution as a result: solves the scenario on N, rN, r^2 N ... cells and reports, per
// species, the observed order and the Richardson error of its profile and of its scores
// (Roache 1998); with --equidistribute, first places N edges by equidistributing a
// monitor of the e-folding lengths of a first solve and studies that grid family instead.
#include <fmt/format.h>

#include <iostream>

#include "analysis/observations.hpp"
#include "solve/resolution_runner.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"
#include "report/column_report.hpp"
#include "report/resolution_report.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"

namespace colchem::app {

namespace {

struct ResolveCliOptions {
  std::string config, output, grid_out;
  std::vector<std::string> sets;
  std::size_t cells = 0, levels = 3, ratio = 2, equidistribute = 0;
  int passes = 2;
  double max_ratio = 1.2, uniform_share = 0.5, floor = 1e-10, low = 1.5, high = 2.5;
};

int run_resolve(const ResolveCliOptions& o, Context& ctx) {
  // 1. Load the scenario (for its grid, observations and the provenance of the output).
  const UnitSystem units;
  const Scenario sc = load_scenario(o.config, o.sets, units);
  const std::filesystem::path output = o.output.empty()
                                           ? std::filesystem::path(sc.name + "_resolution.nc")
                                           : std::filesystem::path(o.output);
  ObservationSet obs;
  if (!sc.observations.empty()) obs = read_observations(sc.observations, units);
  if (!(o.low < o.high)) {
    throw InputError(ExitCode::kUsage, SourceLocation{"--order-low/--order-high"}, "",
                     "--order-low below --order-high", fmt::format("{} and {}", o.low, o.high));
  }

  // 2. The coarsest grid: the scenario's, or uniform cells over its column.
  const Grid& g = sc.background.grid;
  std::vector<double> base = g.edge_cm;
  if (o.cells > 0) base = Grid::uniform(g.edge_cm.front(), g.edge_cm.back(), o.cells).edge_cm;

  const PetscSession petsc;
  const InterruptGuard interrupt;
  SolveRequest req = solve_request(BaseStart(o.config, o.sets), ctx.log.get(), interrupt);
  req.observations = obs.points.empty() ? nullptr : &obs;

  // 3. Optionally adapt: equidistribute the monitor of a solve, write the grid section.
  if (o.equidistribute > 0) {
    EquidistributionOptions eo;
    eo.max_neighbour_ratio = o.max_ratio;
    eo.relative_floor = o.floor;
    eo.uniform_share = o.uniform_share;
    base = adapt_grid(req, base, o.equidistribute, o.passes, eo, units);
    std::filesystem::path grid_file = o.grid_out;
    if (grid_file.empty())
      grid_file = std::filesystem::path(output).replace_extension(".grid.yaml");
    write_text_file(grid_file,
                    grid_section_yaml(base, fmt::format("equidistributed grid of {} cells for {} "
                                                        "(colchem resolve --equidistribute)",
                                                        o.equidistribute, o.config)));
    ctx.log->info("wrote the adapted grid to {}", grid_file.string());
  }

  // 4. Solve the grid family, compare, write and print.
  ResolutionOptions ro;
  ro.relative_floor = o.floor;
  ro.range.low = o.low;
  ro.range.high = o.high;
  const ResolutionStudy st = run_resolution_study(req, base, o.levels, o.ratio, ro, units);
  Dataset ds;
  add_provenance(ds, sc, ctx.command_line);
  add_resolution(ds, st, ro);
  write_dataset(ds, output);
  std::cout << resolution_table_text(st);
  ctx.log->info("wrote {}", output.string());
  if (!st.all_converged()) {
    ctx.log->error("a level did not converge: its species are marked failed");
    return static_cast<int>(ExitCode::kNotConverged);
  }
  return 0;
}

}  // namespace

void add_resolve_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "resolve",
      "Solve a scenario on a family of refined grids; report each species' observed order and "
      "Richardson error estimate (profiles and scores); optionally adapt the grid first.");
  auto o = std::make_shared<ResolveCliOptions>();
  cmd->add_option("CONFIG", o->config, "Scenario file (YAML)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("-o,--output", o->output,
                  "Output NetCDF file (default: SCENARIO_NAME_resolution.nc)");
  cmd->add_option("--set", o->sets,
                  "Override a config value by its dotted key path, e.g. "
                  "--set solver.tolerance=1e-10 (repeatable)");
  cmd->add_option("--cells", o->cells,
                  "Coarsest level: this many uniform cells over the scenario's column "
                  "(default: the scenario's grid)")
      ->check(CLI::Range(std::size_t{3}, std::size_t{100000}));
  cmd->add_option("--levels", o->levels, "Number of grids (at least 3)")
      ->check(CLI::Range(std::size_t{3}, std::size_t{8}));
  cmd->add_option("--ratio", o->ratio, "Refinement ratio between levels (each cell split in r)")
      ->check(CLI::Range(std::size_t{2}, std::size_t{8}));
  cmd->add_option("--floor", o->floor,
                  "Altitudes where a species is below FLOOR times its peak are not compared")
      ->check(CLI::Range(0.0, 1.0));
  cmd->add_option("--order-low", o->low, "Lowest observed order counted as asymptotic");
  cmd->add_option("--order-high", o->high, "Highest observed order counted as asymptotic");
  cmd->add_option("--equidistribute", o->equidistribute,
                  "Adapt first: N edges equidistributing the e-folding monitor of a solve on "
                  "the coarsest grid; the study then refines the adapted grid")
      ->check(CLI::Range(std::size_t{3}, std::size_t{100000}));
  cmd->add_option("--passes", o->passes, "Solve-and-equidistribute passes")
      ->check(CLI::Range(1, 10));
  cmd->add_option("--max-ratio", o->max_ratio, "Bound on the ratio of neighbouring cell widths")
      ->check(CLI::Range(1.0, 10.0));
  cmd->add_option("--uniform-share", o->uniform_share,
                  "Share of the adapted cells spread uniformly (the rest follow the shortest "
                  "e-folding length of the species' profiles)")
      ->check(CLI::Range(0.01, 0.99));
  cmd->add_option("--grid-out", o->grid_out,
                  "Where the adapted grid is written as a grid: section (default: "
                  "OUTPUT with .grid.yaml)");
  out.emplace_back(cmd, [o](Context& ctx) { return run_resolve(*o, ctx); });
}

}  // namespace colchem::app
