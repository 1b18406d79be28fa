// Physical constants in cgs units (the trade's units: cm, g, s, K).
// SI-defining exact values (BIPM SI Brochure, 9th ed., 2019) and CODATA 2018
// recommended values, converted to cgs.
#pragma once

namespace colchem::constants {

inline constexpr double kBoltzmann = 1.380649e-16;         ///< erg K^-1 (exact)
inline constexpr double kPlanck = 6.62607015e-27;          ///< erg s (exact)
inline constexpr double kSpeedOfLight = 2.99792458e10;     ///< cm s^-1 (exact)
inline constexpr double kAvogadro = 6.02214076e23;         ///< mol^-1 (exact)
inline constexpr double kAtomicMassUnit = 1.66053906660e-24;  ///< g (CODATA 2018)
inline constexpr double kGravitational = 6.67430e-8;       ///< cm^3 g^-1 s^-2 (CODATA 2018)
inline constexpr double kAstronomicalUnit = 1.495978707e13;  ///< cm (IAU 2012, exact)
inline constexpr double kSolarRadiusCm = 6.957e10;  ///< cm, nominal solar radius (IAU 2015, exact)
inline constexpr double kElectronMass = 9.1093837015e-28;  ///< g (CODATA 2018)
inline constexpr double kElementaryCharge = 4.80320471e-10;  ///< statC (CODATA 2018, cgs-Gaussian)
inline constexpr double kPi = 3.14159265358979323846;
inline constexpr double kCmPerKm = 1.0e5;
inline constexpr double kPaPerBarye = 0.1;  ///< 1 dyn cm^-2 = 0.1 Pa

}  // namespace colchem::constants
