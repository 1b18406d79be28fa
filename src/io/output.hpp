// The run's CF-1.10 NetCDF file: conventions, provenance, the background column.
// Later stages (species, J-values, rates, budgets) add their variables through the same
// NcWriter before commit().
#pragma once

#include <string>

#include "core/background.hpp"
#include "io/netcdf_file.hpp"
#include "io/scenario.hpp"

namespace colchem {

/// CF global attributes: Conventions, title, institution-free provenance (program version,
/// git revision, creation time, command line), and the resolved scenario and its included
/// files as text so that the file reproduces its run.
void write_provenance(NcWriter& nc, const Scenario& sc, const std::string& command_line);

/// Defines the altitude coordinates ("altitude" at cell centres, "altitude_edge" at edges,
/// with CF bounds) and the background profiles; call write_background_data after
/// end_definitions().
void define_background(NcWriter& nc, const Background& bg);
void write_background_data(NcWriter& nc, const Background& bg);

/// UTC now in ISO 8601 ("2026-12-02T04:30:00Z").
std::string utc_timestamp();

}  // namespace colchem
