// The file of `colchem sensitivity` as a Dataset (report/sensitivity_report.hpp).
#include "report/sensitivity_report.hpp"

#include <cmath>

#include "core/column_state.hpp"
#include "core/constants.hpp"
#include "report/column_report.hpp"

namespace colchem {

std::vector<double> reaction_shares(const SensitivityResult& res) {
  double sum = 0.0;
  for (const auto& r : res.reactions) sum += std::abs(r.dG);
  std::vector<double> out;
  for (const auto& r : res.reactions) out.push_back(sum > 0.0 ? std::abs(r.dG) / sum : 0.0);
  return out;
}

namespace {

/// The adjoint lambda, species-major (res.lambda is cell-major, [j*S + s]).
DatasetVariable adjoint_field(const SensitivityResult& res, std::size_t S,
                              const std::string& lambda_units) {
  DatasetVariable lam = number_variable(
      "adjoint", {"species", "altitude"},
      {lambda_units,
       "adjoint lambda: dG/d(source) of a steady source of the species in the cell (cm-3 "
       "s-1); 0 for held species",
       "",
       {}},
      species_major(res.lambda, S));
  return lam;
}

}  // namespace

Dataset sensitivity_dataset(const Scenario& sc, const ColumnModel& model, std::span<const double> x,
                            const Objective& obj, const SensitivityResult& res,
                            const std::string& command_line) {
  const std::size_t S = model.species_count();
  const std::size_t R = res.reactions.size(), P = res.parameters.size();
  const std::string g_units = obj.units.empty() ? "1" : obj.units;
  const std::string lambda_units = g_units == "1" ? "cm3 s" : g_units + " cm3 s";
  Dataset ds;
  add_provenance(ds, sc, command_line);
  ds.global_text("colchem_objective", obj.label);
  ds.global_number("colchem_objective_value", res.value);
  ds.global_text("colchem_objective_units", g_units);
  ds.global_text("colchem_sensitivity_method",
                 "discrete adjoint of the steady state (Cacuci 1981, J. Math. Phys. 22, 2794): "
                 "J^T lambda = (dG/dx)^T, dG/dp = dG/dp|_x - lambda^T dF/dp");
  ds.global_number("colchem_adjoint_krylov_iterations", res.krylov_iterations);
  ds.global_number("colchem_adjoint_seconds", res.total_s);
  std::vector<std::string> ids, eqs, pn, pd;
  DatasetVariable dG = number_variable(
      "dG_dlnk", {"reaction"},
      {g_units, "derivative of the objective with respect to ln k of the reaction", "", {}}, {});
  DatasetVariable ls = number_variable("log_sensitivity", {"reaction"},
                                       {"1", "d ln G / d ln k of the reaction", "", {}}, {});
  DatasetVariable share = number_variable(
      "share", {"reaction"}, {"1", "|dG/d ln k| over its sum over the reactions", "", {}},
      reaction_shares(res));
  DatasetVariable profile = number_variable(
      "sensitivity_profile", {"reaction", "altitude"},
      {g_units,
       "dG/d ln k of the reaction with k scaled in this cell alone (sums to dG_dlnk)",
       "",
       {}},
      res.reaction_profile);
  for (const auto& r : res.reactions) {
    ids.push_back(r.parameter.name);
    eqs.push_back(r.equation);
    dG.numbers.push_back(r.dG);
    ls.numbers.push_back(r.log_sensitivity);
  }
  DatasetVariable pv =
      number_variable("parameter_value", {"parameter"},
                      {"1", "value of a named parameter (1: a multiplier)", "", {}}, {});
  DatasetVariable pdG =
      number_variable("parameter_dG", {"parameter"},
                      {g_units,
                       "dG/dp for a named parameter, dG/d ln p for a multiplier or boundary value",
                       "",
                       {}},
                      {});
  DatasetVariable pls = number_variable("parameter_log_sensitivity", {"parameter"},
                                        {"1", "d ln G / d ln p", "", {}}, {});
  for (const auto& p : res.parameters) {
    pn.push_back(p.parameter.name);
    pd.push_back(p.equation);
    pv.numbers.push_back(p.parameter.value);
    pdG.numbers.push_back(p.dG);
    pls.numbers.push_back(p.log_sensitivity);
  }
  const DatasetVariable lam = adjoint_field(res, S, lambda_units);
  ResultFields f;
  f.dimensions = {{"reaction", R}, {"parameter", P}};
  f.texts = {
      string_variable("reaction_id", "reaction", "reaction id, as in the mechanism file", ids),
      string_variable("reaction_equation", "reaction",
                      "reaction equation as written in the mechanism", eqs),
      string_variable("parameter_name", "parameter", "parameter", pn),
      string_variable("parameter_description", "parameter", "what the parameter is", pd)};
  f.numbers = {dG, ls, share, profile, pv, pdG, pls, lam};
  add_state(ds, model.background(), model.species(), x, std::move(f));
  return ds;
}

}  // namespace colchem
