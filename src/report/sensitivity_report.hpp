// The file of `colchem sensitivity` (CF-1.10), as a Dataset: the
// state's background and species profiles, the objective, the ranked reaction
// sensitivities with their profiles dG/d ln k_r(z), the other parameters' sensitivities
// and the adjoint solution (README "Sensitivities").
#pragma once

#include <string>

#include "core/dataset.hpp"
#include "solve/scenario.hpp"
#include "solve/adjoint.hpp"
#include "solve/column_model.hpp"

namespace colchem {

Dataset sensitivity_dataset(const Scenario& sc, const ColumnModel& model, std::span<const double> x,
                            const Objective& obj, const SensitivityResult& res,
                            const std::string& command_line);

/// Shares of |dG/d ln k_r| in their sum over the reactions (0 when the sum is 0).
std::vector<double> reaction_shares(const SensitivityResult& res);

}  // namespace colchem
