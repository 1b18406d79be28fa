// Reading a checkpoint back (io/restart_file.hpp).
#include "io/restart_file.hpp"

#include <cmath>

#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"

namespace colchem {

RestartFile read_checkpoint(const std::filesystem::path& file, const ColumnModel& model,
                            SolverMethod method) {
  const NcReader nc(file);
  RestartFile out;
  if (nc.global_text("colchem_solver_status") != std::optional<std::string>("checkpoint")) {
    out.why_not = "not a checkpoint";
    return out;
  }
  const auto written_by = nc.global_text("colchem_solver_method");
  const auto time_s = nc.global_number("colchem_model_time_s");
  const auto iterations = nc.global_number("colchem_iterations");
  const auto step_s = nc.global_number("colchem_step_s");
  if (!written_by || !time_s || !iterations || !step_s) {
    out.why_not = "a checkpoint without the solver's position (older colchem)";
    return out;
  }
  if (*written_by != method_name(method)) {
    out.why_not = "a checkpoint of method " + *written_by + ", this run is " + method_name(method);
    return out;
  }
  const ModelColumn old = read_model_column(nc);
  const std::vector<double>& edges = model.background().grid.edge_cm;
  bool same_grid = old.edge_cm.size() == edges.size();
  for (std::size_t e = 0; same_grid && e < edges.size(); ++e) {
    same_grid = std::abs(old.edge_cm[e] - edges[e]) <= 1e-12 * std::abs(edges[e]) + 1e-9;
  }
  if (!same_grid) {
    out.why_not = "a checkpoint on another grid";
    return out;
  }
  if (old.species != model.species()) {
    out.why_not = "a checkpoint with other species";
    return out;
  }
  const std::size_t S = model.species_count(), N = model.cells();
  RunCheckpoint cp;
  cp.method = *written_by;
  cp.iteration = static_cast<long>(*iterations);
  cp.time_s = *time_s;
  cp.step_s = *step_s;
  cp.x.resize(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) cp.x[j * S + s] = old.number_density[s * N + j];
  }
  if (nc.has_variable("snapshot")) {
    cp.snapshot_times_s = nc.read("snapshot");  // seconds since the stated origin = model time
    const std::vector<double> snd = nc.read("snapshot_number_density");
    if (snd.size() != cp.snapshot_times_s.size() * S * N) {
      throw InputError(ExitCode::kInputData, SourceLocation{file.string()},
                       "snapshot_number_density", "a (snapshot, species, altitude) variable",
                       "a different shape");
    }
    for (std::size_t k = 0; k < cp.snapshot_times_s.size(); ++k) {
      std::vector<double> x(S * N);
      for (std::size_t s = 0; s < S; ++s) {
        for (std::size_t j = 0; j < N; ++j) x[j * S + s] = snd[(k * S + s) * N + j];
      }
      cp.snapshots.push_back(std::move(x));
    }
  }
  out.checkpoint = std::move(cp);
  return out;
}

}  // namespace colchem
