// A sweep's file as a Dataset, the ranking and the ranked tables (report/sweep_report.hpp).
#include "report/sweep_report.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/constants.hpp"
#include "report/column_report.hpp"

namespace colchem {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double score_value(const std::vector<SpeciesScore>& scores, const std::string& what) {
  if (scores.empty()) return kNaN;
  double sum = 0.0;
  for (const auto& s : scores) {
    if (what == "chi2_log")
      sum += s.chi2_log;
    else if (what == "chi2_linear")
      sum += s.chi2_linear;
    else if (what == "reduced_chi2_log")
      sum += s.reduced_chi2_log;
    else
      sum += s.reduced_chi2_linear;
  }
  return sum;
}
}  // namespace

std::vector<std::size_t> rank_variants(const SweepResults& r, const std::string& rank_by) {
  std::vector<std::size_t> idx(r.variants.size());
  for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
  auto key = [&](std::size_t i) {
    const double v =
        r.outcomes[i].converged && i < r.scores.size() ? score_value(r.scores[i], rank_by) : kNaN;
    return std::isnan(v) ? std::numeric_limits<double>::infinity() : v;
  };
  std::stable_sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
    const bool fa = !r.outcomes[a].converged, fb = !r.outcomes[b].converged;
    if (fa != fb) return fb;
    return key(a) < key(b);
  });
  return idx;
}

namespace {
/// Every variant's label, status, overrides and solver outcome, and its mole fractions.
void add_variants(Dataset& ds, const SweepResults& r, const std::vector<std::size_t>& ranking,
                  std::size_t cells) {
  const std::size_t V = r.variants.size(), S = r.species.size();
  std::vector<std::string> labels, status, overrides;
  std::vector<double> state, conv, its, res, wall, rank, warm, pos(V), mf;
  for (std::size_t v = 0; v < V; ++v) {
    const auto& o = r.outcomes[v];
    labels.push_back(r.variants[v].label);
    status.push_back(o.converged ? std::string("converged") : o.reason);
    std::string lines;
    for (const auto& a : r.variants[v].overrides) lines += (lines.empty() ? "" : "\n") + a;
    overrides.push_back(lines);
    const VariantState st = o.skipped       ? VariantState::kNotRun
                            : o.converged   ? VariantState::kConverged
                            : o.interrupted ? VariantState::kInterrupted
                                            : VariantState::kFailed;
    state.push_back(static_cast<double>(st));
    conv.push_back(o.converged ? 1.0 : 0.0);
    its.push_back(o.iterations);
    res.push_back(o.residual);
    wall.push_back(o.wall_seconds);
    rank.push_back(o.rank);
    warm.push_back(o.warm_started ? 1.0 : 0.0);
    const auto& f = r.mole_fraction[v];
    if (f.size() == S * cells) {
      mf.insert(mf.end(), f.begin(), f.end());
    } else {
      mf.insert(mf.end(), S * cells, kNaN);
    }
  }
  for (std::size_t k = 0; k < ranking.size(); ++k) pos[ranking[k]] = static_cast<double>(k + 1);
  ds.strings("variant_label", "variant", "variant: modules, overrides, parameters", labels);
  ds.strings("variant_status", "variant", "converged, or the reason the variant failed", status);
  ds.strings("variant_overrides", "variant",
             "every --set override of the variant, one per line (colchem run "
             "--from-sweep FILE --variant N runs it)",
             overrides);
  ds.flag("variant_state", {"variant"}, "what the file holds for the variant",
          "not_run converged failed interrupted", state);
  ds.flag("variant_converged", {"variant"}, "variant converged", "not_converged converged", conv);
  ds.variable("variant_iterations", {"variant"}, {"1", "solver iterations", "", {}, true}, its);
  ds.variable("variant_residual", {"variant"},
              {"1", "scaled coupled residual of the end state", "", {}}, res);
  ds.variable("variant_wall_time", {"variant"}, {"s", "wall time of the variant", "", {}}, wall);
  ds.variable("variant_rank_of_process", {"variant"},
              {"1", "MPI rank that ran the variant", "", {}}, rank);
  ds.flag("variant_warm_started", {"variant"}, "start of the variant", "own_cold_start base_state",
          warm);
  ds.variable("variant_ranking", {"variant"},
              {"1", "position in the ranked table (1 = best)", "", {}}, pos);
  ds.variable("mole_fraction", {"variant", "species", "altitude"},
              {"1", "mole fraction (NaN where the variant failed)", "", {}}, mf)
      .nan_fill();
}

/// The swept parameters' values and the modules switched on, per variant.
void add_parameters_and_modules(Dataset& ds, const SweepResults& r) {
  if (!r.parameter_names.empty()) {
    std::vector<double> pv;
    for (const auto& var : r.variants) {
      for (const auto& name : r.parameter_names) {
        double val = kNaN;
        for (const auto& [n, x] : var.parameters) {
          if (n == name) val = x;
        }
        pv.push_back(val);
      }
    }
    ds.dimension("parameter", r.parameter_names.size());
    ds.strings("parameter_name", "parameter", "swept mechanism parameter", r.parameter_names);
    ds.variable("parameter_value", {"variant", "parameter"},
                {"1", "parameter value of the variant", "", {}}, pv);
  }
  if (!r.module_names.empty()) {
    std::vector<double> on;
    for (const auto& var : r.variants) {
      for (const auto& m : r.module_names) {
        const bool has = std::find(var.modules.begin(), var.modules.end(), m) != var.modules.end();
        on.push_back(has ? 1.0 : 0.0);
      }
    }
    ds.dimension("module", r.module_names.size());
    ds.strings("module_name", "module", "mechanism module", r.module_names);
    ds.flag("module_on", {"variant", "module"}, "module switched on", "off on", on);
  }
}

/// The observed points (those of the first variant) and every variant's scores.
void add_sweep_scores(Dataset& ds, const SweepResults& r) {
  const auto& first = r.scores.front();
  const std::size_t V = r.variants.size(), Q = first.size();
  std::vector<std::string> names, osp;
  std::vector<double> oz, ov, ou, ol;
  for (const auto& s : first) {
    names.push_back(s.species);
    for (const auto& p : s.points) {
      osp.push_back(p.obs.species);
      oz.push_back(p.obs.altitude_cm / constants::kCmPerKm);
      ov.push_back(p.obs.value);
      ou.push_back(p.obs.uncertainty);
      ol.push_back(p.obs.upper_limit ? 1.0 : 0.0);
    }
  }
  std::vector<double> mat, c2[4];
  for (std::size_t v = 0; v < V; ++v) {
    const auto& sc = r.scores[v];
    for (std::size_t q = 0; q < Q; ++q) {
      const bool ok = q < sc.size();
      c2[0].push_back(ok ? sc[q].chi2_log : kNaN);
      c2[1].push_back(ok ? sc[q].chi2_linear : kNaN);
      c2[2].push_back(ok ? sc[q].reduced_chi2_log : kNaN);
      c2[3].push_back(ok ? sc[q].reduced_chi2_linear : kNaN);
      for (std::size_t p = 0; p < first[q].points.size(); ++p) {
        mat.push_back(ok && p < sc[q].points.size() ? sc[q].points[p].model : kNaN);
      }
    }
  }
  ds.dimension("scored_species", Q);
  ds.dimension("observation", osp.size());
  ds.strings("score_species", "scored_species", "species scored against observations", names);
  ds.variable("observation_altitude", {"observation"},
              {"km", "altitude of the observed point", "altitude", {}}, oz);
  ds.variable("observation_value", {"observation"},
              {"1", "observed mole fraction (or upper limit)", "", {}}, ov);
  ds.variable("observation_uncertainty", {"observation"}, {"1", "one-sigma uncertainty", "", {}},
              ou);
  ds.flag("observation_upper_limit", {"observation"}, "observed value is an upper limit",
          "value upper_limit", ol);
  ds.strings("observation_species", "observation", "species of the observed point", osp);
  ds.variable("model_at_observation", {"variant", "observation"},
              {"1", "model mole fraction at the observed altitude", "", {}}, mat);
  const char* what[4] = {"chi2_log", "chi2_linear", "reduced_chi2_log", "reduced_chi2_linear"};
  for (int k = 0; k < 4; ++k) {
    ds.variable(what[k], {"variant", "scored_species"},
                {"1", std::string(what[k]) + " of the variant", "", {}}, c2[k]);
  }
}
}  // namespace

void add_sweep(Dataset& ds, const Background& bg, const SweepResults& r,
               const std::vector<std::size_t>& ranking) {
  add_background(ds, bg);
  ds.dimension("variant", r.variants.size());
  ds.dimension("species", r.species.size());
  ds.strings("species_name", "species", "species name (colchem notation)", r.species);
  add_variants(ds, r, ranking, bg.grid.cells());
  add_parameters_and_modules(ds, r);
  if (!r.scores.empty() && !r.scores.front().empty()) add_sweep_scores(ds, r);
}

namespace {
struct Row {
  std::size_t rank, variant;
  std::string label, status;
  double chi2_log, chi2_linear, red_log, red_lin, residual, wall;
  int iterations;
};

std::vector<Row> rows(const SweepResults& r, const std::vector<std::size_t>& ranking) {
  std::vector<Row> out;
  for (std::size_t k = 0; k < ranking.size(); ++k) {
    const std::size_t v = ranking[k];
    const auto& o = r.outcomes[v];
    const auto& sc = v < r.scores.size() ? r.scores[v] : std::vector<SpeciesScore>{};
    out.push_back({k + 1, v, r.variants[v].label, o.converged ? std::string("converged") : o.reason,
                   o.converged ? score_value(sc, "chi2_log") : kNaN,
                   o.converged ? score_value(sc, "chi2_linear") : kNaN,
                   o.converged ? score_value(sc, "reduced_chi2_log") : kNaN,
                   o.converged ? score_value(sc, "reduced_chi2_linear") : kNaN, o.residual,
                   o.wall_seconds, o.iterations});
  }
  return out;
}

std::string csv_quote(const std::string& s) {
  std::string q = "\"";
  for (char c : s) q += c == '"' ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}
}  // namespace

std::string sweep_table_csv(const SweepResults& r, const std::vector<std::size_t>& ranking,
                            const std::string& rank_by) {
  std::string out =
      "# ranked by " + rank_by + " (summed over scored species); failed variants last\n";
  out +=
      "rank,variant,label,status,chi2_log,reduced_chi2_log,chi2_linear,reduced_chi2_linear,"
      "iterations,residual,wall_time_s\n";
  for (const auto& w : rows(r, ranking)) {
    out += fmt::format("{},{},{},{},{:.10g},{:.10g},{:.10g},{:.10g},{},{:.3e},{:.3f}\n", w.rank,
                       w.variant, csv_quote(w.label), csv_quote(w.status), w.chi2_log, w.red_log,
                       w.chi2_linear, w.red_lin, w.iterations, w.residual, w.wall);
  }
  return out;
}

std::string sweep_table_text(const SweepResults& r, const std::vector<std::size_t>& ranking,
                             const std::string& rank_by) {
  std::size_t width = 7;
  for (const auto& v : r.variants) width = std::max(width, v.label.size());
  std::string out =
      fmt::format("{:>4}  {:<{}}  {:>10}  {:>9}  {:>10}  {:>5}  {:>9}  {}\n", "rank", "variant",
                  width, "chi2_log", "red.log", "chi2_lin", "iter", "residual", "status");
  for (const auto& w : rows(r, ranking)) {
    out += fmt::format("{:>4}  {:<{}}  {:>10.4g}  {:>9.4g}  {:>10.4g}  {:>5}  {:>9.2e}  {}\n",
                       w.rank, w.label, width, w.chi2_log, w.red_log, w.chi2_linear, w.iterations,
                       w.residual, w.status);
  }
  out += "(ranked by " + rank_by + ")\n";
  return out;
}

}  // namespace colchem
