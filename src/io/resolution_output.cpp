#include "io/resolution_output.hpp"

#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "core/constants.hpp"
#include "io/output.hpp"

namespace colchem {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

using Field = NcField;
using TextField = NcTextField;

double status_code(ResolutionStatus s) {
  return static_cast<double>(static_cast<int>(s));
}

const std::map<std::string, std::string>& status_flags() {
  static const std::map<std::string, std::string> flags = {
      {"flag_meanings", "asymptotic not_asymptotic resolved failed"}};
  return flags;
}
}  // namespace

void write_resolution_netcdf(NcWriter& nc, const ResolutionStudy& st,
                             const ResolutionOptions& options) {
  const auto& base = st.levels.front();
  const std::size_t L = st.levels.size(), S = st.profiles.size();
  const std::size_t K = base.background.grid.cells();
  define_background(nc, base.background);
  nc.dimension("level", L);
  nc.dimension("level_pair", L - 1);
  nc.dimension("level_triple", L - 2);
  nc.dimension("species", S);
  nc.global_number("refinement_ratio", static_cast<double>(st.ratio));
  nc.global_number("formal_order", options.range.formal_order);
  nc.global_number("asymptotic_order_low", options.range.low);
  nc.global_number("asymptotic_order_high", options.range.high);
  nc.global_number("resolved_below", options.range.resolved_below);
  nc.global_number("relative_floor", options.relative_floor);
  nc.global_text("resolution_method",
                 "Richardson extrapolation (Roache 1998, Verification and Validation in "
                 "Computational Science and Engineering): p = ln(|u1-u2|/|u2-u3|)/ln r, error of "
                 "the finest (u2-u3)/(r^p-1); profiles compared as log10 mole fraction at the "
                 "coarsest level's cell centres; level l splits every coarsest cell into r^l");

  std::vector<Field> fields;
  std::vector<TextField> texts;
  texts.push_back({"species_name", "species", "species name (colchem notation)", {}});
  texts.push_back({"level_status", "level", "solver outcome of the level", {}});
  Field cells{"level_cells", {"level"}, {"1", "number of cells of the level", "", {}, true}, {}};
  Field conv{
      "level_converged",
      {"level"},
      {"", "level converged", "", {{"flag_meanings", "not_converged converged"}}, true, {0, 1}},
      {}};
  Field its{"level_iterations", {"level"}, {"1", "solver iterations of the level", "", {}}, {}};
  Field res{"level_residual", {"level"}, {"1", "scaled coupled residual of the level", "", {}}, {}};
  for (const auto& l : st.levels) {
    cells.data.push_back(static_cast<double>(l.background.grid.cells()));
    conv.data.push_back(l.converged ? 1.0 : 0.0);
    its.data.push_back(static_cast<double>(l.iterations));
    res.data.push_back(l.residual);
    texts[1].data.push_back(l.converged ? std::string("converged") : l.reason);
  }
  fields.insert(fields.end(), {cells, conv, its, res});

  Field logf{"log10_mole_fraction",
             {"level", "species", "altitude"},
             {"1",
              "log10 of the mole fraction, each level interpolated to the coarsest "
              "level's cell centres (linear in altitude and log f)",
              "",
              {}},
             {}};
  Field used{"compared",
             {"species", "altitude"},
             {"",
              "altitude enters the norms (f above the floor on every level)",
              "",
              {{"flag_meanings", "excluded included"}},
              true,
              {0, 1}},
             {}};
  Field dmax{"difference_max",
             {"level_pair", "species"},
             {"1", "max over altitude of |log10 f_l - log10 f_(l+1)|", "", {}},
             {}};
  Field drms{"difference_rms",
             {"level_pair", "species"},
             {"1", "RMS over altitude of log10 f_l - log10 f_(l+1)", "", {}},
             {}};
  Field pr{"observed_order_rms",
           {"level_triple", "species"},
           {"1", "observed order from the RMS differences of levels l, l+1, l+2", "", {}},
           {}};
  Field pm{"observed_order_max",
           {"level_triple", "species"},
           {"1", "observed order from the max differences of levels l, l+1, l+2", "", {}},
           {}};
  Field err{"estimated_error_log10",
            {"species", "altitude"},
            {"1",
             "Richardson error of the finest level's log10 mole fraction (finest minus "
             "exact)",
             "",
             {}},
            {}};
  Field emax{"estimated_error_max",
             {"species"},
             {"1", "max over altitude of |estimated_error_log10|", "", {}},
             {}};
  Field erms{"estimated_error_rms",
             {"species"},
             {"1", "RMS over altitude of estimated_error_log10", "", {}},
             {}};
  Field stat{"resolution_status",
             {"species"},
             {"", "asymptotic range of the finest triple", "", status_flags(), true, {0, 1, 2, 3}},
             {}};
  for (std::size_t l = 0; l < L; ++l) {
    for (const auto& p : st.profiles)
      logf.data.insert(logf.data.end(), p.log10_f[l].begin(), p.log10_f[l].end());
  }
  for (std::size_t l = 0; l + 1 < L; ++l) {
    for (const auto& p : st.profiles) {
      dmax.data.push_back(p.differences[l].max);
      drms.data.push_back(p.differences[l].rms);
    }
  }
  for (std::size_t l = 0; l + 2 < L; ++l) {
    for (const auto& p : st.profiles) {
      pr.data.push_back(p.order_rms[l]);
      pm.data.push_back(p.order_max[l]);
    }
  }
  for (const auto& p : st.profiles) {
    texts[0].data.push_back(p.species);
    for (std::size_t k = 0; k < K; ++k) used.data.push_back(p.compared[k] ? 1.0 : 0.0);
    err.data.insert(err.data.end(), p.error_log10.begin(), p.error_log10.end());
    emax.data.push_back(p.error_max);
    erms.data.push_back(p.error_rms);
    stat.data.push_back(status_code(p.status));
  }
  fields.insert(fields.end(), {logf, used, dmax, drms, pr, pm, err, emax, erms, stat});

  if (!st.scores.empty()) {
    std::size_t P = 0;
    for (const auto& q : st.scores) P += q.altitude_cm.size();
    nc.dimension("scored_species", st.scores.size());
    nc.dimension("observation", P);
    texts.push_back({"score_species", "scored_species", "species scored against observations", {}});
    texts.push_back({"observation_species", "observation", "species of the observed point", {}});
    Field c2{"chi2_log",
             {"level", "scored_species"},
             {"1", "chi-square (log space) of the level", "", {}},
             {}};
    Field c2p{
        "chi2_log_order", {"scored_species"}, {"1", "observed order of chi2_log", "", {}}, {}};
    Field c2e{"chi2_log_error",
              {"scored_species"},
              {"1", "Richardson error of the finest level's chi2_log (finest minus exact)", "", {}},
              {}};
    Field c2s{"chi2_log_status",
              {"scored_species"},
              {"", "asymptotic range of chi2_log", "", status_flags(), true, {0, 1, 2, 3}},
              {}};
    Field oz{"observation_altitude",
             {"observation"},
             {"km", "altitude of the observed point", "altitude", {}},
             {}};
    Field om{"log10_model_at_observation",
             {"level", "observation"},
             {"1", "log10 of the model mole fraction at the observed altitude", "", {}},
             {}};
    Field op{"observation_order",
             {"observation"},
             {"1", "observed order of the model value there", "", {}},
             {}};
    Field oe{"observation_error_log10",
             {"observation"},
             {"1", "Richardson error of the finest level's log10 model value there", "", {}},
             {}};
    Field os{"observation_status",
             {"observation"},
             {"", "asymptotic range there", "", status_flags(), true, {0, 1, 2, 3}},
             {}};
    for (std::size_t l = 0; l < L; ++l) {
      for (const auto& q : st.scores) {
        c2.data.push_back(l < q.chi2_log.size() ? q.chi2_log[l] : kNaN);
        for (std::size_t i = 0; i < q.altitude_cm.size(); ++i)
          om.data.push_back(q.log10_model[l][i]);
      }
    }
    for (const auto& q : st.scores) {
      texts[texts.size() - 2].data.push_back(q.species);
      c2p.data.push_back(q.chi2.order);
      c2e.data.push_back(q.chi2.error);
      c2s.data.push_back(status_code(q.chi2.status));
      for (std::size_t i = 0; i < q.altitude_cm.size(); ++i) {
        texts.back().data.push_back(q.species);
        oz.data.push_back(q.altitude_cm[i] / constants::kCmPerKm);
        op.data.push_back(q.point[i].order);
        oe.data.push_back(q.point[i].error);
        os.data.push_back(status_code(q.point[i].status));
      }
    }
    fields.insert(fields.end(), {c2, c2p, c2e, c2s, oz, om, op, oe, os});
  }

  if (!st.boundary_fluxes.empty()) {
    nc.dimension("boundary_flux", st.boundary_fluxes.size());
    texts.push_back(
        {"boundary_flux_species", "boundary_flux", "species of the compared boundary flux", {}});
    texts.push_back({"boundary_flux_end", "boundary_flux", "bottom or top edge of the column", {}});
    Field bv{"boundary_flux_value",
             {"level", "boundary_flux"},
             {"cm-2 s-1", "net upward flux through the boundary edge on the level", "", {}},
             {}};
    Field bp{"boundary_flux_order",
             {"boundary_flux"},
             {"1", "observed order of the boundary flux (finest triple)", "", {}},
             {}};
    Field be{
        "boundary_flux_error",
        {"boundary_flux"},
        {"cm-2 s-1", "Richardson error of the finest level's flux (finest minus exact)", "", {}},
        {}};
    Field bs{"boundary_flux_status",
             {"boundary_flux"},
             {"", "asymptotic range of the boundary flux", "", status_flags(), true, {0, 1, 2, 3}},
             {}};
    Field bg{"boundary_flux_grows",
             {"boundary_flux"},
             {"1",
              "1 where the flux changes more with each refinement (a boundary layer thinner "
              "than the cells)",
              "",
              {}},
             {}};
    for (std::size_t l = 0; l < L; ++l) {
      for (const auto& b : st.boundary_fluxes) bv.data.push_back(b.flux[l]);
    }
    for (const auto& b : st.boundary_fluxes) {
      texts[texts.size() - 2].data.push_back(b.species);
      texts.back().data.push_back(b.end);
      bp.data.push_back(b.estimate.order);
      be.data.push_back(b.estimate.error);
      bs.data.push_back(status_code(b.estimate.status));
      bg.data.push_back(b.grows ? 1.0 : 0.0);
    }
    fields.insert(fields.end(), {bv, bp, be, bs, bg});
  }

  write_fields(nc, base.background, texts, fields);
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
