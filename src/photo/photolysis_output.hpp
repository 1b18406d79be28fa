// Photolysis output: J-values per channel (CF-1.10 NetCDF variables J_<channel>, units
// "s-1", on the "altitude" dimension that io/output.cpp's define_background creates), the
// wavelength bins (coordinate "wavelength" in nm with bounds), the stellar photon flux at
// the top of the atmosphere and, on request, the direct-beam actinic flux (altitude,
// wavelength) in cm-2 s-1 nm-1; with the two-stream scheme also the diffuse upward and
// downward fluxes (altitude, wavelength) and, per channel, the enhancement factor
// J_enhancement_<channel> = J / J_direct-beam. Plus a printable table of J against altitude.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "core/grid.hpp"
#include "io/netcdf_file.hpp"
#include "photo/photolysis_model.hpp"

namespace colchem {

/// Defines dimension "wavelength" and the variables above. Call after define_background
/// (it uses the dimensions "altitude" and "nv") and before end_definitions().
/// `with_enhancement` defines J_enhancement_<channel> (write it with J_direct).
void define_photolysis_output(NcWriter& nc, const PhotolysisModel& model, bool with_spectrum,
                              bool with_enhancement = false);

/// Writes the data. J[c * N + j] as returned by PhotolysisModel::compute; actinic_flux
/// [j * B + b], required (and only written) when the output was defined with_spectrum (the
/// diffuse fluxes of a two-stream model come from its last compute() with actinic flux).
/// J_direct: the direct-beam J of the same state, when defined with_enhancement.
void write_photolysis_output(NcWriter& nc, const PhotolysisModel& model, std::span<const double> J,
                             std::span<const double> actinic_flux = {},
                             std::span<const double> J_direct = {});

/// J / J_direct per entry; 1 where J_direct is 0 (no direct-beam J to compare with).
std::vector<double> enhancement_factors(std::span<const double> J,
                                        std::span<const double> J_direct);

/// A fixed-width text table: altitude (km) and one column of J (s^-1) per channel.
std::string format_jvalue_table(const PhotolysisModel& model, std::span<const double> J,
                                const Grid& grid, const std::string& unit = "[s-1]");

}  // namespace colchem
