// The background column: gravity, temperature, pressure, air density, eddy diffusion.
//
//   g(z) = g_s (R / (R + z))^2
//   d ln p / dz = -m g(z) / (k_B T(z)),   n_a = p / (k_B T),   H_a = k_B T / (m g)
// (Chamberlain and Hunten 1987, Theory of Planetary Atmospheres, ch. 1). T(z) is piecewise
// linear between table points; ln p is integrated with 6-point Gauss-Legendre quadrature on
// every interval between table points, whose error for a linear T and inverse-square g is
// below 1e-12 relative (tests/core/test_background.cpp compares with the closed form).
// Units: cgs inside (cm, g, s, K, dyn cm^-2).
#pragma once

#include <map>
#include <string>
#include <vector>

#include "core/grid.hpp"
#include "core/interp.hpp"

namespace colchem {

struct PlanetSpec {
  std::string name;
  double radius_cm = 0.0;
  double surface_gravity_cm_s2 = 0.0;  ///< at radius R (z = 0)
  double star_distance_au = 1.0;
};

/// A tabulated profile already converted to internal units.
struct ProfileSpec {
  std::vector<double> altitude_cm;
  std::vector<double> value;
  std::string source;  ///< file it came from (for error messages and provenance)
};

/// A value per altitude: a constant, or a table interpolated linearly (ends held).
struct AltitudeValue {
  double constant = 0.0;
  ProfileSpec table;  ///< used when table.altitude_cm is not empty
  [[nodiscard]] bool from_table() const { return !table.altitude_cm.empty(); }
  [[nodiscard]] double at(double altitude_cm) const;
};

enum class PressureMode { kHydrostatic, kTable };
enum class EddyForm { kConstant, kTable, kDensityPower };

struct BackgroundSpec {
  PlanetSpec planet;
  Grid grid;
  Extrapolation extrapolation = Extrapolation::kForbid;
  ProfileSpec temperature_K;

  PressureMode pressure_mode = PressureMode::kHydrostatic;
  double base_pressure_dyn_cm2 = 0.0;  ///< hydrostatic: p at base_altitude_cm
  double base_altitude_cm = 0.0;
  ProfileSpec pressure_dyn_cm2;  ///< table mode (log-linear interpolation)

  std::map<std::string, double> bulk_mole_fraction;  ///< e.g. CO2: 0.965, N2: 0.035
  double mean_molecular_mass_amu = 0.0;             ///< from the bulk composition or given

  EddyForm eddy_form = EddyForm::kConstant;
  double eddy_cm2_s = 0.0;           ///< constant value, or K at the grid bottom (density_power)
  double eddy_exponent = 0.5;        ///< density_power: K = K0 (n_a(z_bottom) / n_a(z))^exponent
  double eddy_max_cm2_s = 0.0;       ///< density_power cap; 0 = none
  ProfileSpec eddy_table_cm2_s;      ///< table mode (log-linear interpolation)
};

/// The computed background, at cell centres and at cell edges.
struct Background {
  Grid grid;
  PlanetSpec planet;
  double molecule_mass_g = 0.0;
  std::map<std::string, double> bulk_mole_fraction;

  std::vector<double> gravity_cm_s2, temperature_K, pressure_dyn_cm2, air_density_cm3,
      scale_height_cm, eddy_cm2_s;  ///< centres
  std::vector<double> edge_gravity_cm_s2, edge_temperature_K, edge_pressure_dyn_cm2,
      edge_air_density_cm3, edge_eddy_cm2_s;  ///< edges
};

/// Gravity at altitude z above the reference radius, g = g_s (R/(R + z))^2.
double gravity_at(const PlanetSpec& p, double z_cm);
/// Surface gravity g_s = G M / R^2 (cm s^-2) of a planet of mass M (g) and radius R (cm).
double surface_gravity_from_mass(double mass_g, double radius_cm);
/// The planet's mass M = g_s R^2 / G (g) from its surface gravity and radius (the inverse).
double planet_mass_g(const PlanetSpec& planet);

/// ln(p(z_to)/p(z_from)) for a hydrostatic column with piecewise-linear T through
/// (t_alt_cm, t_K) (end values held outside), molecule mass m_g and gravity g(z).
double hydrostatic_log_ratio(const PlanetSpec& planet, double m_g,
                             const std::vector<double>& t_alt_cm,
                             const std::vector<double>& t_K, double z_from, double z_to);

/// Builds the background. Throws std::out_of_range naming the profile when a grid point
/// lies outside a table and extrapolation is forbidden (the loader turns it into an
/// InputError; it checks ranges first).
Background build_background(const BackgroundSpec& spec);

}  // namespace colchem
