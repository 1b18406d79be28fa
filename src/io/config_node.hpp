// Reading YAML configuration into typed values with errors users can act on.
//
// A ConfigDocument owns one parsed YAML file plus any command-line overrides
// ("--set grid.levels=120"). A ConfigNode is a view of one value in it that knows its key
// path, the file and line it came from, and (for maps) which keys the loader asked for, so
// that done() can reject unknown keys with a "did you mean" suggestion. Only the loaders in
// io/ use this; physics code receives the typed structs they build.
#pragma once

#include <yaml-cpp/yaml.h>

#include <filesystem>
#include <map>
#include <memory>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "core/units.hpp"

namespace colchem {

class ConfigNode;
struct ConfigShared;  // the file, exit code and overrides a document's nodes share

class ConfigDocument {
 public:
  /// Parses `file`; a syntax error throws InputError (ExitCode::kConfig) with its position.
  static ConfigDocument load(const std::filesystem::path& file, ExitCode code = ExitCode::kConfig);
  /// Parses `file` and applies each "key.path=value" override in order (the common start of
  /// every loader: scenario, box, sweep).
  static ConfigDocument load(const std::filesystem::path& file,
                             const std::vector<std::string>& overrides,
                             ExitCode code = ExitCode::kConfig);
  /// Parses text (used for tests and for documents embedded in outputs).
  static ConfigDocument from_text(const std::string& text, const std::string& name,
                                  ExitCode code = ExitCode::kConfig);

  /// Applies "a.b.c=value" (value is YAML: 3, 5 km, [a, b], {x: 1}). Missing maps are
  /// created; a sequence element is addressed by its index ("levels.0=1 km").
  void apply_override(const std::string& assignment);

  [[nodiscard]] ConfigNode root() const;
  [[nodiscard]] const std::filesystem::path& file() const;
  /// The document with every override applied, as YAML text.
  [[nodiscard]] std::string resolved_text() const;
  /// The overrides in the order given.
  [[nodiscard]] const std::vector<std::string>& overrides() const { return override_list_; }

 private:
  YAML::Node root_;
  std::shared_ptr<ConfigShared> shared_;
  std::vector<std::string> override_list_;
};

class ConfigNode {
 public:
  /// The value at `key`; a missing key is an error naming the map's location.
  [[nodiscard]] ConfigNode child(const std::string& key) const;
  /// The value at `key` if present. Registers the key as valid either way.
  [[nodiscard]] std::optional<ConfigNode> find(const std::string& key) const;
  [[nodiscard]] bool has(const std::string& key) const;
  /// Declares keys as valid without reading them (for keys read elsewhere).
  void allow(std::initializer_list<const char*> keys) const;
  /// All entries of a map in file order; every key counts as known.
  [[nodiscard]] std::vector<std::pair<std::string, ConfigNode>> entries() const;
  /// Rejects keys that were never asked for: "unknown key; did you mean ...".
  void done() const;
  [[nodiscard]] std::vector<ConfigNode> items() const;
  [[nodiscard]] std::string text() const;
  [[nodiscard]] double number() const;
  [[nodiscard]] long integer() const;
  [[nodiscard]] bool boolean() const;
  /// One of `choices`; anything else is an error listing them.
  [[nodiscard]] std::string choice(const std::vector<std::string>& choices) const;
  /// A number with a unit ("92 bar"), converted to `target_unit`. A bare number is an
  /// error: every dimensional config value carries its unit.
  [[nodiscard]] double quantity(const UnitSystem& units, const std::string& target_unit,
                                const std::string& example) const;
  /// A list of quantities: a YAML list ["0 km", "5 km"], a map {values: [0, 5], unit: km},
  /// or the quoted text "[0, 5, 10] km".
  [[nodiscard]] std::vector<double> quantity_list(const UnitSystem& units,
                                                  const std::string& target_unit,
                                                  const std::string& example) const;
  [[nodiscard]] std::vector<std::string> text_list() const;
  [[nodiscard]] std::vector<double> number_list() const;
  /// A file path, resolved relative to the file this value was written in.
  [[nodiscard]] std::filesystem::path path() const;
  [[nodiscard]] bool is_map() const { return node_.IsMap(); }
  [[nodiscard]] bool is_sequence() const { return node_.IsSequence(); }
  [[nodiscard]] bool is_scalar() const { return node_.IsScalar(); }
  [[nodiscard]] bool is_null() const { return node_.IsNull(); }
  [[nodiscard]] const std::string& key_path() const { return path_; }
  [[nodiscard]] SourceLocation location() const;
  /// Short description of the value for error messages ("'abc'", "a map", "a list").
  [[nodiscard]] std::string describe() const;
  [[noreturn]] void fail(const std::string& expected, const std::string& found,
                         const std::string& hint = {}) const;
  [[noreturn]] void fail(const std::string& expected) const { fail(expected, describe()); }

 private:
  friend class ConfigDocument;
  ConfigNode(YAML::Node node, std::string path, std::shared_ptr<const ConfigShared> doc);
  [[nodiscard]] ConfigNode make_child(const YAML::Node& n, const std::string& sub) const;
  [[nodiscard]] std::string override_origin() const;
  [[noreturn]] void fail_unknown(const YAML::Node& key, const std::string& hint) const;

  YAML::Node node_;
  std::string path_;
  std::shared_ptr<const ConfigShared> doc_;
  std::shared_ptr<std::set<std::string>> known_ = std::make_shared<std::set<std::string>>();
};

/// The whole text of `file` ("YAML file", "table file": `what` names it in the errors).
std::string read_text_file(const std::filesystem::path& file, ExitCode code,
                           const std::string& what);

/// A spelling of `unit` in other letter cases that UDUNITS-2 converts to `target` ("AU" ->
/// "au", "PA" -> "Pa"), as a hint; "" if none.
std::string unit_spelling_hint(const UnitSystem& units, const std::string& unit,
                               const std::string& target);

/// The nearest of `candidates` to `word` when it is close enough to be a likely typo.
std::optional<std::string> nearest_word(const std::string& word,
                                        const std::vector<std::string>& candidates);

}  // namespace colchem
