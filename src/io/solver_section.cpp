// Loader of the `solver:` section: see solver_section.hpp and README.md, section What the model computes.
#include "io/solver_section.hpp"

#include <algorithm>

#include "io/config_node.hpp"

namespace colchem {

namespace {

double positive_number(const ConfigNode& n) {
  const double v = n.number();
  if (!(v > 0.0)) n.fail("a positive number");
  return v;
}

double positive_quantity(const ConfigNode& n, const UnitSystem& u, const char* unit,
                         const char* example) {
  const double v = n.quantity(u, unit, example);
  if (!(v > 0.0)) n.fail(std::string("a positive value such as '") + example + "'");
  return v;
}

int count(const ConfigNode& n, long lo, long hi) {
  const long v = n.integer();
  if (v < lo || v > hi) {
    n.fail("an integer from " + std::to_string(lo) + " to " + std::to_string(hi));
  }
  return static_cast<int>(v);
}

TransientSpec load_transient(const ConfigNode& n, const UnitSystem& u) {
  TransientSpec t;
  if (auto v = n.find("end")) t.end_s = positive_quantity(*v, u, "s", "30 day");
  if (auto v = n.find("step")) t.step_s = positive_quantity(*v, u, "s", "1 h");
  if (auto v = n.find("adaptive")) t.adaptive = v->boolean();
  if (auto v = n.find("relative_tolerance")) t.relative_tolerance = positive_number(*v);
  if (auto v = n.find("min_step")) t.min_step_s = positive_quantity(*v, u, "s", "1e-6 s");
  if (auto v = n.find("max_step")) t.max_step_s = positive_quantity(*v, u, "s", "10 day");
  if (auto v = n.find("steady_check_every")) t.steady_check_every = count(*v, 1, 1000000);
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
        outputs->fail("output times in (0, end]", "entry " + std::to_string(i) +
                                                      " outside (0, end]");
      }
      if (i > 0 && !(s > t.output_times_s[i - 1])) {
        outputs->fail("increasing output times", "a decrease at entry " + std::to_string(i));
      }
    }
  } else if (output_count) {
    t.output_count = count(*output_count, 1, 100000);
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
  if (auto v = n.find("tolerance")) s.tolerance = positive_number(*v);
  if (auto v = n.find("step_tolerance")) s.step_tolerance = positive_number(*v);
  if (auto v = n.find("balance_tolerance")) s.balance_tolerance = positive_number(*v);
  if (auto v = n.find("max_iterations")) s.max_iterations = count(*v, 1, 100000000);
  if (auto v = n.find("initial_pseudo_step")) {
    s.initial_pseudo_step_s = positive_quantity(*v, u, "s", "1e-6 s");
  }
  if (auto v = n.find("warm_pseudo_step")) {
    s.warm_pseudo_step_s = positive_quantity(*v, u, "s", "1e8 s");
  }
  if (auto v = n.find("max_pseudo_step")) {
    s.max_pseudo_step_s = positive_quantity(*v, u, "s", "1e16 s");
  }
  if (auto v = n.find("reference_time")) {
    s.reference_time_s = positive_quantity(*v, u, "s", "1e10 s");
  }
  if (auto v = n.find("absolute_density")) {
    s.absolute_density_cm3 = positive_quantity(*v, u, "cm-3", "1 cm-3");
  }
  if (auto v = n.find("positivity_fraction")) {
    s.positivity_fraction = v->number();
    if (!(s.positivity_fraction >= 0.0 && s.positivity_fraction < 1.0)) {
      v->fail("a fraction in [0, 1)");
    }
  }
  if (auto v = n.find("checkpoint_every")) s.checkpoint_every = count(*v, 0, 100000000);
  if (auto v = n.find("grid_sequencing")) s.grid_sequencing = v->boolean();
  if (auto v = n.find("coarsest_cells")) {
    s.coarsest_cells = static_cast<std::size_t>(count(*v, 2, 100000000));
  }
  if (auto v = n.find("sequence_tolerance")) s.sequence_tolerance = positive_number(*v);
  const auto tr = n.find("transient");
  n.done();
  if (tr) s.transient = load_transient(*tr, u);
  if (s.max_pseudo_step_s < s.initial_pseudo_step_s) {
    n.fail("max_pseudo_step >= initial_pseudo_step", "a smaller max_pseudo_step");
  }
  if (s.method != SolverMethod::kSteady && !tr) {
    n.fail("a 'transient:' section (end, step, ...) for method transient or split_steady",
           "none");
  }
  return s;
}

}  // namespace colchem
