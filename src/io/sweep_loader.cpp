#include "io/sweep_loader.hpp"

#include "io/config_node.hpp"

namespace colchem {

namespace {

/// A list of values, or {log_range | linear_range: {from, to, count}}.
std::vector<double> load_axis_values(const ConfigNode& n, bool* logarithmic) {
  *logarithmic = false;
  if (n.is_sequence()) {
    auto v = n.number_list();
    if (v.empty()) n.fail("at least one value");
    return v;
  }
  const auto log_range = n.find("log_range");
  const auto lin_range = n.find("linear_range");
  if (!log_range == !lin_range) n.fail("a list of values, {log_range: ...} or {linear_range: ...}");
  const ConfigNode r = log_range ? *log_range : *lin_range;
  const double from = r.child("from").number();
  const double to = r.child("to").number();
  const long count = r.child("count").integer();
  r.done();
  n.done();
  if (count < 1 || count > 100000) r.child("count").fail("a count from 1 to 100000");
  if (log_range) {
    if (!(from > 0.0)) r.child("from").fail("a positive 'from' for a logarithmic range");
    if (!(to > 0.0)) r.child("to").fail("a positive 'to' for a logarithmic range");
    *logarithmic = true;
  }
  return axis_range(from, to, static_cast<std::size_t>(count), *logarithmic);
}

}  // namespace

SweepSpec load_sweep(const std::filesystem::path& file, const std::vector<std::string>& overrides) {
  const ConfigDocument doc = ConfigDocument::load(file, overrides);
  const ConfigNode root = doc.root();
  SweepSpec spec;
  spec.file = file;

  const auto s = root.child("sweep");
  spec.name = s.child("name").text();
  spec.scenario = s.child("scenario").path();
  if (auto o = s.find("observations")) spec.observations = o->path();
  spec.output = s.find("output") ? s.child("output").text() : spec.name + "_sweep.nc";
  spec.table = s.find("table") ? s.child("table").text() : spec.name + "_sweep.csv";
  if (auto r = s.find("rank_by")) {
    spec.rank_by =
        r->choice({"chi2_log", "chi2_linear", "reduced_chi2_log", "reduced_chi2_linear"});
  }
  if (auto c = s.find("set")) spec.common_overrides = c->text_list();
  s.done();

  const auto modules = root.find("modules");
  const auto combos = root.find("module_combinations");
  if (modules && combos) combos->fail("either 'modules' or 'module_combinations'", "both");
  if (modules) {
    for (const auto& [label, list] : modules->entries()) {
      spec.module_sets.push_back(
          ModuleSet{label, list.text_list(), list.location(), "modules." + label});
    }
  } else if (combos) {
    const auto always =
        combos->find("always") ? combos->child("always").text_list() : std::vector<std::string>{};
    const auto optional = combos->child("optional").text_list();
    combos->done();
    if (optional.size() > 16) combos->child("optional").fail("at most 16 optional modules");
    spec.module_sets =
        module_combinations(always, optional, combos->location(), "module_combinations");
  }

  if (auto p = root.find("parameters")) {
    for (const auto& [name, values] : p->entries()) {
      ParameterAxis a;
      a.name = name;
      a.values = load_axis_values(values, &a.logarithmic);
      a.where = values.location();
      a.key_path = values.key_path();
      spec.axes.push_back(std::move(a));
    }
  }
  if (auto o = root.find("overrides")) {
    for (const auto& [label, list] : o->entries()) {
      OverrideSet set{label, list.is_null() ? std::vector<std::string>{} : list.text_list()};
      for (const auto& a : set.assignments) {
        if (a.find('=') == std::string::npos)
          list.fail("'key.path=value' assignments", "'" + a + "'");
      }
      spec.override_sets.push_back(std::move(set));
    }
  }
  root.done();
  return spec;
}

}  // namespace colchem
