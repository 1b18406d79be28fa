#include "io/ensemble_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <iterator>
#include <limits>

#include "analysis/ensemble.hpp"
#include "core/constants.hpp"
#include "io/output.hpp"

namespace colchem {

namespace {

using Field = NcField;
using TextField = NcTextField;

}  // namespace

void write_ensemble_netcdf(NcWriter& nc, const Background& bg, const EnsembleResults& r) {
  const std::size_t M = r.converged.size(), R = r.equations.size();
  const std::size_t P = std::size(kEnsemblePercentiles);
  std::size_t ok = 0;
  for (int c : r.converged) ok += c != 0 ? 1 : 0;
  define_background(nc, bg);
  nc.dimension("species", r.species.size());
  nc.dimension("reaction", R);
  nc.dimension("member", M);
  nc.dimension("percentile", P);
  nc.global_number("ensemble_members", static_cast<double>(M));
  nc.global_number("ensemble_converged", static_cast<double>(ok));
  nc.global_text("ensemble_sampling", r.sampling);
  nc.global_number("ensemble_seed", static_cast<double>(r.seed));
  nc.global_number("ensemble_sigmas", r.sigmas);
  nc.global_number("ensemble_reach_above_km", r.above_km);
  nc.global_text(
      "ensemble_method",
      "member m multiplies k_r (or J_r) by exp(z_mr ln f_r(T) / sigmas), f_r(T) = f298 "
      "exp|g (1/T - 1/298)| (JPL Publication 19-5), z standard normal: Latin hypercube "
      "(McKay, Beckman and Conover 1979) or random, seeded; each member's steady state from the "
      "base state; percentiles over the converged members by linear interpolation between order "
      "statistics (Hyndman and Fan 1996, definition 7)");

  std::vector<Field> fields;
  std::vector<TextField> texts;
  texts.push_back({"species_name", "species", "species name (colchem notation)", {r.species}});
  texts.push_back({"reaction_id", "reaction", "reaction id as in the mechanism", {r.ids}});
  texts.push_back({"reaction_equation", "reaction", "reaction of the mechanism", {r.equations}});
  texts.push_back({"member_status", "member", "solver outcome of the member", {r.reasons}});
  Field pct{"percentile", {"percentile"}, {"1", "percentile of the members (percent)", "", {}}, {}};
  pct.data.assign(std::begin(kEnsemblePercentiles), std::end(kEnsemblePercentiles));
  Field f298{"reaction_f298", {"reaction"}, {"1", "uncertainty factor f at 298 K", "", {}}, r.f298};
  Field g{
      "reaction_g", {"reaction"}, {"K", "temperature coefficient g of the factor", "", {}}, r.g_K};
  Field st{"reaction_uncertainty_stated",
           {"reaction"},
           {"",
            "source of the rate uncertainty",
            "",
            {{"flag_meanings", "default_by_kind stated_in_mechanism"}},
            true,
            {0, 1}},
           {}};
  for (int v : r.stated) st.data.push_back(v);
  Field base{"base_mole_fraction",
             {"species", "altitude"},
             {"1", "mole fraction of the base state (every rate at its stated value)", "", {}},
             r.base_mole_fraction};
  Field pmf{"mole_fraction_percentile",
            {"percentile", "species", "altitude"},
            {"1", "percentiles of the members' mole fractions", "", {}},
            {}};
  for (std::size_t p = 0; p < P; ++p) {
    if (r.percentile[p].empty()) {
      pmf.data.insert(pmf.data.end(), r.base_mole_fraction.size(),
                      std::numeric_limits<double>::quiet_NaN());
    } else {
      pmf.data.insert(pmf.data.end(), r.percentile[p].begin(), r.percentile[p].end());
    }
  }
  Field z{"member_z",
          {"member", "reaction"},
          {"1", "standard normal draw of each reaction in each member", "", {}},
          r.z};
  Field conv{
      "member_converged",
      {"member"},
      {"", "member converged", "", {{"flag_meanings", "not_converged converged"}}, true, {0, 1}},
      {}};
  Field its{"member_iterations", {"member"}, {"1", "solver iterations of the member", "", {}}, {}};
  for (std::size_t m = 0; m < M; ++m) {
    conv.data.push_back(r.converged[m]);
    its.data.push_back(r.iterations[m]);
  }
  fields.insert(fields.end(), {pct, f298, g, st, base, pmf, z, conv, its});

  if (!r.scored_species.empty()) {
    const std::size_t Q = r.scored_species.size(), K = r.points.size();
    nc.dimension("scored_species", Q);
    nc.dimension("observation", K);
    texts.push_back({"score_species", "scored_species", "species scored against observations",
                     r.scored_species});
    Field bc{"base_chi2_log",
             {"scored_species"},
             {"1", "chi-square (log) of the base state", "", {}},
             r.base_chi2_log};
    Field mc{"member_chi2_log",
             {"member", "scored_species"},
             {"1", "chi-square (log) of each member (NaN: failed)", "", {}},
             r.member_chi2_log};
    Field cp{"chi2_log_percentile",
             {"percentile", "scored_species"},
             {"1", "percentiles of the members' chi-square (log)", "", {}},
             {}};
    for (double q : kEnsemblePercentiles) {
      for (std::size_t s = 0; s < Q; ++s) {
        std::vector<double> v;
        for (std::size_t m = 0; m < M; ++m) {
          const double c = r.member_chi2_log[m * Q + s];
          if (std::isfinite(c)) v.push_back(c);
        }
        cp.data.push_back(sample_quantile(v, q / 100.0));
      }
    }
    Field rp{"reach_probability",
             {"scored_species"},
             {"1",
              "share of converged members at or above (observed - 1 sigma) at every detected "
              "point above ensemble_reach_above_km",
              "",
              {}},
             r.reach_probability};
    Field rn{"reach_points",
             {"scored_species"},
             {"1", "detected points counted there", "", {}, true},
             r.reach_points};
    texts.push_back({"observation_species", "observation", "species of the observed point", {}});
    Field oz{"observation_altitude", {"observation"}, {"km", "altitude", "altitude", {}}, {}};
    Field ov{"observation_value", {"observation"}, {"1", "observed mole fraction", "", {}}, {}};
    Field ou{"observation_upper_limit",
             {"observation"},
             {"",
              "observed value is an upper limit",
              "",
              {{"flag_meanings", "value upper_limit"}},
              true,
              {0, 1}},
             {}};
    Field os{"observation_uncertainty",
             {"observation"},
             {"1", "1-sigma uncertainty of the observed value (0: upper limit)", "", {}},
             {}};
    Field ob{"observation_base_model",
             {"observation"},
             {"1", "base state's mole fraction there", "", {}},
             {}};
    Field ol{"observation_low95",
             {"observation"},
             {"1", "2.5th percentile of the members there", "", {}},
             {}};
    Field oh{"observation_high95",
             {"observation"},
             {"1", "97.5th percentile of the members there", "", {}},
             {}};
    Field oi{"observation_inside95",
             {"observation"},
             {"",
              "observed point against the 95 % band",
              "",
              {{"flag_meanings", "outside_column outside_band inside_band"}},
              true,
              {-1, 0, 1}},
             {}};
    for (const auto& p : r.points) {
      texts.back().data.push_back(p.point.species);
      oz.data.push_back(p.point.altitude_cm / constants::kCmPerKm);
      ov.data.push_back(p.point.value);
      ou.data.push_back(p.point.upper_limit ? 1.0 : 0.0);
      os.data.push_back(p.point.uncertainty);
      ob.data.push_back(p.inside ? p.base_model : std::numeric_limits<double>::quiet_NaN());
      ol.data.push_back(p.low95);
      oh.data.push_back(p.high95);
      oi.data.push_back(p.inside95);
    }
    fields.insert(fields.end(), {bc, mc, cp, rp, rn, oz, ov, ou, os, ob, ol, oh, oi});
  }

  if (!r.attribution.empty()) {
    nc.dimension("target", r.attribution.size());
    nc.global_text(
        "attribution_method",
        "first order (delta method): Var_1(ln x) = sum_r a_r^2, a_r = sum_j S_rj ln f_r(T_j) / "
        "sigmas, S_rj = d ln x / d ln k_r(z_j) from the discrete adjoint of the base state, "
        "each cell at its own temperature; share_r = a_r^2 / Var_1; compared with the sample "
        "variance (n - 1) of ln x over the converged members, agreement when within 20 %");
    texts.push_back({"attribution_species", "target", "species of the attribution target", {}});
    Field az{"attribution_altitude", {"target"}, {"km", "altitude", "altitude", {}}, {}};
    Field ab{"attribution_base_value",
             {"target"},
             {"1", "base state's mole fraction at the target", "", {}},
             {}};
    Field a1{"attribution_first_order_variance",
             {"target"},
             {"1", "first-order variance of ln(mole fraction) from the adjoint", "", {}},
             {}};
    Field ae{"attribution_ensemble_variance",
             {"target"},
             {"1", "sample variance of ln(mole fraction) over the converged members", "", {}},
             {}};
    Field an{"attribution_ensemble_members",
             {"target"},
             {"1", "converged members behind the ensemble variance", "", {}},
             {}};
    Field al{"attribution_largest_scaled_sensitivity",
             {"target"},
             {"1", "largest |S_r sigma_r| over the reactions (large: nonlinear)", "", {}},
             {}};
    Field ag{"attribution_agree",
             {"target"},
             {"",
              "first-order variance within 20 % of the ensemble's",
              "",
              {{"flag_meanings", "no yes"}},
              true,
              {0, 1}},
             {}};
    Field as{"attribution_log_sensitivity",
             {"target", "reaction"},
             {"1", "d ln(mole fraction) / d ln k over the whole column (0: inactive)", "", {}},
             {}};
    Field aa{"attribution_scaled_sensitivity",
             {"target", "reaction"},
             {"1", "a_r = sum_j S_rj sigma_r(T_j): the reaction's 1-sigma effect on ln x", "", {}},
             {}};
    Field ash{"attribution_share",
              {"target", "reaction"},
              {"1", "the reaction's share of the first-order variance", "", {}},
              {}};
    for (const auto& a : r.attribution) {
      texts.back().data.push_back(a.species);
      az.data.push_back(a.altitude_cm / constants::kCmPerKm);
      ab.data.push_back(a.base_value);
      a1.data.push_back(a.first_order_variance);
      ae.data.push_back(a.ensemble_variance);
      an.data.push_back(a.ensemble_members);
      al.data.push_back(a.largest_scaled);
      ag.data.push_back(a.agree);
      as.data.insert(as.data.end(), a.log_sensitivity.begin(), a.log_sensitivity.end());
      aa.data.insert(aa.data.end(), a.scaled.begin(), a.scaled.end());
      ash.data.insert(ash.data.end(), a.share.begin(), a.share.end());
    }
    fields.insert(fields.end(), {az, ab, a1, ae, an, al, ag, as, aa, ash});
  }

  write_fields(nc, bg, texts, fields);
}

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

}  // namespace colchem
