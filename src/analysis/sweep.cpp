#include "analysis/sweep.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace colchem {

std::string exact_number(double v) { return fmt::format("{:.17g}", v); }

namespace {
std::string join(const std::vector<std::string>& v, const std::string& sep) {
  std::string out;
  for (const auto& s : v) out += (out.empty() ? "" : sep) + s;
  return out;
}

}  // namespace

std::vector<Variant> expand_variants(const SweepSpec& spec) {
  const std::vector<ModuleSet> modules =
      spec.module_sets.empty() ? std::vector<ModuleSet>{ModuleSet{"scenario", {}, {}, {}}}
                               : spec.module_sets;
  const std::vector<OverrideSet> overrides =
      spec.override_sets.empty() ? std::vector<OverrideSet>{OverrideSet{"", {}}} : spec.override_sets;
  std::size_t grid = 1;
  for (const auto& a : spec.axes) grid *= a.values.size();

  std::vector<Variant> out;
  for (std::size_t m = 0; m < modules.size(); ++m) {
    for (std::size_t o = 0; o < overrides.size(); ++o) {
      for (std::size_t g = 0; g < grid; ++g) {
        Variant v;
        v.index = out.size();
        v.module_set = m;
        v.override_set = o;
        v.module_label = modules[m].label;
        v.modules = modules[m].modules;
        v.override_label = overrides[o].label;
        v.overrides = spec.common_overrides;
        if (!v.modules.empty()) {
          v.overrides.push_back("chemistry.modules=[" + join(v.modules, ", ") + "]");
        }
        std::size_t rest = g;
        std::vector<std::string> label_parts{v.module_label};
        if (!v.override_label.empty()) label_parts.push_back(v.override_label);
        // Last axis fastest.
        std::vector<std::size_t> idx(spec.axes.size());
        for (std::size_t a = spec.axes.size(); a-- > 0;) {
          idx[a] = rest % spec.axes[a].values.size();
          rest /= spec.axes[a].values.size();
        }
        for (std::size_t a = 0; a < spec.axes.size(); ++a) {
          const double val = spec.axes[a].values[idx[a]];
          v.parameters.emplace_back(spec.axes[a].name, val);
          v.overrides.push_back("chemistry.parameters." + spec.axes[a].name + "=" + exact_number(val));
          label_parts.push_back(fmt::format("{}={:.4g}", spec.axes[a].name, val));
        }
        for (const auto& s : overrides[o].assignments) v.overrides.push_back(s);
        v.label = join(label_parts, " ");
        out.push_back(std::move(v));
      }
    }
  }
  return out;
}

}  // namespace colchem
