// The file of `colchem run`: background, species, J-values, reaction rates, fluxes at cell
// edges, column densities, element budgets, convergence history, snapshots and scores
// (README "Outputs"), and the checkpoint a long run leaves behind; both as Datasets for the
// writer in io/.
#pragma once

#include <string>
#include <vector>

#include "analysis/budget.hpp"
#include "analysis/score.hpp"
#include "core/dataset.hpp"
#include "solve/scenario.hpp"
#include "solve/column_model.hpp"
#include "solve/column_run.hpp"

namespace colchem {

/// Element budgets of a state (held species' chemistry reported as supply).
std::vector<ElementBudget> column_element_budgets(const ColumnModel& model,
                                                  const ColumnDiagnostics& d);

/// The run file. `scores` may be empty. Refreshes the model's photolysis at the end state.
Dataset run_dataset(const Scenario& sc, ColumnModel& model, const RunOutcome& outcome,
                    const std::string& command_line, const std::vector<SpeciesScore>& scores);

/// A checkpoint: the layout of a run file without diagnostics (background, species,
/// number densities, snapshots so far), status "checkpoint", and where the solver stood:
/// `colchem_solver_method`, `colchem_model_time_s`, `colchem_iterations` and
/// `colchem_step_s` (RunCheckpoint::step_s).
Dataset checkpoint_dataset(const Scenario& sc, const ColumnModel& model, const RunCheckpoint& cp,
                           const std::string& command_line);

}  // namespace colchem
