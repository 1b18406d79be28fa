#include "analysis/observations.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "io/table.hpp"

namespace colchem {

std::vector<std::string> ObservationSet::species() const {
  std::vector<std::string> out;
  for (const auto& p : points) {
    if (std::find(out.begin(), out.end(), p.species) == out.end()) out.push_back(p.species);
  }
  return out;
}

ObservationSet read_observations(const std::filesystem::path& file, const UnitSystem& units) {
  const Table t = Table::read(file, ExitCode::kInputData, {"species"});
  const auto z = t.column("altitude", units, "cm");
  const auto& sp = t.texts("species");
  const auto v = t.column("value", units, "1");
  const auto u = t.column("uncertainty", units, "1");
  const auto& flag = t.raw("upper_limit");
  ObservationSet set;
  set.file = file;
  set.text = t.text();
  for (std::size_t r = 0; r < t.rows(); ++r) {
    if (sp[r].empty()) t.fail_row(r, "species", "a species name", "an empty field");
    if (!(v[r] > 0.0)) t.fail_row(r, "value", "a positive mole fraction", std::to_string(v[r]));
    if (flag[r] != 0.0 && flag[r] != 1.0) {
      t.fail_row(r, "upper_limit", "0 (detection) or 1 (upper limit)", std::to_string(flag[r]));
    }
    const bool limit = flag[r] == 1.0;
    if (u[r] < 0.0 || (!limit && !(u[r] > 0.0))) {
      t.fail_row(r, "uncertainty",
                 limit ? "a non-negative uncertainty" : "a positive uncertainty for a detection",
                 fmt::format("{:.6g} (as a mole fraction)", u[r]));
    }
    set.points.push_back({z[r], sp[r], v[r], u[r], limit, t.line_of_row(r)});
  }
  return set;
}

}  // namespace colchem
