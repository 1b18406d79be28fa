// Text summaries printed by the commands.
#pragma once

#include <string>

#include "core/background.hpp"
#include "io/scenario.hpp"
#include "solve/column_run.hpp"

namespace colchem::app {

std::string summarize_scenario(const Scenario& sc, const Background& bg);
/// Status, residual, element budgets and key species after a run.
std::string summarize_run(const Scenario& sc, ColumnModel& model, const RunOutcome& r);

}  // namespace colchem::app
