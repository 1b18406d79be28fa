// Scoring a model profile against observations.
//
// The model mole fraction f_m is interpolated to each observed altitude linearly in
// altitude and log(f) (mole fractions vary exponentially with altitude; common practice, no
// source). For each point with observed value f_o and one-sigma uncertainty s:
//   log space:     r_log = (log10 f_m - log10 f_o) / s_log,  s_log = s / (f_o ln 10)
//   linear space:  r_lin = (f_m - f_o) / s
//   chi^2 = sum r^2 over counted points; reduced chi^2 = chi^2 / (N - p)
// Upper limits count only when the model exceeds them (r = 0 otherwise); an upper limit given
// with zero uncertainty takes s = f_o (a model a factor e above the limit adds 1 to chi^2 in log
// space). N counts every point inside the model's altitude range (detections and upper
// limits); p is the number of fitted parameters (0 for a single run). Points outside the
// model's altitude range are reported and not counted.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "analysis/observations.hpp"

namespace colchem {

struct PointScore {
  ObservationPoint obs;
  bool inside = false;    ///< within the model's altitude range
  bool counted = false;   ///< contributes to chi^2 (detections; upper limits when exceeded)
  double model = 0.0;     ///< interpolated model mole fraction
  double residual_log = 0.0;
  double residual_linear = 0.0;
};

struct SpeciesScore {
  std::string species;
  std::size_t n_points = 0;  ///< N: points inside the model range
  double chi2_log = 0.0;
  double chi2_linear = 0.0;
  double reduced_chi2_log = 0.0;     ///< NaN when N <= p
  double reduced_chi2_linear = 0.0;  ///< NaN when N <= p
  std::vector<PointScore> points;
};

/// The two grid points around z and the weight of the upper one, w = (z - z_lo)/(z_hi - z_lo)
/// (lo = hi when the grid has one point); valid = false for z outside the grid.
struct InterpolationWeights {
  bool valid = false;
  std::size_t lo = 0, hi = 0;
  double w = 0.0;
};
InterpolationWeights interpolation_weights(std::span<const double> altitude_cm, double z_cm);

/// One-sigma of a point in mole fraction: its uncertainty, or its value for an upper limit
/// given with zero uncertainty.
double observation_sigma(const ObservationPoint& o);

/// Model f(z) at altitude z, interpolated in altitude and log f; z outside
/// [altitude.front(), altitude.back()] returns NaN.
double interpolate_log_profile(std::span<const double> altitude_cm, std::span<const double> f,
                               double z_cm);

/// Scores one species' model profile against its observed points.
SpeciesScore score_species(const std::string& species, std::span<const double> altitude_cm,
                           std::span<const double> model_mole_fraction,
                           const std::vector<ObservationPoint>& points, int fitted_parameters);

/// Every observed species is one of `model_species`; otherwise an InputError
/// (ExitCode::kInputData) naming the observation file and line. Commands call it at load,
/// before they solve; score_column calls it too.
void require_observed_species(const ObservationSet& obs,
                              const std::vector<std::string>& model_species);

/// Scores every observed species against a model column given as mole fractions [s][j] at
/// cell centres. An observed species the model lacks is an InputError naming the
/// observation file and line.
std::vector<SpeciesScore> score_column(std::span<const double> altitude_cm,
                                       const std::vector<std::string>& model_species,
                                       std::span<const double> mole_fraction,
                                       const ObservationSet& obs, int fitted_parameters);

}  // namespace colchem
