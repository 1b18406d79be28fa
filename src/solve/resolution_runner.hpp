// Solving one scenario on a family of grids (for Richardson extrapolation) and on
// equidistributed grids, through the same path as `colchem run`: load_scenario() with the
// grid replaced by an override, ColumnModel, run_column(). The math is in
// analysis/resolution.hpp. A PetscSession must exist while these run.
#pragma once

#include <spdlog/logger.h>

#include <filesystem>
#include <functional>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "analysis/resolution.hpp"
#include "analysis/score.hpp"
#include "core/background.hpp"
#include "core/units.hpp"
#include "solve/column_model.hpp"
#include "solve/column_run.hpp"

namespace colchem {

/// One solve on one grid.
struct LevelResult {
  Background background;
  std::vector<std::string> species;
  bool converged = false;
  std::string reason;
  long iterations = 0;
  double wall_s = 0.0;
  double residual = 0.0;
  /// Mole fractions [s*N + j]; empty when the solve failed.
  std::vector<double> mole_fraction;
  std::vector<bool> held;  ///< [s]
  std::vector<SpeciesScore> scores;
  /// Net upward flux through the bottom and top edges (cm^-2 s^-1, ColumnDiagnostics);
  /// empty when the solve failed.
  std::vector<double> bottom_flux, top_flux;  ///< [s]
};

/// The override that replaces a scenario's grid by listed edges (in km, 17 digits).
std::string grid_override(std::span<const double> edges_cm);

struct SolveRequest {
  std::filesystem::path config;
  std::vector<std::string> overrides;            ///< the user's, applied before the grid override
  const ObservationSet* observations = nullptr;  ///< scores each level when not null
  spdlog::logger* log = nullptr;
  std::function<bool()> stop_requested;
  /// Reads the scenario with the given overrides (the app passes io/scenario.hpp's
  /// load_scenario: analysis/ reads no files itself).
  std::function<Scenario(const std::filesystem::path&, const std::vector<std::string>&,
                         const UnitSystem&)>
      load_scenario;
};

/// Solves the scenario on `edges_cm`, warm-started from `warm` (interpolated log-linearly in
/// altitude) when it converged and the solver seeks a steady state.
LevelResult solve_on_edges(const SolveRequest& req, std::span<const double> edges_cm,
                           const UnitSystem& units, const LevelResult* warm);

/// Sets x0 (the state of `model`, n[j*S + s]) to the converged `warm` level interpolated
/// log-linearly in altitude (ends held), held species imposed; false (x0 untouched) when
/// `warm` did not converge or has other species.
bool start_from_level(const LevelResult& warm, const ColumnModel& model, std::vector<double>& x0);

/// The coarser grids of a grid sequence below `edges_cm`, coarsest first: each drops every
/// other edge of the next finer one (keeping the top edge), down to the last with at least
/// `coarsest_cells` cells. Empty when halving once would go below that.
std::vector<std::vector<double>> coarser_grids(std::span<const double> edges_cm,
                                               std::size_t coarsest_cells);

/// A steady cold start by grid sequencing: solves the scenario on coarser_grids(...) in turn,
/// each from the last converged level below it (cold when there is none), and returns the
/// last converged level interpolated onto the target grid (x0 empty when none converged;
/// `levels` says what each level did). When `target` uses the two-stream scheme the coarser
/// levels are solved with the direct beam (the start only; the target grid gets the
/// scenario's own radiative transfer). The coarser levels stop at a scaled residual of
/// `level_tolerance` (solver.sequence_tolerance), their step and balance tests waived.
struct SequencedStart {
  std::vector<double> x0;
  std::vector<SequenceLevel> levels;
};
SequencedStart sequenced_start(const SolveRequest& req, const ColumnModel& target,
                               std::size_t coarsest_cells, double level_tolerance,
                               const UnitSystem& units);

/// Scores' resolution: chi-square (log) per level and each observed point's log10 model value.
struct ScoreResolution {
  std::string species;
  std::vector<double> chi2_log;  ///< [level]
  RichardsonEstimate chi2;
  std::vector<double> altitude_cm;               ///< observed points inside the column
  std::vector<std::vector<double>> log10_model;  ///< [level][point]
  std::vector<RichardsonEstimate> point;         ///< [point], finest triple
};

/// A boundary flux's resolution. A boundary value that the chemistry next to it cannot
/// sustain makes a boundary layer of thickness ~sqrt(K/k) (k: the loss frequency there);
/// while the cells are thicker than the layer, the flux through the boundary grows with each
/// refinement, and so does everything it supplies. Profiles near a boundary can look
/// converged while this flux is not, so it is compared on its own.
struct BoundaryFluxResolution {
  std::string species;
  std::string end;              ///< "bottom" or "top"
  std::vector<double> flux;     ///< [level], cm^-2 s^-1 upward; NaN where a level failed
  RichardsonEstimate estimate;  ///< finest triple (relative threshold as for scalars)
  /// |d23| > |d12| with the same sign: the flux grows with refinement.
  bool grows = false;
};

/// The boundary fluxes worth comparing: those of species not held whose flux at the finest
/// converged level exceeds `relative_floor` times the largest boundary flux there.
std::vector<BoundaryFluxResolution> compare_boundary_fluxes(const std::vector<LevelResult>& levels,
                                                            double ratio,
                                                            const AsymptoticRange& range,
                                                            double relative_floor = 1e-6);

struct ResolutionStudy {
  std::size_t ratio = 2;
  std::vector<LevelResult> levels;  ///< coarsest first
  std::vector<SpeciesResolution> profiles;
  std::vector<ScoreResolution> scores;
  std::vector<BoundaryFluxResolution> boundary_fluxes;
  [[nodiscard]] bool all_converged() const;
};

/// Solves on base_edges refined by ratio^l, l = 0..level_count-1, and compares.
ResolutionStudy run_resolution_study(const SolveRequest& req, std::span<const double> base_edges,
                                     std::size_t level_count, std::size_t ratio,
                                     const ResolutionOptions& options, const UnitSystem& units);

/// Compares solved levels (the comparison without the solves).
ResolutionStudy compare_levels(std::vector<LevelResult> levels, std::size_t ratio,
                               const ResolutionOptions& options);

/// Adapted edges with `cells` cells: solves on `start_edges`, equidistributes, and repeats on
/// the new grid `passes` times in all. Every solve is appended to `solves` when not null.
/// Throws RunError (kNotConverged) when a solve fails.
std::vector<double> adapt_grid(const SolveRequest& req, std::span<const double> start_edges,
                               std::size_t cells, int passes,
                               const EquidistributionOptions& options, const UnitSystem& units,
                               std::vector<LevelResult>* solves = nullptr);

}  // namespace colchem
