// Reading colchem's own files back (io/output.hpp): the species profiles of a run file and
// the reaction diagnostics for budgets (checkpoints: io/restart_file.cpp); and the check that
// an output path is not one of the inputs.
#include "io/output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>

#include "analysis/budget.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"

namespace colchem {

namespace {

// Checks on the NetCDF inputs colchem reads back (run files, checkpoints): every variable of
// the shape its dimensions promise, finite, altitudes strictly increasing. A file that fails
// is refused (exit 4) naming the file, the variable, what was expected and what was found,
// before any value is used.
[[noreturn]] void refuse(const NcReader& nc, const std::string& var, const std::string& expected,
                         const std::string& found) {
  throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, var, expected, found);
}

std::string shape_text(const std::vector<std::size_t>& shape) {
  if (shape.empty()) return "a single value";
  std::string s = "(";
  for (std::size_t i = 0; i < shape.size(); ++i) s += (i ? ", " : "") + std::to_string(shape[i]);
  return s + ")";
}

/// Reads `var` after checking that its shape is `want` (named by `dims` in the message).
std::vector<double> read_shaped(const NcReader& nc, const std::string& var,
                                const std::vector<std::size_t>& want, const std::string& dims) {
  const auto got = nc.shape(var);
  if (got != want) {
    refuse(nc, var, "a (" + dims + ") variable of shape " + shape_text(want),
           "shape " + shape_text(got));
  }
  std::vector<double> v = nc.read(var);
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (!std::isfinite(v[i])) {
      refuse(nc, var, "finite values", fmt::format("{} at index {}", v[i], i));
    }
  }
  return v;
}

void require_increasing(const NcReader& nc, const std::string& var, const std::vector<double>& v) {
  for (std::size_t i = 1; i < v.size(); ++i) {
    if (!(v[i] > v[i - 1])) {
      refuse(nc, var, "strictly increasing values (bottom to top)",
             fmt::format("{} after {} at index {}", v[i], v[i - 1], i));
    }
  }
}

/// The altitude grid (km in the file): at least one cell, centres and edges increasing,
/// one more edge than centres.
void read_grid(const NcReader& nc, std::vector<double>& centre_cm, std::vector<double>& edge_cm,
               bool centres) {
  const std::size_t N = nc.dimension("altitude");
  if (N == 0) refuse(nc, "altitude", "at least one altitude cell", "a zero-length dimension");
  if (centres) {
    const auto z = read_shaped(nc, "altitude", {N}, "altitude");
    require_increasing(nc, "altitude", z);
    for (double v : z) centre_cm.push_back(v * constants::kCmPerKm);
  }
  const auto e = read_shaped(nc, "altitude_edge", {N + 1}, "altitude + 1");
  require_increasing(nc, "altitude_edge", e);
  for (double v : e) edge_cm.push_back(v * constants::kCmPerKm);
}

std::vector<std::string> read_names(const NcReader& nc, const std::string& var,
                                    const std::string& dim) {
  const std::size_t n = nc.dimension(dim);
  auto names = nc.read_strings(var);
  if (names.size() != n) {
    refuse(nc, var, fmt::format("one name per '{}' ({})", dim, n), std::to_string(names.size()));
  }
  if (n == 0) refuse(nc, var, "at least one " + dim, "none");
  return names;
}

}  // namespace

void refuse_output_onto_input(
    const std::filesystem::path& output,
    const std::vector<std::pair<std::string, std::filesystem::path>>& inputs) {
  std::error_code ec;
  if (output.empty() || !std::filesystem::exists(output, ec)) return;
  for (const auto& [what, in] : inputs) {
    if (in.empty()) continue;
    if (std::filesystem::equivalent(output, in, ec) && !ec) {
      throw InputError(ExitCode::kOutput, SourceLocation{output.string()}, "-o/--output",
                       "an output path that is not one of the inputs",
                       what + " '" + in.string() + "'",
                       "writing it would overwrite the input; choose another output path");
    }
  }
}

ModelColumn read_model_column(const std::filesystem::path& file) {
  return read_model_column(NcReader(file));
}

ModelColumn read_model_column(const NcReader& nc) {
  ModelColumn m;
  read_grid(nc, m.altitude_cm, m.edge_cm, true);
  m.species = read_names(nc, "species_name", "species");
  const std::size_t S = m.species.size(), N = m.cells();
  m.number_density = read_shaped(nc, "number_density", {S, N}, "species, altitude");
  m.mole_fraction = read_shaped(nc, "mole_fraction", {S, N}, "species, altitude");
  // Number densities are not negative; round-off below zero (a millionth of the species'
  // largest value, common practice, no source) is tolerated.
  for (std::size_t s = 0; s < S; ++s) {
    double top = 0.0;
    for (std::size_t j = 0; j < N; ++j) top = std::max(top, m.number_density[s * N + j]);
    for (std::size_t j = 0; j < N; ++j) {
      const double v = m.number_density[s * N + j];
      if (v < 0.0 && !(v >= -1e-6 * top)) {
        refuse(nc, "number_density",
               "number densities of at least zero (round-off to -1e-6 of the species' largest)",
               fmt::format("{:.6g} cm-3 for {} at altitude index {}", v, m.species[s], j));
      }
    }
  }
  return m;
}

BudgetInputs read_budget_inputs(const NcReader& nc) {
  BudgetInputs in;
  for (const char* v :
       {"reaction_rate", "net_stoichiometry", "transport_tendency", "net_tendency"}) {
    if (!nc.has_variable(v)) {
      throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, v,
                       "a run file with reaction diagnostics (written by colchem run)",
                       "no variable '" + std::string(v) + "'");
    }
  }
  std::vector<double> unused;
  read_grid(nc, unused, in.edge_cm, false);
  in.species = read_names(nc, "species_name", "species");
  in.equations = read_names(nc, "reaction_equation", "reaction");
  // Run files written before reactions had ids have no reaction_id: the tables then show
  // the equations alone.
  if (nc.has_variable("reaction_id")) in.reaction_ids = read_names(nc, "reaction_id", "reaction");
  in.reaction_ids.resize(in.equations.size());
  const std::size_t S = in.species.size(), N = in.edge_cm.size() - 1, R = in.equations.size();
  in.net_stoichiometry = read_shaped(nc, "net_stoichiometry", {R, S}, "reaction, species");
  in.reaction_rate = read_shaped(nc, "reaction_rate", {R, N}, "reaction, altitude");
  in.transport_tendency = read_shaped(nc, "transport_tendency", {S, N}, "species, altitude");
  in.net_tendency = read_shaped(nc, "net_tendency", {S, N}, "species, altitude");
  return in;
}

}  // namespace colchem
