#include "core/error.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <vector>

namespace colchem {

std::string message_number(double v) {
  return fmt::format("{:.6g}", v);
}

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

std::string clip_for_message(const std::string& text) {
  constexpr std::size_t kKeep = 200, kLimit = 240;
  if (text.size() <= kLimit) return text;
  std::string out = text.substr(0, kKeep);
  out.append("... (").append(std::to_string(text.size())).append(" characters in all)");
  return out;
}

namespace {
std::string compose(const SourceLocation& where, const std::string& key_path,
                    const std::string& expected, const std::string& found,
                    const std::string& hint) {
  // append() again (GCC bug 105329, -Wrestrict on operator+ chains).
  std::string msg = clip_for_message(where.str());
  msg.append(": ");
  if (!key_path.empty()) msg.append("'").append(clip_for_message(key_path)).append("': ");
  msg.append("expected ").append(clip_for_message(expected));
  msg.append(", found ").append(clip_for_message(found));
  if (!hint.empty()) msg.append("; ").append(clip_for_message(hint));
  return msg;
}
}  // namespace

InputError::InputError(ExitCode code, SourceLocation where, std::string key_path,
                       std::string expected, std::string found, std::string hint)
    : std::runtime_error(compose(where, key_path, expected, found, hint)),
      code_(code),
      where_(std::move(where)),
      key_path_(clip_for_message(key_path)),
      expected_(clip_for_message(expected)),
      found_(clip_for_message(found)) {}

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
