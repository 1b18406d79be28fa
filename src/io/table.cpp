#include "io/table.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <sstream>

#include "io/config_node.hpp"

namespace colchem {

namespace {
std::string trim(const std::string& s) {
  const auto a = s.find_first_not_of(" \t\r");
  if (a == std::string::npos) return {};
  const auto b = s.find_last_not_of(" \t\r");
  return s.substr(a, b - a + 1);
}

std::vector<std::string> split_fields(const std::string& line, bool comma) {
  std::vector<std::string> out;
  if (comma) {
    std::stringstream ss(line);
    std::string f;
    while (std::getline(ss, f, ',')) out.push_back(trim(f));
    if (!line.empty() && line.back() == ',') out.emplace_back();
  } else {
    // White space separates fields; a "[unit]" token belongs to the name before it.
    std::stringstream ss(line);
    std::string f;
    while (ss >> f) {
      if (!out.empty() && f.front() == '[' && out.back().find('[') == std::string::npos) {
        out.back() += " " + f;
      } else {
        out.push_back(f);
      }
    }
  }
  return out;
}
}  // namespace

Table Table::read(const std::filesystem::path& file, ExitCode code,
                  const std::vector<std::string>& text_columns,
                  const std::vector<std::string>* numeric_columns) {
  return parse(read_text_file(file, code, "table file"), file.string(), code, text_columns,
               numeric_columns);
}

/// The header line: "name [unit]" fields, names distinct.
void Table::parse_header(const std::string& line, int line_no, bool comma) {
  header_line_ = line_no;
  for (const auto& field : split_fields(line, comma)) {
    const auto open = field.find('[');
    std::string col = trim(field.substr(0, open));
    std::string unit;
    if (open != std::string::npos) {
      const auto close = field.find(']', open);
      if (close == std::string::npos) {
        throw InputError(code_, SourceLocation{file_, line_no}, "header",
                         "'name [unit]' for every column", "'" + field + "' without ']'");
      }
      unit = trim(field.substr(open + 1, close - open - 1));
    }
    if (col.empty()) {
      throw InputError(code_, SourceLocation{file_, line_no}, "header", "a column name",
                       "'" + field + "'");
    }
    if (std::find(names_.begin(), names_.end(), col) != names_.end()) {
      throw InputError(code_, SourceLocation{file_, line_no}, "header", "distinct column names",
                       "'" + col + "' twice");
    }
    names_.push_back(col);
    units_.push_back(unit);
  }
  data_.resize(names_.size());
  cells_.resize(names_.size());
}

/// One data row: a field per column, numbers where `as_text` is false.
void Table::parse_row(const std::vector<std::string>& fields, int line_no,
                      const std::vector<bool>& as_text) {
  if (fields.size() != names_.size()) {
    throw InputError(code_, SourceLocation{file_, line_no}, "",
                     std::to_string(names_.size()) + " fields (as in the header on line " +
                         std::to_string(header_line_) + ")",
                     std::to_string(fields.size()) + " fields");
  }
  for (std::size_t c = 0; c < fields.size(); ++c) {
    if (as_text[c]) {
      cells_[c].push_back(fields[c]);
      continue;
    }
    std::size_t used = 0;
    double v = NAN;
    try {
      v = std::stod(fields[c], &used);
    } catch (const std::exception&) {
      used = 0;
    }
    if (used == 0 || used != fields[c].size() || !std::isfinite(v)) {
      throw InputError(code_, SourceLocation{file_, line_no}, names_[c], "a finite number",
                       "'" + fields[c] + "'");
    }
    data_[c].push_back(v);
  }
  row_lines_.push_back(line_no);
  ++rows_;
}

Table Table::parse(const std::string& text, const std::string& name, ExitCode code,
                   const std::vector<std::string>& text_columns,
                   const std::vector<std::string>* numeric_columns) {
  Table t;
  t.file_ = name;
  t.text_ = text;
  t.code_ = code;
  const auto listed = [](const std::vector<std::string>& list, const std::string& col) {
    return std::find(list.begin(), list.end(), col) != list.end();
  };
  std::stringstream ss(text);
  std::string raw;
  int line_no = 0;
  bool comma = false;
  std::vector<bool> as_text;
  while (std::getline(ss, raw)) {
    ++line_no;
    const auto hash = raw.find('#');
    const std::string line = trim(hash == std::string::npos ? raw : raw.substr(0, hash));
    if (line.empty()) continue;
    if (!t.names_.empty()) {
      t.parse_row(split_fields(line, comma), line_no, as_text);
      continue;
    }
    comma = line.find(',') != std::string::npos;
    t.parse_header(line, line_no, comma);
    for (const auto& col : t.names_) {
      as_text.push_back(listed(text_columns, col) ||
                        (numeric_columns != nullptr && !listed(*numeric_columns, col)));
    }
  }
  if (t.names_.empty()) {
    throw InputError(code, SourceLocation{name}, "", "a header line naming the columns",
                     "an empty file");
  }
  if (t.rows_ == 0) {
    throw InputError(code, SourceLocation{name, t.header_line_}, "",
                     "at least one data row after the header", "none");
  }
  return t;
}

std::size_t Table::index(const std::string& col) const {
  const auto it = std::find(names_.begin(), names_.end(), col);
  if (it != names_.end()) return static_cast<std::size_t>(it - names_.begin());
  const auto near = nearest_word(col, names_);
  throw InputError(code_, SourceLocation{file_, header_line_}, "header",
                   "a column named '" + col + "'",
                   fmt::format("columns {}", fmt::join(names_, ", ")),
                   near ? "did you mean '" + *near + "'?" : std::string());
}

bool Table::has(const std::string& col) const {
  return std::find(names_.begin(), names_.end(), col) != names_.end();
}

const std::vector<double>& Table::raw(const std::string& col) const {
  const std::size_t i = index(col);
  if (data_[i].size() != rows_) {
    throw InputError(code_, SourceLocation{file_, header_line_}, col, "a numeric column",
                     "a text column");
  }
  return data_[i];
}

const std::vector<std::string>& Table::texts(const std::string& col) const {
  const std::size_t i = index(col);
  if (cells_[i].size() != rows_) {
    throw InputError(code_, SourceLocation{file_, header_line_}, col, "a text column",
                     "a numeric column");
  }
  return cells_[i];
}
const std::string& Table::unit(const std::string& col) const {
  return units_[index(col)];
}

std::vector<double> Table::column(const std::string& col, const UnitSystem& units,
                                  const std::string& target_unit) const {
  const std::size_t i = index(col);
  (void)raw(col);  // numeric columns only
  const std::string& from = units_[i];
  auto factor = units.convert(1.0, from, target_unit);
  auto offset = units.convert(0.0, from, target_unit);
  if (!factor || !offset) {
    std::string hint = unit_spelling_hint(units, from, target_unit);
    if (hint.empty()) {
      hint = "write the unit in brackets after the column name, e.g. '" + col + " [" + target_unit +
             "]'";
    }
    throw InputError(code_, SourceLocation{file_, header_line_}, col,
                     "a unit convertible to '" + target_unit + "'",
                     from.empty() ? std::string("no unit") : "'" + from + "'", hint);
  }
  std::vector<double> out(data_[i].size());
  const double scale = *factor - *offset;
  for (std::size_t r = 0; r < out.size(); ++r) out[r] = scale * data_[i][r] + *offset;
  return out;
}

void Table::require_increasing(const std::string& col) const {
  const auto& v = raw(col);
  for (std::size_t r = 1; r < v.size(); ++r) {
    if (!(v[r] > v[r - 1])) {
      fail_row(r, col, "values increasing down the column",
               message_number(v[r]) + " after " + message_number(v[r - 1]));
    }
  }
}

void Table::fail_row(std::size_t row, const std::string& col, const std::string& expected,
                     const std::string& found) const {
  throw InputError(code_, SourceLocation{file_, row_lines_.at(row)}, col, expected, found);
}

TableRef table_ref(const ConfigNode& n, const TableRefForm& form) {
  TableRef r;
  r.column = form.column;
  r.axis_column = form.axis_column;
  if (n.is_scalar() && form.file_alone) {
    r.file = n.path();
    return r;
  }
  if (!n.is_map()) n.fail(form.expected);
  r.file = n.child("table").path();
  if (form.column_required) {
    r.column = n.child("column").text();
  } else if (auto c = n.find("column")) {
    r.column = c->text();
  }
  if (!form.axis_key.empty()) {
    if (auto c = n.find(form.axis_key)) r.axis_column = c->text();
  }
  return r;
}

Table TableRef::read() const {
  Table t = Table::read(file);
  if (!axis_column.empty()) t.require_increasing(axis_column);
  return t;
}

TableProfile TableRef::profile(const Table& t, const UnitSystem& units,
                               const std::string& axis_unit, const std::string& value_unit) const {
  return TableProfile{t.column(axis_column, units, axis_unit),
                      value_unit.empty() ? t.raw(column) : t.column(column, units, value_unit),
                      file.string()};
}

}  // namespace colchem
