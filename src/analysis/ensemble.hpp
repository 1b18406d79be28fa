// Rate-uncertainty ensembles: drawing the members and summarising their profiles.
//
// Member m multiplies the rate constant (or J) of mechanism reaction r at temperature T by
//   F_mr(T) = exp(z_mr ln f_r(T) / K),   f_r(T) = f298_r exp|g_r (1/T - 1/298)|,
// z_mr a standard normal draw, K the number of standard deviations the stated factor spans
// (1: f is a 1-sigma factor, the reading of the JPL evaluation's f; 2: a 2-sigma bound).
// So ln k is normal with standard deviation ln f(T) / K, and one draw per reaction holds at
// every altitude (a rate constant is wrong in the same direction everywhere).
//
// Sampling: Latin hypercube (McKay, Beckman and Conover 1979, Technometrics 21, 239): for
// every reaction the M members fall one into each of the M equal-probability strata of
// (0, 1), in a seeded random order; or plain random sampling. Uniforms come from a seeded
// 64-bit Mersenne Twister (std::mt19937_64, whose output sequence the C++ standard fixes)
// converted by our own code, so an ensemble is the same on every platform and rank count.
#pragma once

#include <cstddef>
#include <cstdint>
#include <span>
#include <string>
#include <vector>

#include "chem/mechanism.hpp"

namespace colchem {

enum class EnsembleSampling { kLatinHypercube, kRandom };

/// "latin_hypercube" or "random".
const char* sampling_name(EnsembleSampling s);

/// The standard normal quantile Phi^-1(u) for 0 < u < 1, to double precision (bisection on
/// Phi(x) = erfc(-x/sqrt 2)/2, polished by Newton steps).
double standard_normal_quantile(double u);

/// z[m * R + r], M members by R reactions (see the header comment).
std::vector<double> draw_standard_normals(std::size_t members, std::size_t reactions,
                                          std::uint64_t seed, EnsembleSampling sampling);

/// The q-quantile (0 <= q <= 1) of `values` by linear interpolation between order
/// statistics (definition 7 of Hyndman and Fan 1996, Am. Stat. 50, 361); NaN when empty.
double sample_quantile(std::vector<double> values, double q);

/// The percentiles every ensemble reports.
inline constexpr double kEnsemblePercentiles[] = {2.5, 16.0, 50.0, 84.0, 97.5};

}  // namespace colchem

namespace colchem {

/// Percentiles (kEnsemblePercentiles) over the members that converged: out[p][i] for every
/// entry i of the members' value vectors (all of one length; an empty vector is a failed
/// member and is left out). Entries of length 0 when no member converged.
std::vector<std::vector<double>> ensemble_percentiles(
    const std::vector<std::vector<double>>& member_values);

/// The standard deviation of ln k of one reaction at temperature T (see the header comment):
/// ln f(T) / sigmas, f(T) = RateUncertainty::factor.
double ensemble_log_sigma(const RateUncertainty& u, double T_K, double sigmas);

/// The rate factor of one reaction in one member at temperature T: exp(z ensemble_log_sigma).
double ensemble_rate_factor(double z, const RateUncertainty& u, double T_K, double sigmas);

}  // namespace colchem
