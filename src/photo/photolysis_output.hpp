// Photolysis results for the terminal: the enhancement factor J / J_direct-beam per channel
// and a printable table of J against altitude. (The NetCDF variables of photolysis are
// built in report/photolysis_report.hpp.)
#pragma once

#include <span>
#include <string>
#include <vector>

#include "core/grid.hpp"
#include "photo/photolysis_model.hpp"

namespace colchem {

/// J / J_direct per entry; 1 where J_direct is 0 (no direct-beam J to compare with).
std::vector<double> enhancement_factors(std::span<const double> J,
                                        std::span<const double> J_direct);

/// A fixed-width text table: altitude (km) and one column of J (s^-1) per channel.
std::string format_jvalue_table(const PhotolysisModel& model, std::span<const double> J,
                                const Grid& grid, const std::string& unit = "[s-1]");

}  // namespace colchem
