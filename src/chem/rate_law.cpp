// Rate constants k(T, [M]) (s^-1, cm^3 s^-1, cm^6 s^-1): Arrhenius k = A (T/300)^b
// exp(-E/T), falloff and chemical activation (JPL Publication 19-5, Burkholder et al. 2019),
// Troe (Troe 1983), equilibrium reverse: equations and units in chem/rate_law.hpp.
#include "chem/rate_law.hpp"

#include <cmath>

namespace colchem {

const char* rate_form_name(RateForm f) {
  switch (f) {
    case RateForm::kArrhenius: return "arrhenius";
    case RateForm::kFalloff: return "falloff";
    case RateForm::kTroe: return "troe";
    case RateForm::kChemicalActivation: return "chemical_activation";
    case RateForm::kEquilibriumReverse: return "equilibrium_reverse";
    case RateForm::kConstant: return "constant";
    case RateForm::kFirstOrder: return "first_order";
    case RateForm::kPhotolysis: return "photolysis";
  }
  return "?";
}

double ArrheniusParams::at(double T) const {
  double k = A;
  if (b != 0.0) k *= std::pow(T / 300.0, b);
  if (E != 0.0) k *= std::exp(-E / T);
  return k;
}

bool RateLaw::folds_third_body() const {
  if (form == RateForm::kFalloff || form == RateForm::kTroe ||
      form == RateForm::kChemicalActivation) {
    return true;
  }
  if (form == RateForm::kEquilibriumReverse && !forward.empty()) {
    return forward.front().folds_third_body();
  }
  return false;
}

bool RateLaw::uses_third_body() const { return folds_third_body(); }

double RateLaw::low_pressure_limit(double T) const {
  switch (form) {
    case RateForm::kFalloff: return k0_300 * std::pow(T / 300.0, -n);
    case RateForm::kTroe: return k0.at(T);
    case RateForm::kEquilibriumReverse:
      return forward.empty() ? 0.0 : forward.front().low_pressure_limit(T);
    default: return 0.0;
  }
}

namespace {

// The JPL 19-5 broadening: k0M / (1 + k0M/kinf) * Fc^{1/(1 + log10(k0M/kinf)^2)}.
double jpl_falloff(double k0M, double kinf, double Fc) {
  if (kinf <= 0.0) return k0M;  // low-pressure limit only
  if (k0M <= 0.0) return 0.0;
  const double ratio = k0M / kinf;
  const double x = std::log10(ratio);
  return k0M / (1.0 + ratio) * std::pow(Fc, 1.0 / (1.0 + x * x));
}

}  // namespace

double rate_constant(const RateLaw& law, double T, double M) {
  switch (law.form) {
    case RateForm::kArrhenius: return law.arrhenius.at(T);
    case RateForm::kConstant:
    case RateForm::kFirstOrder: return law.arrhenius.A;
    case RateForm::kPhotolysis: return 0.0;
    case RateForm::kFalloff: {
      const double k0 = law.k0_300 * std::pow(T / 300.0, -law.n);
      const double kinf = law.kinf_300 * std::pow(T / 300.0, -law.m);
      return jpl_falloff(k0 * M, kinf, law.Fc);
    }
    case RateForm::kChemicalActivation: {
      const double k0 = law.k0_300 * std::pow(T / 300.0, -law.n);
      const double kinf = law.kinf_300 * std::pow(T / 300.0, -law.m);
      // k0 * (falloff of k0[M] against kinf) / [M]: written without dividing by M so that
      // M = 0 gives the low-pressure limit k0.
      const double ratio = k0 * M / kinf;
      const double x = ratio > 0.0 ? std::log10(ratio) : -300.0;
      return k0 / (1.0 + ratio) * std::pow(0.6, 1.0 / (1.0 + x * x));
    }
    case RateForm::kTroe: {
      const double k0 = law.k0.at(T);
      const double kinf = law.kinf.at(T);
      if (kinf <= 0.0) return k0 * M;
      const double pr = k0 * M / kinf;
      if (pr <= 0.0) return 0.0;
      double fcent = (1.0 - law.alpha) * std::exp(-T / law.T3) + law.alpha * std::exp(-T / law.T1);
      if (law.has_T2) fcent += std::exp(-law.T2 / T);
      const double lf = std::log10(fcent);
      const double c = -0.4 - 0.67 * lf;
      const double nn = 0.75 - 1.27 * lf;
      const double y = (std::log10(pr) + c) / (nn - 0.14 * (std::log10(pr) + c));
      const double logF = lf / (1.0 + y * y);
      return kinf * pr / (1.0 + pr) * std::pow(10.0, logF);
    }
    case RateForm::kEquilibriumReverse: {
      const double kf = law.forward.empty() ? 0.0 : rate_constant(law.forward.front(), T, M);
      return kf / (law.K_A * std::exp(law.K_B / T));
    }
  }
  return 0.0;
}

void rate_constants(std::span<const RateLaw> laws, std::span<const double> T,
                    std::span<const double> M, std::span<double> k) {
  const std::size_t levels = T.size();
  for (std::size_t r = 0; r < laws.size(); ++r) {
    const RateLaw& law = laws[r];
    double* kr = k.data() + r * levels;
    const double* Mr = M.data() + r * levels;
    switch (law.form) {
      // The forms that do not depend on T or [M] fill their row directly.
      case RateForm::kConstant:
      case RateForm::kFirstOrder:
        for (std::size_t j = 0; j < levels; ++j) kr[j] = law.arrhenius.A;
        break;
      case RateForm::kPhotolysis:
        for (std::size_t j = 0; j < levels; ++j) kr[j] = 0.0;
        break;
      default:
        for (std::size_t j = 0; j < levels; ++j) kr[j] = rate_constant(law, T[j], Mr[j]);
    }
  }
}

std::string rate_constant_units(int order) {
  switch (order) {
    case 0:
      return "cm-3 s-1";
    case 1:
      return "s-1";
    case 2:
      return "cm3 s-1";
    default:
      return "cm" + std::to_string(3 * (order - 1)) + " s-1";
  }
}

void convert_rate_units(RateLaw& law, double f, double f3) {
  switch (law.form) {
    case RateForm::kArrhenius:
    case RateForm::kConstant:
    case RateForm::kFirstOrder:
      law.arrhenius.A *= f;
      break;
    case RateForm::kFalloff:
      law.kinf_300 *= f;
      law.k0_300 *= f * f3;
      break;
    case RateForm::kTroe:
      law.kinf.A *= f;
      law.k0.A *= f * f3;
      break;
    case RateForm::kChemicalActivation:
      law.k0_300 *= f;
      law.kinf_300 *= f / f3;
      break;
    case RateForm::kEquilibriumReverse:
    case RateForm::kPhotolysis:
      break;
  }
}

}  // namespace colchem
