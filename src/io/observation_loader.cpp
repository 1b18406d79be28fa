// Observation files (io/observation_loader.hpp).
#include "io/observation_loader.hpp"

#include <fmt/format.h>
#include <spdlog/spdlog.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "core/interp.hpp"
#include "io/table.hpp"

namespace colchem {

const std::vector<std::string>& observation_columns() {
  static const std::vector<std::string> kColumns{
      "altitude", "species", "value", "uncertainty", "upper_limit", "altitude_uncertainty",
      "kernel"};
  return kColumns;
}

namespace {

std::string joined(const std::vector<std::string>& v) {
  return fmt::format("{}", fmt::join(v, ", "));
}

// Reads the kernel row named in row r's `kernel` field ("PATH" or "PATH:COLUMN"); tables are
// read once per file.
AveragingKernel read_kernel(const Table& obs, std::size_t r, const std::string& field,
                            double altitude_cm, const UnitSystem& units,
                            std::map<std::string, Table>& tables, ObservationSet& set) {
  const auto colon = field.rfind(':');  // '#' would start a comment in a table
  const std::string rel = field.substr(0, colon);
  const std::string column = colon == std::string::npos ? "weight" : field.substr(colon + 1);
  if (rel.empty() || column.empty()) {
    obs.fail_row(r, "kernel", "'-', PATH or PATH:COLUMN", "'" + field + "'");
  }
  const std::filesystem::path path = set.file.parent_path() / rel;
  auto it = tables.find(path.string());
  if (it == tables.end()) {
    std::error_code ec;
    if (!std::filesystem::is_regular_file(path, ec)) {
      obs.fail_row(r, "kernel", "an existing kernel table (relative to the observation file)",
                   "'" + path.string() + "', which does not exist");
    }
    it = tables.emplace(path.string(), Table::read(path, ExitCode::kInputData)).first;
    set.kernel_files.emplace_back(path, it->second.text());
    it->second.require_increasing("altitude");
  }
  const Table& t = it->second;
  if (!t.has(column)) {
    obs.fail_row(r, "kernel",
                 "a weight column of " + path.string() + " (" + joined(t.names()) + ")",
                 "'" + column + "'");
  }
  AveragingKernel k;
  k.source = rel + ":" + column;
  k.altitude_cm = t.column("altitude", units, "cm");
  k.weight = t.column(column, units, "1");
  for (std::size_t i = 0; i < t.rows(); ++i) {
    if (!std::isfinite(k.weight[i])) {
      t.fail_row(i, column, "a finite weight", fmt::format("{:.6g}", k.weight[i]));
    }
  }
  if (t.has("a_priori")) {
    k.a_priori = t.column("a_priori", units, "1");
    if (altitude_cm < k.altitude_cm.front() || altitude_cm > k.altitude_cm.back()) {
      obs.fail_row(r, "kernel",
                   fmt::format("a kernel whose altitudes ({:.6g} to {:.6g} km) cover the observed "
                               "altitude, to interpolate its a_priori",
                               k.altitude_cm.front() / 1e5, k.altitude_cm.back() / 1e5),
                   fmt::format("{:.6g} km", altitude_cm / 1e5));
    }
    k.a_priori_at_point = interp_linear_hold(k.altitude_cm, k.a_priori, altitude_cm);
  }
  return k;
}

}  // namespace

ObservationSet read_observations(const std::filesystem::path& file, const UnitSystem& units) {
  static const std::vector<std::string> kNumeric{"altitude", "value", "uncertainty", "upper_limit",
                                                 "altitude_uncertainty"};
  const Table t = Table::read(file, ExitCode::kInputData, {"species", "kernel"}, &kNumeric);
  ObservationSet set;
  set.file = file;
  set.text = t.text();
  const auto& known = observation_columns();
  for (const auto& name : t.names()) {
    if (std::find(known.begin(), known.end(), name) != known.end()) continue;
    set.warnings.push_back(fmt::format("{}: unknown column '{}' is ignored; known columns: {}",
                                       file.string(), name, joined(known)));
    spdlog::warn("{}", set.warnings.back());
  }
  const auto z = t.column("altitude", units, "cm");
  const auto& sp = t.texts("species");
  const auto v = t.column("value", units, "1");
  const auto u = t.column("uncertainty", units, "1");
  const auto& flag = t.raw("upper_limit");
  const std::vector<double> sz = t.has("altitude_uncertainty")
                                     ? t.column("altitude_uncertainty", units, "cm")
                                     : std::vector<double>(t.rows(), 0.0);
  std::map<std::string, Table> kernels;
  for (std::size_t r = 0; r < t.rows(); ++r) {
    if (sp[r].empty()) t.fail_row(r, "species", "a species name", "an empty field");
    if (flag[r] != 0.0 && flag[r] != 1.0) {
      t.fail_row(r, "upper_limit", "0 (detection) or 1 (upper limit)",
                 fmt::format("{:.6g}", flag[r]));
    }
    const bool limit = flag[r] == 1.0;
    ObservationPoint p{z[r], sp[r], v[r], u[r], limit, t.line_of_row(r), sz[r], std::nullopt};
    if (t.has("kernel") && t.texts("kernel")[r] != "-" && !t.texts("kernel")[r].empty()) {
      p.kernel = read_kernel(t, r, t.texts("kernel")[r], z[r], units, kernels, set);
    }
    set.points.push_back(std::move(p));
  }
  check_observations(set);
  return set;
}

}  // namespace colchem
