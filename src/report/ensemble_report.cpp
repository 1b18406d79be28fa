// The ensemble file as a Dataset and its printed summary (report/ensemble_report.hpp).
#include "report/ensemble_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>
#include <limits>

#include "analysis/ensemble.hpp"
#include "core/constants.hpp"
#include "report/column_report.hpp"

namespace colchem {

namespace {

using Field = DatasetVariable;

/// The ensemble's global attributes: size, sampling, seed and method.
void add_ensemble_globals(Dataset& ds, const EnsembleResults& r) {
  const std::size_t M = r.converged.size();
  std::size_t ok = 0;
  for (int c : r.converged) ok += c != 0 ? 1 : 0;
  ds.global_number("ensemble_members", static_cast<double>(M));
  ds.global_number("ensemble_converged", static_cast<double>(ok));
  ds.global_text("ensemble_sampling", r.sampling);
  ds.global_number("ensemble_seed", static_cast<double>(r.seed));
  ds.global_number("ensemble_sigmas", r.sigmas);
  ds.global_number("ensemble_reach_above_km", r.above_km);
  ds.global_text(
      "ensemble_method",
      "member m multiplies k_r (or J_r) by exp(z_mr ln f_r(T) / sigmas), f_r(T) = f298 "
      "exp|g (1/T - 1/298)| (JPL Publication 19-5), z standard normal: Latin hypercube "
      "(McKay, Beckman and Conover 1979) or random, seeded; each member's steady state from the "
      "base state; percentiles over the converged members by linear interpolation between order "
      "statistics (Hyndman and Fan 1996, definition 7)");
}

/// The reactions with their uncertainty, the members, and the profiles' percentiles.
void add_members(ResultFields& f, const EnsembleResults& r) {
  const std::size_t M = r.converged.size(), P = std::size(kEnsemblePercentiles);
  f.texts.push_back(
      string_variable("species_name", "species", "species name (colchem notation)", r.species));
  f.texts.push_back(
      string_variable("reaction_id", "reaction", "reaction id as in the mechanism", r.ids));
  f.texts.push_back(
      string_variable("reaction_equation", "reaction", "reaction of the mechanism", r.equations));
  f.texts.push_back(
      string_variable("member_status", "member", "solver outcome of the member", r.reasons));
  Field pct = number_variable("percentile", {"percentile"},
                              {"1", "percentile of the members (percent)", "", {}}, {});
  pct.numbers.assign(std::begin(kEnsemblePercentiles), std::end(kEnsemblePercentiles));
  Field f298 = number_variable("reaction_f298", {"reaction"},
                               {"1", "uncertainty factor f at 298 K", "", {}}, r.f298);
  Field g = number_variable("reaction_g", {"reaction"},
                            {"K", "temperature coefficient g of the factor", "", {}}, r.g_K);
  Field st = flag_variable("reaction_uncertainty_stated", {"reaction"},
                           "source of the rate uncertainty", "default_by_kind stated_in_mechanism");
  for (int v : r.stated) st.numbers.push_back(v);
  Field base = number_variable(
      "base_mole_fraction", {"species", "altitude"},
      {"1", "mole fraction of the base state (every rate at its stated value)", "", {}},
      r.base_mole_fraction);
  Field pmf = number_variable("mole_fraction_percentile", {"percentile", "species", "altitude"},
                              {"1", "percentiles of the members' mole fractions", "", {}}, {});
  for (std::size_t p = 0; p < P; ++p) {
    if (r.percentile[p].empty()) {
      pmf.numbers.insert(pmf.numbers.end(), r.base_mole_fraction.size(),
                         std::numeric_limits<double>::quiet_NaN());
    } else {
      pmf.numbers.insert(pmf.numbers.end(), r.percentile[p].begin(), r.percentile[p].end());
    }
  }
  Field z =
      number_variable("member_z", {"member", "reaction"},
                      {"1", "standard normal draw of each reaction in each member", "", {}}, r.z);
  Field conv =
      flag_variable("member_converged", {"member"}, "member converged", "not_converged converged");
  Field its = number_variable("member_iterations", {"member"},
                              {"1", "solver iterations of the member", "", {}}, {});
  for (std::size_t m = 0; m < M; ++m) {
    conv.numbers.push_back(r.converged[m]);
    its.numbers.push_back(r.iterations[m]);
  }
  f.numbers.insert(f.numbers.end(), {pct, f298, g, st, base, pmf, z, conv, its});
}

/// The scores of the base state and the members, and the observed points against the band.
void add_ensemble_scores(Dataset& ds, ResultFields& f, const EnsembleResults& r) {
  const std::size_t M = r.converged.size();
  const std::size_t Q = r.scored_species.size(), K = r.points.size();
  ds.dimension("scored_species", Q);
  ds.dimension("observation", K);
  f.texts.push_back(string_variable("score_species", "scored_species",
                                    "species scored against observations", r.scored_species));
  Field bc = number_variable("base_chi2_log", {"scored_species"},
                             {"1", "chi-square (log) of the base state", "", {}}, r.base_chi2_log);
  Field mc = number_variable("member_chi2_log", {"member", "scored_species"},
                             {"1", "chi-square (log) of each member (NaN: failed)", "", {}},
                             r.member_chi2_log);
  Field cp = number_variable("chi2_log_percentile", {"percentile", "scored_species"},
                             {"1", "percentiles of the members' chi-square (log)", "", {}}, {});
  for (double q : kEnsemblePercentiles) {
    for (std::size_t s = 0; s < Q; ++s) {
      std::vector<double> v;
      for (std::size_t m = 0; m < M; ++m) {
        const double c = r.member_chi2_log[m * Q + s];
        if (std::isfinite(c)) v.push_back(c);
      }
      cp.numbers.push_back(sample_quantile(v, q / 100.0));
    }
  }
  Field rp = number_variable(
      "reach_probability", {"scored_species"},
      {"1",
       "share of converged members at or above (observed - 1 sigma) at every detected "
       "point above ensemble_reach_above_km",
       "",
       {}},
      r.reach_probability);
  Field rn = number_variable("reach_points", {"scored_species"},
                             {"1", "detected points counted there", "", {}, true}, r.reach_points);
  f.texts.push_back(
      string_variable("observation_species", "observation", "species of the observed point", {}));
  Field oz = number_variable("observation_altitude", {"observation"},
                             {"km", "altitude", "altitude", {}}, {});
  Field ov = number_variable("observation_value", {"observation"},
                             {"1", "observed mole fraction", "", {}}, {});
  Field ou = flag_variable("observation_upper_limit", {"observation"},
                           "observed value is an upper limit", "value upper_limit");
  Field os = number_variable(
      "observation_uncertainty", {"observation"},
      {"1", "1-sigma uncertainty of the observed value (0: upper limit)", "", {}}, {});
  Field ob = number_variable("observation_base_model", {"observation"},
                             {"1", "base state's mole fraction there", "", {}}, {});
  Field ol = number_variable("observation_low95", {"observation"},
                             {"1", "2.5th percentile of the members there", "", {}}, {});
  Field oh = number_variable("observation_high95", {"observation"},
                             {"1", "97.5th percentile of the members there", "", {}}, {});
  Field oi =
      flag_variable("observation_inside95", {"observation"}, "observed point against the 95 % band",
                    "outside_column outside_band inside_band", {}, {-1, 0, 1});
  for (const auto& p : r.points) {
    f.texts.back().strings.push_back(p.point.species);
    oz.numbers.push_back(p.point.altitude_cm / constants::kCmPerKm);
    ov.numbers.push_back(p.point.value);
    ou.numbers.push_back(p.point.upper_limit ? 1.0 : 0.0);
    os.numbers.push_back(p.point.uncertainty);
    ob.numbers.push_back(p.inside ? p.base_model : std::numeric_limits<double>::quiet_NaN());
    ol.numbers.push_back(p.low95);
    oh.numbers.push_back(p.high95);
    oi.numbers.push_back(p.inside95);
  }
  f.numbers.insert(f.numbers.end(), {bc, mc, cp, rp, rn, oz, ov, ou, os, ob, ol, oh, oi});
}

/// The first-order attribution of each target's variance.
void add_attribution(Dataset& ds, ResultFields& f, const EnsembleResults& r) {
  ds.dimension("target", r.attribution.size());
  ds.global_text(
      "attribution_method",
      "first order (delta method): Var_1(ln x) = sum_r a_r^2, a_r = sum_j S_rj ln f_r(T_j) / "
      "sigmas, S_rj = d ln x / d ln k_r(z_j) from the discrete adjoint of the base state, "
      "each cell at its own temperature; share_r = a_r^2 / Var_1; compared with the sample "
      "variance (n - 1) of ln x over the converged members, agreement when within 20 %");
  f.texts.push_back(
      string_variable("attribution_species", "target", "species of the attribution target", {}));
  Field az =
      number_variable("attribution_altitude", {"target"}, {"km", "altitude", "altitude", {}}, {});
  Field ab = number_variable("attribution_base_value", {"target"},
                             {"1", "base state's mole fraction at the target", "", {}}, {});
  Field a1 = number_variable(
      "attribution_first_order_variance", {"target"},
      {"1", "first-order variance of ln(mole fraction) from the adjoint", "", {}}, {});
  Field ae = number_variable(
      "attribution_ensemble_variance", {"target"},
      {"1", "sample variance of ln(mole fraction) over the converged members", "", {}}, {});
  Field an = number_variable("attribution_ensemble_members", {"target"},
                             {"1", "converged members behind the ensemble variance", "", {}}, {});
  Field al = number_variable(
      "attribution_largest_scaled_sensitivity", {"target"},
      {"1", "largest |S_r sigma_r| over the reactions (large: nonlinear)", "", {}}, {});
  Field ag = flag_variable("attribution_agree", {"target"},
                           "first-order variance within 20 % of the ensemble's", "no yes");
  Field as = number_variable(
      "attribution_log_sensitivity", {"target", "reaction"},
      {"1", "d ln(mole fraction) / d ln k over the whole column (0: inactive)", "", {}}, {});
  Field aa = number_variable(
      "attribution_scaled_sensitivity", {"target", "reaction"},
      {"1", "a_r = sum_j S_rj sigma_r(T_j): the reaction's 1-sigma effect on ln x", "", {}}, {});
  Field ash =
      number_variable("attribution_share", {"target", "reaction"},
                      {"1", "the reaction's share of the first-order variance", "", {}}, {});
  for (const auto& a : r.attribution) {
    f.texts.back().strings.push_back(a.species);
    az.numbers.push_back(a.altitude_cm / constants::kCmPerKm);
    ab.numbers.push_back(a.base_value);
    a1.numbers.push_back(a.first_order_variance);
    ae.numbers.push_back(a.ensemble_variance);
    an.numbers.push_back(a.ensemble_members);
    al.numbers.push_back(a.largest_scaled);
    ag.numbers.push_back(a.agree);
    as.numbers.insert(as.numbers.end(), a.log_sensitivity.begin(), a.log_sensitivity.end());
    aa.numbers.insert(aa.numbers.end(), a.scaled.begin(), a.scaled.end());
    ash.numbers.insert(ash.numbers.end(), a.share.begin(), a.share.end());
  }
  f.numbers.insert(f.numbers.end(), {az, ab, a1, ae, an, al, ag, as, aa, ash});
}

}  // namespace

void add_ensemble(Dataset& ds, const Background& bg, const EnsembleResults& r) {
  add_background(ds, bg);
  ds.dimension("species", r.species.size());
  ds.dimension("reaction", r.equations.size());
  ds.dimension("member", r.converged.size());
  ds.dimension("percentile", std::size(kEnsemblePercentiles));
  add_ensemble_globals(ds, r);
  ResultFields f;
  add_members(f, r);
  if (!r.scored_species.empty()) add_ensemble_scores(ds, f, r);
  if (!r.attribution.empty()) add_attribution(ds, f, r);
  add_result_fields(ds, std::move(f));
}

namespace {
/// Per attribution target: the first-order against the ensemble's variance, the verdict and
/// the top three contributors.
std::string attribution_text(const EnsembleResults& r) {
  std::string out;
  if (!r.attribution.empty()) {
    out +=
        "variance of ln(mole fraction): first order from the adjoint (sum_r (S_r sigma_r)^2) "
        "against the ensemble's own\n";
  }
  for (const auto& a : r.attribution) {
    const double ratio = a.first_order_variance / a.ensemble_variance;
    // The sampling error of a sample variance of n normal values, sqrt(2 / (n - 1)) relative
    // (Latin hypercube sampling does no worse for monotone responses: McKay et al. 1979).
    const double rel_se = std::sqrt(2.0 / (a.ensemble_members - 1.0));
    std::string verdict;
    if (a.agree == 1) {
      verdict = "agree within 20 %";
    } else if (std::isfinite(ratio) && std::abs(ratio - 1.0) < 2.0 * rel_se) {
      verdict = fmt::format("DIFFER by {:+.0f} %, within 2 sampling errors of {:.0f} members",
                            100.0 * (ratio - 1.0), a.ensemble_members);
    } else if (std::isfinite(ratio)) {
      verdict = fmt::format("DIFFER by {:+.0f} % (largest |S sigma| {:.2g}: {})",
                            100.0 * (ratio - 1.0), a.largest_scaled,
                            // 0.3: ln x moves by more than 35 % per sigma of one reaction
                            // (rule of thumb, common practice, no source).
                            a.largest_scaled > 0.3 ? "nonlinear: first order not valid here"
                                                   : "sampling or interactions");
    } else {
      verdict = "no ensemble variance to compare";
    }
    out += fmt::format("  {:<8} {:7.2f} km  first order {:.3g}  ensemble {:.3g}  {}\n", a.species,
                       a.altitude_cm / constants::kCmPerKm, a.first_order_variance,
                       a.ensemble_variance, verdict);
    std::vector<std::size_t> order(a.share.size());
    for (std::size_t k = 0; k < order.size(); ++k) order[k] = k;
    std::sort(order.begin(), order.end(),
              [&](std::size_t i, std::size_t j) { return a.share[i] > a.share[j]; });
    for (std::size_t k = 0; k < std::min<std::size_t>(3, order.size()); ++k) {
      const std::size_t i = order[k];
      if (!(a.share[i] > 0.0)) break;
      out +=
          fmt::format("      {:5.1f} %  S {:+.3g}  S sigma {:+.3g}  {}  {}\n", 100.0 * a.share[i],
                      a.log_sensitivity[i], a.scaled[i], r.ids[i], r.equations[i]);
    }
  }
  return out;
}
}  // namespace

std::string ensemble_summary_text(const EnsembleResults& r) {
  std::size_t ok = 0;
  for (int c : r.converged) ok += c != 0 ? 1 : 0;
  std::string out = fmt::format(
      "ensemble: {} members ({} sampling, seed {}, factors as {} sigma), {} converged, {} "
      "failed and left out of the statistics\n",
      r.converged.size(), r.sampling, r.seed, r.sigmas, ok, r.converged.size() - ok);
  std::size_t defaults = 0;
  for (int s : r.stated) defaults += s == 0 ? 1 : 0;
  out += fmt::format(
      "uncertainties: {} of {} reactions stated in the mechanism, {} by the "
      "default of their kind\n",
      r.stated.size() - defaults, r.stated.size(), defaults);
  const std::size_t Q = r.scored_species.size(), M = r.converged.size();
  for (std::size_t s = 0; s < Q; ++s) {
    std::vector<double> v;
    for (std::size_t m = 0; m < M; ++m) {
      const double c = r.member_chi2_log[m * Q + s];
      if (std::isfinite(c)) v.push_back(c);
    }
    out +=
        fmt::format("{}: chi2_log base {:.4g}; members median {:.4g}, 95 % range {:.4g} - {:.4g}\n",
                    r.scored_species[s], r.base_chi2_log[s], sample_quantile(v, 0.5),
                    sample_quantile(v, 0.025), sample_quantile(v, 0.975));
  }
  if (!r.points.empty()) {
    out += "observed points against the members' 95 % band (2.5-97.5 %):\n";
    for (const auto& p : r.points) {
      if (!p.inside) continue;
      out += fmt::format(
          "  {:<8} {:7.2f} km  observed {}{:.3g}  base {:.3g}  band {:.3g} - {:.3g}  {}\n",
          p.point.species, p.point.altitude_cm / constants::kCmPerKm,
          p.point.upper_limit ? "< " : "", p.point.value, p.base_model, p.low95, p.high95,
          p.inside95 == 1 ? "inside" : (p.point.upper_limit ? "band above the limit" : "OUTSIDE"));
    }
    for (std::size_t s = 0; s < Q; ++s) {
      if (!(r.reach_points[s] > 0)) continue;
      out += fmt::format(
          "{}: chance that the network alone reaches the {} detected points above {} km (each at "
          "least observed - 1 sigma): {:.3g}\n",
          r.scored_species[s], r.reach_points[s], r.above_km, r.reach_probability[s]);
    }
  }
  return out + attribution_text(r);
}

}  // namespace colchem
