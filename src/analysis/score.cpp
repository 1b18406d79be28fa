#include "analysis/score.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/error.hpp"

namespace colchem {

InterpolationWeights interpolation_weights(std::span<const double> z, double at) {
  InterpolationWeights iw;
  if (z.empty() || at < z.front() || at > z.back()) return iw;
  iw.valid = true;
  if (z.size() == 1) return iw;
  auto it = std::upper_bound(z.begin(), z.end(), at);
  const std::size_t k =
      std::clamp<std::size_t>(static_cast<std::size_t>(it - z.begin()), 1, z.size() - 1);
  iw.lo = k - 1;
  iw.hi = k;
  iw.w = (at - z[k - 1]) / (z[k] - z[k - 1]);
  return iw;
}

double observation_sigma(const ObservationPoint& o) {
  return (o.upper_limit && o.uncertainty == 0.0) ? o.value : o.uncertainty;
}

double interpolate_log_profile(std::span<const double> z, std::span<const double> f, double at) {
  const InterpolationWeights iw = interpolation_weights(z, at);
  if (!iw.valid) return std::numeric_limits<double>::quiet_NaN();
  // Mole fractions are positive; a non-positive model value (possible only in a failed
  // state) is floored at the smallest normal double so the logarithm stays finite.
  const double tiny = std::numeric_limits<double>::min();
  return std::exp((1.0 - iw.w) * std::log(std::max(f[iw.lo], tiny)) +
                  iw.w * std::log(std::max(f[iw.hi], tiny)));
}

namespace {

// f_m at z with d f_m / d f_j of the two cells it is interpolated from.
struct PointValue {
  bool valid = false;
  double m = 0.0;
  InterpolationWeights iw;
  double d_lo = 0.0, d_hi = 0.0;
};

PointValue point_value(std::span<const double> z, std::span<const double> f, double at) {
  PointValue p;
  p.iw = interpolation_weights(z, at);
  p.valid = p.iw.valid;
  if (!p.valid) return p;
  p.m = interpolate_log_profile(z, f, at);
  const double tiny = std::numeric_limits<double>::min();
  p.d_lo = p.m * (1.0 - p.iw.w) / std::max(f[p.iw.lo], tiny);
  p.d_hi = p.m * p.iw.w / std::max(f[p.iw.hi], tiny);
  return p;
}

}  // namespace

ModelledObservation modelled_observation(std::span<const double> z, std::span<const double> f,
                                         const ObservationPoint& o) {
  ModelledObservation out;
  out.sigma = observation_sigma(o);
  if (o.kernel) {
    const AveragingKernel& k = *o.kernel;
    double prior = k.a_priori.empty() ? 0.0 : k.a_priori_at_point;
    for (std::size_t i = 0; i < k.weight.size(); ++i) {
      const PointValue p = point_value(z, f, k.altitude_cm[i]);
      if (!p.valid) return out;
      out.value += k.weight[i] * p.m;
      out.d_value.emplace_back(p.iw.lo, k.weight[i] * p.d_lo);
      out.d_value.emplace_back(p.iw.hi, k.weight[i] * p.d_hi);
      if (!k.a_priori.empty()) prior -= k.weight[i] * k.a_priori[i];
    }
    out.value += prior;
    out.inside = true;
    return out;
  }
  const PointValue p = point_value(z, f, o.altitude_cm);
  if (!p.valid) return out;
  out.inside = true;
  out.value = p.m;
  out.d_value = {{p.iw.lo, p.d_lo}, {p.iw.hi, p.d_hi}};
  if (o.altitude_uncertainty_cm > 0.0 && p.iw.lo != p.iw.hi) {
    // Slope of the log-linear interpolant: g = m L / dz, L = ln f_hi - ln f_lo.
    const double tiny = std::numeric_limits<double>::min();
    const double f_lo = std::max(f[p.iw.lo], tiny), f_hi = std::max(f[p.iw.hi], tiny);
    const double dz = z[p.iw.hi] - z[p.iw.lo];
    const double L = std::log(f_hi) - std::log(f_lo);
    const double g = p.m * L / dz;
    const double sz = o.altitude_uncertainty_cm;
    out.sigma = std::sqrt(out.sigma * out.sigma + g * g * sz * sz);
    const double dg_lo = (p.d_lo * L - p.m / f_lo) / dz;
    const double dg_hi = (p.d_hi * L + p.m / f_hi) / dz;
    const double c = g * sz * sz / out.sigma;
    out.d_sigma = {{p.iw.lo, c * dg_lo}, {p.iw.hi, c * dg_hi}};
  }
  return out;
}

double observation_residual(const ModelledObservation& m, const ObservationPoint& o, bool log_space,
                            std::vector<std::pair<std::size_t, double>>* dr) {
  const double ln10 = std::log(10.0);
  const double value = log_space ? std::max(m.value, std::numeric_limits<double>::min()) : m.value;
  const double num = log_space ? std::log10(value) - std::log10(o.value) : value - o.value;
  const double s = log_space ? m.sigma / (o.value * ln10) : m.sigma;
  const double r = num / s;
  if (dr != nullptr) {
    dr->clear();
    // dr/df = (d num/df - r ds/df) / s
    const double dnum = log_space ? 1.0 / (value * ln10) : 1.0;
    const double ds = log_space ? 1.0 / (o.value * ln10) : 1.0;
    for (const auto& [j, d] : m.d_value) dr->emplace_back(j, dnum * d / s);
    for (const auto& [j, d] : m.d_sigma) dr->emplace_back(j, -r * ds * d / s);
  }
  return r;
}

SpeciesScore score_species(const std::string& species, std::span<const double> altitude_cm,
                           std::span<const double> model, const std::vector<ObservationPoint>& pts,
                           int fitted_parameters) {
  SpeciesScore s;
  s.species = species;
  for (const auto& o : pts) {
    if (o.species != species) continue;
    PointScore p;
    p.obs = o;
    const ModelledObservation m = modelled_observation(altitude_cm, model, o);
    p.inside = m.inside;
    p.model = m.inside ? m.value : std::numeric_limits<double>::quiet_NaN();
    p.sigma = m.sigma;
    if (p.inside) {
      ++s.n_points;
      p.counted = !o.upper_limit || p.model > o.value;
      if (p.counted) {
        p.residual_log = observation_residual(m, o, true, nullptr);
        p.residual_linear = observation_residual(m, o, false, nullptr);
        s.chi2_log += p.residual_log * p.residual_log;
        s.chi2_linear += p.residual_linear * p.residual_linear;
      }
    }
    s.points.push_back(p);
  }
  const double dof = static_cast<double>(s.n_points) - fitted_parameters;
  const double nan = std::numeric_limits<double>::quiet_NaN();
  s.reduced_chi2_log = dof > 0 ? s.chi2_log / dof : nan;
  s.reduced_chi2_linear = dof > 0 ? s.chi2_linear / dof : nan;
  return s;
}

void require_observed_species(const ObservationSet& obs,
                              const std::vector<std::string>& model_species) {
  for (const auto& name : obs.species()) {
    if (std::find(model_species.begin(), model_species.end(), name) != model_species.end()) {
      continue;
    }
    int line = 0;
    for (const auto& p : obs.points) {
      if (p.species == name) {
        line = p.line;
        break;
      }
    }
    std::string list;
    for (const auto& m : model_species) list += (list.empty() ? "" : ", ") + m;
    throw InputError(ExitCode::kInputData, SourceLocation{obs.file.string(), line}, "species",
                     "a species of the model (" + list + ")", "'" + name + "'");
  }
}

std::vector<SpeciesScore> score_column(std::span<const double> altitude_cm,
                                       const std::vector<std::string>& model_species,
                                       std::span<const double> mole_fraction,
                                       const ObservationSet& obs, int fitted_parameters) {
  const std::size_t N = altitude_cm.size();
  std::vector<SpeciesScore> out;
  require_observed_species(obs, model_species);
  for (const auto& name : obs.species()) {
    const auto it = std::find(model_species.begin(), model_species.end(), name);
    const std::size_t s = static_cast<std::size_t>(it - model_species.begin());
    out.push_back(score_species(name, altitude_cm, mole_fraction.subspan(s * N, N), obs.points,
                                fitted_parameters));
  }
  return out;
}

}  // namespace colchem
