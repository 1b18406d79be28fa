#include "io/sweep_loader.hpp"

#include <cmath>

#include "io/config_node.hpp"

namespace colchem {

namespace {

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
  std::vector<double> v(static_cast<std::size_t>(count));
  if (log_range) {
    if (!(from > 0.0)) r.child("from").fail("a positive 'from' for a logarithmic range");
    if (!(to > 0.0)) r.child("to").fail("a positive 'to' for a logarithmic range");
    *logarithmic = true;
    for (long i = 0; i < count; ++i) {
      const double w = count == 1 ? 0.0 : static_cast<double>(i) / static_cast<double>(count - 1);
      v[static_cast<std::size_t>(i)] = std::exp((1 - w) * std::log(from) + w * std::log(to));
    }
    v.back() = to;
  } else {
    for (long i = 0; i < count; ++i) {
      const double w = count == 1 ? 0.0 : static_cast<double>(i) / static_cast<double>(count - 1);
      v[static_cast<std::size_t>(i)] = (1 - w) * from + w * to;
    }
  }
  return v;
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
    spec.rank_by = r->choice({"chi2_log", "chi2_linear", "reduced_chi2_log", "reduced_chi2_linear"});
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
    const auto always = combos->find("always") ? combos->child("always").text_list()
                                               : std::vector<std::string>{};
    const auto optional = combos->child("optional").text_list();
    combos->done();
    if (optional.size() > 16) combos->child("optional").fail("at most 16 optional modules");
    // Every subset of the optional modules, smallest first.
    for (std::size_t mask = 0; mask < (std::size_t{1} << optional.size()); ++mask) {
      ModuleSet m;
      m.modules = always;
      m.where = combos->location();
      m.key_path = "module_combinations";
      std::string label;
      for (std::size_t k = 0; k < optional.size(); ++k) {
        if (mask & (std::size_t{1} << k)) {
          m.modules.push_back(optional[k]);
          label += (label.empty() ? "" : "+") + optional[k];
        }
      }
      m.label = label.empty() ? std::string("none") : label;
      spec.module_sets.push_back(std::move(m));
    }
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
        if (a.find('=') == std::string::npos) list.fail("'key.path=value' assignments", "'" + a + "'");
      }
      spec.override_sets.push_back(std::move(set));
    }
  }
  root.done();
  return spec;
}

}  // namespace colchem
