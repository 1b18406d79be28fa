// A resolution study as a Dataset, its printed table and an adapted grid section
// (report/resolution_report.hpp).
#include "report/resolution_report.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "core/constants.hpp"
#include "report/column_report.hpp"

namespace colchem {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

using Field = DatasetVariable;

double status_code(ResolutionStatus s) {
  return static_cast<double>(static_cast<int>(s));
}

/// The flag meanings of ResolutionStatus, in its order.
constexpr const char* kStatusMeanings = "asymptotic not_asymptotic resolved failed";

/// Every level's size and solver outcome; the species names.
void add_levels(ResultFields& f, const ResolutionStudy& st) {
  f.texts.push_back(
      string_variable("species_name", "species", "species name (colchem notation)", {}));
  f.texts.push_back(string_variable("level_status", "level", "solver outcome of the level", {}));
  Field cells = number_variable("level_cells", {"level"},
                                {"1", "number of cells of the level", "", {}, true}, {});
  Field conv =
      flag_variable("level_converged", {"level"}, "level converged", "not_converged converged");
  Field its = number_variable("level_iterations", {"level"},
                              {"1", "solver iterations of the level", "", {}}, {});
  Field res = number_variable("level_residual", {"level"},
                              {"1", "scaled coupled residual of the level", "", {}}, {});
  for (const auto& l : st.levels) {
    cells.numbers.push_back(static_cast<double>(l.background.grid.cells()));
    conv.numbers.push_back(l.converged ? 1.0 : 0.0);
    its.numbers.push_back(static_cast<double>(l.iterations));
    res.numbers.push_back(l.residual);
    f.texts[1].strings.push_back(l.converged ? std::string("converged") : l.reason);
  }
  f.numbers.insert(f.numbers.end(), {cells, conv, its, res});
}

/// The profiles on the coarsest grid, their differences, observed orders and errors.
void add_profiles(ResultFields& f, const ResolutionStudy& st) {
  const std::size_t L = st.levels.size();
  const std::size_t K = st.levels.front().background.grid.cells();
  Field logf =
      number_variable("log10_mole_fraction", {"level", "species", "altitude"},
                      {"1",
                       "log10 of the mole fraction, each level interpolated to the coarsest "
                       "level's cell centres (linear in altitude and log f)",
                       "",
                       {}},
                      {});
  Field used = flag_variable("compared", {"species", "altitude"},
                             "altitude enters the norms (f above the floor on every level)",
                             "excluded included");
  Field dmax =
      number_variable("difference_max", {"level_pair", "species"},
                      {"1", "max over altitude of |log10 f_l - log10 f_(l+1)|", "", {}}, {});
  Field drms = number_variable("difference_rms", {"level_pair", "species"},
                               {"1", "RMS over altitude of log10 f_l - log10 f_(l+1)", "", {}}, {});
  Field pr = number_variable(
      "observed_order_rms", {"level_triple", "species"},
      {"1", "observed order from the RMS differences of levels l, l+1, l+2", "", {}}, {});
  Field pm = number_variable(
      "observed_order_max", {"level_triple", "species"},
      {"1", "observed order from the max differences of levels l, l+1, l+2", "", {}}, {});
  Field err =
      number_variable("estimated_error_log10", {"species", "altitude"},
                      {"1",
                       "Richardson error of the finest level's log10 mole fraction (finest minus "
                       "exact)",
                       "",
                       {}},
                      {});
  Field emax = number_variable("estimated_error_max", {"species"},
                               {"1", "max over altitude of |estimated_error_log10|", "", {}}, {});
  Field erms = number_variable("estimated_error_rms", {"species"},
                               {"1", "RMS over altitude of estimated_error_log10", "", {}}, {});
  Field stat = flag_variable("resolution_status", {"species"},
                             "asymptotic range of the finest triple", kStatusMeanings);
  for (std::size_t l = 0; l < L; ++l) {
    for (const auto& p : st.profiles)
      logf.numbers.insert(logf.numbers.end(), p.log10_f[l].begin(), p.log10_f[l].end());
  }
  for (std::size_t l = 0; l + 1 < L; ++l) {
    for (const auto& p : st.profiles) {
      dmax.numbers.push_back(p.differences[l].max);
      drms.numbers.push_back(p.differences[l].rms);
    }
  }
  for (std::size_t l = 0; l + 2 < L; ++l) {
    for (const auto& p : st.profiles) {
      pr.numbers.push_back(p.order_rms[l]);
      pm.numbers.push_back(p.order_max[l]);
    }
  }
  for (const auto& p : st.profiles) {
    f.texts[0].strings.push_back(p.species);
    for (std::size_t k = 0; k < K; ++k) used.numbers.push_back(p.compared[k] ? 1.0 : 0.0);
    err.numbers.insert(err.numbers.end(), p.error_log10.begin(), p.error_log10.end());
    emax.numbers.push_back(p.error_max);
    erms.numbers.push_back(p.error_rms);
    stat.numbers.push_back(status_code(p.status));
  }
  f.numbers.insert(f.numbers.end(), {logf, used, dmax, drms, pr, pm, err, emax, erms, stat});
}

/// chi2_log and the model at every observed point, per level, with their orders.
void add_resolution_scores(Dataset& ds, ResultFields& f, const ResolutionStudy& st) {
  const std::size_t L = st.levels.size();
  std::size_t P = 0;
  for (const auto& q : st.scores) P += q.altitude_cm.size();
  ds.dimension("scored_species", st.scores.size());
  ds.dimension("observation", P);
  f.texts.push_back(string_variable("score_species", "scored_species",
                                    "species scored against observations", {}));
  f.texts.push_back(
      string_variable("observation_species", "observation", "species of the observed point", {}));
  Field c2 = number_variable("chi2_log", {"level", "scored_species"},
                             {"1", "chi-square (log space) of the level", "", {}}, {});
  Field c2p = number_variable("chi2_log_order", {"scored_species"},
                              {"1", "observed order of chi2_log", "", {}}, {});
  Field c2e = number_variable(
      "chi2_log_error", {"scored_species"},
      {"1", "Richardson error of the finest level's chi2_log (finest minus exact)", "", {}}, {});
  Field c2s = flag_variable("chi2_log_status", {"scored_species"}, "asymptotic range of chi2_log",
                            kStatusMeanings);
  Field oz = number_variable("observation_altitude", {"observation"},
                             {"km", "altitude of the observed point", "altitude", {}}, {});
  Field om = number_variable(
      "log10_model_at_observation", {"level", "observation"},
      {"1", "log10 of the model mole fraction at the observed altitude", "", {}}, {});
  Field op = number_variable("observation_order", {"observation"},
                             {"1", "observed order of the model value there", "", {}}, {});
  Field oe = number_variable(
      "observation_error_log10", {"observation"},
      {"1", "Richardson error of the finest level's log10 model value there", "", {}}, {});
  Field os = flag_variable("observation_status", {"observation"}, "asymptotic range there",
                           kStatusMeanings);
  for (std::size_t l = 0; l < L; ++l) {
    for (const auto& q : st.scores) {
      c2.numbers.push_back(l < q.chi2_log.size() ? q.chi2_log[l] : kNaN);
      for (std::size_t i = 0; i < q.altitude_cm.size(); ++i)
        om.numbers.push_back(q.log10_model[l][i]);
    }
  }
  for (const auto& q : st.scores) {
    f.texts[f.texts.size() - 2].strings.push_back(q.species);
    c2p.numbers.push_back(q.chi2.order);
    c2e.numbers.push_back(q.chi2.error);
    c2s.numbers.push_back(status_code(q.chi2.status));
    for (std::size_t i = 0; i < q.altitude_cm.size(); ++i) {
      f.texts.back().strings.push_back(q.species);
      oz.numbers.push_back(q.altitude_cm[i] / constants::kCmPerKm);
      op.numbers.push_back(q.point[i].order);
      oe.numbers.push_back(q.point[i].error);
      os.numbers.push_back(status_code(q.point[i].status));
    }
  }
  f.numbers.insert(f.numbers.end(), {c2, c2p, c2e, c2s, oz, om, op, oe, os});
}

/// The boundary fluxes per level, with their orders.
void add_boundary_fluxes(Dataset& ds, ResultFields& f, const ResolutionStudy& st) {
  const std::size_t L = st.levels.size();
  ds.dimension("boundary_flux", st.boundary_fluxes.size());
  f.texts.push_back(string_variable("boundary_flux_species", "boundary_flux",
                                    "species of the compared boundary flux", {}));
  f.texts.push_back(string_variable("boundary_flux_end", "boundary_flux",
                                    "bottom or top edge of the column", {}));
  Field bv = number_variable(
      "boundary_flux_value", {"level", "boundary_flux"},
      {"cm-2 s-1", "net upward flux through the boundary edge on the level", "", {}}, {});
  Field bp =
      number_variable("boundary_flux_order", {"boundary_flux"},
                      {"1", "observed order of the boundary flux (finest triple)", "", {}}, {});
  Field be = number_variable(
      "boundary_flux_error", {"boundary_flux"},
      {"cm-2 s-1", "Richardson error of the finest level's flux (finest minus exact)", "", {}}, {});
  Field bs = flag_variable("boundary_flux_status", {"boundary_flux"},
                           "asymptotic range of the boundary flux", kStatusMeanings);
  Field bg = number_variable(
      "boundary_flux_grows", {"boundary_flux"},
      {"1",
       "1 where the flux changes more with each refinement (a boundary layer thinner "
       "than the cells)",
       "",
       {}},
      {});
  for (std::size_t l = 0; l < L; ++l) {
    for (const auto& b : st.boundary_fluxes) bv.numbers.push_back(b.flux[l]);
  }
  for (const auto& b : st.boundary_fluxes) {
    f.texts[f.texts.size() - 2].strings.push_back(b.species);
    f.texts.back().strings.push_back(b.end);
    bp.numbers.push_back(b.estimate.order);
    be.numbers.push_back(b.estimate.error);
    bs.numbers.push_back(status_code(b.estimate.status));
    bg.numbers.push_back(b.grows ? 1.0 : 0.0);
  }
  f.numbers.insert(f.numbers.end(), {bv, bp, be, bs, bg});
}

}  // namespace

void add_resolution(Dataset& ds, const ResolutionStudy& st, const ResolutionOptions& options) {
  const auto& base = st.levels.front();
  const std::size_t L = st.levels.size(), S = st.profiles.size();
  add_background(ds, base.background);
  ds.dimension("level", L);
  ds.dimension("level_pair", L - 1);
  ds.dimension("level_triple", L - 2);
  ds.dimension("species", S);
  ds.global_number("refinement_ratio", static_cast<double>(st.ratio));
  ds.global_number("formal_order", options.range.formal_order);
  ds.global_number("asymptotic_order_low", options.range.low);
  ds.global_number("asymptotic_order_high", options.range.high);
  ds.global_number("resolved_below", options.range.resolved_below);
  ds.global_number("relative_floor", options.relative_floor);
  ds.global_text("resolution_method",
                 "Richardson extrapolation (Roache 1998, Verification and Validation in "
                 "Computational Science and Engineering): p = ln(|u1-u2|/|u2-u3|)/ln r, error of "
                 "the finest (u2-u3)/(r^p-1); profiles compared as log10 mole fraction at the "
                 "coarsest level's cell centres; level l splits every coarsest cell into r^l");

  ResultFields f;
  add_levels(f, st);
  add_profiles(f, st);
  if (!st.scores.empty()) add_resolution_scores(ds, f, st);
  if (!st.boundary_fluxes.empty()) add_boundary_fluxes(ds, f, st);
  add_result_fields(ds, std::move(f));
}

std::string resolution_table_text(const ResolutionStudy& st) {
  std::string out = "levels (cells):";
  for (const auto& l : st.levels) {
    out += fmt::format(" {}{}", l.background.grid.cells(), l.converged ? "" : " (not converged)");
  }
  out += fmt::format(", refinement ratio {}\n", st.ratio);
  std::size_t w = 7;
  for (const auto& p : st.profiles) w = std::max(w, p.species.size());
  const std::size_t L = st.levels.size();
  out += fmt::format("{:<{}}  {:>9}  {:>9}  {:>7}  {:>7}  {:>9}  {:>9}  {:>5}  {}\n", "species", w,
                     "max|d12|", "max|d23|", "p(rms)", "p(max)", "err(max)", "err(rms)", "pts",
                     "status");
  for (const auto& p : st.profiles) {
    const auto& d1 = p.differences[L - 3];
    const auto& d2 = p.differences[L - 2];
    out += fmt::format(
        "{:<{}}  {:>9.3g}  {:>9.3g}  {:>7.3f}  {:>7.3f}  {:>9.3g}  {:>9.3g}  {:>5}  {}\n",
        p.species, w, d1.max, d2.max, p.by_rms.order, p.by_max.order, p.error_max, p.error_rms,
        d2.points, resolution_status_name(p.status));
  }
  out +=
      "(differences and errors in log10 mole fraction at the coarsest cell centres; "
      "err = Richardson error of the finest level)\n";
  if (!st.boundary_fluxes.empty()) {
    out += fmt::format("{:<{}}  {:<6}  {:>11}  {:>11}  {:>11}  {:>7}  {:>10}  {}\n", "flux", w,
                       "edge", "level L-2", "level L-1", "level L", "p", "err", "status");
    for (const auto& b : st.boundary_fluxes) {
      out +=
          fmt::format("{:<{}}  {:<6}  {:>11.4e}  {:>11.4e}  {:>11.4e}  {:>7.3f}  {:>10.3g}  {}{}\n",
                      b.species, w, b.end, b.flux[L - 3], b.flux[L - 2], b.flux[L - 1],
                      b.estimate.order, b.estimate.error, resolution_status_name(b.estimate.status),
                      b.grows ? " (grows with refinement: a boundary layer thinner than the "
                                "cells)"
                              : "");
    }
    out += "(net upward flux through the boundary edge, cm-2 s-1, on the three finest levels)\n";
  }
  if (!st.scores.empty()) {
    out += fmt::format("{:<{}}  {:>12}  {:>12}  {:>12}  {:>7}  {:>10}  {}\n", "scored", w,
                       "chi2_log(1)", "chi2_log(2)", "chi2_log(3)", "p", "err", "status");
    for (const auto& q : st.scores) {
      out += fmt::format("{:<{}}  {:>12.6g}  {:>12.6g}  {:>12.6g}  {:>7.3f}  {:>10.3g}  {}\n",
                         q.species, w, q.chi2_log[L - 3], q.chi2_log[L - 2], q.chi2_log[L - 1],
                         q.chi2.order, q.chi2.error, resolution_status_name(q.chi2.status));
      for (std::size_t i = 0; i < q.altitude_cm.size(); ++i) {
        const auto& e = q.point[i];
        out += fmt::format(
            "{:<{}}    at {:8.3f} km: log10 f {:>9.4f}, p {:>7.3f}, err {:>10.3g}  {}\n", "", w,
            q.altitude_cm[i] / constants::kCmPerKm, q.log10_model[L - 1][i], e.order, e.error,
            resolution_status_name(e.status));
      }
    }
  }
  return out;
}

std::string grid_section_yaml(std::span<const double> edges_cm, const std::string& comment) {
  std::string out = "# " + comment + "\ngrid:\n  edges:\n    unit: km\n    values: [";
  for (std::size_t k = 0; k < edges_cm.size(); ++k) {
    out += fmt::format("{}{:.12g}", k == 0 ? "" : (k % 6 == 0 ? ",\n             " : ", "),
                       edges_cm[k] / constants::kCmPerKm);
  }
  return out + "]\n";
}

}  // namespace colchem
