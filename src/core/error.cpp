#include "core/error.hpp"

#include <algorithm>
#include <vector>

namespace colchem {

std::string SourceLocation::str() const {
  // Built with append(): GCC 12 warns falsely (-Wrestrict, GCC bug 105329) on the
  // equivalent operator+ chain.
  std::string s = file.empty() ? std::string("<input>") : file;
  if (line > 0) {
    s.append(":").append(std::to_string(line));
    if (column > 0) s.append(":").append(std::to_string(column));
  }
  return s;
}

namespace {
std::string compose(const SourceLocation& where, const std::string& key_path,
                    const std::string& expected, const std::string& found,
                    const std::string& hint) {
  std::string msg = where.str() + ": ";
  if (!key_path.empty()) msg += "'" + key_path + "': ";
  msg += "expected " + expected + ", found " + found;
  if (!hint.empty()) msg += "; " + hint;
  return msg;
}
}  // namespace

InputError::InputError(ExitCode code, SourceLocation where, std::string key_path,
                       std::string expected, std::string found, std::string hint)
    : std::runtime_error(compose(where, key_path, expected, found, hint)),
      code_(code),
      where_(std::move(where)),
      key_path_(std::move(key_path)),
      expected_(std::move(expected)),
      found_(std::move(found)) {}

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      const std::size_t subst = prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, subst});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

}  // namespace colchem
