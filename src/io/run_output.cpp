#include "io/run_output.hpp"

#include <cmath>

#include "core/column_state.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"
#include "io/score_output.hpp"
#include "photo/photolysis_output.hpp"

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

void define_snapshots(NcWriter& nc, std::size_t count) {
  if (count == 0) return;
  nc.dimension("snapshot", count);
  nc.variable("snapshot", {"snapshot"},
              {kModelTimeUnits,
               "model time of the snapshot",
               "time",
               {{"axis", "T"}, {"calendar", kModelTimeCalendar}}});
  nc.variable("snapshot_number_density", {"snapshot", "species", "altitude"},
              {"cm-3", "number density at the snapshot time", "", {}});
  nc.variable("snapshot_column_density", {"snapshot", "species"},
              {"cm-2", "column density at the snapshot time", "", {}});
}

void write_snapshots(NcWriter& nc, const Background& bg, std::size_t S,
                     const std::vector<double>& times,
                     const std::vector<std::vector<double>>& snapshots) {
  if (snapshots.empty()) return;
  nc.put("snapshot", times);
  std::vector<double> snd, scol;
  for (const auto& x : snapshots) {
    const std::vector<double> nd = species_major(x, S);
    const std::vector<double> col = column_densities(x, S, bg.grid);
    snd.insert(snd.end(), nd.begin(), nd.end());
    scol.insert(scol.end(), col.begin(), col.end());
  }
  nc.put("snapshot_number_density", snd);
  nc.put("snapshot_column_density", scol);
}

void write_status(NcWriter& nc, const RunOutcome& o) {
  nc.global_text("colchem_solver_method", o.method);
  nc.global_text("colchem_solver_status", to_string(o.status));
  nc.global_text("colchem_solver_reason", o.reason);
  nc.global_number("colchem_residual_norm", o.residual_norm);
  nc.global_number("colchem_column_balance", o.balance.worst);
  nc.global_number("colchem_iterations", static_cast<double>(o.iterations));
  if (!o.sequence.empty()) {
    nc.global_text("colchem_grid_sequence", describe_sequence(o.sequence, false));
  }
  nc.global_number("colchem_model_time_s", o.time_s);
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

void write_run_file(const std::filesystem::path& file, const Scenario& sc, ColumnModel& model,
                    const RunOutcome& o, const std::string& command_line,
                    const std::vector<SpeciesScore>& scores) {
  const Background& bg = model.background();
  const std::size_t S = model.species_count();
  NcWriter nc(file);
  write_provenance(nc, sc, command_line);
  write_status(nc, o);
  if (!model.injections().empty()) {
    nc.global_number("colchem_injection_time_s", model.injections().front().time_s);
  }
  define_background(nc, bg);
  const bool chem = model.has_chemistry();
  ColumnDiagnostics d;
  std::vector<ElementBudget> budgets;
  std::vector<ExchangeReport> exchanges;
  if (chem) {
    model.refresh_photolysis(o.x);
    d = model.diagnostics(o.x, o.time_s);
    budgets = column_element_budgets(model, d);
    exchanges = model.exchange_report(o.x);
    define_species(nc, model.species());
    define_reactions(nc, d.equations.size());
    nc.variable("held_fixed", {"species"},
                {"",
                 "species held at its background mixing ratio",
                 "",
                 {{"flag_meanings", "transported held_fixed"}},
                 true,
                 {0, 1}});
    for (const char* v : {"flux", "eddy_flux", "molecular_flux"}) {
      nc.variable(v, {"species", "altitude_edge"},
                  {"cm-2 s-1", std::string(v) + " through cell edges, positive upward", "", {}});
    }
    nc.variable("bottom_flux", {"species"}, {"cm-2 s-1", "upward flux through the bottom edge", "", {}});
    nc.variable("top_flux", {"species"}, {"cm-2 s-1", "upward flux through the top edge", "", {}});
    nc.dimension("element", budgets.size());
    nc.string_variable("element_name", "element", "chemical element");
    for (const auto& [v, what] : std::vector<std::pair<std::string, std::string>>{
             {"element_boundary_in", "atoms entering through the bottom minus leaving through the top"},
             {"element_chemistry", "chemical change of the transported species"},
             {"element_held_supply", "chemical change of held species (supplied from outside)"},
             {"element_sinks", "removal by sinks (condensation, product-less reactions)"},
             {"element_condensed", "gained from the condensed phase (evaporation minus condensation; part of chemistry)"},
             {"element_profile_supply", "supplied to hold species profiles (part of chemistry)"},
             {"element_imbalance", "boundary_in + chemistry: column change of the element"}}) {
      nc.variable(v, {"element"}, {"cm-2 s-1", what, "", {}});
    }
    nc.variable("element_relative_imbalance", {"element"},
                {"1", "|imbalance| / gross (sum of magnitudes of every column term)", "", {}});
    if (!exchanges.empty()) {
      nc.dimension("exchange", exchanges.size());
      nc.string_variable("exchange_equation", "exchange",
                         "exchange with a condensed phase or held profile (its pseudo-reaction)");
      nc.variable("exchange_equilibrium_density", {"exchange", "altitude"},
                  {"cm-3",
                   "saturation density (held density for a held profile); 0 where the exchange "
                   "does not act",
                   "",
                   {}});
      nc.variable(
          "exchange_rate_constant", {"exchange", "altitude"},
          {"s-1",
           "relaxation rate constant k of f = -k (n - n_eq); 0 where the exchange does not act",
           "",
           {}});
      nc.variable("exchange_reservoir", {"exchange", "altitude"},
                  {"",
                   "a condensed reservoir (or held profile) allows evaporation or supply",
                   "",
                   {{"flag_meanings", "no_reservoir reservoir"}},
                   true,
                   {0, 1}});
    }
    if (model.photolysis()) define_photolysis_output(nc, *model.photolysis(), false);
    define_snapshots(nc, o.snapshots.size());
  }
  nc.dimension("iteration", o.history.size());
  nc.variable("history_residual_norm", {"iteration"}, {"1", "scaled coupled residual", "", {}});
  nc.variable("history_step", {"iteration"}, {"s", "pseudo-time step (steady) or time step (transient)", "", {}});
  nc.variable("history_change", {"iteration"}, {"1", "max relative change (steady) or step error estimate (transient)", "", {}});
  nc.variable("history_time", {"iteration"}, {"s", "model time (transient)", "", {}});
  nc.variable("history_wall_time", {"iteration"}, {"s", "wall time since the solve started", "", {}});
  if (!scores.empty()) define_scores(nc, scores);
  nc.end_definitions();

  write_background_data(nc, bg);
  if (chem) {
    write_species_data(nc, bg, model.species(), o.x);
    write_reaction_data(nc, {d.reaction_ids, d.equations, d.net_stoichiometry, d.reaction_rate,
                             d.chemical_tendency, d.transport_tendency, d.net_tendency});
    std::vector<double> heldv;
    for (std::size_t s = 0; s < S; ++s) heldv.push_back(model.held(s) ? 1.0 : 0.0);
    nc.put("held_fixed", heldv);
    nc.put("flux", d.edge_flux);
    nc.put("eddy_flux", d.eddy_flux);
    nc.put("molecular_flux", d.molecular_flux);
    nc.put("bottom_flux", d.bottom_flux);
    nc.put("top_flux", d.top_flux);
    std::vector<std::string> el;
    std::vector<double> bin, ch, hs, sk, im, rel, cd, ps;
    for (const auto& b : budgets) {
      el.push_back(b.element);
      bin.push_back(b.boundary_in);
      ch.push_back(b.chemistry);
      hs.push_back(b.held_supply);
      sk.push_back(b.sinks);
      cd.push_back(b.condensed);
      ps.push_back(b.profile_supply);
      im.push_back(b.imbalance);
      rel.push_back(b.relative_imbalance);
    }
    nc.put_strings("element_name", el);
    nc.put("element_boundary_in", bin);
    nc.put("element_chemistry", ch);
    nc.put("element_held_supply", hs);
    nc.put("element_sinks", sk);
    nc.put("element_condensed", cd);
    nc.put("element_profile_supply", ps);
    nc.put("element_imbalance", im);
    nc.put("element_relative_imbalance", rel);
    if (!exchanges.empty()) {
      std::vector<std::string> xeq;
      std::vector<double> xn, xk, xr;
      for (const auto& x : exchanges) {
        xeq.push_back(x.equation);
        xn.insert(xn.end(), x.n_eq.begin(), x.n_eq.end());
        xk.insert(xk.end(), x.k.begin(), x.k.end());
        for (int v : x.reservoir) xr.push_back(v);
      }
      nc.put_strings("exchange_equation", xeq);
      nc.put("exchange_equilibrium_density", xn);
      nc.put("exchange_rate_constant", xk);
      nc.put("exchange_reservoir", xr);
    }
    if (model.photolysis()) write_photolysis_output(nc, *model.photolysis(), model.jvalues(), {});
    write_snapshots(nc, bg, S, o.snapshot_times_s, o.snapshots);
  }
  std::vector<double> hr, hs, hc, ht, hw;
  for (const auto& h : o.history) {
    hr.push_back(h.residual_norm);
    hs.push_back(h.step_s);
    hc.push_back(h.change);
    ht.push_back(h.time_s);
    hw.push_back(h.wall_s);
  }
  nc.put("history_residual_norm", hr);
  nc.put("history_step", hs);
  nc.put("history_change", hc);
  nc.put("history_time", ht);
  nc.put("history_wall_time", hw);
  if (!scores.empty()) write_scores(nc, scores);
  nc.commit();
}

void write_checkpoint(const std::filesystem::path& file, const Scenario& sc,
                      const ColumnModel& model, const RunCheckpoint& cp,
                      const std::string& command_line) {
  const Background& bg = model.background();
  NcWriter nc(file);
  write_provenance(nc, sc, command_line);
  nc.global_text("colchem_solver_status", "checkpoint");
  nc.global_text("colchem_solver_method", cp.method);
  nc.global_number("colchem_model_time_s", cp.time_s);
  nc.global_number("colchem_iterations", static_cast<double>(cp.iteration));
  nc.global_number("colchem_step_s", cp.step_s);
  define_background(nc, bg);
  define_species(nc, model.species());
  define_snapshots(nc, cp.snapshots.size());
  nc.end_definitions();
  write_background_data(nc, bg);
  write_species_data(nc, bg, model.species(), cp.x);
  write_snapshots(nc, bg, model.species_count(), cp.snapshot_times_s, cp.snapshots);
  nc.commit();
}

RestartFile read_checkpoint(const std::filesystem::path& file, const ColumnModel& model,
                            SolverMethod method) {
  const NcReader nc(file);
  RestartFile out;
  if (nc.global_text("colchem_solver_status") != std::optional<std::string>("checkpoint")) {
    out.why_not = "not a checkpoint";
    return out;
  }
  const auto written_by = nc.global_text("colchem_solver_method");
  const auto time_s = nc.global_number("colchem_model_time_s");
  const auto iterations = nc.global_number("colchem_iterations");
  const auto step_s = nc.global_number("colchem_step_s");
  if (!written_by || !time_s || !iterations || !step_s) {
    out.why_not = "a checkpoint without the solver's position (older colchem)";
    return out;
  }
  if (*written_by != method_name(method)) {
    out.why_not = "a checkpoint of method " + *written_by + ", this run is " + method_name(method);
    return out;
  }
  const ModelColumn old = read_model_column(nc);
  const std::vector<double>& edges = model.background().grid.edge_cm;
  bool same_grid = old.edge_cm.size() == edges.size();
  for (std::size_t e = 0; same_grid && e < edges.size(); ++e) {
    same_grid = std::abs(old.edge_cm[e] - edges[e]) <= 1e-12 * std::abs(edges[e]) + 1e-9;
  }
  if (!same_grid) {
    out.why_not = "a checkpoint on another grid";
    return out;
  }
  if (old.species != model.species()) {
    out.why_not = "a checkpoint with other species";
    return out;
  }
  const std::size_t S = model.species_count(), N = model.cells();
  RunCheckpoint cp;
  cp.method = *written_by;
  cp.iteration = static_cast<long>(*iterations);
  cp.time_s = *time_s;
  cp.step_s = *step_s;
  cp.x.resize(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) cp.x[j * S + s] = old.number_density[s * N + j];
  }
  if (nc.has_variable("snapshot")) {
    cp.snapshot_times_s = nc.read("snapshot");  // seconds since the stated origin = model time
    const std::vector<double> snd = nc.read("snapshot_number_density");
    if (snd.size() != cp.snapshot_times_s.size() * S * N) {
      throw InputError(ExitCode::kInputData, SourceLocation{file.string()},
                       "snapshot_number_density", "a (snapshot, species, altitude) variable",
                       "a different shape");
    }
    for (std::size_t k = 0; k < cp.snapshot_times_s.size(); ++k) {
      std::vector<double> x(S * N);
      for (std::size_t s = 0; s < S; ++s) {
        for (std::size_t j = 0; j < N; ++j) x[j * S + s] = snd[(k * S + s) * N + j];
      }
      cp.snapshots.push_back(std::move(x));
    }
  }
  out.checkpoint = std::move(cp);
  return out;
}

}  // namespace colchem
