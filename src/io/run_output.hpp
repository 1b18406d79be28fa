// The NetCDF of `colchem run`: background, species, J-values, reaction rates, fluxes at
// cell edges, column densities, element budgets, convergence history, snapshots and scores
// (README "Outputs"). Written to a temporary and renamed.
#pragma once

#include <filesystem>
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

/// A checkpoint: the same layout, status "checkpoint", without diagnostics.
void write_checkpoint(const std::filesystem::path& file, const Scenario& sc,
                      const ColumnModel& model, const std::vector<double>& x, double time_s,
                      long iteration, const std::string& command_line);

}  // namespace colchem
