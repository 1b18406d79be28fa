// The ensemble file (colchem ensemble) and its printed summary.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "core/background.hpp"
#include "io/netcdf_file.hpp"

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

struct EnsembleResults {
  std::vector<std::string> species;
  std::string sampling;
  std::uint64_t seed = 0;
  double sigmas = 1.0;
  double above_km = 90.0;
  // Reactions of the mechanism (all modules), with their uncertainty.
  std::vector<std::string> equations;
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
};

void write_ensemble_netcdf(NcWriter& nc, const Background& bg, const EnsembleResults& r);

/// Members converged and failed; per scored species the base chi2_log and the members'
/// percentiles of it; per observed point whether it lies in the 95 % band; the chance of
/// reaching the observations above `above_km`.
std::string ensemble_summary_text(const EnsembleResults& r);

}  // namespace colchem
