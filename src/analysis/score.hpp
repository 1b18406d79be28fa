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
//
// The modelled observation m of a point:
//   plain:   m = f_m(z_o), interpolated as above.
//   kernel:  m = sum_k a_k f_m(z_k) + (x_a(z_o) - sum_k a_k x_a(z_k)) with the a-priori term
//            only when the kernel gives x_a: row i of x_hat = A x + (I - A) x_a (Rodgers 2000,
//            "Inverse Methods for Atmospheric Sounding", ch. 2-3, eq. 3.10 form), with the
//            model profile evaluated at the kernel's altitudes z_k by the same interpolation.
//            The point is inside when every z_k is inside the model's range.
//   altitude uncertainty sigma_z: s_eff^2 = s^2 + (df_m/dz sigma_z)^2, the slope of the
//            interpolated profile at z_o (first-order propagation of an altitude error through
//            the profile; common practice, no source). s_eff replaces s above.
// In log space a modelled value m <= 0 (possible with an a-priori term) is floored at the
// smallest normal double.
#pragma once

#include <span>
#include <string>
#include <utility>
#include <vector>

#include "analysis/observations.hpp"

namespace colchem {

struct PointScore {
  ObservationPoint obs;
  bool inside = false;    ///< within the model's altitude range
  bool counted = false;   ///< contributes to chi^2 (detections; upper limits when exceeded)
  double model = 0.0;     ///< modelled observation (interpolated, or through the kernel)
  double sigma = 0.0;     ///< one-sigma used: observation_sigma, widened by sigma_z
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

/// The modelled observation of a point, its effective one-sigma and their derivatives with
/// respect to the model mole fractions f_j at the cells j they depend on.
struct ModelledObservation {
  bool inside = false;
  double value = 0.0;
  double sigma = 0.0;
  std::vector<std::pair<std::size_t, double>> d_value;  ///< (j, d value / d f_j)
  std::vector<std::pair<std::size_t, double>> d_sigma;  ///< (j, d sigma / d f_j)
};
ModelledObservation modelled_observation(std::span<const double> altitude_cm,
                                         std::span<const double> f, const ObservationPoint& o);

/// Residual of a modelled observation: (log10 m - log10 f_o) / (s / (f_o ln 10)) in log
/// space, (m - f_o) / s in linear space; with dr/df_j when `dr` is not null (the sum over
/// value and sigma dependences).
double observation_residual(const ModelledObservation& m, const ObservationPoint& o, bool log_space,
                            std::vector<std::pair<std::size_t, double>>* dr);

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
