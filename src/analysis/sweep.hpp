// Sweeps: variants of a scenario formed by crossing module on/off combinations, parameter
// grids and sets of config overrides. Every variant is expressed as "--set" overrides of
// the base scenario, so a variant is exactly what a user could run by hand.
#pragma once

#include <filesystem>
#include <functional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "core/error.hpp"

namespace colchem {

struct ModuleSet {
  std::string label;                 ///< e.g. "base+h2so4_overtone"
  std::vector<std::string> modules;  ///< switched on (chemistry.modules)
  SourceLocation where;              ///< where the sweep file names them (for errors)
  std::string key_path;              ///< e.g. "modules.sulfur" (for errors)
};

struct ParameterAxis {
  std::string name;            ///< a mechanism parameter (chemistry.parameters.NAME)
  std::vector<double> values;
  bool logarithmic = false;    ///< distance between variants measured in log(value)
  SourceLocation where;        ///< where the sweep file names it (for errors)
  std::string key_path;        ///< e.g. "parameters.k_scale" (for errors)
};

struct OverrideSet {
  std::string label;
  std::vector<std::string> assignments;  ///< "key.path=value"
};

/// `count` values from `from` to `to` (both included), evenly spaced in value or, when
/// `logarithmic` (from, to > 0), in log(value).
std::vector<double> axis_range(double from, double to, std::size_t count, bool logarithmic);

/// `always` plus every subset of `optional` (at most 16), in the order of the subset's bit
/// mask, labelled "a+b" ("none" for the empty subset).
std::vector<ModuleSet> module_combinations(const std::vector<std::string>& always,
                                           const std::vector<std::string>& optional,
                                           const SourceLocation& where,
                                           const std::string& key_path);

struct SweepSpec {
  std::string name;
  std::filesystem::path file;         ///< the sweep file
  std::filesystem::path scenario;     ///< base scenario (resolved)
  std::filesystem::path observations; ///< optional; scores each variant when given
  std::filesystem::path output;       ///< NetCDF with a variant dimension
  std::filesystem::path table;        ///< ranked CSV table
  std::vector<ModuleSet> module_sets;      ///< empty: the scenario's own modules
  std::vector<ParameterAxis> axes;
  std::vector<OverrideSet> override_sets;  ///< empty: none
  std::vector<std::string> common_overrides;  ///< applied to every variant (sweep.set)
  std::string rank_by = "chi2_log";        ///< score used for ranking
};

struct Variant {
  std::size_t index = 0;
  std::string label;
  std::string module_label;
  std::vector<std::string> modules;                  ///< empty: scenario default
  std::vector<std::pair<std::string, double>> parameters;
  std::string override_label;
  std::vector<std::string> overrides;  ///< every "--set" this variant applies, in order
  std::size_t module_set = 0;          ///< index into SweepSpec::module_sets
  std::size_t override_set = 0;
};

/// The cross product, in a fixed order (module sets outermost, then override sets, then
/// parameters with the last axis fastest). The order does not depend on the number of ranks.
std::vector<Variant> expand_variants(const SweepSpec& spec);

/// Drops, from every variant, the swept parameters that do not act on it (`acts(variant,
/// parameter)` false: e.g. a parameter whose reactions sit in a switched-off module), then
/// keeps the first of the variants that have become identical (same module set, override
/// set and overrides) and renumbers them. Returns how many variants were merged away;
/// `dropped` (optional) receives "label: parameter" notes of the parameters dropped.
std::size_t merge_duplicate_variants(
    std::vector<Variant>& variants,
    const std::function<bool(const Variant&, const std::string&)>& acts,
    std::vector<std::string>* dropped = nullptr);

/// The label of a variant from its parts: module label, override label, parameters.
std::string variant_label(const Variant& v);

/// A 64-bit FNV-1a digest of `text` as 16 hex digits (to tell definitions apart, not a
/// cryptographic hash).
std::string text_digest(std::string_view text);

/// A variant range "A:B" (variants A to B-1, 0-based; either end may be left out) checked
/// against the number of variants; throws InputError (exit 2) naming the option.
std::pair<std::size_t, std::size_t> parse_variant_range(const std::string& text, std::size_t count);

/// Formats a value for a "--set" override so that it reads back exactly (17 significant
/// digits).
std::string exact_number(double v);

}  // namespace colchem
