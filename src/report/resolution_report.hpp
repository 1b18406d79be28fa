// A resolution study's results: the file as a Dataset (the coarsest level's background as the
// altitude coordinate, every level's log10 mole fraction on it, differences, observed orders,
// Richardson error estimates and statuses), the printed table, and an adapted grid as a
// reusable `grid:` section.
#pragma once

#include <span>
#include <string>

#include "solve/resolution_runner.hpp"
#include "core/dataset.hpp"

namespace colchem {

/// The study's variables after the provenance (the coarsest level's background first).
void add_resolution(Dataset& ds, const ResolutionStudy& st, const ResolutionOptions& options);

/// The per-species table (and the scores' table when there are scores).
std::string resolution_table_text(const ResolutionStudy& st);

/// A `grid:` section listing the edges in km, with a comment saying where it came from.
std::string grid_section_yaml(std::span<const double> edges_cm, const std::string& comment);

}  // namespace colchem
