// Rate constants k(T, [M]) of every reaction form (cgs: s^-1, cm^3 s^-1, cm^6 s^-1).
//
//   arrhenius:  k = A (T/300)^b exp(-E/T)                          (E in K)
//   falloff:    k0 = k0_300 (T/300)^-n, kinf = kinf_300 (T/300)^-m,
//               k = k0[M]/(1 + k0[M]/kinf) Fc^{1/(1 + (log10(k0[M]/kinf))^2)}, Fc = 0.6
//               (JPL Publication 19-5, Burkholder et al. 2019); kinf_300 = 0 means the
//               low-pressure limit k = k0[M]. k is bimolecular-equivalent.
//   troe:       Pr = k0[M]/kinf, Fcent = (1-alpha) e^{-T/T3} + alpha e^{-T/T1} + e^{-T2/T},
//               log10 F = log10 Fcent / (1 + ((log10 Pr + c)/(N - 0.14 (log10 Pr + c)))^2),
//               c = -0.4 - 0.67 log10 Fcent, N = 0.75 - 1.27 log10 Fcent (Troe 1983);
//               k = kinf Pr/(1 + Pr) F.
//   chemical_activation (JPL 19-5): k = k0(T)/(1 + k0(T)[M]/kinf(T))
//               0.6^{1/(1 + (log10(k0(T)[M]/kinf(T)))^2)}, k0 in cm^3 s^-1, kinf in s^-1.
//   equilibrium_reverse: k = k_forward(T, [M]) / K(T), K = A exp(B/T) cm^3 (JPL 19-5).
//   constant, first_order: k as given; photolysis: J supplied per level.
#pragma once

#include <span>
#include <string>
#include <vector>

namespace colchem {

enum class RateForm {
  kArrhenius,
  kFalloff,
  kTroe,
  kChemicalActivation,
  kEquilibriumReverse,
  kConstant,
  kFirstOrder,
  kPhotolysis,
};

/// The mechanism-file key of a form ("arrhenius", ...).
const char* rate_form_name(RateForm f);

/// The units of a rate constant of reaction order n in number densities: cm^(3(n-1)) s-1
/// ("cm-3 s-1" for a zero-order source, "s-1", "cm3 s-1", "cm6 s-1", ...).
std::string rate_constant_units(int order);

struct ArrheniusParams {
  double A = 0.0;
  double b = 0.0;
  double E = 0.0;  ///< K
  [[nodiscard]] double at(double T) const;
};

struct RateLaw {
  RateForm form = RateForm::kConstant;
  ArrheniusParams arrhenius;  ///< arrhenius; constant and first_order use A only
  // falloff and chemical_activation (JPL 19-5 parameters):
  double k0_300 = 0.0, n = 0.0, kinf_300 = 0.0, m = 0.0, Fc = 0.6;
  // troe:
  ArrheniusParams k0, kinf;
  double alpha = 0.0, T3 = 0.0, T1 = 0.0, T2 = 0.0;
  bool has_T2 = false;
  // equilibrium_reverse: K = K_A exp(K_B / T); forward holds exactly one thermal form.
  double K_A = 0.0, K_B = 0.0;
  std::vector<RateLaw> forward;
  // photolysis:
  std::string channel;

  /// True for the forms whose k has [M] folded in (falloff, troe, chemical_activation, and
  /// an equilibrium_reverse whose forward is one); for these a "+ M" in the equation does
  /// not multiply the rate (chemical activation is usually written without it).
  [[nodiscard]] bool folds_third_body() const;
  /// True when k depends on [M] at all.
  [[nodiscard]] bool uses_third_body() const;
  /// Low-pressure (termolecular) limit k0(T), cm^6 s^-1, for the fall-off forms; 0 else.
  [[nodiscard]] double low_pressure_limit(double T) const;
};

/// k(T, [M]) of a thermal form (photolysis returns 0: its J comes from elsewhere).
double rate_constant(const RateLaw& law, double T, double M);

/// Evaluates every law at every level in one call: k[r * levels + j] for law r at level j,
/// with T[j] and M[r * levels + j] (third-body density of reaction r at level j).
void rate_constants(std::span<const RateLaw> laws, std::span<const double> T,
                    std::span<const double> M, std::span<double> k);

/// Converts a law's parameters written in another unit: f is the factor of k's unit, f3 that
/// of k times time (a volume; it turns a bimolecular factor into a termolecular one, kinf
/// into s-1, ...). The forward law of equilibrium_reverse is converted by the caller.
void convert_rate_units(RateLaw& law, double f, double f3);

}  // namespace colchem
