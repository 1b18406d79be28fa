#include "io/config_node.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <sstream>

namespace colchem {

// ---------------------------------------------------------------------------------------
// ConfigDocument

namespace {

SourceLocation mark_location(const std::string& file, const YAML::Mark& m) {
  // yaml-cpp marks are 0-based; -1 when unknown.
  return SourceLocation{file, m.line >= 0 ? m.line + 1 : 0, m.column >= 0 ? m.column + 1 : 0};
}

std::vector<std::string> split_path(const std::string& path) {
  std::vector<std::string> parts;
  std::size_t start = 0;
  for (auto dot = path.find('.'); dot != std::string::npos; dot = path.find('.', start)) {
    parts.push_back(path.substr(start, dot - start));
    start = dot + 1;
  }
  parts.push_back(path.substr(start));
  return parts;
}

bool is_index(const std::string& s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) { return c >= '0' && c <= '9'; });
}

// A list index of a --set path, refused (exit 2) when it is not below the list's size; an
// index too long for any list is refused before conversion.
std::size_t list_index(const std::string& key, std::size_t size, const SourceLocation& where,
                       const std::string& path) {
  const auto first = key.find_first_not_of('0');
  const std::string digits = first == std::string::npos ? "0" : key.substr(first);
  const std::size_t idx = digits.size() > 9 ? size : std::stoul(digits);
  if (idx >= size) {
    throw InputError(ExitCode::kUsage, where, path, "an index below " + std::to_string(size),
                     key.size() > 40 ? "'" + key.substr(0, 40) + "...'" : "'" + key + "'");
  }
  return idx;
}

// The key path of a node for messages while checking the raw tree.
std::string join_key(const std::string& path, const std::string& key) {
  return path.empty() ? key : path + "." + key;
}

// Structural checks yaml-cpp does not make: every map key is a single value (not a list or
// a map: `[a, b]: 1`), and no key appears twice in one map (the first would otherwise win
// silently). `origin` replaces the file position for values given on the command line.
void check_tree(const YAML::Node& n, const std::string& file, const std::string& path,
                ExitCode code, const std::string& origin) {
  auto where = [&](const YAML::Node& at) {
    return origin.empty() ? mark_location(file, at.Mark()) : SourceLocation{origin};
  };
  if (n.IsSequence()) {
    for (std::size_t i = 0; i < n.size(); ++i) {
      check_tree(n[i], file, join_key(path, std::to_string(i)), code, origin);
    }
    return;
  }
  if (!n.IsMap()) return;
  std::map<std::string, YAML::Mark> seen;
  for (auto it = n.begin(); it != n.end(); ++it) {
    if (!it->first.IsScalar()) {
      throw InputError(code, where(it->first), path, "a key that is a single word or value",
                       it->first.IsMap()        ? "a map used as a key"
                       : it->first.IsSequence() ? "a list used as a key"
                                                : "an empty key",
                       "write the key as plain text (quote it if it contains ':' or brackets)");
    }
    const std::string key = it->first.Scalar();
    const auto [prev, fresh] = seen.emplace(key, it->first.Mark());
    if (!fresh) {
      const std::string first_line =
          prev->second.line >= 0 ? "line " + std::to_string(prev->second.line + 1) : "earlier";
      throw InputError(code, where(it->first), join_key(path, key), "each key once in a map",
                       "'" + key + "' again (first at " + first_line + ")",
                       "remove one of the two; the first would otherwise win silently");
    }
    check_tree(it->second, file, join_key(path, key), code, origin);
  }
}

}  // namespace

struct ConfigShared {
  std::filesystem::path file;
  ExitCode code = ExitCode::kConfig;
  std::map<std::string, std::string> overrides;  // key path -> original "k=v" text
};

std::string read_text_file(const std::filesystem::path& file, ExitCode code,
                           const std::string& what) {
  std::error_code ec;
  if (std::filesystem::is_directory(file, ec)) {
    throw InputError(code, SourceLocation{file.string()}, "", "a " + what, "a directory");
  }
  std::ifstream in(file);
  if (!in) {
    throw InputError(code, SourceLocation{file.string()}, "", "a readable " + what,
                     "no such file or it cannot be read");
  }
  std::stringstream buf;
  buf << in.rdbuf();
  return buf.str();
}

ConfigDocument ConfigDocument::load(const std::filesystem::path& file, ExitCode code) {
  return from_text(read_text_file(file, code, "YAML file"), file.string(), code);
}

ConfigDocument ConfigDocument::load(const std::filesystem::path& file,
                                    const std::vector<std::string>& overrides, ExitCode code) {
  ConfigDocument doc = load(file, code);
  for (const auto& o : overrides) doc.apply_override(o);
  return doc;
}

ConfigDocument ConfigDocument::from_text(const std::string& text, const std::string& name,
                                         ExitCode code) {
  ConfigDocument doc;
  doc.shared_ = std::make_shared<ConfigShared>(ConfigShared{name, code, {}});
  try {
    doc.root_ = YAML::Load(text);
  } catch (const YAML::ParserException& e) {
    throw InputError(code, mark_location(name, e.mark), "", "valid YAML", "a syntax error", e.msg);
  }
  if (!doc.root_.IsMap() && !doc.root_.IsNull()) {
    throw InputError(code, mark_location(name, doc.root_.Mark()), "",
                     "a map of sections at the top level", "a list or a single value");
  }
  if (doc.root_.IsNull()) doc.root_ = YAML::Node(YAML::NodeType::Map);
  check_tree(doc.root_, name, "", code, "");
  return doc;
}

void ConfigDocument::apply_override(const std::string& assignment) {
  const SourceLocation where{"--set " + assignment};
  const auto eq = assignment.find('=');
  if (eq == std::string::npos || eq == 0) {
    throw InputError(ExitCode::kUsage, where, "", "KEY.PATH=VALUE", "'" + assignment + "'");
  }
  const std::string path = assignment.substr(0, eq);
  const std::string value_text = assignment.substr(eq + 1);
  YAML::Node value;
  try {
    value = YAML::Load(value_text);
  } catch (const YAML::ParserException& e) {
    throw InputError(ExitCode::kUsage, where, path, "a YAML value", "'" + value_text + "'", e.msg);
  }
  check_tree(value, "", path, ExitCode::kUsage, where.file);
  const auto parts = split_path(path);
  if (std::find(parts.begin(), parts.end(), "") != parts.end()) {
    throw InputError(ExitCode::kUsage, where, path, "dot-separated keys", "an empty key");
  }
  // yaml-cpp nodes are handles: assigning through a chain of operator[] edits the tree.
  YAML::Node cur = root_;
  for (std::size_t i = 0; i < parts.size(); ++i) {
    const auto& key = parts[i];
    const bool last = i + 1 == parts.size();
    if (cur.IsSequence()) {
      if (!is_index(key)) {
        throw InputError(ExitCode::kUsage, where, path, "a list index (0, 1, ...) after a list",
                         "'" + key + "'");
      }
      const std::size_t idx = list_index(key, cur.size(), where, path);
      if (last) {
        cur[idx] = value;
      } else {
        cur.reset(cur[idx]);
      }
    } else if (cur.IsScalar()) {  // never the root, which is a map
      throw InputError(ExitCode::kUsage, where, path, "a path through maps",
                       "a single value at '" + parts[i - 1] + "', which has no key '" + key + "'");
    } else if (last) {
      cur[key] = value;
    } else {
      if (!cur[key].IsDefined() || cur[key].IsNull()) cur[key] = YAML::Node(YAML::NodeType::Map);
      cur.reset(cur[key]);
    }
  }
  shared_->overrides[path] = assignment;
  override_list_.push_back(assignment);
}

ConfigNode ConfigDocument::root() const {
  return ConfigNode(root_, "", shared_);
}

const std::filesystem::path& ConfigDocument::file() const {
  return shared_->file;
}

std::string ConfigDocument::resolved_text() const {
  YAML::Emitter out;
  out << root_;
  return std::string(out.c_str()) + "\n";
}

// ---------------------------------------------------------------------------------------
// ConfigNode

ConfigNode::ConfigNode(YAML::Node node, std::string path, std::shared_ptr<const ConfigShared> doc)
    : node_(std::move(node)), path_(std::move(path)), doc_(std::move(doc)) {}

ConfigNode ConfigNode::make_child(const YAML::Node& n, const std::string& sub) const {
  return ConfigNode(n, path_.empty() ? sub : path_ + "." + sub, doc_);
}

std::string ConfigNode::override_origin() const {
  // The value came from the command line if its path, or a parent of it, was overridden.
  for (const auto& [p, text] : doc_->overrides) {
    if (path_ == p ||
        (path_.size() > p.size() && path_.compare(0, p.size(), p) == 0 && path_[p.size()] == '.')) {
      return "--set " + text;
    }
  }
  return {};
}

SourceLocation ConfigNode::location() const {
  const std::string origin = override_origin();
  if (!origin.empty()) return SourceLocation{origin};
  return mark_location(doc_->file.string(), node_.Mark());
}

std::string ConfigNode::describe() const {
  if (!node_.IsDefined() || node_.IsNull()) return "nothing (an empty value)";
  if (node_.IsMap()) return "a map";
  if (node_.IsSequence()) return "a list of " + std::to_string(node_.size()) + " items";
  return "'" + node_.Scalar() + "'";
}

void ConfigNode::fail(const std::string& expected, const std::string& found,
                      const std::string& hint) const {
  throw InputError(doc_->code, location(), path_, expected, found, hint);
}

void ConfigNode::fail_unknown(const YAML::Node& key, const std::string& hint) const {
  const ConfigNode bad = make_child(key, key.Scalar());
  const std::string where = path_.empty() ? std::string("at the top level") : "in '" + path_ + "'";
  throw InputError(doc_->code, bad.location(), bad.key_path(), "a known key " + where,
                   "unknown key '" + key.Scalar() + "'", hint);
}

ConfigNode ConfigNode::child(const std::string& key) const {
  auto c = find(key);
  if (!c) {
    if (!node_.IsMap()) fail("a map containing '" + key + "'");
    // A required key that is missing is most often a misspelt one: report that key.
    for (auto it = node_.begin(); it != node_.end(); ++it) {
      const std::string present = it->first.as<std::string>();
      if (known_->count(present) == 0 && nearest_word(present, {key})) {
        fail_unknown(it->first, "did you mean '" + key + "'?");
      }
    }
    fail("a key '" + key + "' here", "none", "add '" + key + ":' to this section");
  }
  return *c;
}

std::optional<ConfigNode> ConfigNode::find(const std::string& key) const {
  known_->insert(key);
  if (!node_.IsMap()) {
    if (node_.IsNull() || !node_.IsDefined()) return std::nullopt;
    fail("a map (section of 'key: value' lines)");
  }
  YAML::Node n = node_[key];
  if (!n.IsDefined()) return std::nullopt;
  return make_child(n, key);
}

bool ConfigNode::has(const std::string& key) const {
  return find(key).has_value();
}

void ConfigNode::allow(std::initializer_list<const char*> keys) const {
  for (const char* k : keys) known_->insert(k);
}

std::vector<std::pair<std::string, ConfigNode>> ConfigNode::entries() const {
  std::vector<std::pair<std::string, ConfigNode>> out;
  if (node_.IsNull() || !node_.IsDefined()) return out;
  if (!node_.IsMap()) fail("a map (section of 'key: value' lines)");
  for (auto it = node_.begin(); it != node_.end(); ++it) {
    const std::string key = it->first.as<std::string>();
    known_->insert(key);
    out.emplace_back(key, make_child(it->second, key));
  }
  return out;
}

std::optional<std::string> nearest_word(const std::string& word,
                                        const std::vector<std::string>& candidates) {
  std::optional<std::string> best;
  std::size_t best_d = std::max<std::size_t>(2, word.size() / 3) + 1;
  for (const auto& c : candidates) {
    const std::size_t d = edit_distance(word, c);
    if (d < best_d) {
      best_d = d;
      best = c;
    }
  }
  return best;
}

void ConfigNode::done() const {
  if (!node_.IsMap()) return;
  const std::vector<std::string> valid(known_->begin(), known_->end());
  for (auto it = node_.begin(); it != node_.end(); ++it) {
    const std::string key = it->first.as<std::string>();
    if (known_->count(key) != 0) continue;
    const auto near = nearest_word(key, valid);
    fail_unknown(it->first, near ? "did you mean '" + *near + "'?"
                                 : fmt::format("valid keys here: {}", fmt::join(valid, ", ")));
  }
}

std::vector<ConfigNode> ConfigNode::items() const {
  if (!node_.IsSequence()) fail("a list");
  std::vector<ConfigNode> out;
  out.reserve(node_.size());
  for (std::size_t i = 0; i < node_.size(); ++i) {
    out.push_back(make_child(node_[i], std::to_string(i)));
  }
  return out;
}

std::string ConfigNode::text() const {
  if (!node_.IsScalar()) fail("a single value");
  return node_.Scalar();
}

double ConfigNode::number() const {
  const std::string s = text();
  std::size_t used = 0;
  double v = 0.0;
  try {
    v = std::stod(s, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used == 0 || s.find_first_not_of(" \t", used) != std::string::npos) {
    auto q = split_quantity(s);
    if (q && !q->unit.empty()) {
      fail("a plain number (this key takes no unit)", "'" + s + "'");
    }
    fail("a number");
  }
  if (!std::isfinite(v)) fail("a finite number");
  return v;
}

long ConfigNode::integer() const {
  const std::string s = text();
  std::size_t used = 0;
  long v = 0;
  try {
    v = std::stol(s, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used == 0 || used != s.size()) fail("a whole number");
  return v;
}

bool ConfigNode::boolean() const {
  const std::string s = text();
  if (s == "true" || s == "yes" || s == "on") return true;
  if (s == "false" || s == "no" || s == "off") return false;
  fail("true or false");
}

std::string ConfigNode::choice(const std::vector<std::string>& choices) const {
  const std::string s = text();
  if (std::find(choices.begin(), choices.end(), s) != choices.end()) return s;
  const auto near = nearest_word(s, choices);
  fail(fmt::format("one of: {}", fmt::join(choices, ", ")), "'" + s + "'",
       near ? "did you mean '" + *near + "'?" : std::string());
}

std::string unit_spelling_hint(const UnitSystem& units, const std::string& unit,
                               const std::string& target) {
  if (auto cand = units.case_respelling(unit, target)) {
    return "did you mean '" + *cand + "'? (unit symbols are case-sensitive)";
  }
  return {};
}

double ConfigNode::quantity(const UnitSystem& units, const std::string& target_unit,
                            const std::string& example) const {
  const std::string s = text();
  auto q = split_quantity(s);
  if (!q) fail("a number with a unit, such as '" + example + "'");
  if (q->unit.empty()) {
    fail("a number with a unit, such as '" + example + "'", "'" + s + "' with no unit",
         "every dimensional value carries its unit");
  }
  auto v = units.convert(q->value, q->unit, target_unit);
  if (!v) {
    if (!units.parses(q->unit)) {
      fail("a unit that UDUNITS-2 knows (convertible to '" + target_unit + "')",
           "'" + q->unit + "'", unit_spelling_hint(units, q->unit, target_unit));
    }
    fail("a unit convertible to '" + target_unit + "', such as '" + example + "'",
         "'" + q->unit + "'", unit_spelling_hint(units, q->unit, target_unit));
  }
  if (!std::isfinite(*v)) fail("a finite value");
  return *v;
}

std::vector<double> ConfigNode::quantity_list(const UnitSystem& units,
                                              const std::string& target_unit,
                                              const std::string& example) const {
  std::vector<double> out;
  if (node_.IsSequence()) {
    for (const auto& item : items()) out.push_back(item.quantity(units, target_unit, example));
    return out;
  }
  // Plain numbers sharing one unit: {values: [0, 5, 10], unit: km} or "[0, 5, 10] km" (quoted
  // in YAML); a unit error is reported at
  // the `unit` key or at the text.
  std::vector<double> values;
  std::string unit;
  std::optional<ConfigNode> unit_key;  // (assigning a ConfigNode would edit the YAML tree)
  if (node_.IsMap()) {
    unit_key.emplace(child("unit"));
    unit = unit_key->text();
    values = child("values").number_list();
    done();
  } else {
    const std::string s = text();
    const auto open = s.find('[');
    const auto close = s.find(']');
    if (open == std::string::npos || close == std::string::npos || close < open) {
      fail("a list of quantities: [" + example + ", ...] or {values: [...], unit: ...}");
    }
    unit = s.substr(close + 1);
    unit.erase(0, unit.find_first_not_of(" \t"));
    std::stringstream body(s.substr(open + 1, close - open - 1));
    for (std::string item; std::getline(body, item, ',');) {
      auto q = split_quantity(item);
      if (!q || !q->unit.empty()) {
        fail("plain numbers inside '[...] " + unit + "'", "'" + item + "'");
      }
      values.push_back(q->value);
    }
  }
  for (const double v : values) {
    auto converted = units.convert(v, unit, target_unit);
    if (!converted) {
      (unit_key ? *unit_key : *this)
          .fail("a unit convertible to '" + target_unit + "'", "'" + unit + "'",
                unit_spelling_hint(units, unit, target_unit));
    }
    out.push_back(*converted);
  }
  return out;
}

std::vector<std::string> ConfigNode::text_list() const {
  std::vector<std::string> out;
  if (node_.IsScalar()) return {text()};
  for (const auto& item : items()) out.push_back(item.text());
  return out;
}

std::vector<double> ConfigNode::number_list() const {
  std::vector<double> out;
  for (const auto& item : items()) out.push_back(item.number());
  return out;
}

std::filesystem::path ConfigNode::path() const {
  const std::filesystem::path p(text());
  if (p.is_absolute()) return p;
  // Paths are relative to the file they are written in; for a command-line override,
  // relative to the working directory.
  if (!override_origin().empty()) return p;
  return doc_->file.parent_path() / p;
}

}  // namespace colchem
