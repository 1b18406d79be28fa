// Exchange of a gas with a condensed phase, and profiles held by relaxation (one kernel).
//
//   f(n) = -k (n - n_eq)   where n > n_eq (condensation), or where n < n_eq and a condensed
//                          reservoir is present (evaporation); f = 0 otherwise.
//   df/dn = -k on the active branch, 0 otherwise (exact; at n = n_eq the branch is the one
//   f uses, so f and df/dn always come from the same side).
//
// Units: n, n_eq in cm^-3, k in s^-1, f in cm^-3 s^-1 (positive = gas gained).
//
// The rate constant k is either 1/tau (a timescale, constant or a profile) or the kinetic
// (free-molecular) uptake law k = alpha vbar A / 4, alpha the accommodation coefficient,
// vbar = sqrt(8 k_B T / (pi m)) the mean molecular speed (cm s^-1) and A the aerosol surface
// area density (cm^2 cm^-3) (Seinfeld and Pandis, Atmospheric Chemistry and Physics, ch. 11,
// the free-molecular limit of mass transfer; from memory).
//
// n_eq is the saturation density n_sat = p_sat / (k_B T), or, for a held profile, the held
// mixing ratio times n_air (held_profile; reservoir everywhere in its range, so the term is
// the supply or removal needed to keep the profile).
//
// Saturation laws (p in atm unless stated):
//  - h2so4_ayers1980: pure H2SO4, ln p = -10156/T + 16.259 (Ayers, Gillett and Gras 1980,
//    Geophys. Res. Lett. 7, 433; from memory). Kept as the one-way deck sink of earlier
//    scenarios.
//  - h2so4_aqueous: p = a_H2SO4(w, T) p_pure(T) over aqueous acid of weight fraction w, with
//    p_pure extended beyond the fitted range (338-445 K) by Kulmala and Laaksonen (1990,
//    J. Chem. Phys. 93, 696; from memory):
//      ln p_pure = -10156/T0 + 16.259
//                  + 10156 [ -1/T + 1/T0 + 0.38/(Tc - T0) (1 + ln(T0/T) - T0/T) ],
//      T0 = 360.15 K, Tc = 905 K.
//    a_H2SO4(w, 298.15 K) (pure-liquid reference) is interpolated in log10 a from a table
//    after Giauque et al. (1960, J. Am. Chem. Soc. 82, 62) as used by Ayers et al. (1980);
//    the table values are from memory and approximate (order of magnitude). At other
//    temperatures ln a(T) = ln a(298.15 K) 298.15/T (excess chemical potential independent
//    of T; common practice, no source).
//  - clausius_clapeyron: ln(p/Pa) = A - B/T.
#pragma once

#include <cstddef>
#include <limits>
#include <span>
#include <string>
#include <vector>

#include "core/background.hpp"

namespace colchem {

/// Pure H2SO4 vapour pressure (atm), Ayers et al. 1980 fit.
double h2so4_pure_pressure_ayers_atm(double T);
/// Pure H2SO4 vapour pressure (atm), Ayers et al. 1980 with the Kulmala and Laaksonen 1990
/// temperature extension.
double h2so4_pure_pressure_atm(double T);
/// Activity of H2SO4 in aqueous acid of weight fraction w (0.4..1) at T (K).
double h2so4_activity(double weight_fraction, double T);
/// The range of weight fractions the activity table covers.
inline constexpr double kH2SO4ActivityMinWeight = 0.4;
/// Mean molecular speed sqrt(8 k_B T / (pi m)) (cm s^-1), m in g.
double mean_molecular_speed(double T, double mass_g);

/// One species' exchange with a condensed phase, or one held profile (scenario level).
struct CondensationExchange {
  enum class Saturation { kH2SO4Ayers1980, kH2SO4Aqueous, kClausiusClapeyron, kHeldProfile };
  enum class Rate { kTimescale, kKinetic };
  std::size_t species = 0;
  Saturation saturation = Saturation::kH2SO4Ayers1980;
  double cc_A = 0.0;                ///< ln Pa
  double cc_B = 0.0;                ///< K
  AltitudeValue weight_fraction;    ///< h2so4_aqueous: acid weight fraction
  AltitudeValue held_mixing_ratio;  ///< held profile: the mixing ratio held
  Rate rate = Rate::kTimescale;
  double timescale_s = 0.0;            ///< constant timescale (when no timescale_table)
  ProfileSpec timescale_table;         ///< s, by altitude (optional)
  double accommodation = 1.0;          ///< kinetic law
  AltitudeValue surface_area_cm2_cm3;  ///< kinetic law; also a reservoir where > 0
  bool has_condensed = false;          ///< a condensed-phase profile is given
  AltitudeValue condensed;             ///< present where > 0 (any unit: a mass or mixing ratio)
  double below_cm = std::numeric_limits<double>::infinity();   ///< cells with centre below
  double above_cm = -std::numeric_limits<double>::infinity();  ///< and at or above this

  /// Saturation number density (cm^-3) at temperature T, acid weight fraction w (only for
  /// h2so4_aqueous); not for a held profile.
  [[nodiscard]] double saturation_density(double T, double w = 1.0) const;
  /// True where the term applies.
  [[nodiscard]] bool applies_at(double altitude_cm) const {
    return altitude_cm < below_cm && altitude_cm >= above_cm;
  }
};

/// One cell's exchange with everything the kernel needs.
struct ExchangeCell {
  std::size_t cell = 0, species = 0, term = 0;  ///< term: index of the exchange in the spec
  double n_eq = 0.0;                            ///< cm^-3
  double k = 0.0;                               ///< s^-1
  bool reservoir = false;                       ///< evaporation allowed (n < n_eq)
};

/// The kernel: f and df/dn of one cell's exchange at density n (the only place the formula
/// is written; every solver reaches it through the chemistry operator).
struct ExchangeValue {
  double f = 0.0;
  double dfdn = 0.0;
};
inline ExchangeValue exchange_tendency(const ExchangeCell& c, double n) {
  if (n > c.n_eq || c.reservoir) return {-c.k * (n - c.n_eq), -c.k};
  return {};
}

/// Markers of the pseudo-reactions that stand for exchange terms in budgets and run files.
inline constexpr const char* kCondensedPhaseMarker = "(condensed phase)";
inline constexpr const char* kHeldProfileMarker = "(held-profile supply)";
/// "X -> (condensed phase)" or "X -> (held-profile supply)".
std::string exchange_equation(const std::string& species, const CondensationExchange& x);

/// The cells of one exchange on a column (T, n_air, altitude per cell; molecule mass in g).
/// Cells where the term does not apply are omitted.
std::vector<ExchangeCell> exchange_cells(const CondensationExchange& x, std::size_t term,
                                         std::span<const double> T, std::span<const double> air,
                                         std::span<const double> altitude_cm, double mass_g);

}  // namespace colchem
