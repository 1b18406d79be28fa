#include "io/sensitivity_output.hpp"

#include <cmath>

#include "core/constants.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"

namespace colchem {

std::vector<double> reaction_shares(const SensitivityResult& res) {
  double sum = 0.0;
  for (const auto& r : res.reactions) sum += std::abs(r.dG);
  std::vector<double> out;
  for (const auto& r : res.reactions) out.push_back(sum > 0.0 ? std::abs(r.dG) / sum : 0.0);
  return out;
}

void write_sensitivity_file(const std::filesystem::path& file, const Scenario& sc,
                            const ColumnModel& model, std::span<const double> x,
                            const Objective& obj, const SensitivityResult& res,
                            const std::string& command_line) {
  const Background& bg = model.background();
  const std::size_t S = model.species_count(), N = model.cells();
  const std::size_t R = res.reactions.size(), P = res.parameters.size();
  const std::string g_units = obj.units.empty() ? "1" : obj.units;
  const std::string lambda_units = g_units == "1" ? "cm3 s" : g_units + " cm3 s";
  NcWriter nc(file);
  write_provenance(nc, sc, command_line);
  nc.global_text("colchem_objective", obj.label);
  nc.global_number("colchem_objective_value", res.value);
  nc.global_text("colchem_objective_units", g_units);
  nc.global_text("colchem_sensitivity_method",
                 "discrete adjoint of the steady state (Cacuci 1981, J. Math. Phys. 22, 2794): "
                 "J^T lambda = (dG/dx)^T, dG/dp = dG/dp|_x - lambda^T dF/dp");
  nc.global_number("colchem_adjoint_krylov_iterations", res.krylov_iterations);
  nc.global_number("colchem_adjoint_seconds", res.total_s);
  define_background(nc, bg);
  define_species(nc, model.species());
  nc.dimension("reaction", R);
  nc.dimension("parameter", P);
  nc.string_variable("reaction_id", "reaction",
                     "reaction identifier (k and its 1-based number in the mechanism file)");
  nc.string_variable("reaction_equation", "reaction",
                     "reaction equation as written in the mechanism");
  nc.variable(
      "dG_dlnk", {"reaction"},
      {g_units, "derivative of the objective with respect to ln k of the reaction", "", {}});
  nc.variable("log_sensitivity", {"reaction"}, {"1", "d ln G / d ln k of the reaction", "", {}});
  nc.variable("share", {"reaction"}, {"1", "|dG/d ln k| over its sum over the reactions", "", {}});
  nc.variable("sensitivity_profile", {"reaction", "altitude"},
              {g_units,
               "dG/d ln k of the reaction with k scaled in this cell alone (sums to dG_dlnk)",
               "",
               {}});
  nc.string_variable("parameter_name", "parameter", "parameter");
  nc.string_variable("parameter_description", "parameter", "what the parameter is");
  nc.variable("parameter_value", {"parameter"},
              {"1", "value of a named parameter (1: a multiplier)", "", {}});
  nc.variable("parameter_dG", {"parameter"},
              {g_units,
               "dG/dp for a named parameter, dG/d ln p for a multiplier or boundary value",
               "",
               {}});
  nc.variable("parameter_log_sensitivity", {"parameter"}, {"1", "d ln G / d ln p", "", {}});
  nc.variable("adjoint", {"species", "altitude"},
              {lambda_units,
               "adjoint lambda: dG/d(source) of a steady source of the species in the cell (cm-3 "
               "s-1); 0 for held species",
               "",
               {}});
  nc.end_definitions();
  write_background_data(nc, bg);
  write_species_data(nc, bg, model.species(), x);
  std::vector<std::string> ids, eqs, pn, pd;
  std::vector<double> dG, ls, pv, pdG, pls;
  for (const auto& r : res.reactions) {
    ids.push_back(r.parameter.name);
    eqs.push_back(r.equation);
    dG.push_back(r.dG);
    ls.push_back(r.log_sensitivity);
  }
  for (const auto& p : res.parameters) {
    pn.push_back(p.parameter.name);
    pd.push_back(p.equation);
    pv.push_back(p.parameter.value);
    pdG.push_back(p.dG);
    pls.push_back(p.log_sensitivity);
  }
  nc.put_strings("reaction_id", ids);
  nc.put_strings("reaction_equation", eqs);
  nc.put("dG_dlnk", dG);
  nc.put("log_sensitivity", ls);
  nc.put("share", reaction_shares(res));
  nc.put("sensitivity_profile", res.reaction_profile);
  nc.put_strings("parameter_name", pn);
  nc.put_strings("parameter_description", pd);
  nc.put("parameter_value", pv);
  nc.put("parameter_dG", pdG);
  nc.put("parameter_log_sensitivity", pls);
  std::vector<double> lam(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) lam[s * N + j] = res.lambda[j * S + s];
  }
  nc.put("adjoint", lam);
  nc.commit();
}

}  // namespace colchem
