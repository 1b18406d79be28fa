// Loader of the `solver:` section: see solver_section.hpp and README.md, section What the model
// computes. Both levels are key tables (io/key_table.hpp); the defaults are SolverSpec's.
#include "io/solver_section.hpp"

#include "io/config_node.hpp"
#include "io/key_table.hpp"

namespace colchem {

namespace {

TransientSpec load_transient(const ConfigNode& n, const UnitSystem& u) {
  TransientSpec t;
  const Key keys[] = {
      positive("end", &t.end_s, "s", "30 day"),
      positive("step", &t.step_s, "s", "1 h"),
      flag("adaptive", &t.adaptive),
      positive("relative_tolerance", &t.relative_tolerance),
      positive("min_step", &t.min_step_s, "s", "1e-6 s"),
      positive("max_step", &t.max_step_s, "s", "10 day"),
      count("steady_check_every", &t.steady_check_every, 1, 1000000),
  };
  read_keys(n, u, keys);
  const auto outputs = n.find("outputs");
  const auto output_count = n.find("output_count");
  n.done();
  if (outputs && output_count) {
    output_count->fail("either 'outputs' or 'output_count', not both", "both");
  }
  if (outputs) {
    t.output_times_s = outputs->quantity_list(u, "s", "1 day");
    for (std::size_t i = 0; i < t.output_times_s.size(); ++i) {
      const double s = t.output_times_s[i];
      if (!(s > 0.0 && s <= t.end_s)) {
        outputs->fail("output times in (0, end]",
                      "entry " + std::to_string(i) + " outside (0, end]");
      }
      if (i > 0 && !(s > t.output_times_s[i - 1])) {
        outputs->fail("increasing output times", "a decrease at entry " + std::to_string(i));
      }
    }
  } else if (output_count) {
    const Key row = count("output_count", &t.output_count, 1, 100000);
    read_keys(n, u, {&row, 1});
    for (int k = 1; k <= t.output_count; ++k) {
      t.output_times_s.push_back(t.end_s * k / t.output_count);
    }
  }
  if (t.min_step_s > t.step_s) n.fail("min_step not larger than step", "min_step > step");
  return t;
}

}  // namespace

SolverSpec load_solver_section(const ConfigNode& n, const UnitSystem& u) {
  SolverSpec s;
  if (auto v = n.find("method")) {
    const std::string m = v->choice({"steady", "transient", "split_steady"});
    s.method = m == "steady"      ? SolverMethod::kSteady
               : m == "transient" ? SolverMethod::kTransient
                                  : SolverMethod::kSplitSteady;
  }
  const Key keys[] = {
      positive("tolerance", &s.tolerance),
      positive("step_tolerance", &s.step_tolerance),
      positive("balance_tolerance", &s.balance_tolerance),
      count("max_iterations", &s.max_iterations, 1, 100000000),
      positive("initial_pseudo_step", &s.initial_pseudo_step_s, "s", "1e-6 s"),
      positive("warm_pseudo_step", &s.warm_pseudo_step_s, "s", "1e8 s"),
      positive("max_pseudo_step", &s.max_pseudo_step_s, "s", "1e16 s"),
      positive("reference_time", &s.reference_time_s, "s", "1e10 s"),
      positive("absolute_density", &s.absolute_density_cm3, "cm-3", "1 cm-3"),
      number("positivity_fraction", &s.positivity_fraction, 0.0, 1.0, "a fraction in [0, 1)")
          .below_hi(),
      count("checkpoint_every", &s.checkpoint_every, 0, 100000000),
      flag("grid_sequencing", &s.grid_sequencing),
      count("coarsest_cells", &s.coarsest_cells, 2, 100000000),
      positive("sequence_tolerance", &s.sequence_tolerance),
  };
  read_keys(n, u, keys);
  const auto tr = n.find("transient");
  n.done();
  if (tr) s.transient = load_transient(*tr, u);
  if (s.max_pseudo_step_s < s.initial_pseudo_step_s) {
    n.fail("max_pseudo_step >= initial_pseudo_step", "a smaller max_pseudo_step");
  }
  if (s.method != SolverMethod::kSteady && !tr) {
    n.fail("a 'transient:' section (end, step, ...) for method transient or split_steady", "none");
  }
  return s;
}

}  // namespace colchem
