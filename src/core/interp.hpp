// Interpolation of tabulated profiles onto the model grid.
// Linear in x for temperature and similar quantities; linear in log(y) for quantities that
// vary exponentially (pressure, density, eddy diffusion, mixing ratio). Outside the table
// the policy decides: an error (the default) or holding the end value.
#pragma once

#include <optional>
#include <span>
#include <vector>

namespace colchem {

enum class Extrapolation { kForbid, kHoldEnds };
enum class InterpScale { kLinear, kLog };

/// Interpolates y(x) at `at`. x strictly increasing. Returns nullopt for the first point that
/// falls outside [x.front(), x.back()] under kForbid; the index goes to *bad_index.
std::optional<std::vector<double>> interpolate(std::span<const double> x,
                                               std::span<const double> y,
                                               std::span<const double> at, InterpScale scale,
                                               Extrapolation policy,
                                               std::size_t* bad_index = nullptr);

/// Single-point linear interpolation with end values held (internal use: x increasing).
double interp_linear_hold(std::span<const double> x, std::span<const double> y, double at);

}  // namespace colchem
