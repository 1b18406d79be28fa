// Scores against observations as Dataset entries (dimension `observation` for the
// per-point residuals, `scored_species` for the chi-square sums), and the table printed by
// `colchem compare` and `colchem run`.
#pragma once

#include <string>
#include <vector>

#include "analysis/score.hpp"
#include "core/dataset.hpp"

namespace colchem {

void add_scores(Dataset& ds, const std::vector<SpeciesScore>& scores);

/// The table printed by `colchem compare`.
std::string format_scores(const std::vector<SpeciesScore>& scores);

}  // namespace colchem
