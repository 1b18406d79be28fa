// Box mode: one well-mixed cell at fixed T and p,
//   dn/dt = P(n) - L(n),   n(0) = n0,
// integrated with the stiff integrator of chem/stiff_integrator.hpp between output times.
#pragma once

#include <filesystem>
#include <map>
#include <string>
#include <utility>
#include <vector>

#include "chem/mechanism.hpp"
#include "chem/stiff_integrator.hpp"

namespace colchem {

struct BoxProblem {
  ChemistrySpec chemistry;
  double temperature_K = 0.0;
  double air_cm3 = 0.0;
  std::map<std::string, double> bulk_mole_fraction;
  std::vector<double> initial_cm3;                         ///< per species
  std::vector<std::pair<std::string, double>> photolysis;  ///< channel, J (s^-1)
  std::vector<double> times_s;  ///< output times, increasing, starting at 0
  StiffOptions solver;
};

/// A box-mode run: one well-mixed cell at fixed T and p (README.md, section Configuration reference
/// "Box mode").
struct BoxSpec {
  std::string name;
  std::string description;
  std::filesystem::path file;
  double temperature_K = 0.0;
  double pressure_dyn_cm2 = 0.0;
  double air_cm3 = 0.0;  ///< p / (k_B T)
  double duration_s = 0.0;
  std::size_t outputs = 50;
  bool log_spacing = true;
  double first_output_s = 0.0;  ///< log spacing: first output time (default duration 1e-6)
  std::map<std::string, double> bulk_mole_fraction;
  std::vector<double> initial_cm3;                         ///< per species (mechanism order)
  std::vector<std::pair<std::string, double>> photolysis;  ///< channel, J (s^-1)
  std::vector<std::string> report;  ///< reactions (ids) whose rates the summary prints
  ChemistrySpec chemistry;
  StiffOptions solver;
  std::filesystem::path output_file;
  std::string resolved_yaml;
  std::vector<std::string> overrides;
};

/// The box integration problem a box configuration describes (output times included).
BoxProblem box_problem(const BoxSpec& box);

struct BoxResult {
  std::vector<double> times_s;
  std::size_t species = 0, reactions = 0;
  std::vector<std::size_t> reaction_index;  ///< active reaction -> mechanism reaction
  std::vector<double> n_cm3;                ///< [t * S + s]
  std::vector<double> production;           ///< [t * S + s] cm^-3 s^-1
  std::vector<double> loss;                 ///< [t * S + s]
  std::vector<double> rates;                ///< [t * R + r] cm^-3 s^-1
  StiffStats stats;
};

/// Output times: 0, then `count` times up to `duration` (log-spaced from `first`, or
/// linear).
std::vector<double> box_output_times(double duration_s, std::size_t count, bool log_spacing,
                                     double first_s);

/// Integrates; throws RunError (kNotConverged) if the integrator fails.
BoxResult run_box(const BoxProblem& problem);

}  // namespace colchem
