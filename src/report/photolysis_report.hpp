// Photolysis output as Dataset entries: J-values per channel (variables J_<channel>, units
// "s-1", on the "altitude" dimension of add_background) and all channels in J(channel,
// altitude), the wavelength bins (coordinate "wavelength" in nm with bounds), the stellar
// photon flux at the top of the atmosphere and, with the spectrum, the actinic flux
// (altitude, wavelength) in cm-2 s-1 nm-1; with the two-stream scheme also the diffuse
// upward and downward fluxes and, with J_direct, the enhancement factor
// J_enhancement_<channel> = J / J_direct-beam per channel.
#pragma once

#include <span>

#include "core/dataset.hpp"
#include "photo/photolysis_model.hpp"

namespace colchem {

struct PhotolysisData {
  std::span<const double> J;  ///< [c * N + j] as returned by PhotolysisModel::compute
  /// [j * B + b]; defines the spectrum variables when `with_spectrum` (data when not empty;
  /// the diffuse fluxes of a two-stream model come from its last compute() with actinic flux).
  std::span<const double> actinic_flux = {};
  std::span<const double> J_direct = {};  ///< the direct-beam J of the same state, or empty
  bool with_spectrum = false;
};

/// Adds dimensions "wavelength" and "channel" and the variables above (after add_background:
/// it uses the dimensions "altitude" and "nv").
void add_photolysis(Dataset& ds, const PhotolysisModel& model, const PhotolysisData& d);

}  // namespace colchem
