// Rate constants against JPL Publication 19-5 (Burkholder et al. 2019). The JPL parameters
// below are recalled (from memory), not looked up; each expected value is computed by hand
// from them with the JPL formula, the arithmetic shown beside it. [M] = p/(k_B T) with
// k_B = 1.380649e-23 J/K.
#include <catch2/catch.hpp>

#include <cmath>

#include "chem/kinetics.hpp"
#include "chem/rate_law.hpp"
#include "io/mechanism_loader.hpp"

using namespace colchem;

namespace {

const char* kJpl = R"(
mechanism: {name: jpl-check}
species:
  - {name: O}
  - {name: O(1D)}
  - {name: O2}
  - {name: O3}
  - {name: OH}
  - {name: HO2}
  - {name: H}
  - {name: N2}
  - {name: Cl}
  - {name: ClO}
  - {name: Cl2O2}
  - {name: CH4}
  - {name: CH3}
  - {name: H2O}
  - {name: CO}
  - {name: CO2}
  - {name: SO2}
  - {name: SO3}
  - {name: HSO3}
  - {name: NO2}
  - {name: HO2NO2}
modules:
  - name: all
    reactions:
      - {id: o_o3, equation: O + O3 -> 2 O2, rate: {arrhenius: {A: 8.0e-12, E: 2060}}}
      - {id: oh_o3, equation: OH + O3 -> HO2 + O2, rate: {arrhenius: {A: 1.7e-12, E: 940}}}
      - {id: o1d_n2, equation: O(1D) + N2 -> O + N2, rate: {arrhenius: {A: 2.15e-11, E: -110}}}
      - {id: cl_o3, equation: Cl + O3 -> ClO + O2, rate: {arrhenius: {A: 2.3e-11, E: 200}}}
      - {id: oh_ch4, equation: OH + CH4 -> CH3 + H2O, rate: {arrhenius: {A: 2.45e-12, E: 1775}}}
      - {id: o_o2_m, equation: O + O2 + M -> O3 + M, rate: {falloff: {k0_300: 6.1e-34, n: 2.4, kinf_300: 0, m: 0}}}
      - {id: oh_so2_m, equation: OH + SO2 + M -> HSO3 + M, rate: {falloff: {k0_300: 2.9e-31, n: 4.1, kinf_300: 1.7e-12, m: -0.2}}}
      - {id: o_so2_m, equation: O + SO2 + M -> SO3 + M, rate: {falloff: {k0_300: 1.8e-33, n: -2.0, kinf_300: 4.2e-14, m: -1.8}}}
      - {id: oh_co, equation: OH + CO -> H + CO2, rate: {chemical_activation: {k0_300: 1.5e-13, n: -0.6, kinf_300: 2.1e9, m: -6.1}}}
      - {id: clo_clo_m, equation: ClO + ClO + M -> Cl2O2 + M, rate: {falloff: {k0_300: 1.9e-32, n: 3.6, kinf_300: 3.7e-12, m: 1.6}}}
      - id: cl2o2_m
        equation: Cl2O2 + M -> ClO + ClO + M
        rate:
          equilibrium_reverse:
            forward: {falloff: {k0_300: 1.9e-32, n: 3.6, kinf_300: 3.7e-12, m: 1.6}}
            A: 2.16e-27
            B: 8537
      - id: ho2no2_m
        equation: HO2NO2 + M -> HO2 + NO2 + M
        rate:
          equilibrium_reverse:
            forward: {falloff: {k0_300: 1.9e-31, n: 3.4, kinf_300: 4.0e-12, m: 0.3}}
            A: 2.1e-27
            B: 10900
)";

enum Rx { kOO3, kOHO3, kO1DN2, kClO3, kOHCH4, kOO2M, kOHSO2, kOSO2, kOHCO, kClOClO, kCl2O2, kHO2NO2 };

double air(double p_pa, double T) { return p_pa * 10.0 / (1.380649e-16 * T); }

double k_of(const Mechanism& m, Rx r, double T, double p_pa) {
  return rate_constant(m.reactions[static_cast<std::size_t>(r)].rate, T, air(p_pa, T));
}

}  // namespace

TEST_CASE("bimolecular Arrhenius rate constants match JPL 19-5", "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(kJpl, "jpl.yaml", units);
  // JPL 19-5, from memory: O + O3, A = 8.0e-12, E/R = 2060 K.
  // 298 K: 8.0e-12 exp(-2060/298) = 8.0e-12 * 9.9502e-4 = 7.9601e-15
  CHECK(k_of(*m, kOO3, 298, 1e5) == Approx(7.9601e-15).epsilon(1e-4));
  // 200 K: 8.0e-12 exp(-10.3) = 8.0e-12 * 3.3633e-5 = 2.6906e-16
  CHECK(k_of(*m, kOO3, 200, 1e5) == Approx(2.6906e-16).epsilon(1e-4));
  // JPL 19-5, from memory: OH + O3, 1.7e-12, 940 K. 298 K: 1.7e-12 * 0.042666 = 7.2532e-14
  CHECK(k_of(*m, kOHO3, 298, 1e5) == Approx(7.2532e-14).epsilon(1e-4));
  // 200 K: 1.7e-12 exp(-4.7) = 1.7e-12 * 9.0953e-3 = 1.5462e-14
  CHECK(k_of(*m, kOHO3, 200, 1e5) == Approx(1.5462e-14).epsilon(1e-4));
  // JPL 19-5, from memory: O(1D) + N2, 2.15e-11, -110 K. 298 K: 2.15e-11 * 1.44647 = 3.1099e-11
  CHECK(k_of(*m, kO1DN2, 298, 1e5) == Approx(3.1099e-11).epsilon(1e-4));
  // 200 K: 2.15e-11 exp(0.55) = 2.15e-11 * 1.73325 = 3.7265e-11
  CHECK(k_of(*m, kO1DN2, 200, 1e5) == Approx(3.7265e-11).epsilon(1e-4));
  // JPL 19-5, from memory: Cl + O3, 2.3e-11, 200 K. 298 K: 2.3e-11 * 0.51113 = 1.1756e-11
  CHECK(k_of(*m, kClO3, 298, 1e5) == Approx(1.1756e-11).epsilon(1e-4));
  // 200 K: 2.3e-11 exp(-1) = 2.3e-11 * 0.367879 = 8.4612e-12
  CHECK(k_of(*m, kClO3, 200, 1e5) == Approx(8.4612e-12).epsilon(1e-4));
  // JPL 19-5, from memory: OH + CH4, 2.45e-12, 1775 K. 298 K: 2.45e-12 * 2.58928e-3 = 6.3437e-15
  CHECK(k_of(*m, kOHCH4, 298, 1e5) == Approx(6.3437e-15).epsilon(1e-4));
  // 200 K: 2.45e-12 exp(-8.875) = 2.45e-12 * 1.39842e-4 = 3.4261e-16
  CHECK(k_of(*m, kOHCH4, 200, 1e5) == Approx(3.4261e-16).epsilon(1e-4));
}

TEST_CASE("termolecular fall-off rate constants match JPL 19-5 at three pressures",
          "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(kJpl, "jpl.yaml", units);
  // [M] at 298 K: 1 bar 2.43053e19, 10 mbar 2.43053e17, 0.1 mbar 2.43053e15 cm-3.
  // [M] at 200 K: 1 bar 3.62149e19, 10 mbar 3.62149e17, 0.1 mbar 3.62149e15 cm-3.
  // JPL 19-5, from memory: O + O2 + M, k0_300 = 6.1e-34, n = 2.4, low-pressure limit only.
  // k0(298) = 6.1e-34 (298/300)^-2.4 = 6.19872e-34; k = k0 [M]
  CHECK(k_of(*m, kOO2M, 298, 1e5) == Approx(6.19872e-34 * 2.43053e19).epsilon(1e-4));  // 1.50661e-14
  CHECK(k_of(*m, kOO2M, 298, 1e3) == Approx(1.50661e-16).epsilon(1e-4));
  CHECK(k_of(*m, kOO2M, 298, 10) == Approx(1.50661e-18).epsilon(1e-4));
  // k0(200) = 6.1e-34 (2/3)^-2.4 = 1.61417e-33; at 1 bar 1.61417e-33 * 3.62149e19 = 5.84569e-14
  CHECK(k_of(*m, kOO2M, 200, 1e5) == Approx(5.84569e-14).epsilon(1e-4));

  // JPL 19-5, from memory: OH + SO2 + M, k0_300 = 2.9e-31, n = 4.1, kinf_300 = 1.7e-12, m = -0.2.
  // 298 K: k0 = 2.98063e-31, kinf = 1.69773e-12.
  //  1 bar: r = k0[M]/kinf = 4.26718, log10 r = 0.63013, F = 0.6^(1/1.39708) = 0.69375,
  //         k = 7.24451e-12/5.26718 * 0.69375 = 9.5419e-13
  CHECK(k_of(*m, kOHSO2, 298, 1e5) == Approx(9.5419e-13).epsilon(1e-4));
  //  10 mbar: r = 0.0426718, log10 r = -1.36987, F = 0.6^(1/2.87651) = 0.83729,
  //         k = 7.24451e-14/1.0426718 * 0.83729 = 5.8175e-14
  CHECK(k_of(*m, kOHSO2, 298, 1e3) == Approx(5.8175e-14).epsilon(1e-4));
  //  0.1 mbar: r = 4.26718e-4, log10 r = -3.36987, F = 0.6^(1/12.3559) = 0.95950,
  //         k = 7.24451e-16/1.000427 * 0.95950 = 6.9481e-16
  CHECK(k_of(*m, kOHSO2, 298, 10) == Approx(6.9481e-16).epsilon(1e-4));
  // 200 K, 1 bar: k0 = 1.52888e-30, kinf = 1.56758e-12, r = 35.3206, log10 r = 1.54802,
  //   F = 0.6^(1/3.39639) = 0.86036, k = 5.53682e-11/36.3206 * 0.86036 = 1.3116e-12
  CHECK(k_of(*m, kOHSO2, 200, 1e5) == Approx(1.3116e-12).epsilon(1e-4));

  // JPL 19-5, from memory: O + SO2 + M, 1.8e-33, n = -2.0, kinf_300 = 4.2e-14, m = -1.8.
  // 298 K, 1 bar: k0 = 1.77608e-33, kinf = 4.14973e-14, r = 1.04026, log10 r = 0.017142,
  //   F = 0.6^(1/1.000294) = 0.60009, k = 4.31681e-14/2.04026 * 0.60009 = 1.2697e-14
  CHECK(k_of(*m, kOSO2, 298, 1e5) == Approx(1.2697e-14).epsilon(1e-4));
  // 10 mbar: r = 0.0104026, k = 4.31681e-16/1.0104026 * 0.6^(1/(1+1.98296^2)) = 3.8520e-16
  CHECK(k_of(*m, kOSO2, 298, 1e3) == Approx(3.8520e-16).epsilon(1e-4));
  // 0.1 mbar: r = 1.04026e-4, k = 4.31681e-18/1.000104 * 0.6^(1/(1+3.98283^2)) = 4.1876e-18
  CHECK(k_of(*m, kOSO2, 298, 10) == Approx(4.1876e-18).epsilon(1e-4));
  // 200 K, 0.1 mbar: k0 = 8.0e-34, kinf = 2.02435e-14, r = 1.43117e-4, k = 2.8045e-18
  CHECK(k_of(*m, kOSO2, 200, 10) == Approx(2.8045e-18).epsilon(1e-4));
}

TEST_CASE("chemical-activation channel OH + CO -> H + CO2 matches JPL 19-5", "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(kJpl, "jpl.yaml", units);
  // JPL 19-5, from memory: k0_300 = 1.5e-13 cm3 s-1, n = -0.6, kinf_300 = 2.1e9 s-1, m = -6.1.
  // 298 K: k0 = 1.5e-13 (298/300)^0.6 = 1.49399e-13, kinf = 2.1e9 (298/300)^6.1 = 2.01604e9.
  //  1 bar: r = k0[M]/kinf = 1.49399e-13 * 2.43053e19 / 2.01604e9 = 1.80115e-3,
  //         log10 r = -2.74445, F = 0.6^(1/8.53200) = 0.94189,
  //         k = 1.49399e-13 / 1.0018012 * 0.94189 = 1.4046e-13
  CHECK(k_of(*m, kOHCO, 298, 1e5) == Approx(1.4046e-13).epsilon(1e-4));
  //  10 mbar: r = 1.80115e-5, k = 1.49399e-13/1.000018 * 0.6^(1/(1+4.74445^2)) = 1.4619e-13
  CHECK(k_of(*m, kOHCO, 298, 1e3) == Approx(1.4619e-13).epsilon(1e-4));
  // 200 K, 1 bar: k0 = 1.17608e-13, kinf = 1.77036e8, r = 0.0240581,
  //         k = 1.17608e-13/1.0240581 * 0.6^(1/(1+1.61873^2)) = 9.9732e-14
  CHECK(k_of(*m, kOHCO, 200, 1e5) == Approx(9.9732e-14).epsilon(1e-4));
  // Zero pressure: the bimolecular low-pressure limit k0(T) * 0.6^0 = k0.
  CHECK(rate_constant(m->reactions[kOHCO].rate, 298, 0.0) == Approx(1.49399e-13).epsilon(1e-4));
}

TEST_CASE("equilibrium constants give JPL 19-5 reverse rates", "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(kJpl, "jpl.yaml", units);
  // JPL 19-5, from memory: ClO + ClO <=> Cl2O2, K = 2.16e-27 exp(8537/T) cm3.
  // 298 K: K = 2.16e-27 * exp(28.6477) = 5.96995e-15 cm3. Forward at 1 bar
  //   (k0 1.9e-32 n 3.6, kinf 3.7e-12 m 1.6): k0 = 1.94631e-32, kinf = 3.73981e-12,
  //   r = 0.126492, k_f = 3.16493e-13; reverse k = k_f / K = 53.014 s-1.
  CHECK(k_of(*m, kClOClO, 298, 1e5) == Approx(3.16493e-13).epsilon(1e-4));
  CHECK(k_of(*m, kCl2O2, 298, 1e5) == Approx(53.014).epsilon(1e-4));
  // 200 K: K = 2.16e-27 exp(42.685) = 7.45270e-9 cm3; k_f = 1.33566e-12; k = 1.7922e-4 s-1.
  CHECK(k_of(*m, kCl2O2, 200, 1e5) == Approx(1.7922e-4).epsilon(1e-4));
  // JPL 19-5, from memory: HO2 + NO2 <=> HO2NO2, K = 2.1e-27 exp(10900/T) cm3,
  //   forward k0 1.9e-31 n 3.4, kinf 4.0e-12 m 0.3. 298 K, 1 bar: K = 1.61245e-11,
  //   k_f = 1.30440e-12, reverse k = 0.080896 s-1.
  CHECK(k_of(*m, kHO2NO2, 298, 1e5) == Approx(0.080896).epsilon(1e-4));
  // 200 K: K = 9.80096e-4, k_f = 2.82278e-12, reverse k = 2.8801e-9 s-1.
  CHECK(k_of(*m, kHO2NO2, 200, 1e5) == Approx(2.8801e-9).epsilon(1e-4));
}

// The Troe fall-off form (Troe 1983, Ber. Bunsenges. Phys. Chem. 87, 161; Gilbert, Luther
// and Troe 1983, ibid. 87, 169): k = kinf Pr/(1 + Pr) F with Pr = k0[M]/kinf and
// log10 F = log10 Fc / (1 + y^2), y = u/(N - d u), u = log10 Pr + c, c = -0.4 - 0.67 log10 Fc,
// N = 0.75 - 1.27 log10 Fc, d = 0.14 (the published constants, from memory). The checks below
// do not evaluate that expression: they test properties the published form has. F is read
// back from k as F = k (1 + Pr)/(kinf Pr).
namespace {
struct TroeProbe {
  RateLaw law;
  double T = 300.0;
  [[nodiscard]] double k0() const { return law.k0.at(T); }
  [[nodiscard]] double kinf() const { return law.kinf.at(T); }
  /// k at the reduced pressure Pr = 10^log_pr.
  [[nodiscard]] double k_at(double log_pr) const {
    return rate_constant(law, T, std::pow(10.0, log_pr) * kinf() / k0());
  }
  /// The broadening factor F at Pr = 10^log_pr, from k.
  [[nodiscard]] double F(double log_pr) const {
    const double pr = std::pow(10.0, log_pr);
    return k_at(log_pr) * (1.0 + pr) / (kinf() * pr);
  }
};

TroeProbe troe_probe(double alpha, double T3, double T1) {
  TroeProbe p;
  p.law.form = RateForm::kTroe;
  p.law.k0 = {2.9e-31, -4.1, 0.0};
  p.law.kinf = {1.7e-12, 0.2, 0.0};
  p.law.alpha = alpha;
  p.law.T3 = T3;
  p.law.T1 = T1;
  return p;
}
}  // namespace

TEST_CASE("Troe form without broadening is the Lindemann-Hinshelwood expression", "[chem][rate]") {
  // alpha = 0, T3 huge: Fc = exp(-T/T3) = 1, so log10 F = 0 at every pressure and
  // k = kinf Pr/(1 + Pr) (Lindemann-Hinshelwood, analytic).
  const TroeProbe p = troe_probe(0.0, 1e30, 1.0);
  for (double lp : {-6.0, -1.0, 0.0, 0.7, 4.0}) {
    const double pr = std::pow(10.0, lp);
    CHECK(p.k_at(lp) == Approx(p.kinf() * pr / (1.0 + pr)).epsilon(1e-12));
  }
}

TEST_CASE("Troe form: limits, minimum F = Fc at its centre, half-width points", "[chem][rate]") {
  // Fc = 0.6 exp(-T/200) + 0.4 exp(-T/1500) = 0.4613 at 300 K (Troe 1983's Fcent with
  // alpha = 0.4, T3 = 200 K, T1 = 1500 K).
  const TroeProbe p = troe_probe(0.4, 200.0, 1500.0);
  const double fc = 0.6 * std::exp(-300.0 / 200.0) + 0.4 * std::exp(-300.0 / 1500.0);
  const double lf = std::log10(fc);
  const double c = -0.4 - 0.67 * lf, N = 0.75 - 1.27 * lf, d = 0.14;
  // High-pressure limit: k -> kinf, independent of [M] (analytic: Pr/(1 + Pr) -> 1 and y grows
  // without bound as u -> N/d = 8.4, so F -> 1; F = 0.99992 at Pr = 1e8, 0.99919 at 1e7).
  CHECK(p.k_at(8.0) == Approx(p.kinf()).epsilon(1e-3));
  CHECK(p.k_at(8.0) / p.k_at(7.0) == Approx(1.0).epsilon(1e-3));
  // Low-pressure limit: k proportional to [M] (per decade within 5e-3: F still drifts by
  // Fc^(1/(1 + y^2)), y ~ -4.3 there) and k/(k0[M]) = F between Fc and 1, tending slowly to
  // Fc^(d^2/(1 + d^2)) = 0.985 (y -> -1/d); 0.960 at Pr = 1e-12 (analytic from the form).
  CHECK(p.k_at(-12.0) / p.k_at(-13.0) == Approx(10.0).epsilon(5e-3));
  const double f_low = p.F(-12.0);
  CHECK(f_low < std::pow(fc, d * d / (1.0 + d * d)));
  CHECK(f_low > 0.95);
  // Fc is the smallest F, reached at the centre of the fall-off, u = 0 (log10 Pr = -c);
  // F > Fc on either side (analytic: 1/(1 + y^2) <= 1 with equality only at y = 0).
  CHECK(p.F(-c) == Approx(fc).epsilon(1e-12));
  CHECK(p.F(-c - 0.1) > fc);
  CHECK(p.F(-c + 0.1) > fc);
  double f_min = 1.0;
  for (int i = -80; i <= 80; ++i) f_min = std::min(f_min, p.F(0.1 * i));
  CHECK(f_min >= fc);
  CHECK(f_min == Approx(fc).epsilon(2e-3));
  // Half-width points: log10 F = log10 Fc / 2 where y = +-1, at u = N/(1 + d) and
  // u = -N/(1 - d) (analytic from the published form; N is the width in decades).
  CHECK(p.F(-c + N / (1.0 + d)) == Approx(std::sqrt(fc)).epsilon(1e-12));
  CHECK(p.F(-c - N / (1.0 - d)) == Approx(std::sqrt(fc)).epsilon(1e-12));
}

TEST_CASE("Troe form: the optional T2 term adds exp(-T2/T) to Fc", "[chem][rate]") {
  // alpha = 0 and T3 -> 0 remove the first two terms; T2 = T ln 2 leaves Fc = 0.5 (Troe
  // 1983), so the smallest F is 0.5, at log10 Pr = -c = 0.4 + 0.67 log10 0.5.
  TroeProbe p = troe_probe(0.0, 1e-30, 1.0);
  p.law.has_T2 = true;
  p.law.T2 = p.T * std::log(2.0);
  const double c = -0.4 - 0.67 * std::log10(0.5);
  CHECK(p.F(-c) == Approx(0.5).epsilon(1e-12));
  CHECK(p.F(-c + 0.2) > 0.5);
  CHECK(p.F(-c - 0.2) > 0.5);
}

TEST_CASE("JPL fall-off form: F = Fc where k0[M] = kinf, half-width at one decade, limits",
          "[chem][rate]") {
  // JPL 19-5 (Burkholder et al. 2019, section 2): k = k0[M]/(1 + k0[M]/kinf)
  // Fc^(1/(1 + log10(k0[M]/kinf)^2)), Fc = 0.6: F = Fc exactly at k0[M] = kinf, F = sqrt(Fc)
  // one decade either side, and the limits k0[M] and kinf.
  RateLaw law;
  law.form = RateForm::kFalloff;
  law.k0_300 = 2.5e-31;
  law.n = 1.8;
  law.kinf_300 = 2.2e-11;
  law.m = 0.7;
  const double T = 300.0, k0 = 2.5e-31, kinf = 2.2e-11;
  const auto F = [&](double log_ratio) {
    const double r = std::pow(10.0, log_ratio);
    return rate_constant(law, T, r * kinf / k0) * (1.0 + r) / (kinf * r);
  };
  CHECK(F(0.0) == Approx(0.6).epsilon(1e-12));
  CHECK(F(1.0) == Approx(std::sqrt(0.6)).epsilon(1e-12));
  CHECK(F(-1.0) == Approx(std::sqrt(0.6)).epsilon(1e-12));
  // Limits: F = Fc^(1/(1 + x^2)) -> 1 slowly (0.99943 at x = +-30, analytic).
  CHECK(rate_constant(law, T, 1e-30 * kinf / k0) == Approx(1e-30 * kinf).epsilon(1e-3));
  CHECK(rate_constant(law, T, 1e30 * kinf / k0) == Approx(kinf).epsilon(1e-3));
}

TEST_CASE("rate_constants evaluates every reaction at every level in one call", "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(kJpl, "jpl.yaml", units);
  std::vector<std::size_t> mods{0};
  Kinetics kin(m, mods, {});
  const std::vector<double> T{298.0, 200.0};
  const std::vector<double> n{air(1e5, 298.0), air(10, 200.0)};
  kin.set_conditions(T, n, {{"N2", 1.0}});
  const auto k = kin.rate_constants();
  REQUIRE(k.size() == m->reactions.size() * 2);
  // Same values as the scalar cases above (JPL 19-5, from memory).
  CHECK(k[kOO3 * 2 + 0] == Approx(7.9601e-15).epsilon(1e-4));
  CHECK(k[kOO3 * 2 + 1] == Approx(2.6906e-16).epsilon(1e-4));
  CHECK(k[kOSO2 * 2 + 1] == Approx(2.8045e-18).epsilon(1e-4));
  CHECK(k[kOHCO * 2 + 0] == Approx(1.4046e-13).epsilon(1e-4));
}

TEST_CASE("a chemical-activation channel written with + M is not multiplied by [M] again",
          "[chem][rate]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(R"(
mechanism: {name: ca}
species: [{name: OH}, {name: CO}, {name: H}, {name: CO2}]
modules:
  - name: m
    reactions:
      - {id: oh_co_2, equation: OH + CO -> H + CO2, rate: {chemical_activation: {k0_300: 1.5e-13, n: -0.6, kinf_300: 2.1e9, m: -6.1}}}
      - id: oh_co_m
        equation: OH + CO + M -> H + CO2 + M
        rate: {chemical_activation: {k0_300: 1.5e-13, n: -0.6, kinf_300: 2.1e9, m: -6.1}}
)", "ca.yaml", units);
  Kinetics kin(m, std::vector<std::size_t>{0}, {});
  kin.set_conditions(std::vector<double>{298.0}, std::vector<double>{2.43053e19}, {{"N2", 1.0}});
  // Both give the bimolecular 1.4046e-13 cm3 s-1 (JPL 19-5, from memory; see above).
  CHECK(kin.rate_constants()[0] == Approx(1.4046e-13).epsilon(1e-4));
  CHECK(kin.rate_constants()[1] == Approx(1.4046e-13).epsilon(1e-4));
}

// CO + O + M -> CO2 + M in both shipped Pyrene mechanisms against the Arrhenius form it is
// fitted to, k0 = 2.2e-33 exp(-1780/T) cm6 s-1 (Tsang and Hampson 1986, from memory): the
// power-law fit k0_300 (T/300)^-n with n = -7.3 passes through it at 300 K (2.2e-33 x
// exp(-5.933) = 5.83e-36) and 200 K (2.2e-33 x exp(-8.9) = 3.00e-37) and, like it, rises
// with T. The compact file once had n = +7.3: 1.12e-34 at 200 K, 370x too fast.
TEST_CASE("Pyrene CO + O + M follows its activation energy", "[chem][rate]") {
  const UnitSystem units;
  for (const char* file : {COLCHEM_SOURCE_DIR "/configs/mechanisms/pyrene.yaml",
                           COLCHEM_SOURCE_DIR "/configs/mechanisms/pyrene_extended.yaml"}) {
    INFO(file);
    const auto m = load_mechanism(file, units);
    const Reaction* rx = nullptr;
    for (const auto& r : m->reactions) {
      if (r.equation == "CO + O + M -> CO2 + M") rx = &r;
    }
    REQUIRE(rx != nullptr);
    for (double T : {200.0, 300.0}) {
      INFO("T = " << T);
      CHECK(rx->rate.low_pressure_limit(T) ==
            Approx(2.2e-33 * std::exp(-1780.0 / T)).epsilon(0.03));
    }
    CHECK(rx->rate.low_pressure_limit(170.0) < rx->rate.low_pressure_limit(260.0));
  }
}
