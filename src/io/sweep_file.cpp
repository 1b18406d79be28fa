// Reading a sweep file back (io/sweep_file.hpp).
#include "io/sweep_file.hpp"

#include <fmt/format.h>

#include "core/error.hpp"

namespace colchem {

SweepFileRecord read_sweep_file(const std::filesystem::path& file) {
  const NcReader nc(file);
  const auto need = [&](const std::string& what) {
    nc.refuse(what, "a sweep file written by this version of colchem sweep",
              "no " + what + " (not a sweep file, or written before it was stored)");
  };
  for (const char* v : {"variant_state", "variant_overrides", "variant_status", "mole_fraction"}) {
    if (!nc.has_variable(v)) need(std::string("variable ") + v);
  }
  const auto text = [&](const char* name) {
    const auto t = nc.global_text(name);
    if (!t) need(std::string("global attribute ") + name);
    return t.value_or("");
  };
  SweepFileRecord rec;
  rec.file = file;
  rec.definition = text("colchem_sweep_definition");
  rec.definition_hash = text("colchem_sweep_definition_hash");
  rec.scenario = text("colchem_sweep_scenario");
  rec.piece = nc.global_text("colchem_sweep_piece").value_or("");
  rec.labels = nc.read_strings("variant_label", "variant");
  rec.status = nc.read_strings("variant_status", "variant");
  rec.overrides = nc.read_strings("variant_overrides", "variant");
  // Residuals, wall times and the mole fractions of failed variants may be NaN.
  const auto state = nc.read("variant_state", {"variant"});
  const auto its = nc.read("variant_iterations", {"variant"});
  const auto res = nc.read("variant_residual", {"variant"}, false);
  const auto wall = nc.read("variant_wall_time", {"variant"}, false);
  const auto rank = nc.read("variant_rank_of_process", {"variant"});
  const auto warm = nc.read("variant_warm_started", {"variant"});
  const auto mf = nc.read("mole_fraction", {"variant", "species", "altitude"}, false);
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
    const auto pos = nc.read("variant_ranking", {"variant"}, false);
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

}  // namespace colchem
