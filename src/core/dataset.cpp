// Dataset: the plain description of a file (core/dataset.hpp); helpers that make a typical
// variable one statement.
#include "core/dataset.hpp"

#include <limits>
#include <stdexcept>

namespace colchem {

DatasetVariable& DatasetVariable::nan_fill() {
  after.push_back({"_FillValue", "", std::numeric_limits<double>::quiet_NaN()});
  return *this;
}

DatasetVariable number_variable(const std::string& name, std::vector<std::string> dims,
                                VarAttrs attrs, std::vector<double> data) {
  DatasetVariable v;
  v.name = name;
  v.dims = std::move(dims);
  v.attrs = std::move(attrs);
  v.numbers = std::move(data);
  return v;
}

DatasetVariable flag_variable(const std::string& name, std::vector<std::string> dims,
                              const std::string& long_name, const std::string& meanings,
                              std::vector<double> data, std::vector<int> values) {
  if (values.empty()) {
    // One value per meaning, 0, 1, ...
    int k = 0;
    values.push_back(k++);
    for (char c : meanings) {
      if (c == ' ') values.push_back(k++);
    }
  }
  return number_variable(
      name, std::move(dims),
      {"", long_name, "", {{"flag_meanings", meanings}}, true, std::move(values)}, std::move(data));
}

DatasetVariable string_variable(const std::string& name, const std::string& dim,
                                const std::string& long_name, std::vector<std::string> values) {
  DatasetVariable v;
  v.kind = DatasetVariable::Kind::kStrings;
  v.name = name;
  v.dims = {dim};
  v.attrs.long_name = long_name;
  v.strings = std::move(values);
  return v;
}

void Dataset::global_text(const std::string& name, std::string value) {
  globals_.push_back({name, std::move(value), std::nullopt});
}

void Dataset::global_number(const std::string& name, double value) {
  globals_.push_back({name, "", value});
}

void Dataset::dimension(const std::string& name, std::size_t len) {
  dimensions_.emplace_back(name, len);
}

DatasetVariable& Dataset::add(DatasetVariable v) {
  variables_.push_back(std::move(v));
  return variables_.back();
}

DatasetVariable& Dataset::variable(const std::string& name, std::vector<std::string> dims,
                                   VarAttrs attrs, std::vector<double> data) {
  return add(number_variable(name, std::move(dims), std::move(attrs), std::move(data)));
}

DatasetVariable& Dataset::flag(const std::string& name, std::vector<std::string> dims,
                               const std::string& long_name, const std::string& meanings,
                               std::vector<double> data, std::vector<int> values) {
  return add(flag_variable(name, std::move(dims), long_name, meanings, std::move(data),
                           std::move(values)));
}

DatasetVariable& Dataset::strings(const std::string& name, const std::string& dim,
                                  const std::string& long_name, std::vector<std::string> values) {
  return add(string_variable(name, dim, long_name, std::move(values)));
}

DatasetVariable& Dataset::text(const std::string& name, const std::string& long_name,
                               std::string value) {
  DatasetVariable v;
  v.kind = DatasetVariable::Kind::kText;
  v.name = name;
  v.attrs.long_name = long_name;
  v.strings = {std::move(value)};
  return add(std::move(v));
}

DatasetVariable& Dataset::at(const std::string& name) {
  for (auto& v : variables_) {
    if (v.name == name) return v;
  }
  throw std::logic_error("Dataset: no variable '" + name + "'");
}

}  // namespace colchem
