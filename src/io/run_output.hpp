// The NetCDF of `colchem run`: background, species, J-values, reaction rates, fluxes at
// cell edges, column densities, element budgets, convergence history, snapshots and scores
// (README "Outputs"). Written to a temporary and renamed.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "analysis/budget.hpp"
#include "analysis/score.hpp"
#include "io/scenario.hpp"
#include "solve/column_model.hpp"
#include "solve/column_run.hpp"

namespace colchem {

/// Element budgets of a state (held species' chemistry reported as supply).
std::vector<ElementBudget> column_element_budgets(const ColumnModel& model,
                                                  const ColumnDiagnostics& d);

/// Writes the run file. `scores` may be empty.
void write_run_file(const std::filesystem::path& file, const Scenario& sc, ColumnModel& model,
                    const RunOutcome& outcome, const std::string& command_line,
                    const std::vector<SpeciesScore>& scores);

/// A checkpoint: the layout of a run file without diagnostics (background, species,
/// number densities, snapshots so far), status "checkpoint", and where the solver stood:
/// `colchem_solver_method`, `colchem_model_time_s`, `colchem_iterations` and
/// `colchem_step_s` (RunCheckpoint::step_s).
void write_checkpoint(const std::filesystem::path& file, const Scenario& sc,
                      const ColumnModel& model, const RunCheckpoint& cp,
                      const std::string& command_line);

/// Reading a file given to `run --restart`: `checkpoint` is set when the file is a
/// checkpoint of this column (the same cell edges to 1e-12 relative and the same species in
/// the same order) written by a run of `method`, and `why_not` says otherwise why the file
/// can only give an initial state (a run file, another grid, another method, ...).
struct RestartFile {
  std::optional<RunCheckpoint> checkpoint;
  std::string why_not;
};
RestartFile read_checkpoint(const std::filesystem::path& file, const ColumnModel& model,
                            SolverMethod method);

}  // namespace colchem
