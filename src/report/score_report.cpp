// Scores against observations as Dataset entries, and their printed table
// (report/score_report.hpp).
#include "report/score_report.hpp"

#include <fmt/format.h>

#include "core/constants.hpp"

namespace colchem {

namespace {
/// The per-point residuals along `observation`.
void add_points(Dataset& ds, const std::vector<SpeciesScore>& scores) {
  std::vector<std::string> sp;
  std::vector<double> z, v, u, lim, m, rl, rlin, counted;
  for (const auto& s : scores) {
    for (const auto& p : s.points) {
      sp.push_back(p.obs.species);
      z.push_back(p.obs.altitude_cm / constants::kCmPerKm);
      v.push_back(p.obs.value);
      u.push_back(p.obs.uncertainty);
      lim.push_back(p.obs.upper_limit ? 1.0 : 0.0);
      m.push_back(p.model);
      rl.push_back(p.residual_log);
      rlin.push_back(p.residual_linear);
      counted.push_back(p.counted ? 1.0 : 0.0);
    }
  }
  ds.dimension("observation", sp.size());
  ds.dimension("scored_species", scores.size());
  ds.strings("observation_species", "observation", "species of the observed point", sp);
  ds.variable("observation_altitude", {"observation"},
              {"km", "altitude of the observed point", "altitude", {}}, z);
  ds.variable("observation_value", {"observation"},
              {"1", "observed mole fraction (or upper limit)", "", {}}, v);
  ds.variable("observation_uncertainty", {"observation"},
              {"1", "one-sigma uncertainty of the observed mole fraction", "", {}}, u);
  ds.flag("observation_upper_limit", {"observation"}, "observed value is an upper limit",
          "value upper_limit", lim);
  ds.variable("model_at_observation", {"observation"},
              {"1", "model mole fraction interpolated in altitude and log mole fraction", "", {}},
              m);
  ds.variable("residual_log", {"observation"},
              {"1", "(log10 model - log10 observed)/sigma_log; 0 where not counted", "", {}}, rl);
  ds.variable("residual_linear", {"observation"},
              {"1", "(model - observed)/sigma; 0 where not counted", "", {}}, rlin);
  ds.variable("observation_counted", {"observation"},
              {"1", "1 where the point adds to chi-square", "", {}}, counted);
}
}  // namespace

void add_scores(Dataset& ds, const std::vector<SpeciesScore>& scores) {
  add_points(ds, scores);
  std::vector<std::string> names;
  std::vector<double> c2l, c2lin, rc2l, rc2lin, npts;
  for (const auto& s : scores) {
    names.push_back(s.species);
    c2l.push_back(s.chi2_log);
    c2lin.push_back(s.chi2_linear);
    rc2l.push_back(s.reduced_chi2_log);
    rc2lin.push_back(s.reduced_chi2_linear);
    npts.push_back(static_cast<double>(s.n_points));
  }
  ds.strings("score_species", "scored_species", "species scored against observations", names);
  ds.variable("chi2_log", {"scored_species"}, {"1", "chi-square in log10 mole fraction", "", {}},
              c2l);
  ds.variable("chi2_linear", {"scored_species"}, {"1", "chi-square in mole fraction", "", {}},
              c2lin);
  ds.variable("reduced_chi2_log", {"scored_species"}, {"1", "chi2_log/(N - p)", "", {}}, rc2l);
  ds.variable("reduced_chi2_linear", {"scored_species"}, {"1", "chi2_linear/(N - p)", "", {}},
              rc2lin);
  ds.variable("score_points", {"scored_species"},
              {"1", "N: observed points inside the model altitude range", "", {}}, npts);
}

std::string format_scores(const std::vector<SpeciesScore>& scores) {
  std::string out;
  for (const auto& s : scores) {
    out += fmt::format(
        "{}: N = {}, chi2_log = {:.4g} (reduced {:.4g}), chi2_linear = {:.4g} "
        "(reduced {:.4g})\n",
        s.species, s.n_points, s.chi2_log, s.reduced_chi2_log, s.chi2_linear,
        s.reduced_chi2_linear);
    out += fmt::format("  {:>8} {:>11} {:>11} {:>11} {:>5} {:>9} {:>9}\n", "z [km]", "observed",
                       "sigma", "model", "kind", "r_log", "r_lin");
    for (const auto& p : s.points) {
      const char* kind = p.obs.upper_limit ? "limit" : "det";
      if (!p.inside) {
        out += fmt::format("  {:8.2f} {:11.3e} {:11.3e} {:>11} {:>5} {:>9} {:>9}\n",
                           p.obs.altitude_cm / constants::kCmPerKm, p.obs.value, p.obs.uncertainty,
                           "outside", kind, "-", "-");
        continue;
      }
      out += fmt::format("  {:8.2f} {:11.3e} {:11.3e} {:11.3e} {:>5} {:9.3f} {:9.3f}{}\n",
                         p.obs.altitude_cm / constants::kCmPerKm, p.obs.value, p.obs.uncertainty,
                         p.model, kind, p.residual_log, p.residual_linear,
                         p.counted ? "" : "  (below limit)");
    }
  }
  return out;
}

}  // namespace colchem
