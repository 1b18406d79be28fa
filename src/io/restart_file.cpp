// Reading a checkpoint back (io/restart_file.hpp).
#include "io/restart_file.hpp"

#include <algorithm>
#include <cmath>

#include "io/netcdf_file.hpp"
#include "io/output.hpp"

namespace colchem {

RestartFile read_checkpoint(const std::filesystem::path& file, const ColumnModel& model,
                            SolverMethod method) {
  const NcReader nc(file);
  if (nc.global_text("colchem_solver_status") != std::optional<std::string>("checkpoint")) {
    return {{}, "not a checkpoint"};
  }
  const auto written_by = nc.global_text("colchem_solver_method");
  const auto time_s = nc.global_number("colchem_model_time_s");
  const auto iterations = nc.global_number("colchem_iterations");
  const auto step_s = nc.global_number("colchem_step_s");
  if (!written_by || !time_s || !iterations || !step_s) {
    return {{}, "a checkpoint without the solver's position (older colchem)"};
  }
  if (*written_by != method_name(method)) {
    return {{}, "a checkpoint of method " + *written_by + ", this run is " + method_name(method)};
  }
  const ModelColumn old = read_model_column(nc);
  const std::vector<double>& edges = model.background().grid.edge_cm;
  if (!std::equal(
          old.edge_cm.begin(), old.edge_cm.end(), edges.begin(), edges.end(),
          [](double a, double b) { return std::abs(a - b) <= 1e-12 * std::abs(b) + 1e-9; })) {
    return {{}, "a checkpoint on another grid"};
  }
  if (old.species != model.species()) return {{}, "a checkpoint with other species"};
  const std::size_t S = model.species_count(), N = model.cells();
  // The file is species-major [s*N + j], the state cell-major [j*S + s].
  const auto cell_major = [S, N](const double* n) {
    std::vector<double> x(S * N);
    for (std::size_t s = 0; s < S; ++s) {
      for (std::size_t j = 0; j < N; ++j) x[j * S + s] = n[s * N + j];
    }
    return x;
  };
  RunCheckpoint cp;
  cp.method = *written_by;
  cp.iteration = static_cast<long>(*iterations);
  cp.time_s = *time_s;
  cp.step_s = *step_s;
  cp.x = cell_major(old.number_density.data());
  if (nc.has_variable("snapshot")) {
    // Seconds since the stated origin = model time.
    cp.snapshot_times_s = nc.read("snapshot", {"snapshot"});
    const auto snd = nc.read("snapshot_number_density", {"snapshot", "species", "altitude"});
    for (std::size_t k = 0; k < cp.snapshot_times_s.size(); ++k) {
      cp.snapshots.push_back(cell_major(snd.data() + k * S * N));
    }
  }
  return {std::move(cp), ""};
}

}  // namespace colchem
