// colchem sweep SWEEP.yaml: run every variant of a scenario (module combinations x parameter
// grids x config overrides), on one process or under mpirun, score each against the
// observations, and write one NetCDF with a variant dimension plus a ranked table.
#include <mpi.h>

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <iostream>
#include <limits>
#include <map>
#include <optional>
#include <set>
#include <sstream>
#include <tuple>

#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "analysis/sweep_runner.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "chem/kinetics.hpp"
#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/scenario.hpp"
#include "io/sweep_loader.hpp"
#include "io/sweep_output.hpp"
#include "solve/column_run.hpp"
#include "solve/interrupt.hpp"
#include "solve/petsc_session.hpp"
#include "solve/progress.hpp"

namespace colchem::app {

namespace {

struct SweepCliOptions {
  std::string file;
  std::vector<std::string> sets;
  std::string output, table, variants;
  std::vector<std::string> resume, merge;
  bool dry_run = false, retry_failed = false;
  double progress_every = 0.2;
};

std::string file_text(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

/// What makes two runs the same sweep, one "what: digest" line each: the base scenario and
/// every file it reads, the observations, the ranking score and every variant's overrides
/// (the output paths and the range of a piece are not part of it).
std::string sweep_definition(const SweepSpec& spec, const Scenario& base,
                             const std::vector<Variant>& variants) {
  std::string d;
  d += fmt::format("scenario {}: {}\n", spec.scenario.filename().string(),
                   text_digest(file_text(spec.scenario)));
  for (const auto& f : base.inputs) {
    d += fmt::format("{} {}: {}\n", f.role, f.path.filename().string(), text_digest(f.text));
  }
  if (!spec.observations.empty()) {
    d += fmt::format("observations {}: {}\n", spec.observations.filename().string(),
                     text_digest(file_text(spec.observations)));
  }
  d += "rank_by: " + spec.rank_by + "\n";
  d += fmt::format("variants: {}\n", variants.size());
  std::string all;
  for (const auto& v : variants) {
    for (const auto& a : v.overrides) all += a + "\n";
    all += "\x1e";
  }
  d += "variant overrides: " + text_digest(all) + "\n";
  return d;
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string l; std::getline(in, l);) out.push_back(l);
  return out;
}

/// Refuses a sweep file of another definition, naming what differs (the lines of the
/// definition, and the first variant whose overrides differ).
void require_same_definition(const SweepFileRecord& rec, const std::string& definition,
                             const std::vector<Variant>& variants, const std::string& option) {
  if (rec.definition == definition) return;
  const auto mine = lines_of(definition), theirs = lines_of(rec.definition);
  const auto only_in = [](const std::vector<std::string>& a, const std::vector<std::string>& b) {
    std::vector<std::string> out;
    for (const auto& l : a) {
      if (std::find(b.begin(), b.end(), l) == b.end()) out.push_back("'" + l + "'");
    }
    return out.empty() ? std::string("nothing") : fmt::format("{}", fmt::join(out, ", "));
  };
  // The first variant whose overrides differ, by the overrides only one side has.
  std::vector<std::string> diffs;
  for (std::size_t v = 0; v < variants.size() && v < rec.overrides.size(); ++v) {
    const auto file_sets = lines_of(rec.overrides[v]);
    if (file_sets == variants[v].overrides) continue;
    diffs.push_back(fmt::format("variant {}: file has {}, sweep has {}", v,
                                only_in(file_sets, variants[v].overrides),
                                only_in(variants[v].overrides, file_sets)));
    break;
  }
  for (std::size_t k = 0; k < theirs.size(); ++k) {
    const auto& l = theirs[k];
    if (std::find(mine.begin(), mine.end(), l) != mine.end()) continue;
    if (l.starts_with("variant overrides:") && !diffs.empty()) continue;
    const auto colon = l.rfind(": ");
    const std::string what = l.substr(0, colon);
    const auto same = std::find_if(
        mine.begin(), mine.end(), [&](const std::string& m) { return m.starts_with(what + ": "); });
    diffs.push_back(same == mine.end() ? "'" + what + "' only in the file"
                                       : "'" + what + "' differs (file " + l.substr(colon + 2) +
                                             ", sweep " + same->substr(colon + 2) + ")");
  }
  for (const auto& l : mine) {
    const std::string what = l.substr(0, l.rfind(": "));
    const bool in_file = std::any_of(theirs.begin(), theirs.end(), [&](const std::string& t) {
      return t.starts_with(what + ": ");
    });
    if (!in_file) diffs.push_back("'" + what + "' only in the sweep");
  }
  throw InputError(ExitCode::kConfig, SourceLocation{rec.file.string()}, option,
                   "a sweep file of the same sweep definition (scenario, input files, "
                   "observations, rank_by and variant overrides)",
                   "another definition: " + fmt::format("{}", fmt::join(diffs, "; ")),
                   "run the sweep without " + option +
                       " or with the sweep file and --set "
                       "values that produced it");
}

/// The swept parameters that act on a variant: named in the scale of one of its active
/// reactions, or used by its photolysis data (conservatively, whatever channel). A variant
/// whose scenario does not load counts every parameter as acting (it fails later, as
/// before).
std::set<std::string> acting_parameters(const SweepSpec& spec, const Variant& v,
                                        const UnitSystem& units) {
  std::set<std::string> out;
  try {
    const Scenario sc = load_scenario(spec.scenario, v.overrides, units);
    ColumnModel model(sc);
    if (!model.has_chemistry()) throw std::runtime_error("no chemistry");
    const Kinetics& kin = model.chemistry().kinetics();
    const Mechanism& mech = kin.mechanism();
    for (std::size_t r = 0; r < kin.reaction_count(); ++r) {
      for (const auto& f : mech.reactions[kin.mechanism_reaction(r)].scale) {
        out.insert(mech.parameters[f.parameter].name);
      }
    }
    for (std::size_t q = 0; q < mech.parameters.size(); ++q) {
      if (model.photolysis() && model.photolysis()->acts_on(q)) out.insert(mech.parameters[q].name);
    }
  } catch (const std::exception&) {
    for (const auto& a : spec.axes) out.insert(a.name);
  }
  return out;
}

std::string one_line(const std::vector<std::string>& v) {
  return fmt::format("{}", fmt::join(v, " "));
}

int run_sweep(const SweepCliOptions& o, Context& ctx) {
  const PetscSession petsc;  // initialises MPI as well
  int rank = 0, size = 1;
  MPI_Comm_rank(MPI_COMM_WORLD, &rank);
  MPI_Comm_size(MPI_COMM_WORLD, &size);
  const UnitSystem units;
  SweepSpec spec = load_sweep(o.file, o.sets);
  if (!o.resume.empty() && !o.merge.empty()) {
    throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "--merge",
                     "either --resume or --merge", "both");
  }
  if (o.retry_failed && o.resume.empty()) {
    throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "--retry-failed",
                     "--resume FILE with it", "no --resume");
  }
  if (!o.merge.empty() && !o.variants.empty()) {
    throw InputError(ExitCode::kUsage, SourceLocation{"command line"}, "--merge",
                     "--merge without --variants (the merged file holds every variant)",
                     "--variants " + o.variants);
  }
  std::vector<Variant> variants = expand_variants(spec);

  // The base scenario fixes the grid and species every variant must share.
  const Scenario base = load_scenario(spec.scenario, spec.common_overrides, units);
  ColumnModel base_model(base);
  if (!base_model.has_chemistry()) {
    throw InputError(ExitCode::kConfig, SourceLocation{spec.scenario.string()}, "chemistry",
                     "a scenario with a chemistry section", "none");
  }
  // Every module a variant switches on exists in the mechanism: refused here (exit 3), not
  // as every variant failing.
  const Mechanism& mech = *base.chemistry.mechanism;
  for (const auto& ms : spec.module_sets) {
    for (const auto& name : ms.modules) {
      if (mech.module_index(name)) continue;
      std::vector<std::string> all;
      for (const auto& md : mech.modules) all.push_back(md.name);
      const auto near = nearest_word(name, all);
      throw InputError(ExitCode::kConfig, ms.where, ms.key_path,
                       "a module of mechanism '" + mech.name + "' (" +
                           fmt::format("{}", fmt::join(all, ", ")) + ")",
                       "unknown module '" + name + "'",
                       near ? "did you mean '" + *near + "'?" : std::string{});
    }
  }
  // Every swept parameter exists and every value lies within its bounds: refused here
  // (exit 3), not as every variant failing.
  for (const auto& a : spec.axes) {
    const auto idx = mech.parameter_index(a.name);
    if (!idx) {
      std::vector<std::string> all;
      for (const auto& p : mech.parameters) all.push_back(p.name);
      const auto near = nearest_word(a.name, all);
      throw InputError(ExitCode::kConfig, a.where, a.key_path,
                       "a parameter of mechanism '" + mech.name + "' (" +
                           fmt::format("{}", fmt::join(all, ", ")) + ")",
                       "unknown parameter '" + a.name + "'",
                       near ? "did you mean '" + *near + "'?" : std::string{});
    }
    const Parameter& p = mech.parameters[*idx];
    for (const double x : a.values) {
      if (!(x >= p.min && x <= p.max)) {
        throw InputError(ExitCode::kConfig, a.where, a.key_path,
                         fmt::format("values of '{}' within [{}, {}]", a.name, p.min, p.max),
                         fmt::format("{}", x));
      }
    }
  }
  // A parameter that acts on no reaction of a variant (its module switched off) does not
  // make a variant of its own: such variants are merged.
  if (!spec.axes.empty()) {
    std::map<std::pair<std::size_t, std::size_t>, std::set<std::string>> acting;
    for (const auto& v : variants) {
      const auto key = std::make_pair(v.module_set, v.override_set);
      if (!acting.contains(key)) acting.emplace(key, acting_parameters(spec, v, units));
    }
    const std::size_t before = variants.size();
    std::vector<std::string> dropped;
    const std::size_t merged = merge_duplicate_variants(
        variants,
        [&](const Variant& v, const std::string& p) {
          return acting.at({v.module_set, v.override_set}).contains(p);
        },
        &dropped);
    if (merged > 0 && rank == 0) {
      ctx.log->info(
          "merged {} duplicate variant{} of {} (parameters that act on no reaction of the "
          "variant; module set: parameter): {}",
          merged, merged == 1 ? "" : "s", before, fmt::join(dropped, ", "));
    }
  }
  const std::string definition = sweep_definition(spec, base, variants);
  const std::size_t V = variants.size();

  if (o.dry_run) {
    if (rank == 0) {
      std::cout << fmt::format("sweep {}: {} variants (definition {})\n", spec.name, V,
                               text_digest(definition));
      std::cout << "variant\tmodules\tparameters\toverrides\n";
      for (const auto& v : variants) {
        std::vector<std::string> params;
        // Readable here; the overrides column carries the exact values.
        for (const auto& [n, x] : v.parameters) params.push_back(fmt::format("{}={:.6g}", n, x));
        std::cout << fmt::format(
            "{}\t{}\t{}\t{}\n", v.index,
            v.modules.empty() ? v.module_label : fmt::format("{}", fmt::join(v.modules, "+")),
            params.empty() ? "-" : one_line(params),
            v.overrides.empty() ? "-" : fmt::format("{}", fmt::join(v.overrides, " | ")));
      }
      std::cout << fmt::format("{} variants\n", V);
    }
    return 0;
  }

  // A piece of the sweep (job arrays): variants [lo, hi) only, into its own files.
  std::size_t lo = 0, hi = V;
  const bool piece = !o.variants.empty();
  if (piece) {
    std::tie(lo, hi) = parse_variant_range(o.variants, V);
    const auto piece_name = [&](const std::filesystem::path& p) {
      std::filesystem::path q = p;
      q.replace_extension(fmt::format(".variants-{}-{}{}", lo, hi, p.extension().string()));
      return q;
    };
    if (o.output.empty()) spec.output = piece_name(spec.output);
    if (o.table.empty()) spec.table = piece_name(spec.table);
  }
  if (!o.output.empty()) spec.output = o.output;
  if (!o.table.empty()) spec.table = o.table;

  // Results carried over from earlier files (--resume) or pieces (--merge).
  std::vector<std::optional<VariantOutcome>> carried(V);
  std::vector<std::string> carried_from(V);
  const bool merging = !o.merge.empty();
  for (const auto& f : merging ? o.merge : o.resume) {
    const SweepFileRecord rec = read_sweep_file(f);
    require_same_definition(rec, definition, variants, merging ? "--merge" : "--resume");
    for (std::size_t v = 0; v < V; ++v) {
      const VariantState st = rec.state[v];
      const bool finished = st == VariantState::kConverged ||
                            (st == VariantState::kFailed && (merging || !o.retry_failed));
      if (!finished) continue;
      if (carried[v]) {
        if (merging) {
          throw InputError(ExitCode::kInputData, SourceLocation{f}, "--merge",
                           "pieces that each hold a variant at most once",
                           fmt::format("variant {} also in {}", v, carried_from[v]));
        }
        continue;
      }
      carried[v] = rec.outcomes[v];
      carried_from[v] = f;
    }
  }
  if (merging) {
    std::vector<std::string> missing;
    for (std::size_t v = 0; v < V; ++v) {
      if (!carried[v]) missing.push_back(std::to_string(v));
    }
    if (!missing.empty()) {
      if (missing.size() > 20) {
        const auto n = missing.size();
        missing.resize(20);
        missing.push_back(fmt::format("... ({} in all)", n));
      }
      throw InputError(ExitCode::kInputData, SourceLocation{o.merge.front()}, "--merge",
                       fmt::format("pieces that together finish all {} variants", V),
                       "no finished result for variant" +
                           std::string(missing.size() == 1 ? " " : "s ") +
                           fmt::format("{}", fmt::join(missing, ", ")),
                       "run the piece holding them again with --resume PIECE (it keeps the "
                       "finished ones)");
    }
  }
  std::vector<std::size_t> todo;
  for (std::size_t v = lo; v < hi; ++v) {
    if (!carried[v]) todo.push_back(v);
  }

  // Rank 0 writes the files: it holds them for the whole sweep (one live writer per path).
  std::vector<OutputClaim> claims;
  if (rank == 0) claims = claim_outputs({spec.output, spec.table});

  const std::size_t S = base_model.species_count(), N = base_model.cells();
  ObservationSet obs;
  if (!spec.observations.empty()) {
    obs = read_observations(spec.observations, units);
    require_observed_species(obs, base_model.species());  // not as every variant failing
  }
  if (rank == 0) {
    ctx.log->info("sweep {}: {} variants on {} rank{}", spec.name, V, size, size == 1 ? "" : "s");
    if (piece) ctx.log->info("this piece: variants {}:{} ({} of {})", lo, hi, hi - lo, V);
    const std::size_t kept =
        std::count_if(carried.begin(), carried.end(), [](const auto& c) { return c.has_value(); });
    if (!o.resume.empty()) {
      ctx.log->info("resuming: {} finished variant{} kept from {}, {} to run", kept,
                    kept == 1 ? "" : "s", fmt::join(o.resume, ", "), todo.size());
    }
    if (merging) ctx.log->info("merging {} pieces: all {} variants finished", o.merge.size(), V);
  }
  const InterruptGuard interrupt;

  // Every variant starts from the base scenario's steady state, solved on every rank by
  // the same deterministic solve (grid sequencing as `colchem run`), so that a variant's
  // answer does not depend on the rank that ran it or on what that rank ran before: the
  // scores on 1 and 2 ranks are identical (tests/cli/sweep_test.sh). A variant that does
  // not converge from there (or every variant, when the base did not converge) starts
  // again from its own scenario's cold start, grid-sequenced as `colchem run` does.
  // Merging pieces solves nothing, and a rank with nothing to run skips the base.
  std::optional<BaseSolve> base_solve;
  if (!merging && !todo.empty()) {
    BaseStart base_start(spec.scenario.string(), spec.common_overrides);
    base_start.progress = rank == 0;
    try {
      base_solve = solve_steady_base(base_start, base, base_model, units, ctx, interrupt,
                                     "base state of the sweep");
    } catch (const RunError& e) {
      // Stopped on a coarser level of the base state: no variant starts (the stop request
      // is seen first), and the files record every variant as interrupted (exit 7).
      if (e.code() != ExitCode::kInterrupted) throw;
      ctx.log->warn("interrupted (signal {}) during the base state of the sweep",
                    interrupt.signal_number());
    }
  }
  const bool base_ok = base_solve && base_solve->run.ok();

  const VariantRunner runner = [&](const Variant& v) {
    VariantOutcome result;
    const Scenario sc = load_scenario(spec.scenario, v.overrides, units);
    ColumnModel model(sc);
    if (model.species_count() != S || model.cells() != N) {
      result.reason = "the variant changes the grid or the species of the base scenario";
      return result;
    }
    RunControls controls;
    controls.stop_requested = interrupt.query();
    RunOutcome r;
    if (base_ok) {
      std::vector<double> x0 = base_solve->run.x;
      model.impose_held(x0);
      controls.warm_start = true;
      r = run_column(model, sc.solver, std::move(x0), controls);
      result.warm_started = true;
    }
    if (!base_ok || (!r.ok() && r.status != SolveStatus::kInterrupted)) {
      BaseStart own(spec.scenario.string(), v.overrides);
      own.progress = false;
      StartState st;
      try {
        st = start_state(own, sc, model, units, nullptr, interrupt);
      } catch (const RunError& e) {
        if (e.code() != ExitCode::kInterrupted) throw;
        result.interrupted = true;
        result.reason = "interrupted";
        return result;
      }
      model.impose_held(st.x0);
      controls.warm_start = st.warm;
      const long before = base_ok ? r.iterations : 0;
      r = run_column(model, sc.solver, std::move(st.x0), controls);
      r.iterations += before;
      result.warm_started = false;
    }
    result.converged = r.ok();
    result.interrupted = r.status == SolveStatus::kInterrupted;
    result.reason = r.ok() ? std::string("converged")
                           : (result.interrupted ? std::string("interrupted") : r.reason);
    result.iterations = static_cast<int>(r.iterations);
    result.residual = r.residual_norm;
    result.values = mole_fractions(model, r.x);
    return result;
  };
  BatchProgress batch(*ctx.log, "sweep", o.progress_every);
  const VariantDone done = [&](const Variant& v, const VariantOutcome& r) {
    batch.finished(r.finished, r.to_run);
    ctx.log->info("variant {}/{} [{}] {} on rank {}: {} ({} iterations, {:.2f} s)", v.index + 1, V,
                  v.label, r.warm_started ? "from the base" : "cold", rank,
                  r.converged ? "converged" : (r.interrupted ? r.reason : "FAILED: " + r.reason),
                  r.iterations, r.wall_seconds);
  };
  std::vector<VariantOutcome> outcomes;
  if (merging) {
    if (rank == 0) outcomes.resize(V);  // every variant is carried (checked above)
  } else {
    outcomes = run_variants(MPI_COMM_WORLD, variants, runner, done, interrupt.query(), &todo);
  }
  // The other ranks wait for rank 0's exit code, so that none exits (and mpirun aborts the
  // job, killing rank 0) before rank 0 has written the files.
  if (rank != 0) {
    int code = 0;
    MPI_Bcast(&code, 1, MPI_INT, 0, MPI_COMM_WORLD);
    return code;
  }
  const auto finish = [](int code) {
    MPI_Bcast(&code, 1, MPI_INT, 0, MPI_COMM_WORLD);
    return code;
  };
  for (std::size_t v = 0; v < V; ++v) {
    if (carried[v]) {
      outcomes[v] = *carried[v];
      outcomes[v].index = v;
    } else if (outcomes[v].skipped) {
      outcomes[v].reason = fmt::format("not run: outside variants {}:{} of this piece", lo, hi);
    }
  }

  SweepResults res;
  res.variants = variants;
  res.species = base_model.species();
  for (const auto& a : spec.axes) res.parameter_names.push_back(a.name);
  std::set<std::string> modules;
  for (const auto& m : spec.module_sets) modules.insert(m.modules.begin(), m.modules.end());
  res.module_names.assign(modules.begin(), modules.end());
  for (auto& oc : outcomes) {
    res.mole_fraction.push_back(oc.converged ? oc.values : std::vector<double>{});
    std::vector<SpeciesScore> scores;
    if (!obs.points.empty() && oc.converged) {
      // Every variant is a fixed model, not a fit: p = 0 in the reduced chi-square.
      scores = score_column(base_model.background().grid.center_cm, res.species, oc.values, obs, 0);
    }
    res.scores.push_back(std::move(scores));
  }
  if (!obs.points.empty()) {
    // Failed variants get the observation layout with no model values, for a rectangular file.
    std::vector<SpeciesScore> layout;
    for (const auto& sc : res.scores) {
      if (!sc.empty()) {
        layout = sc;
        break;
      }
    }
    for (auto& sc : layout) {
      sc.chi2_log = sc.chi2_linear = sc.reduced_chi2_log = sc.reduced_chi2_linear =
          std::numeric_limits<double>::quiet_NaN();
      for (auto& p : sc.points) p.model = std::numeric_limits<double>::quiet_NaN();
    }
    for (auto& sc : res.scores) {
      if (sc.empty()) sc = layout;
    }
  }
  res.outcomes = std::move(outcomes);
  std::size_t converged = 0, interrupted = 0, not_run = 0;
  for (const auto& oc : res.outcomes) {
    converged += oc.converged ? 1 : 0;
    interrupted += oc.interrupted ? 1 : 0;
    not_run += oc.skipped ? 1 : 0;
  }
  const std::size_t failed = res.outcomes.size() - converged - interrupted - not_run;
  // What the files say about the sweep as a whole: complete only when nothing was
  // interrupted; a sweep with no converged variant is not a result either.
  const std::string sweep_status = interrupted > 0  ? "interrupted"
                                   : converged == 0 ? "failed"
                                                    : "complete";
  const std::string counts =
      fmt::format("{} of {} variants converged, {} failed, {} interrupted", converged,
                  res.outcomes.size(), failed, interrupted) +
      (not_run > 0 ? fmt::format(", {} not run (piece {}:{})", not_run, lo, hi) : std::string{});
  const auto ranking = rank_variants(res, spec.rank_by);
  {
    NcWriter nc(spec.output);
    write_provenance(nc, base, ctx.command_line);
    nc.global_text("colchem_sweep_file", spec.file.string());
    nc.global_text("colchem_sweep_scenario",
                   std::filesystem::weakly_canonical(spec.scenario).string());
    nc.global_text("colchem_sweep_definition", definition);
    nc.global_text("colchem_sweep_definition_hash", text_digest(definition));
    if (piece) nc.global_text("colchem_sweep_piece", fmt::format("{}:{}", lo, hi));
    nc.global_number("colchem_sweep_ranks", size);
    nc.global_text("colchem_sweep_status", sweep_status + ": " + counts);
    write_sweep_netcdf(nc, base_model.background(), res, ranking);
    nc.commit();
  }
  write_text_file(spec.table, sweep_table_csv(res, ranking, spec.rank_by));
  std::cout << sweep_table_text(res, ranking, spec.rank_by);
  ctx.log->info("wrote {} and {}; {}", spec.output.string(), spec.table.string(), counts);
  if (interrupted > 0) {
    ctx.log->warn(
        "sweep interrupted (signal {}): {} variant{} not finished, recorded as "
        "'interrupted'; the results are incomplete; continue with --resume {}",
        interrupt.signal_number(), interrupted, interrupted == 1 ? "" : "s", spec.output.string());
    return finish(static_cast<int>(ExitCode::kInterrupted));
  }
  if (converged == 0) {
    ctx.log->error(
        "no variant of the sweep converged: 0 of {} ({} failed); the reasons are in the "
        "status column of {}",
        res.outcomes.size() - not_run, failed, spec.table.string());
    return finish(static_cast<int>(ExitCode::kNotConverged));
  }
  return finish(0);
}

}  // namespace

void add_sweep_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "sweep",
      "Run a sweep of scenario variants (modules x parameters x overrides); under "
      "mpirun the variants are shared among the ranks. Exits 5 when no variant "
      "converged; SIGINT/SIGTERM: unfinished variants are written as 'interrupted', "
      "exit 7.");
  auto o = std::make_shared<SweepCliOptions>();
  cmd->add_option("SWEEP", o->file, "Sweep file (YAML; README \"Sweeps\")")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option("--set", o->sets, "Override a value of the sweep file by its key path");
  cmd->add_option("-o,--output", o->output, "NetCDF output (default: sweep.output)");
  cmd->add_option("--table", o->table, "Ranked CSV table (default: sweep.table)");
  cmd->add_flag("--dry-run", o->dry_run,
                "List the variants (index, modules, parameters, overrides) and their count "
                "without solving");
  cmd->add_option("--resume", o->resume,
                  "Sweep file(s) of an earlier run of this sweep: keep their finished variants "
                  "and run only the others (interrupted or never started)")
      ->check(CLI::ExistingFile);
  cmd->add_flag("--retry-failed", o->retry_failed,
                "With --resume: run the variants that failed again too");
  cmd->add_option("--variants", o->variants,
                  "Run only variants A to B-1 (0-based, 'A:B') into a piece file (for job "
                  "arrays; join the pieces with --merge)");
  cmd->add_option("--merge", o->merge,
                  "Join piece files of this sweep (from --variants) into one sweep file "
                  "without solving; refuses pieces of another sweep definition or a variant "
                  "left unfinished")
      ->check(CLI::ExistingFile);
  cmd->add_option("--progress-every", o->progress_every,
                  "At most one progress line (variants done/total, time left; and each "
                  "variant's solve) per this many seconds (0: every line)")
      ->check(CLI::NonNegativeNumber)
      ->capture_default_str();
  out.emplace_back(cmd, [o](Context& ctx) { return run_sweep(*o, ctx); });
}

}  // namespace colchem::app
