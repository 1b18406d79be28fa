// Scores against observations, written into a run's NetCDF (dimension `observation` for the
// per-point residuals, `scored_species` for the chi-square sums).
#pragma once

#include <vector>

#include "analysis/score.hpp"
#include "io/netcdf_file.hpp"

namespace colchem {

void define_scores(NcWriter& nc, const std::vector<SpeciesScore>& scores);
void write_scores(NcWriter& nc, const std::vector<SpeciesScore>& scores);

/// The table printed by `colchem compare`.
std::string format_scores(const std::vector<SpeciesScore>& scores);

}  // namespace colchem
