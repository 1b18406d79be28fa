// Reading colchem's own files back (io/output.hpp; checkpoints: io/restart_file.cpp). A file
// that fails a check is refused (exit 4) naming the file, the variable, what was expected
// and what was found, before any value is used.
#include "io/output.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "analysis/budget.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"

namespace colchem {

namespace {

/// The altitudes of `var` (km in the file, on its own dimension) in cm, strictly increasing.
std::vector<double> read_altitudes(const NcReader& nc, const std::string& var) {
  std::vector<double> z = nc.read(var, {var});
  for (std::size_t i = 1; i < z.size(); ++i) {
    if (!(z[i] > z[i - 1])) {
      nc.refuse(var, "strictly increasing values (bottom to top)",
                fmt::format("{} after {} at index {}", z[i], z[i - 1], i));
    }
  }
  for (double& v : z) v *= constants::kCmPerKm;
  return z;
}

/// The grid: at least one altitude cell, centres (when `centres` is set) and edges strictly
/// increasing, one more edge than cells.
void read_grid(const NcReader& nc, std::vector<double>* centres, std::vector<double>& edges) {
  const std::size_t N = nc.dimension("altitude");
  if (N == 0) nc.refuse("altitude", "at least one altitude cell", "a zero-length dimension");
  if (centres) *centres = read_altitudes(nc, "altitude");
  if (const std::size_t E = nc.dimension("altitude_edge"); E != N + 1) {
    nc.refuse("altitude_edge", fmt::format("one more edge than altitude cells ({})", N + 1),
              std::to_string(E));
  }
  edges = read_altitudes(nc, "altitude_edge");
}

/// The names along `dim`, at least one.
std::vector<std::string> read_names(const NcReader& nc, const std::string& var,
                                    const std::string& dim) {
  auto names = nc.read_strings(var, dim);
  if (names.empty()) nc.refuse(var, "at least one " + dim, "none");
  return names;
}

}  // namespace

void refuse_output_onto_input(
    const std::filesystem::path& output,
    const std::vector<std::pair<std::string, std::filesystem::path>>& inputs) {
  std::error_code ec;
  if (output.empty() || !std::filesystem::exists(output, ec)) return;
  for (const auto& [what, in] : inputs) {
    if (!in.empty() && std::filesystem::equivalent(output, in, ec) && !ec) {
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
  read_grid(nc, &m.altitude_cm, m.edge_cm);
  const std::size_t N = m.cells();
  m.species = read_names(nc, "species_name", "species");
  m.number_density = nc.read("number_density", {"species", "altitude"});
  m.mole_fraction = nc.read("mole_fraction", {"species", "altitude"});
  // Number densities are not negative; round-off below zero (a millionth of the species'
  // largest value, common practice, no source) is tolerated.
  for (std::size_t s = 0; s < m.species.size(); ++s) {
    const auto row = m.number_density.begin() + static_cast<std::ptrdiff_t>(s * N);
    const double top = std::max(0.0, *std::max_element(row, row + static_cast<std::ptrdiff_t>(N)));
    for (std::size_t j = 0; j < N; ++j) {
      if (row[j] < -1e-6 * top) {
        nc.refuse("number_density",
                  "number densities of at least zero (round-off to -1e-6 of the species' largest)",
                  fmt::format("{:.6g} cm-3 for {} at altitude index {}", row[j], m.species[s], j));
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
      nc.refuse(v, "a run file with reaction diagnostics (written by colchem run)",
                "no variable '" + std::string(v) + "'");
    }
  }
  read_grid(nc, nullptr, in.edge_cm);
  in.species = read_names(nc, "species_name", "species");
  in.equations = read_names(nc, "reaction_equation", "reaction");
  // Run files written before reactions had ids have no reaction_id: the tables then show
  // the equations alone.
  if (nc.has_variable("reaction_id")) in.reaction_ids = read_names(nc, "reaction_id", "reaction");
  in.reaction_ids.resize(in.equations.size());
  in.net_stoichiometry = nc.read("net_stoichiometry", {"reaction", "species"});
  in.reaction_rate = nc.read("reaction_rate", {"reaction", "altitude"});
  in.transport_tendency = nc.read("transport_tendency", {"species", "altitude"});
  in.net_tendency = nc.read("net_tendency", {"species", "altitude"});
  return in;
}

}  // namespace colchem
