// The run file and the checkpoint as Datasets (report/run_report.hpp), one function per
// topic: solver status, fluxes, element budgets, exchanges, snapshots, history.
#include "report/run_report.hpp"

#include "core/column_state.hpp"
#include "report/column_report.hpp"
#include "report/photolysis_report.hpp"
#include "report/score_report.hpp"

namespace colchem {

namespace {
BudgetInputs budget_inputs(const ColumnModel& model, const ColumnDiagnostics& d) {
  BudgetInputs in;
  in.edge_cm = model.background().grid.edge_cm;
  in.species = model.species();
  in.equations = d.equations;
  in.reaction_ids = d.reaction_ids;
  in.net_stoichiometry = d.net_stoichiometry;
  in.reaction_rate = d.reaction_rate;
  in.transport_tendency = d.transport_tendency;
  in.net_tendency = d.net_tendency;
  return in;
}

void add_snapshots(Dataset& ds, const Background& bg, std::size_t S,
                   const std::vector<double>& times,
                   const std::vector<std::vector<double>>& snapshots) {
  if (snapshots.empty()) return;
  std::vector<double> snd, scol;
  for (const auto& x : snapshots) {
    const std::vector<double> nd = species_major(x, S);
    const std::vector<double> col = column_densities(x, S, bg.grid);
    snd.insert(snd.end(), nd.begin(), nd.end());
    scol.insert(scol.end(), col.begin(), col.end());
  }
  ds.dimension("snapshot", snapshots.size());
  ds.variable("snapshot", {"snapshot"},
              {kModelTimeUnits,
               "model time of the snapshot",
               "time",
               {{"axis", "T"}, {"calendar", kModelTimeCalendar}}},
              times);
  ds.variable("snapshot_number_density", {"snapshot", "species", "altitude"},
              {"cm-3", "number density at the snapshot time", "", {}}, snd);
  ds.variable("snapshot_column_density", {"snapshot", "species"},
              {"cm-2", "column density at the snapshot time", "", {}}, scol);
}

void add_status(Dataset& ds, const RunOutcome& o) {
  ds.global_text("colchem_solver_method", o.method);
  ds.global_text("colchem_solver_status", to_string(o.status));
  ds.global_text("colchem_solver_reason", o.reason);
  ds.global_number("colchem_residual_norm", o.residual_norm);
  ds.global_number("colchem_column_balance", o.balance.worst);
  ds.global_number("colchem_iterations", static_cast<double>(o.iterations));
  if (!o.sequence.empty()) {
    ds.global_text("colchem_grid_sequence", describe_sequence(o.sequence, false));
  }
  ds.global_number("colchem_model_time_s", o.time_s);
}

/// Held species and the fluxes through the cell edges.
void add_fluxes(Dataset& ds, const ColumnModel& model, const ColumnDiagnostics& d) {
  std::vector<double> held;
  for (std::size_t s = 0; s < model.species_count(); ++s) held.push_back(model.held(s) ? 1 : 0);
  ds.flag("held_fixed", {"species"}, "species held at its background mixing ratio",
          "transported held_fixed", held);
  for (const auto& [v, data] :
       {std::pair{"flux", &d.edge_flux}, std::pair{"eddy_flux", &d.eddy_flux},
        std::pair{"molecular_flux", &d.molecular_flux}}) {
    ds.variable(v, {"species", "altitude_edge"},
                {"cm-2 s-1", std::string(v) + " through cell edges, positive upward", "", {}},
                *data);
  }
  ds.variable("bottom_flux", {"species"},
              {"cm-2 s-1", "upward flux through the bottom edge", "", {}}, d.bottom_flux);
  ds.variable("top_flux", {"species"}, {"cm-2 s-1", "upward flux through the top edge", "", {}},
              d.top_flux);
}

void add_element_budgets(Dataset& ds, const std::vector<ElementBudget>& budgets) {
  ds.dimension("element", budgets.size());
  std::vector<std::string> el;
  for (const auto& b : budgets) el.push_back(b.element);
  ds.strings("element_name", "element", "chemical element", el);
  const auto column = [&](double ElementBudget::*m) {
    std::vector<double> v;
    for (const auto& b : budgets) v.push_back(b.*m);
    return v;
  };
  struct Term {
    const char* name;
    double ElementBudget::*member;
    const char* what;
  };
  for (const Term& t :
       {Term{"element_boundary_in", &ElementBudget::boundary_in,
             "atoms entering through the bottom minus leaving through the top"},
        Term{"element_chemistry", &ElementBudget::chemistry,
             "chemical change of the transported species"},
        Term{"element_held_supply", &ElementBudget::held_supply,
             "chemical change of held species (supplied from outside)"},
        Term{"element_sinks", &ElementBudget::sinks,
             "removal by sinks (condensation, product-less reactions)"},
        Term{"element_condensed", &ElementBudget::condensed,
             "gained from the condensed phase (evaporation minus condensation; part of "
             "chemistry)"},
        Term{"element_profile_supply", &ElementBudget::profile_supply,
             "supplied to hold species profiles (part of chemistry)"},
        Term{"element_imbalance", &ElementBudget::imbalance,
             "boundary_in + chemistry: column change of the element"}}) {
    ds.variable(t.name, {"element"}, {"cm-2 s-1", t.what, "", {}}, column(t.member));
  }
  ds.variable("element_relative_imbalance", {"element"},
              {"1", "|imbalance| / gross (sum of magnitudes of every column term)", "", {}},
              column(&ElementBudget::relative_imbalance));
}

void add_exchanges(Dataset& ds, const std::vector<ExchangeReport>& exchanges) {
  if (exchanges.empty()) return;
  std::vector<std::string> xeq;
  std::vector<double> xn, xk, xr;
  for (const auto& x : exchanges) {
    xeq.push_back(x.equation);
    xn.insert(xn.end(), x.n_eq.begin(), x.n_eq.end());
    xk.insert(xk.end(), x.k.begin(), x.k.end());
    for (int v : x.reservoir) xr.push_back(v);
  }
  ds.dimension("exchange", exchanges.size());
  ds.strings("exchange_equation", "exchange",
             "exchange with a condensed phase or held profile (its pseudo-reaction)", xeq);
  ds.variable("exchange_equilibrium_density", {"exchange", "altitude"},
              {"cm-3",
               "saturation density (held density for a held profile); 0 where the exchange "
               "does not act",
               "",
               {}},
              xn);
  ds.variable("exchange_rate_constant", {"exchange", "altitude"},
              {"s-1",
               "relaxation rate constant k of f = -k (n - n_eq); 0 where the exchange does not act",
               "",
               {}},
              xk);
  ds.flag("exchange_reservoir", {"exchange", "altitude"},
          "a condensed reservoir (or held profile) allows evaporation or supply",
          "no_reservoir reservoir", xr);
}

/// Species, reactions, fluxes, budgets, exchanges, J-values and snapshots of the end state.
void add_chemistry(Dataset& ds, ColumnModel& model, const RunOutcome& o) {
  const Background& bg = model.background();
  model.refresh_photolysis(o.x);
  const ColumnDiagnostics d = model.diagnostics(o.x, o.time_s);
  add_species(ds, bg, model.species(), o.x);
  add_reactions(ds, {d.reaction_ids, d.equations, d.net_stoichiometry, d.reaction_rate,
                     d.chemical_tendency, d.transport_tendency, d.net_tendency});
  add_fluxes(ds, model, d);
  add_element_budgets(ds, column_element_budgets(model, d));
  add_exchanges(ds, model.exchange_report(o.x));
  if (model.photolysis()) add_photolysis(ds, *model.photolysis(), {model.jvalues()});
  add_snapshots(ds, bg, model.species_count(), o.snapshot_times_s, o.snapshots);
}

void add_history(Dataset& ds, const std::vector<HistoryRow>& history) {
  std::vector<double> hr, hs, hc, ht, hw;
  for (const auto& h : history) {
    hr.push_back(h.residual_norm);
    hs.push_back(h.step_s);
    hc.push_back(h.change);
    ht.push_back(h.time_s);
    hw.push_back(h.wall_s);
  }
  ds.dimension("iteration", history.size());
  ds.variable("history_residual_norm", {"iteration"}, {"1", "scaled coupled residual", "", {}}, hr);
  ds.variable("history_step", {"iteration"},
              {"s", "pseudo-time step (steady) or time step (transient)", "", {}}, hs);
  ds.variable("history_change", {"iteration"},
              {"1", "max relative change (steady) or step error estimate (transient)", "", {}}, hc);
  ds.variable("history_time", {"iteration"}, {"s", "model time (transient)", "", {}}, ht);
  ds.variable("history_wall_time", {"iteration"},
              {"s", "wall time since the solve started", "", {}}, hw);
}
}  // namespace

std::vector<ElementBudget> column_element_budgets(const ColumnModel& model,
                                                  const ColumnDiagnostics& d) {
  const Mechanism& mech = model.chemistry().kinetics().mechanism();
  std::vector<std::vector<std::pair<std::string, int>>> atoms;
  std::vector<bool> held;
  for (std::size_t s = 0; s < model.species_count(); ++s) {
    atoms.emplace_back(mech.species[s].composition.atoms.begin(),
                       mech.species[s].composition.atoms.end());
    held.push_back(model.held(s));
  }
  return element_budgets(budget_inputs(model, d), atoms, held, d.bottom_flux, d.top_flux);
}

Dataset run_dataset(const Scenario& sc, ColumnModel& model, const RunOutcome& o,
                    const std::string& command_line, const std::vector<SpeciesScore>& scores) {
  Dataset ds;
  add_provenance(ds, sc, command_line);
  add_status(ds, o);
  if (!model.injections().empty()) {
    ds.global_number("colchem_injection_time_s", model.injections().front().time_s);
  }
  add_background(ds, model.background());
  if (model.has_chemistry()) add_chemistry(ds, model, o);
  add_history(ds, o.history);
  if (!scores.empty()) add_scores(ds, scores);
  return ds;
}

Dataset checkpoint_dataset(const Scenario& sc, const ColumnModel& model, const RunCheckpoint& cp,
                           const std::string& command_line) {
  const Background& bg = model.background();
  Dataset ds;
  add_provenance(ds, sc, command_line);
  ds.global_text("colchem_solver_status", "checkpoint");
  ds.global_text("colchem_solver_method", cp.method);
  ds.global_number("colchem_model_time_s", cp.time_s);
  ds.global_number("colchem_iterations", static_cast<double>(cp.iteration));
  ds.global_number("colchem_step_s", cp.step_s);
  add_background(ds, bg);
  add_species(ds, bg, model.species(), cp.x);
  add_snapshots(ds, bg, model.species_count(), cp.snapshot_times_s, cp.snapshots);
  return ds;
}

}  // namespace colchem
