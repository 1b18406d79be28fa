// colchem sweep SWEEP.yaml: run every variant of a scenario (module combinations x parameter
// grids x config overrides), on one process or under mpirun, score each against the
// observations, and write one NetCDF with a variant dimension plus a ranked table.
//
//   colchem sweep configs/pyrene_sweep.yaml --dry-run             list the variants, solve nothing
//   mpirun -n 4 colchem sweep configs/pyrene_sweep.yaml            every variant over 4 ranks
//   colchem sweep configs/pyrene_sweep.yaml --variants 0:4 -o a.nc --table a.csv
//   colchem sweep configs/pyrene_sweep.yaml --variants 4: -o b.nc --table b.csv
//   colchem sweep configs/pyrene_sweep.yaml --merge a.nc b.nc     join pieces, solve nothing
//   colchem sweep configs/pyrene_sweep.yaml --resume out/pyrene_sweep.nc   finish an interrupted
//   one
//
// run_sweep() 1. loads the sweep and its base scenario, 2. plans the variants, 3. picks
// this piece's variants and the results carried over, 4. solves the base state and runs
// the variants over the ranks, 5. writes the sweep file and the ranked table on rank 0.
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
#include "app/batch.hpp"
#include "app/commands.hpp"
#include "app/steady_base.hpp"
#include "chem/kinetics.hpp"
#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/dataset_writer.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/output_claim.hpp"
#include "io/scenario.hpp"
#include "io/sweep_file.hpp"
#include "io/sweep_loader.hpp"
#include "report/column_report.hpp"
#include "report/sweep_report.hpp"
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

/// The option combinations a sweep refuses (exit 2).
void require_option_combination(const SweepCliOptions& o) {
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
}

/// Refuses a module or parameter `name` that mechanism `mech` lacks (exit 3), suggesting
/// the nearest of `all`.
[[noreturn]] void refuse_unknown(const SourceLocation& where, const std::string& key_path,
                                 const std::string& what, const Mechanism& mech,
                                 const std::vector<std::string>& all, const std::string& name) {
  const auto near = nearest_word(name, all);
  throw InputError(ExitCode::kConfig, where, key_path,
                   "a " + what + " of mechanism '" + mech.name + "' (" +
                       fmt::format("{}", fmt::join(all, ", ")) + ")",
                   "unknown " + what + " '" + name + "'",
                   near ? "did you mean '" + *near + "'?" : std::string{});
}

/// The base scenario has chemistry, every module a variant switches on exists in its
/// mechanism, every swept parameter exists and every value lies within its bounds: refused
/// here (exit 3), not as every variant failing.
void require_sweepable(const SweepSpec& spec, const Scenario& base, const ColumnModel& base_model) {
  if (!base_model.has_chemistry()) {
    throw InputError(ExitCode::kConfig, SourceLocation{spec.scenario.string()}, "chemistry",
                     "a scenario with a chemistry section", "none");
  }
  const Mechanism& mech = *base.chemistry.mechanism;
  std::vector<std::string> modules, parameters;
  for (const auto& md : mech.modules) modules.push_back(md.name);
  for (const auto& p : mech.parameters) parameters.push_back(p.name);
  for (const auto& ms : spec.module_sets) {
    for (const auto& name : ms.modules) {
      if (!mech.module_index(name))
        refuse_unknown(ms.where, ms.key_path, "module", mech, modules, name);
    }
  }
  for (const auto& a : spec.axes) {
    const auto idx = mech.parameter_index(a.name);
    if (!idx) refuse_unknown(a.where, a.key_path, "parameter", mech, parameters, a.name);
    const Parameter& p = mech.parameters[*idx];
    for (const double x : a.values) {
      if (!(x >= p.min && x <= p.max)) {
        throw InputError(ExitCode::kConfig, a.where, a.key_path,
                         fmt::format("values of '{}' within [{}, {}]", a.name, p.min, p.max),
                         fmt::format("{}", x));
      }
    }
  }
}

/// A parameter that acts on no reaction of a variant (its module switched off) does not
/// make a variant of its own: such variants are merged (logged on rank 0).
void merge_inert_variants(const SweepSpec& spec, std::vector<Variant>& variants,
                          const UnitSystem& units, spdlog::logger& log, int rank) {
  if (spec.axes.empty()) return;
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
    log.info(
        "merged {} duplicate variant{} of {} (parameters that act on no reaction of the "
        "variant; module set: parameter): {}",
        merged, plural(merged), before, fmt::join(dropped, ", "));
  }
}

/// --dry-run: the variants (index, modules, parameters, overrides) and their count.
void print_variants(const SweepSpec& spec, const std::vector<Variant>& variants,
                    const std::string& definition) {
  const std::size_t V = variants.size();
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

/// What the sweep runs and where it writes: the variants, the definition that makes two
/// runs the same sweep, and the range [lo, hi) of a piece (job arrays; every variant
/// otherwise).
struct SweepPlan {
  SweepSpec spec;
  std::vector<Variant> variants;
  std::string definition;
  std::size_t lo = 0, hi = 0;
  bool piece = false;
};

/// A piece of the sweep (--variants) runs variants [lo, hi) only, into its own files
/// (FILE.variants-LO-HI.EXT unless -o / --table name them).
void choose_piece(const SweepCliOptions& o, SweepPlan& plan) {
  plan.lo = 0;
  plan.hi = plan.variants.size();
  plan.piece = !o.variants.empty();
  if (plan.piece) {
    std::tie(plan.lo, plan.hi) = parse_variant_range(o.variants, plan.variants.size());
    const auto piece_name = [&](const std::filesystem::path& p) {
      std::filesystem::path q = p;
      q.replace_extension(
          fmt::format(".variants-{}-{}{}", plan.lo, plan.hi, p.extension().string()));
      return q;
    };
    if (o.output.empty()) plan.spec.output = piece_name(plan.spec.output);
    if (o.table.empty()) plan.spec.table = piece_name(plan.spec.table);
  }
  if (!o.output.empty()) plan.spec.output = o.output;
  if (!o.table.empty()) plan.spec.table = o.table;
}

/// Results carried over from earlier files (--resume) or pieces (--merge), per variant,
/// with the file each came from.
struct Carried {
  std::vector<std::optional<VariantOutcome>> outcome;
  std::vector<std::string> from;
  [[nodiscard]] std::size_t count() const {
    return static_cast<std::size_t>(
        std::count_if(outcome.begin(), outcome.end(), [](const auto& c) { return c.has_value(); }));
  }
};

/// The finished variants of the --resume files or the --merge pieces (refusing files of
/// another definition and, when merging, a variant in two pieces).
Carried carry_results(const SweepCliOptions& o, const SweepPlan& plan) {
  const std::size_t V = plan.variants.size();
  Carried c{std::vector<std::optional<VariantOutcome>>(V), std::vector<std::string>(V)};
  const bool merging = !o.merge.empty();
  for (const auto& f : merging ? o.merge : o.resume) {
    const SweepFileRecord rec = read_sweep_file(f);
    require_same_definition(rec, plan.definition, plan.variants, merging ? "--merge" : "--resume");
    for (std::size_t v = 0; v < V; ++v) {
      const VariantState st = rec.state[v];
      const bool finished = st == VariantState::kConverged ||
                            (st == VariantState::kFailed && (merging || !o.retry_failed));
      if (!finished) continue;
      if (c.outcome[v]) {
        if (merging) {
          throw InputError(ExitCode::kInputData, SourceLocation{f}, "--merge",
                           "pieces that each hold a variant at most once",
                           fmt::format("variant {} also in {}", v, c.from[v]));
        }
        continue;
      }
      c.outcome[v] = rec.outcomes[v];
      c.from[v] = f;
    }
  }
  return c;
}

/// --merge: refuses pieces that leave a variant unfinished, naming (up to 20 of) them.
void require_all_merged(const SweepCliOptions& o, const Carried& c) {
  const std::size_t V = c.outcome.size();
  std::vector<std::string> missing;
  for (std::size_t v = 0; v < V; ++v) {
    if (!c.outcome[v]) missing.push_back(std::to_string(v));
  }
  if (missing.empty()) return;
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

/// The variants of this piece that no earlier file finished.
std::vector<std::size_t> variants_to_run(const SweepPlan& plan, const Carried& c) {
  std::vector<std::size_t> todo;
  for (std::size_t v = plan.lo; v < plan.hi; ++v) {
    if (!c.outcome[v]) todo.push_back(v);
  }
  return todo;
}

/// Rank 0's account of what the sweep is about to do.
void log_plan(const SweepCliOptions& o, const SweepPlan& plan, const Carried& c, std::size_t to_run,
              int ranks, spdlog::logger& log) {
  const std::size_t V = plan.variants.size();
  log.info("sweep {}: {} variants on {} rank{}", plan.spec.name, V, ranks,
           plural(static_cast<std::size_t>(ranks)));
  if (plan.piece) {
    log.info("this piece: variants {}:{} ({} of {})", plan.lo, plan.hi, plan.hi - plan.lo, V);
  }
  if (!o.resume.empty()) {
    const std::size_t kept = c.count();
    log.info("resuming: {} finished variant{} kept from {}, {} to run", kept, plural(kept),
             fmt::join(o.resume, ", "), to_run);
  }
  if (!o.merge.empty()) log.info("merging {} pieces: all {} variants finished", o.merge.size(), V);
}

/// Every variant starts from the base scenario's steady state, solved on every rank by
/// the same deterministic solve (grid sequencing as `colchem run`), so that a variant's
/// answer does not depend on the rank that ran it or on what that rank ran before: the
/// scores on 1 and 2 ranks are identical (tests/cli/sweep_test.sh). Empty when it was
/// stopped on a coarser level: no variant starts (the stop request is seen first), and the
/// files record every variant as interrupted (exit 7).
std::optional<BaseSolve> solve_sweep_base(const SweepSpec& spec, const Scenario& base,
                                          ColumnModel& base_model, const UnitSystem& units,
                                          Context& ctx, const InterruptGuard& interrupt, int rank) {
  BaseStart base_start(spec.scenario.string(), spec.common_overrides);
  base_start.progress = rank == 0;
  try {
    return solve_steady_base(base_start, base, base_model, units, ctx, interrupt,
                             "base state of the sweep");
  } catch (const RunError& e) {
    if (e.code() != ExitCode::kInterrupted) throw;
    ctx.log->warn("interrupted (signal {}) during the base state of the sweep",
                  interrupt.signal_number());
    return std::nullopt;
  }
}

/// What every variant's solve shares: the sweep, the base state (null when the base did
/// not converge) and the grid and species every variant must keep.
struct VariantSolve {
  const SweepSpec& spec;
  const UnitSystem& units;
  const InterruptGuard& interrupt;
  const std::vector<double>* base_x = nullptr;
  std::size_t species = 0, cells = 0;
};

/// Solves the variant from its own scenario's cold start, grid-sequenced as `colchem run`
/// does (the iterations of a failed solve from the base are counted in); false when it was
/// stopped on a coarser level.
bool solve_cold(const VariantSolve& in, const Variant& v, const Scenario& sc, ColumnModel& model,
                RunControls controls, RunOutcome& r) {
  BaseStart own(in.spec.scenario.string(), v.overrides);
  own.progress = false;
  StartState st;
  try {
    st = start_state(own, sc, model, in.units, nullptr, in.interrupt);
  } catch (const RunError& e) {
    if (e.code() != ExitCode::kInterrupted) throw;
    return false;
  }
  model.impose_held(st.x0);
  controls.warm_start = st.warm;
  const long before = in.base_x ? r.iterations : 0;
  r = run_column(model, sc.solver, std::move(st.x0), controls);
  r.iterations += before;
  return true;
}

/// One variant: from the base state; one that does not converge from there (or every
/// variant, when the base did not converge) starts again from its own cold start.
VariantOutcome solve_variant(const VariantSolve& in, const Variant& v) {
  VariantOutcome result;
  const Scenario sc = load_scenario(in.spec.scenario, v.overrides, in.units);
  ColumnModel model(sc);
  if (model.species_count() != in.species || model.cells() != in.cells) {
    result.reason = "the variant changes the grid or the species of the base scenario";
    return result;
  }
  RunControls controls;
  controls.stop_requested = in.interrupt.query();
  RunOutcome r;
  if (in.base_x) {
    std::vector<double> x0 = *in.base_x;
    model.impose_held(x0);
    controls.warm_start = true;
    r = run_column(model, sc.solver, std::move(x0), controls);
    result.warm_started = true;
  }
  if (!in.base_x || (!r.ok() && r.status != SolveStatus::kInterrupted)) {
    if (!solve_cold(in, v, sc, model, controls, r)) {
      result.interrupted = true;
      result.reason = "interrupted";
      return result;
    }
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
}

/// Runs the variants to run over the ranks (outcomes on rank 0), one line per variant.
std::vector<VariantOutcome> run_sweep_variants(const SweepCliOptions& o, const SweepPlan& plan,
                                               const VariantSolve& in,
                                               const std::vector<std::size_t>& todo, Context& ctx,
                                               int rank) {
  const std::size_t V = plan.variants.size();
  const VariantRunner runner = [&](const Variant& v) { return solve_variant(in, v); };
  const VariantDone line = [&](const Variant& v, const VariantOutcome& r) {
    ctx.log->info("variant {}/{} [{}] {} on rank {}: {} ({} iterations, {:.2f} s)", v.index + 1, V,
                  v.label, r.warm_started ? "from the base" : "cold", rank,
                  r.converged ? "converged" : (r.interrupted ? r.reason : "FAILED: " + r.reason),
                  r.iterations, r.wall_seconds);
  };
  return run_batch(plan.variants, runner, {*ctx.log, "sweep", o.progress_every, line},
                   in.interrupt.query(), &todo);
}

/// Rank 0: the carried results in place, and the variants outside the piece marked.
void complete_outcomes(std::vector<VariantOutcome>& outcomes, const Carried& c,
                       const SweepPlan& plan) {
  for (std::size_t v = 0; v < plan.variants.size(); ++v) {
    if (c.outcome[v]) {
      outcomes[v] = *c.outcome[v];
      outcomes[v].index = v;
    } else if (outcomes[v].skipped) {
      outcomes[v].reason =
          fmt::format("not run: outside variants {}:{} of this piece", plan.lo, plan.hi);
    }
  }
}

/// Failed variants get the observation layout of a scored one with no model values, for a
/// rectangular file.
void fill_unscored(std::vector<std::vector<SpeciesScore>>& scores) {
  std::vector<SpeciesScore> layout;
  for (const auto& sc : scores) {
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
  for (auto& sc : scores) {
    if (sc.empty()) sc = layout;
  }
}

/// The sweep's results: every variant's profiles and scores against the observations.
SweepResults sweep_results(const SweepPlan& plan, const ColumnModel& base_model,
                           const ObservationSet& obs, std::vector<VariantOutcome> outcomes) {
  SweepResults res;
  res.variants = plan.variants;
  res.species = base_model.species();
  for (const auto& a : plan.spec.axes) res.parameter_names.push_back(a.name);
  std::set<std::string> modules;
  for (const auto& m : plan.spec.module_sets) modules.insert(m.modules.begin(), m.modules.end());
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
  if (!obs.points.empty()) fill_unscored(res.scores);
  res.outcomes = std::move(outcomes);
  return res;
}

/// How the variants ended, and what the files say about the sweep as a whole: complete
/// only when nothing was interrupted; a sweep with no converged variant is not a result
/// either.
struct SweepTally {
  std::size_t converged = 0, interrupted = 0, not_run = 0, failed = 0;
  std::string status, counts;
};

SweepTally tally_outcomes(const SweepResults& res, const SweepPlan& plan) {
  SweepTally t;
  for (const auto& oc : res.outcomes) {
    t.converged += oc.converged ? 1 : 0;
    t.interrupted += oc.interrupted ? 1 : 0;
    t.not_run += oc.skipped ? 1 : 0;
  }
  t.failed = res.outcomes.size() - t.converged - t.interrupted - t.not_run;
  t.status = t.interrupted > 0 ? "interrupted" : t.converged == 0 ? "failed" : "complete";
  t.counts = fmt::format("{} of {} variants converged, {} failed, {} interrupted", t.converged,
                         res.outcomes.size(), t.failed, t.interrupted) +
             (t.not_run > 0 ? fmt::format(", {} not run (piece {}:{})", t.not_run, plan.lo, plan.hi)
                            : std::string{});
  return t;
}

/// The sweep file: provenance, the sweep's definition and status, every variant.
void write_sweep_file(const SweepPlan& plan, const Scenario& base, const ColumnModel& base_model,
                      const SweepResults& res, const std::vector<std::size_t>& ranking,
                      const SweepTally& t, int ranks, const std::string& command_line) {
  const SweepSpec& spec = plan.spec;
  Dataset ds;
  add_provenance(ds, base, command_line);
  ds.global_text("colchem_sweep_file", spec.file.string());
  ds.global_text("colchem_sweep_scenario",
                 std::filesystem::weakly_canonical(spec.scenario).string());
  ds.global_text("colchem_sweep_definition", plan.definition);
  ds.global_text("colchem_sweep_definition_hash", text_digest(plan.definition));
  if (plan.piece) ds.global_text("colchem_sweep_piece", fmt::format("{}:{}", plan.lo, plan.hi));
  ds.global_number("colchem_sweep_ranks", ranks);
  ds.global_text("colchem_sweep_status", t.status + ": " + t.counts);
  add_sweep(ds, base_model.background(), res, ranking);
  write_dataset(ds, spec.output);
}

/// The exit code of a written sweep: 7 when interrupted (continue with --resume), 5 when
/// no variant converged, else 0; logged.
int sweep_exit_code(const SweepPlan& plan, const SweepResults& res, const SweepTally& t,
                    const InterruptGuard& interrupt, spdlog::logger& log) {
  if (t.interrupted > 0) {
    log.warn(
        "sweep interrupted (signal {}): {} variant{} not finished, recorded as "
        "'interrupted'; the results are incomplete; continue with --resume {}",
        interrupt.signal_number(), t.interrupted, plural(t.interrupted), plan.spec.output.string());
    return static_cast<int>(ExitCode::kInterrupted);
  }
  if (t.converged == 0) {
    log.error(
        "no variant of the sweep converged: 0 of {} ({} failed); the reasons are in the "
        "status column of {}",
        res.outcomes.size() - t.not_run, t.failed, plan.spec.table.string());
    return static_cast<int>(ExitCode::kNotConverged);
  }
  return 0;
}

/// The base state on every rank, then the variants to run over the ranks: their outcomes
/// on rank 0. Merging pieces solves nothing (every outcome is carried), nor does a rank
/// with nothing to run solve the base.
std::vector<VariantOutcome> run_on_ranks(const SweepCliOptions& o, const SweepPlan& plan,
                                         const Scenario& base, ColumnModel& base_model,
                                         const std::vector<std::size_t>& todo,
                                         const UnitSystem& units, Context& ctx,
                                         const InterruptGuard& interrupt, int rank) {
  if (!o.merge.empty()) {
    return std::vector<VariantOutcome>(rank == 0 ? plan.variants.size() : 0);
  }
  std::optional<BaseSolve> base_solve;
  if (!todo.empty()) {
    base_solve = solve_sweep_base(plan.spec, base, base_model, units, ctx, interrupt, rank);
  }
  const bool base_ok = base_solve && base_solve->run.ok();
  const VariantSolve in{plan.spec,
                        units,
                        interrupt,
                        base_ok ? &base_solve->run.x : nullptr,
                        base_model.species_count(),
                        base_model.cells()};
  return run_sweep_variants(o, plan, in, todo, ctx, rank);
}

/// Rank 0: the results with the carried ones, the sweep file, the ranked table (file and
/// standard output); returns the sweep's exit code.
int report_sweep(const SweepPlan& plan, const Scenario& base, const ColumnModel& base_model,
                 const ObservationSet& obs, const Carried& carried,
                 std::vector<VariantOutcome> outcomes, const InterruptGuard& interrupt, int ranks,
                 Context& ctx) {
  complete_outcomes(outcomes, carried, plan);
  const SweepResults res = sweep_results(plan, base_model, obs, std::move(outcomes));
  const SweepTally tally = tally_outcomes(res, plan);
  const auto ranking = rank_variants(res, plan.spec.rank_by);
  write_sweep_file(plan, base, base_model, res, ranking, tally, ranks, ctx.command_line);
  write_text_file(plan.spec.table, sweep_table_csv(res, ranking, plan.spec.rank_by));
  std::cout << sweep_table_text(res, ranking, plan.spec.rank_by);
  ctx.log->info("wrote {} and {}; {}", plan.spec.output.string(), plan.spec.table.string(),
                tally.counts);
  return sweep_exit_code(plan, res, tally, interrupt, *ctx.log);
}

int run_sweep(const SweepCliOptions& o, Context& ctx) {
  const PetscSession petsc;  // initialises MPI as well
  const WorldRanks world = world_ranks();
  const UnitSystem units;

  // 1. Load the sweep and its variants, and the base scenario, which fixes the grid and
  //    species every variant must share; refuse what would make every variant fail.
  SweepPlan plan;
  plan.spec = load_sweep(o.file, o.sets);
  require_option_combination(o);
  plan.variants = expand_variants(plan.spec);
  const Scenario base = load_scenario(plan.spec.scenario, plan.spec.common_overrides, units);
  ColumnModel base_model(base);
  require_sweepable(plan.spec, base, base_model);

  // 2. Plan: merge the variants that differ only in parameters acting on nothing, fix the
  //    definition; --dry-run lists the variants and stops.
  merge_inert_variants(plan.spec, plan.variants, units, *ctx.log, world.rank);
  plan.definition = sweep_definition(plan.spec, base, plan.variants);
  if (o.dry_run) {
    if (world.rank == 0) print_variants(plan.spec, plan.variants, plan.definition);
    return 0;
  }

  // 3. This piece's range and files, the results carried over (--resume, --merge) and the
  //    variants left to run. Rank 0 holds the files for the whole sweep (one live writer
  //    per path).
  choose_piece(o, plan);
  const Carried carried = carry_results(o, plan);
  if (!o.merge.empty()) require_all_merged(o, carried);
  const std::vector<std::size_t> todo = variants_to_run(plan, carried);
  std::vector<OutputClaim> claims;
  if (world.rank == 0) claims = claim_outputs({plan.spec.output, plan.spec.table});
  const ObservationSet obs = read_model_observations(plan.spec.observations, base_model, units);
  if (world.rank == 0) log_plan(o, plan, carried, todo.size(), world.size, *ctx.log);
  const InterruptGuard interrupt;

  // 4. The base state and the variants over the ranks.
  std::vector<VariantOutcome> outcomes =
      run_on_ranks(o, plan, base, base_model, todo, units, ctx, interrupt, world.rank);
  if (world.rank != 0) return exit_code_of_rank0(0);

  // 5. Rank 0 reports; every rank exits with its code.
  return exit_code_of_rank0(report_sweep(plan, base, base_model, obs, carried, std::move(outcomes),
                                         interrupt, world.size, ctx));
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
