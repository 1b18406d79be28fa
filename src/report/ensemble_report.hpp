// The ensemble file (colchem ensemble) as a Dataset and its printed summary.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "core/background.hpp"
#include "core/dataset.hpp"

namespace colchem {

/// One observed point against the ensemble.
struct EnsemblePoint {
  ObservationPoint point;
  bool inside = false;      ///< within the model column
  double base_model = 0.0;  ///< the base state's value there
  double low95 = 0.0;       ///< 2.5th percentile of the members' values there
  double high95 = 0.0;      ///< 97.5th percentile
  int inside95 =
      -1;  ///< 1 inside the band (an upper limit: the band reaches below it), 0 not, -1 n/a
};

/// The first-order attribution of one target's variance (analysis/attribution.hpp) against
/// the ensemble's own variance there.
struct EnsembleAttribution {
  std::string species;
  double altitude_cm = 0.0;
  double base_value = 0.0;              ///< the base state's mole fraction there
  double first_order_variance = 0.0;    ///< Var_1(ln x)
  double ensemble_variance = 0.0;       ///< sample variance of ln x over converged members
  double ensemble_members = 0.0;        ///< converged members behind it
  double largest_scaled = 0.0;          ///< max_r |S_r sigma_r|
  int agree = 0;                        ///< 1: within 20 % of the ensemble's variance
  std::vector<double> log_sensitivity;  ///< per mechanism reaction (0 when inactive)
  std::vector<double> scaled;           ///< a_r per mechanism reaction
  std::vector<double> share;            ///< a_r^2 / Var_1 per mechanism reaction
};

struct EnsembleResults {
  std::vector<std::string> species;
  std::string sampling;
  std::uint64_t seed = 0;
  double sigmas = 1.0;
  double above_km = 90.0;
  // Reactions of the mechanism (all modules), with their uncertainty.
  std::vector<std::string> ids, equations;
  std::vector<double> f298, g_K;
  std::vector<int> stated;
  std::vector<double> z;  ///< [member][reaction] standard normal draws
  // Members.
  std::vector<int> converged;
  std::vector<std::string> reasons;
  std::vector<int> iterations;
  // Profiles: base [s*N + j], percentiles [p][s*N + j] (kEnsemblePercentiles).
  std::vector<double> base_mole_fraction;
  std::vector<std::vector<double>> percentile;
  // Scores (empty without observations).
  std::vector<std::string> scored_species;
  std::vector<double> base_chi2_log;
  std::vector<double> member_chi2_log;  ///< [member][scored species], NaN for failed members
  std::vector<EnsemblePoint> points;
  std::vector<double> reach_probability;  ///< per scored species (NaN: no detection above)
  std::vector<double> reach_points;       ///< detected points above `above_km` per species
  // Attribution (empty unless asked for).
  std::vector<EnsembleAttribution> attribution;
};

/// The ensemble's variables after the provenance: background, reactions with their
/// uncertainty, members, percentiles of the profiles, scores and attribution.
void add_ensemble(Dataset& ds, const Background& bg, const EnsembleResults& r);

/// Members converged and failed; per scored species the base chi2_log and the members'
/// percentiles of it; per observed point whether it lies in the 95 % band; the chance of
/// reaching the observations above `above_km`; per attribution target the first-order and
/// the ensemble's variance of ln x, whether they agree within 20 %, and the top contributors.
std::string ensemble_summary_text(const EnsembleResults& r);

}  // namespace colchem
