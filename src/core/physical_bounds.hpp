// Bounds of physical sense checked when a scenario or box configuration is loaded, wide
// enough for any real atmosphere and narrow enough that an absurd value (a base pressure of
// 1e300 bar, K = 1e300 cm2 s-1) is refused at its key instead of surfacing later as an
// absurd rate constant or a non-finite residual (common practice, no source).
#pragma once

namespace colchem::bounds {

inline constexpr double kMinTemperatureK = 1.0;
inline constexpr double kMaxTemperatureK = 1e5;
inline constexpr double kMaxPressureDynCm2 = 1e11;  ///< 1e5 bar
inline constexpr double kMaxEddyCm2S = 1e12;

}  // namespace colchem::bounds
