#include "analysis/sweep.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <set>

namespace colchem {

std::string exact_number(double v) { return fmt::format("{:.17g}", v); }

namespace {
std::string join(const std::vector<std::string>& v, const std::string& sep) {
  std::string out;
  for (const auto& s : v) out += (out.empty() ? "" : sep) + s;
  return out;
}

}  // namespace

std::vector<double> axis_range(double from, double to, std::size_t count, bool logarithmic) {
  std::vector<double> v(count);
  for (std::size_t i = 0; i < count; ++i) {
    const double w = count == 1 ? 0.0 : static_cast<double>(i) / static_cast<double>(count - 1);
    v[i] = logarithmic ? std::exp((1 - w) * std::log(from) + w * std::log(to))
                       : (1 - w) * from + w * to;
  }
  if (logarithmic && count > 0) v.back() = to;
  return v;
}

std::vector<ModuleSet> module_combinations(const std::vector<std::string>& always,
                                           const std::vector<std::string>& optional,
                                           const SourceLocation& where,
                                           const std::string& key_path) {
  std::vector<ModuleSet> out;
  for (std::size_t mask = 0; mask < (std::size_t{1} << optional.size()); ++mask) {
    ModuleSet m{{}, always, where, key_path};
    std::vector<std::string> chosen;
    for (std::size_t k = 0; k < optional.size(); ++k) {
      if (mask & (std::size_t{1} << k)) chosen.push_back(optional[k]);
    }
    m.modules.insert(m.modules.end(), chosen.begin(), chosen.end());
    m.label = chosen.empty() ? std::string("none") : join(chosen, "+");
    out.push_back(std::move(m));
  }
  return out;
}

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
        // Last axis fastest.
        std::vector<std::size_t> idx(spec.axes.size());
        for (std::size_t a = spec.axes.size(); a-- > 0;) {
          idx[a] = rest % spec.axes[a].values.size();
          rest /= spec.axes[a].values.size();
        }
        for (std::size_t a = 0; a < spec.axes.size(); ++a) {
          const double val = spec.axes[a].values[idx[a]];
          v.parameters.emplace_back(spec.axes[a].name, val);
          v.overrides.push_back("chemistry.parameters." + spec.axes[a].name + "=" +
                                exact_number(val));
        }
        for (const auto& s : overrides[o].assignments) v.overrides.push_back(s);
        v.label = variant_label(v);
        out.push_back(std::move(v));
      }
    }
  }
  return out;
}

std::string variant_label(const Variant& v) {
  std::vector<std::string> parts{v.module_label};
  if (!v.override_label.empty()) parts.push_back(v.override_label);
  for (const auto& [name, val] : v.parameters) parts.push_back(fmt::format("{}={:.4g}", name, val));
  return join(parts, " ");
}

std::size_t merge_duplicate_variants(
    std::vector<Variant>& variants,
    const std::function<bool(const Variant&, const std::string&)>& acts,
    std::vector<std::string>* dropped) {
  for (auto& v : variants) {
    std::vector<std::pair<std::string, double>> kept;
    for (const auto& p : v.parameters) {
      if (acts(v, p.first)) {
        kept.push_back(p);
        continue;
      }
      const std::string assignment = "chemistry.parameters." + p.first + "=";
      std::erase_if(v.overrides, [&](const std::string& s) { return s.starts_with(assignment); });
      if (dropped) {
        const std::string note = v.module_label + ": " + p.first;
        if (std::find(dropped->begin(), dropped->end(), note) == dropped->end()) {
          dropped->push_back(note);
        }
      }
    }
    v.parameters = std::move(kept);
    v.label = variant_label(v);
  }
  // Same module set, override set and overrides: the same model (a set keeps this linear
  // in the number of variants, up to the logarithm).
  std::vector<Variant> unique;
  std::set<std::string> seen;
  for (auto& v : variants) {
    std::string key = std::to_string(v.module_set) + "\n" + std::to_string(v.override_set);
    for (const auto& a : v.overrides) key += "\n" + a;
    if (!seen.insert(std::move(key)).second) continue;
    v.index = unique.size();
    unique.push_back(std::move(v));
  }
  const std::size_t merged = variants.size() - unique.size();
  variants = std::move(unique);
  return merged;
}

std::string text_digest(std::string_view text) {
  std::uint64_t h = 14695981039346656037ULL;  // FNV-1a 64-bit offset basis and prime
  for (const unsigned char c : text) {
    h ^= c;
    h *= 1099511628211ULL;
  }
  return fmt::format("{:016x}", h);
}

std::pair<std::size_t, std::size_t> parse_variant_range(const std::string& text,
                                                        std::size_t count) {
  const auto bad = [&](const std::string& why) {
    return InputError(ExitCode::kUsage, SourceLocation{"command line"}, "--variants",
                      "A:B with 0 <= A < B <= " + std::to_string(count) +
                          " (variants A to B-1, 0-based; as listed by --dry-run)",
                      "'" + text + "'" + (why.empty() ? std::string{} : " (" + why + ")"));
  };
  const auto colon = text.find(':');
  if (colon == std::string::npos) throw bad("no ':'");
  const auto number = [&](const std::string& part, std::size_t fallback) -> std::size_t {
    if (part.empty()) return fallback;
    if (part.find_first_not_of("0123456789") != std::string::npos) throw bad("not a whole number");
    try {
      return static_cast<std::size_t>(std::stoull(part));
    } catch (const std::exception&) {
      throw bad("out of range");
    }
  };
  const std::size_t a = number(text.substr(0, colon), 0);
  const std::size_t b = number(text.substr(colon + 1), count);
  if (!(a < b && b <= count)) throw bad("the sweep has " + std::to_string(count) + " variants");
  return {a, b};
}

}  // namespace colchem
