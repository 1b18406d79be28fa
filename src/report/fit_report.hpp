// The file of `colchem fit` (CF-1.10), as a Dataset: the fitted
// state's background and species profiles, the fitted parameters with their one-sigma
// uncertainties (Gauss-Newton, unscaled and scaled by the reduced chi-square), bounds and
// bound flags, the correlation matrix, and every observed point with the fitted model
// value and its residual (README "Fits").
#pragma once

#include <string>
#include <vector>

#include "core/dataset.hpp"
#include "solve/scenario.hpp"
#include "solve/column_model.hpp"
#include "solve/fit.hpp"

namespace colchem {

Dataset fit_dataset(const Scenario& sc, const ColumnModel& model,
                    const std::vector<FitParameter>& params, const FitResult& res, bool log_space,
                    const std::string& command_line);

}  // namespace colchem
