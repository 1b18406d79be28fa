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

SpeciesScore score_species(const std::string& species, std::span<const double> altitude_cm,
                           std::span<const double> model, const std::vector<ObservationPoint>& pts,
                           int fitted_parameters) {
  SpeciesScore s;
  s.species = species;
  for (const auto& o : pts) {
    if (o.species != species) continue;
    PointScore p;
    p.obs = o;
    p.model = interpolate_log_profile(altitude_cm, model, o.altitude_cm);
    p.inside = std::isfinite(p.model);
    if (p.inside) {
      ++s.n_points;
      const double sigma = observation_sigma(o);
      const double sigma_log = sigma / (o.value * std::log(10.0));
      p.counted = !o.upper_limit || p.model > o.value;
      if (p.counted) {
        p.residual_log = (std::log10(p.model) - std::log10(o.value)) / sigma_log;
        p.residual_linear = (p.model - o.value) / sigma;
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
