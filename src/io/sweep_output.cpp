#include "io/sweep_output.hpp"

#include <fmt/format.h>
#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <limits>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"

namespace colchem {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

double score_value(const std::vector<SpeciesScore>& scores, const std::string& what) {
  if (scores.empty()) return kNaN;
  double sum = 0.0;
  for (const auto& s : scores) {
    if (what == "chi2_log") sum += s.chi2_log;
    else if (what == "chi2_linear") sum += s.chi2_linear;
    else if (what == "reduced_chi2_log") sum += s.reduced_chi2_log;
    else sum += s.reduced_chi2_linear;
  }
  return sum;
}
}  // namespace

std::vector<std::size_t> rank_variants(const SweepResults& r, const std::string& rank_by) {
  std::vector<std::size_t> idx(r.variants.size());
  for (std::size_t i = 0; i < idx.size(); ++i) idx[i] = i;
  auto key = [&](std::size_t i) {
    const double v = r.outcomes[i].converged && i < r.scores.size()
                         ? score_value(r.scores[i], rank_by)
                         : kNaN;
    return std::isnan(v) ? std::numeric_limits<double>::infinity() : v;
  };
  std::stable_sort(idx.begin(), idx.end(), [&](std::size_t a, std::size_t b) {
    const bool fa = !r.outcomes[a].converged, fb = !r.outcomes[b].converged;
    if (fa != fb) return fb;
    return key(a) < key(b);
  });
  return idx;
}

void write_sweep_netcdf(NcWriter& nc, const Background& bg, const SweepResults& r,
                        const std::vector<std::size_t>& ranking) {
  const std::size_t V = r.variants.size();
  const std::size_t S = r.species.size();
  const std::size_t N = bg.grid.cells();
  define_background(nc, bg);
  nc.dimension("variant", V);
  nc.dimension("species", S);
  nc.string_variable("species_name", "species", "species name (colchem notation)");
  nc.string_variable("variant_label", "variant", "variant: modules, overrides, parameters");
  nc.string_variable("variant_status", "variant", "converged, or the reason the variant failed");
  nc.string_variable("variant_overrides", "variant",
                     "every --set override of the variant, one per line (colchem run "
                     "--from-sweep FILE --variant N runs it)");
  nc.variable("variant_state", {"variant"},
              {"",
               "what the file holds for the variant",
               "",
               {{"flag_meanings", "not_run converged failed interrupted"}},
               true,
               {0, 1, 2, 3}});
  nc.variable(
      "variant_converged", {"variant"},
      {"", "variant converged", "", {{"flag_meanings", "not_converged converged"}}, true, {0, 1}});
  nc.variable("variant_iterations", {"variant"}, {"1", "solver iterations", "", {}, true});
  nc.variable("variant_residual", {"variant"}, {"1", "scaled coupled residual of the end state", "", {}});
  nc.variable("variant_wall_time", {"variant"}, {"s", "wall time of the variant", "", {}});
  nc.variable("variant_rank_of_process", {"variant"}, {"1", "MPI rank that ran the variant", "", {}});
  nc.variable("variant_warm_started", {"variant"},
              {"",
               "start of the variant",
               "",
               {{"flag_meanings", "own_cold_start base_state"}},
               true,
               {0, 1}});
  nc.variable("variant_ranking", {"variant"}, {"1", "position in the ranked table (1 = best)", "", {}});
  nc.variable("mole_fraction", {"variant", "species", "altitude"},
              {"1", "mole fraction (NaN where the variant failed)", "", {}});
  nc.var_number("mole_fraction", "_FillValue", kNaN);
  if (!r.parameter_names.empty()) {
    nc.dimension("parameter", r.parameter_names.size());
    nc.string_variable("parameter_name", "parameter", "swept mechanism parameter");
    nc.variable("parameter_value", {"variant", "parameter"}, {"1", "parameter value of the variant", "", {}});
  }
  if (!r.module_names.empty()) {
    nc.dimension("module", r.module_names.size());
    nc.string_variable("module_name", "module", "mechanism module");
    nc.variable("module_on", {"variant", "module"},
                {"", "module switched on", "", {{"flag_meanings", "off on"}}, true, {0, 1}});
  }
  const bool scored = !r.scores.empty() && !r.scores.front().empty();
  std::size_t P = 0, Q = 0;
  if (scored) {
    Q = r.scores.front().size();
    for (const auto& s : r.scores.front()) P += s.points.size();
    nc.dimension("scored_species", Q);
    nc.dimension("observation", P);
    nc.string_variable("score_species", "scored_species", "species scored against observations");
    nc.variable("observation_altitude", {"observation"}, {"km", "altitude of the observed point", "altitude", {}});
    nc.variable("observation_value", {"observation"}, {"1", "observed mole fraction (or upper limit)", "", {}});
    nc.variable("observation_uncertainty", {"observation"}, {"1", "one-sigma uncertainty", "", {}});
    nc.variable("observation_upper_limit", {"observation"},
                {"",
                 "observed value is an upper limit",
                 "",
                 {{"flag_meanings", "value upper_limit"}},
                 true,
                 {0, 1}});
    nc.string_variable("observation_species", "observation", "species of the observed point");
    nc.variable("model_at_observation", {"variant", "observation"}, {"1", "model mole fraction at the observed altitude", "", {}});
    for (const char* v : {"chi2_log", "chi2_linear", "reduced_chi2_log", "reduced_chi2_linear"}) {
      nc.variable(v, {"variant", "scored_species"}, {"1", std::string(v) + " of the variant", "", {}});
    }
  }
  nc.end_definitions();
  write_background_data(nc, bg);
  nc.put_strings("species_name", r.species);
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
    if (f.size() == S * N) {
      mf.insert(mf.end(), f.begin(), f.end());
    } else {
      mf.insert(mf.end(), S * N, kNaN);
    }
  }
  for (std::size_t k = 0; k < ranking.size(); ++k) pos[ranking[k]] = static_cast<double>(k + 1);
  nc.put_strings("variant_label", labels);
  nc.put_strings("variant_status", status);
  nc.put_strings("variant_overrides", overrides);
  nc.put("variant_state", state);
  nc.put("variant_converged", conv);
  nc.put("variant_iterations", its);
  nc.put("variant_residual", res);
  nc.put("variant_wall_time", wall);
  nc.put("variant_rank_of_process", rank);
  nc.put("variant_warm_started", warm);
  nc.put("variant_ranking", pos);
  nc.put("mole_fraction", mf);
  if (!r.parameter_names.empty()) {
    nc.put_strings("parameter_name", r.parameter_names);
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
    nc.put("parameter_value", pv);
  }
  if (!r.module_names.empty()) {
    nc.put_strings("module_name", r.module_names);
    std::vector<double> on;
    for (const auto& var : r.variants) {
      for (const auto& m : r.module_names) {
        on.push_back(std::find(var.modules.begin(), var.modules.end(), m) != var.modules.end() ? 1.0 : 0.0);
      }
    }
    nc.put("module_on", on);
  }
  if (scored) {
    const auto& first = r.scores.front();
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
    nc.put_strings("score_species", names);
    nc.put_strings("observation_species", osp);
    nc.put("observation_altitude", oz);
    nc.put("observation_value", ov);
    nc.put("observation_uncertainty", ou);
    nc.put("observation_upper_limit", ol);
    std::vector<double> mat, c2l, c2lin, rc2l, rc2lin;
    for (std::size_t v = 0; v < V; ++v) {
      const auto& sc = r.scores[v];
      for (std::size_t q = 0; q < Q; ++q) {
        const bool ok = q < sc.size();
        c2l.push_back(ok ? sc[q].chi2_log : kNaN);
        c2lin.push_back(ok ? sc[q].chi2_linear : kNaN);
        rc2l.push_back(ok ? sc[q].reduced_chi2_log : kNaN);
        rc2lin.push_back(ok ? sc[q].reduced_chi2_linear : kNaN);
        const std::size_t np = first[q].points.size();
        for (std::size_t p = 0; p < np; ++p) {
          mat.push_back(ok && p < sc[q].points.size() ? sc[q].points[p].model : kNaN);
        }
      }
    }
    nc.put("model_at_observation", mat);
    nc.put("chi2_log", c2l);
    nc.put("chi2_linear", c2lin);
    nc.put("reduced_chi2_log", rc2l);
    nc.put("reduced_chi2_linear", rc2lin);
  }
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
  std::string out = "# ranked by " + rank_by + " (summed over scored species); failed variants last\n";
  out += "rank,variant,label,status,chi2_log,reduced_chi2_log,chi2_linear,reduced_chi2_linear,"
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
  std::string out = fmt::format("{:>4}  {:<{}}  {:>10}  {:>9}  {:>10}  {:>5}  {:>9}  {}\n", "rank",
                                "variant", width, "chi2_log", "red.log", "chi2_lin", "iter",
                                "residual", "status");
  for (const auto& w : rows(r, ranking)) {
    out += fmt::format("{:>4}  {:<{}}  {:>10.4g}  {:>9.4g}  {:>10.4g}  {:>5}  {:>9.2e}  {}\n", w.rank,
                       w.label, width, w.chi2_log, w.red_log, w.chi2_linear, w.iterations,
                       w.residual, w.status);
  }
  out += "(ranked by " + rank_by + ")\n";
  return out;
}

SweepFileRecord read_sweep_file(const std::filesystem::path& file) {
  const NcReader nc(file);
  const auto need = [&](const std::string& what) {
    return InputError(ExitCode::kInputData, SourceLocation{file.string()}, what,
                      "a sweep file written by this version of colchem sweep",
                      "no " + what + " (not a sweep file, or written before it was stored)");
  };
  SweepFileRecord rec;
  rec.file = file;
  for (const char* v : {"variant_state", "variant_overrides", "variant_status", "mole_fraction"}) {
    if (!nc.has_variable(v)) throw need(std::string("variable ") + v);
  }
  const auto text = [&](const char* name) {
    auto t = nc.global_text(name);
    if (!t) throw need(std::string("global attribute ") + name);
    return *t;
  };
  rec.definition = text("colchem_sweep_definition");
  rec.definition_hash = text("colchem_sweep_definition_hash");
  rec.scenario = text("colchem_sweep_scenario");
  rec.piece = nc.global_text("colchem_sweep_piece").value_or("");
  rec.labels = nc.read_strings("variant_label");
  rec.status = nc.read_strings("variant_status");
  rec.overrides = nc.read_strings("variant_overrides");
  const auto state = nc.read("variant_state");
  const auto its = nc.read("variant_iterations");
  const auto res = nc.read("variant_residual");
  const auto wall = nc.read("variant_wall_time");
  const auto rank = nc.read("variant_rank_of_process");
  const auto warm = nc.read("variant_warm_started");
  const auto mf = nc.read("mole_fraction");
  const std::size_t V = state.size();
  const std::size_t per = V == 0 ? 0 : mf.size() / V;
  for (std::size_t v = 0; v < V; ++v) {
    const auto st = static_cast<VariantState>(static_cast<int>(state[v]));
    rec.state.push_back(st);
    VariantOutcome o;
    o.index = v;
    o.converged = st == VariantState::kConverged;
    o.interrupted = st == VariantState::kInterrupted;
    o.skipped = st == VariantState::kNotRun;
    o.reason = rec.status[v];
    o.iterations = static_cast<int>(its[v]);
    o.residual = res[v];
    o.wall_seconds = wall[v];
    o.rank = static_cast<int>(rank[v]);
    o.warm_started = warm[v] != 0.0;
    if (o.converged) {
      o.values.assign(mf.begin() + static_cast<std::ptrdiff_t>(v * per),
                      mf.begin() + static_cast<std::ptrdiff_t>((v + 1) * per));
    }
    rec.outcomes.push_back(std::move(o));
  }
  return rec;
}

std::string sweep_file_instead_of_run(const NcReader& nc) {
  if (!nc.global_text("colchem_sweep_file")) return {};
  std::size_t best = 0, count = 0;
  if (nc.has_variable("variant_ranking")) {
    const auto pos = nc.read("variant_ranking");
    count = pos.size();
    for (std::size_t v = 0; v < pos.size(); ++v) {
      if (pos[v] == 1.0) best = v;
    }
  }
  return fmt::format(
      "{} is a sweep file ({} variants), not a run file; write a run file of one variant "
      "with 'colchem run --from-sweep {} --variant N -o variant.nc' (N as in the 'variant' "
      "column of the ranked table; the best-ranked is {}), then give that file",
      nc.path().string(), count, nc.path().string(), best);
}

void write_text_file(const std::filesystem::path& file, const std::string& text) {
  const OutputClaim claim(file);
  std::filesystem::path tmp = file;
  tmp += ".tmp-" + std::to_string(::getpid());
  if (file.has_parent_path()) {
    std::error_code ec;
    std::filesystem::create_directories(file.parent_path(), ec);
  }
  {
    std::ofstream out(tmp);
    out << text;
    if (!out) throw RunError(ExitCode::kOutput, file.string() + ": could not write");
  }
  std::error_code ec;
  std::filesystem::rename(tmp, file, ec);
  if (ec) {
    std::filesystem::remove(tmp, ec);
    throw RunError(ExitCode::kOutput, file.string() + ": could not move into place");
  }
}

}  // namespace colchem
