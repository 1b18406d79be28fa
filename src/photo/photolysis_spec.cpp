// Named parameters written into the photolysis data (photolysis_spec.hpp, ParameterUse):
//   q = p (set) or q = base p (scale); internal value q f, or 1e7 / (q f) nm for an energy
//   threshold (f: cm^-1 per unit of q; lambda_nm = 1e7 / nu~_cm^-1).
#include "photo/photolysis_spec.hpp"

#include <stdexcept>

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

}  // namespace colchem
