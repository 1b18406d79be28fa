// summarize_run (summary.hpp): kept apart from the scenario summary because it reads the
// solver's status, so that the launcher (`check` and the other light commands) does not
// link the solvers.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "app/summary.hpp"
#include "report/run_report.hpp"

namespace colchem::app {

std::string summarize_run(const Scenario& sc, ColumnModel& model, const RunOutcome& r) {
  std::string s = fmt::format(
      "{}: {} {} after {} {} ({:.2f} s); coupled residual {:.2e}; column balance {:.2e}{}\n",
      sc.name, r.method, to_string(r.status), r.iterations,
      r.method == "steady" ? "iterations" : "steps", r.wall_s, r.residual_norm, r.balance.worst,
      r.balance.worst > 0.0 ? " (" + model.species()[r.balance.worst_species] + ")"
                            : " (every species within round-off)");
  if (!r.ok()) s += "  reason: " + r.reason + "\n";
  if (!r.sequence.empty()) {
    long total = r.iterations;
    for (const auto& l : r.sequence) total += l.iterations;
    s += fmt::format("  started by grid sequencing: {}; {} iterations in all\n",
                     describe_sequence(r.sequence, true), total);
  }
  model.refresh_photolysis(r.x);
  const ColumnDiagnostics d = model.diagnostics(r.x, r.time_s);
  s += "element budgets (cm-2 s-1): element, boundary in, sinks (all), of them to the condensed "
       "phase, held supply, held-profile supply, imbalance (relative)\n";
  for (const auto& b : column_element_budgets(model, d)) {
    s += fmt::format(
        "  {:<3} {:+11.3e} {:+11.3e} {:+11.3e} {:+11.3e} {:+11.3e} {:+11.3e} ({:.1e})\n", b.element,
        b.boundary_in, b.sinks, b.condensed, b.held_supply, b.profile_supply, b.imbalance,
        b.relative_imbalance);
  }
  for (const auto& x : model.exchange_report(r.x)) {
    if (x.held_profile) {
      double worst = 0.0;
      for (std::size_t j = 0; j < x.n_eq.size(); ++j) {
        if (x.n_eq[j] > 0.0)
          worst = std::max(worst,
                           std::abs(r.x[j * model.species_count() + x.species] / x.n_eq[j] - 1.0));
      }
      s += fmt::format("{}: largest relative departure from the held profile {:.2e}\n", x.equation,
                       worst);
    } else {
      s += fmt::format(
          "{}: vapour at most 10x saturation in {} of {} cells with condensed phase "
          "(largest vapour/saturation there {:.3g})\n",
          x.equation, x.within_10x, x.reservoir_cells, x.worst_ratio);
    }
  }
  const std::size_t S = model.species_count(), N = model.cells();
  const auto& bg = model.background();
  s += "mole fractions: species, bottom cell, middle cell, top cell\n";
  for (std::size_t k = 0; k < S; ++k) {
    if (model.held(k)) continue;
    const auto f = [&](std::size_t j) { return r.x[j * S + k] / bg.air_density_cm3[j]; };
    s += fmt::format("  {:<10} {:10.3e} {:10.3e} {:10.3e}\n", model.species()[k], f(0), f(N / 2),
                     f(N - 1));
  }
  return s;
}

}  // namespace colchem::app
