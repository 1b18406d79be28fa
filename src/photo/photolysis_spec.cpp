// Named parameters written into the photolysis data (photolysis_spec.hpp, ParameterUse):
//   q = p (set) or q = base p (scale); internal value q f, or 1e7 / (q f) nm for an energy
//   threshold (f: cm^-1 per unit of q; lambda_nm = 1e7 / nu~_cm^-1).
#include "photo/photolysis_spec.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "chem/mechanism.hpp"

namespace colchem {

PhotolysisSpec with_parameters(const PhotolysisSpec& spec, std::span<const double> parameters) {
  PhotolysisSpec out = spec;
  for (const auto& u : spec.parameter_uses) {
    if (!u.resolved || u.parameter >= parameters.size()) {
      throw std::invalid_argument("photolysis parameter '" + u.name + "' has no value");
    }
    const double v = u.value(parameters[u.parameter]);
    switch (u.target) {
      case ParameterTarget::kThreshold:
        out.channels.at(u.channel).threshold_nm = v;
        break;
      case ParameterTarget::kOnsetWidth:
        out.channels.at(u.channel).onset_width_cm1 = v;
        break;
      case ParameterTarget::kYieldValue:
        out.channels.at(u.channel).quantum_yield.value = v;
        break;
      case ParameterTarget::kYieldScale:
        out.channels.at(u.channel).quantum_yield.scale = v;
        break;
      case ParameterTarget::kBandStrength:
        out.absorbers.at(u.absorber).bands.at(u.band).strength_cm = v;
        break;
      case ParameterTarget::kCrossSectionScale:
        out.absorbers.at(u.absorber).cross_section.scale = v;
        break;
    }
  }
  return out;
}

std::string parameter_value_problem(ParameterTarget target, double v, double top) {
  switch (target) {
    case ParameterTarget::kThreshold:
      return v > 0.0 && std::isfinite(v) ? "" : "a positive threshold wavelength or energy";
    case ParameterTarget::kOnsetWidth:
      return v >= 0.0 && std::isfinite(v) ? "" : "an energy width >= 0";
    case ParameterTarget::kBandStrength:
      return v >= 0.0 && std::isfinite(v) ? "" : "a band (or oscillator) strength >= 0";
    case ParameterTarget::kCrossSectionScale:
      return v >= 0.0 && std::isfinite(v) ? "" : "a cross-section scale >= 0";
    case ParameterTarget::kYieldValue:
      return v >= 0.0 && v <= 1.0 ? "" : "a quantum yield from 0 to 1";
    case ParameterTarget::kYieldScale:
      return v >= 0.0 && v * top <= 1.0 ? "" : "a scaled quantum yield from 0 to 1";
  }
  return "";
}

void check_parameter_uses(const PhotolysisSpec& spec, const Mechanism& mech) {
  for (const auto& u : spec.parameter_uses) {
    const Parameter& p = mech.parameters.at(u.parameter);
    double top = 0.0;  // the largest yield the form gives before a kYieldScale
    if (u.target == ParameterTarget::kYieldScale) {
      const auto& q = spec.channels.at(u.channel).quantum_yield;
      for (double y : q.table.value) top = std::max(top, y);
      if (q.form != YieldForm::kTable) top = std::max(q.below_value, q.above_value);
    }
    for (const double x : {p.min, p.max}) {
      const double v = u.value(x);
      const std::string bad = parameter_value_problem(u.target, v, top);
      if (!bad.empty()) {
        throw InputError(
            ExitCode::kInputData, u.where, u.key_path,
            fmt::format("{} for every value of '{}' in [{}, {}]", bad, u.name, p.min, p.max),
            fmt::format("{:g} at {} = {}", v, u.name, x));
      }
    }
  }
  // A declared parameter that neither a reaction nor the photolysis data use does nothing.
  for (std::size_t i = 0; i < mech.parameters.size(); ++i) {
    bool used = std::any_of(spec.parameter_uses.begin(), spec.parameter_uses.end(),
                            [&](const ParameterUse& u) { return u.parameter == i; });
    for (const auto& rx : mech.reactions) {
      for (const auto& f : rx.scale) used = used || f.parameter == i;
    }
    if (!used) {
      const Parameter& p = mech.parameters[i];
      throw InputError(ExitCode::kInputData, p.where, "parameters." + p.name,
                       "a parameter that a reaction's 'scale' or the photolysis data ('" +
                           spec.data_source + "') refer to",
                       "'" + p.name + "', used by nothing",
                       "refer to it ({parameter: " + p.name + "} or {value: ..., scale: " + p.name +
                           "} in the photolysis data) or remove it");
    }
  }
}

}  // namespace colchem
