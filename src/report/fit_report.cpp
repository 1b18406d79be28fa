// The file of `colchem fit` as a Dataset (report/fit_report.hpp): parameters, then
// observations.
#include "report/fit_report.hpp"

#include <cmath>

#include "analysis/score.hpp"
#include "core/constants.hpp"
#include "report/column_report.hpp"

namespace colchem {

namespace {

/// The fitted parameters: start, best fit, uncertainties, bounds and correlations.
void add_parameter_fields(ResultFields& f, const std::vector<FitParameter>& params,
                          const FitResult& res) {
  const std::size_t P = params.size();
  std::vector<std::string> paths;
  DatasetVariable init = number_variable("parameter_initial", {"parameter"},
                                         {"1", "value at the start of the fit", "", {}}, {});
  DatasetVariable val =
      number_variable("parameter_value", {"parameter"}, {"1", "best-fit value", "", {}}, res.value);
  DatasetVariable sig = number_variable(
      "parameter_sigma", {"parameter"},
      {"1",
       "one-sigma uncertainty from (J^T J)^-1 (first order in ln p for log parameters)",
       "",
       {}},
      res.sigma);
  DatasetVariable sigs = number_variable(
      "parameter_sigma_scaled", {"parameter"},
      {"1", "parameter_sigma times sqrt(reduced chi-square)", "", {}}, res.sigma_scaled);
  DatasetVariable sigu = number_variable(
      "parameter_sigma_fitted", {"parameter"},
      {"1", "one-sigma of the fitted variable (ln p for log parameters, else p)", "", {}},
      res.sigma_u);
  DatasetVariable mn =
      number_variable("parameter_min", {"parameter"}, {"1", "lower bound", "", {}}, {});
  DatasetVariable mx =
      number_variable("parameter_max", {"parameter"}, {"1", "upper bound", "", {}}, {});
  DatasetVariable lg =
      number_variable("parameter_log", {"parameter"}, {"1", "1 where fitted as ln p", "", {}}, {});
  DatasetVariable ab =
      number_variable("parameter_at_bound", {"parameter"},
                      {"1", "-1 at the lower bound, 1 at the upper bound, 0 free", "", {}}, {});
  for (std::size_t k = 0; k < P; ++k) {
    paths.push_back(params[k].path);
    init.numbers.push_back(params[k].initial);
    mn.numbers.push_back(params[k].min);
    mx.numbers.push_back(params[k].max);
    lg.numbers.push_back(params[k].log ? 1.0 : 0.0);
    ab.numbers.push_back(res.at_bound[k]);
  }
  DatasetVariable corr = number_variable(
      "parameter_correlation", {"parameter", "parameter2"},
      {"1", "correlation of the fitted variables from (J^T J)^-1", "", {}}, res.correlation);
  f.texts.push_back(
      string_variable("parameter_path", "parameter", "fitted parameter (its path)", paths));
  f.numbers.insert(f.numbers.end(), {init, val, sig, sigs, sigu, mn, mx, lg, ab, corr});
}

/// The observed points with the fitted model's value and residual at each.
void add_observation_fields(ResultFields& f, const FitResult& res) {
  std::vector<std::string> obs_species;
  DatasetVariable oz = number_variable("observation_altitude", {"observation"},
                                       {"km", "altitude of the point", "", {}}, {});
  DatasetVariable ov = number_variable("observation_value", {"observation"},
                                       {"1", "observed mole fraction", "", {}}, {});
  DatasetVariable os = number_variable("observation_sigma", {"observation"},
                                       {"1", "one-sigma of the point", "", {}}, {});
  DatasetVariable ou = number_variable("observation_upper_limit", {"observation"},
                                       {"1", "1 for an upper limit", "", {}}, {});
  DatasetVariable om =
      number_variable("observation_model", {"observation"},
                      {"1", "fitted model mole fraction at the point", "", {}}, {});
  DatasetVariable orr = number_variable(
      "observation_residual", {"observation"},
      {"1", "residual of the point at the best fit (analysis/score.hpp)", "", {}}, {});
  for (const auto& r : res.residuals) {
    obs_species.push_back(r.point.obs.species);
    oz.numbers.push_back(r.point.obs.altitude_cm / constants::kCmPerKm);
    ov.numbers.push_back(r.point.obs.value);
    os.numbers.push_back(observation_sigma(r.point.obs));
    ou.numbers.push_back(r.point.obs.upper_limit ? 1.0 : 0.0);
    om.numbers.push_back(r.point.model);
    orr.numbers.push_back(r.r);
  }
  f.texts.push_back(
      string_variable("observation_species", "observation", "species observed", obs_species));
  f.numbers.insert(f.numbers.end(), {oz, ov, os, ou, om, orr});
}

}  // namespace

Dataset fit_dataset(const Scenario& sc, const ColumnModel& model,
                    const std::vector<FitParameter>& params, const FitResult& res, bool log_space,
                    const std::string& command_line) {
  const std::size_t P = params.size(), M = res.residuals.size();
  Dataset ds;
  add_provenance(ds, sc, command_line);
  ds.global_text("colchem_fit_method",
                 "bounded Gauss-Newton (PETSc TAO, TAOBRGN) on the chi-square residuals; "
                 "Jacobian by forward sensitivities of the steady state, J dx/dp = -dF/dp; "
                 "covariance (J^T J)^-1 at the best fit, unscaled (Press et al., Numerical "
                 "Recipes, 3rd ed., sections 15.4-15.5)");
  ds.global_text("colchem_fit_residuals", log_space ? "chi2_log" : "chi2_linear");
  ds.global_text("colchem_fit_status", res.reason);
  ds.global_number("colchem_fit_converged", res.converged ? 1.0 : 0.0);
  ds.global_number("colchem_fit_chi2", res.chi2);
  ds.global_number("colchem_fit_chi2_initial", res.chi2_initial);
  ds.global_number("colchem_fit_reduced_chi2", res.reduced_chi2);
  ds.global_number("colchem_fit_points", static_cast<double>(res.points));
  ds.global_number("colchem_fit_iterations", res.iterations);
  ds.global_number("colchem_fit_steady_solves", res.steady_solves);
  ds.global_number("colchem_fit_jacobians", res.jacobians);

  ResultFields f;
  f.dimensions = {{"parameter", P}, {"parameter2", P}, {"observation", M}};
  add_parameter_fields(f, params, res);
  add_observation_fields(f, res);
  add_state(ds, model.background(), model.species(), res.x, std::move(f));
  return ds;
}

}  // namespace colchem
