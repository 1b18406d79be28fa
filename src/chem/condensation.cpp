// Saturation laws and exchange cells, f = -k (n - n_eq) (cm^-3 s^-1): equations, units and
// published sources in chem/condensation.hpp.
#include "chem/condensation.hpp"

#include <array>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/ideal_gas.hpp"
#include "core/interp.hpp"

namespace colchem {

namespace {
constexpr double kDynPerAtm = 1.01325e6;
// Ayers et al. (1980) fit and the Kulmala and Laaksonen (1990) extension (from memory).
constexpr double kAyersB = 10156.0;  // K
constexpr double kAyersA = 16.259;
constexpr double kT0 = 360.15;  // K
constexpr double kTc = 905.0;   // K
constexpr double kKL = 0.38;

// log10 a_H2SO4 at 298.15 K against weight fraction, pure-liquid reference. After Giauque
// et al. (1960) as used by Ayers et al. (1980); from memory, approximate (order of
// magnitude): treat as illustrative, not as evaluated data.
constexpr std::array<double, 11> kActivityW{0.40, 0.50, 0.60, 0.70, 0.75, 0.80,
                                            0.85, 0.90, 0.95, 0.98, 1.00};
constexpr std::array<double, 11> kActivityLog10{-10.5, -9.0, -7.4, -5.7, -4.8, -3.9,
                                                -2.9,  -1.9, -0.9, -0.4, 0.0};
constexpr double kActivityT = 298.15;  // K
}  // namespace

double h2so4_pure_pressure_ayers_atm(double T) {
  return std::exp(-kAyersB / T + kAyersA);
}

double h2so4_pure_pressure_atm(double T) {
  const double ln_p0 = -kAyersB / kT0 + kAyersA;
  return std::exp(ln_p0 + kAyersB * (-1.0 / T + 1.0 / kT0 +
                                     kKL / (kTc - kT0) * (1.0 + std::log(kT0 / T) - kT0 / T)));
}

double h2so4_activity(double w, double T) {
  if (!(w >= kActivityW.front() && w <= kActivityW.back())) {
    throw std::invalid_argument("h2so4_activity: weight fraction outside [0.4, 1]");
  }
  const double log10_a = interp_linear_hold(kActivityW, kActivityLog10, w);
  return std::exp(std::log(10.0) * log10_a * kActivityT / T);
}

double mean_molecular_speed(double T, double mass_g) {
  return std::sqrt(8.0 * constants::kBoltzmann * T / (constants::kPi * mass_g));
}

double CondensationExchange::saturation_density(double T, double w) const {
  double p_dyn_cm2 = 0.0;
  switch (saturation) {
    case Saturation::kH2SO4Ayers1980:
      p_dyn_cm2 = kDynPerAtm * h2so4_pure_pressure_ayers_atm(T);
      break;
    case Saturation::kH2SO4Aqueous:
      p_dyn_cm2 = kDynPerAtm * h2so4_activity(w, T) * h2so4_pure_pressure_atm(T);
      break;
    case Saturation::kClausiusClapeyron:
      p_dyn_cm2 = std::exp(cc_A - cc_B / T) / constants::kPaPerBarye;
      break;
    case Saturation::kHeldProfile:
      throw std::logic_error("saturation_density: a held profile has no saturation");
  }
  return ideal_gas_density(p_dyn_cm2, T);
}

std::string exchange_equation(const std::string& species, const CondensationExchange& x) {
  return species + " -> " +
         (x.saturation == CondensationExchange::Saturation::kHeldProfile ? kHeldProfileMarker
                                                                         : kCondensedPhaseMarker);
}

std::vector<ExchangeCell> exchange_cells(const CondensationExchange& x, std::size_t term,
                                         std::span<const double> T, std::span<const double> air,
                                         std::span<const double> z, double mass_g) {
  std::vector<ExchangeCell> out;
  for (std::size_t j = 0; j < T.size() && j < z.size(); ++j) {
    if (!x.applies_at(z[j])) continue;
    ExchangeCell c;
    c.cell = j;
    c.species = x.species;
    c.term = term;
    if (x.saturation == CondensationExchange::Saturation::kHeldProfile) {
      c.n_eq = x.held_mixing_ratio.at(z[j]) * air[j];
      c.reservoir = true;
    } else {
      c.n_eq = x.saturation_density(T[j], x.weight_fraction.at(z[j]));
    }
    if (x.rate == CondensationExchange::Rate::kKinetic) {
      const double area = x.surface_area_cm2_cm3.at(z[j]);
      c.k = 0.25 * x.accommodation * mean_molecular_speed(T[j], mass_g) * area;
      c.reservoir = c.reservoir || area > 0.0;
    } else {
      const double tau =
          x.timescale_table.altitude_cm.empty()
              ? x.timescale_s
              : interp_linear_hold(x.timescale_table.altitude_cm, x.timescale_table.value, z[j]);
      c.k = 1.0 / tau;
    }
    if (x.has_condensed) c.reservoir = c.reservoir || x.condensed.at(z[j]) > 0.0;
    if (c.k > 0.0) out.push_back(c);
  }
  return out;
}

}  // namespace colchem
