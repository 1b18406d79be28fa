// The background column (hydrostatic p, n_a = p/(k_B T), H_a = k_B T/(m g), g(z)): equations,
// units and sources in core/background.hpp and core/ideal_gas.hpp.
#include "core/background.hpp"

#include <algorithm>
#include <array>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/ideal_gas.hpp"
#include "core/interp.hpp"

namespace colchem {

double AltitudeValue::at(double altitude_cm) const {
  if (!from_table()) return constant;
  return interp_linear_hold(table.altitude_cm, table.value, altitude_cm);
}

double surface_gravity_from_mass(double mass_g, double radius_cm) {
  return constants::kGravitational * mass_g / (radius_cm * radius_cm);
}

double planet_mass_g(const PlanetSpec& planet) {
  return planet.surface_gravity_cm_s2 * planet.radius_cm * planet.radius_cm /
         constants::kGravitational;
}

double gravity_at(const PlanetSpec& p, double z_cm) {
  const double r = p.radius_cm / (p.radius_cm + z_cm);
  return p.surface_gravity_cm_s2 * r * r;
}

namespace {
// 6-point Gauss-Legendre nodes and weights on [-1, 1] (Abramowitz and Stegun 1964, table 25.4).
constexpr std::array<double, 6> kGLx{-0.9324695142031521, -0.6612093864662645,
                                     -0.2386191860831969, 0.2386191860831969,
                                     0.6612093864662645,  0.9324695142031521};
constexpr std::array<double, 6> kGLw{0.1713244923791704, 0.3607615730481386,
                                     0.4679139345726910, 0.4679139345726910,
                                     0.3607615730481386, 0.1713244923791704};

std::vector<double> at_points(const ProfileSpec& prof, const std::vector<double>& z,
                              InterpScale scale, Extrapolation policy) {
  std::size_t bad = 0;
  auto v = interpolate(prof.altitude_cm, prof.value, z, scale, policy, &bad);
  if (!v) {
    throw std::out_of_range("altitude " + std::to_string(z[bad] / constants::kCmPerKm) +
                            " km lies outside the table " + prof.source);
  }
  return *v;
}
}  // namespace

double hydrostatic_log_ratio(const PlanetSpec& planet, double m_g,
                             const std::vector<double>& t_alt_cm,
                             const std::vector<double>& t_K, double z_from, double z_to) {
  if (z_from == z_to) return 0.0;
  const double lo = std::min(z_from, z_to);
  const double hi = std::max(z_from, z_to);
  // Breakpoints: the interval ends and every table point inside (T has a kink there).
  std::vector<double> pts{lo};
  for (double zt : t_alt_cm) {
    if (zt > lo && zt < hi) pts.push_back(zt);
  }
  pts.push_back(hi);
  double integral = 0.0;
  for (std::size_t k = 0; k + 1 < pts.size(); ++k) {
    const double a = pts[k];
    const double b = pts[k + 1];
    const double half = 0.5 * (b - a);
    const double mid = 0.5 * (a + b);
    double s = 0.0;
    for (std::size_t q = 0; q < kGLx.size(); ++q) {
      const double z = mid + half * kGLx[q];
      const double T = interp_linear_hold(t_alt_cm, t_K, z);
      s += kGLw[q] * m_g * gravity_at(planet, z) / (constants::kBoltzmann * T);
    }
    integral += half * s;
  }
  return z_to > z_from ? -integral : integral;
}

Background build_background(const BackgroundSpec& spec) {
  Background bg;
  bg.grid = spec.grid;
  bg.planet = spec.planet;
  bg.bulk_mole_fraction = spec.bulk_mole_fraction;
  bg.molecule_mass_g = spec.mean_molecular_mass_amu * constants::kAtomicMassUnit;
  const auto& zc = spec.grid.center_cm;
  const auto& ze = spec.grid.edge_cm;

  bg.temperature_K = at_points(spec.temperature_K, zc, InterpScale::kLinear, spec.extrapolation);
  bg.edge_temperature_K =
      at_points(spec.temperature_K, ze, InterpScale::kLinear, spec.extrapolation);

  auto gravity = [&](const std::vector<double>& z) {
    std::vector<double> g(z.size());
    for (std::size_t i = 0; i < z.size(); ++i) g[i] = gravity_at(spec.planet, z[i]);
    return g;
  };
  bg.gravity_cm_s2 = gravity(zc);
  bg.edge_gravity_cm_s2 = gravity(ze);

  auto pressure = [&](const std::vector<double>& z) {
    if (spec.pressure_mode == PressureMode::kTable) {
      return at_points(spec.pressure_dyn_cm2, z, InterpScale::kLog, spec.extrapolation);
    }
    std::vector<double> p(z.size());
    for (std::size_t i = 0; i < z.size(); ++i) {
      p[i] = spec.base_pressure_dyn_cm2 *
             std::exp(hydrostatic_log_ratio(spec.planet, bg.molecule_mass_g,
                                            spec.temperature_K.altitude_cm,
                                            spec.temperature_K.value, spec.base_altitude_cm,
                                            z[i]));
    }
    return p;
  };
  bg.pressure_dyn_cm2 = pressure(zc);
  bg.edge_pressure_dyn_cm2 = pressure(ze);

  const std::size_t n = zc.size();
  bg.air_density_cm3.resize(n);
  bg.scale_height_cm.resize(n);
  for (std::size_t j = 0; j < n; ++j) {
    bg.air_density_cm3[j] = ideal_gas_density(bg.pressure_dyn_cm2[j], bg.temperature_K[j]);
    bg.scale_height_cm[j] =
        scale_height(bg.temperature_K[j], bg.molecule_mass_g, bg.gravity_cm_s2[j]);
  }
  bg.edge_air_density_cm3.resize(ze.size());
  for (std::size_t j = 0; j < ze.size(); ++j) {
    bg.edge_air_density_cm3[j] =
        ideal_gas_density(bg.edge_pressure_dyn_cm2[j], bg.edge_temperature_K[j]);
  }

  auto eddy = [&](const std::vector<double>& z, const std::vector<double>& na) {
    switch (spec.eddy_form) {
      case EddyForm::kConstant:
        return std::vector<double>(z.size(), spec.eddy_cm2_s);
      case EddyForm::kTable:
        return at_points(spec.eddy_table_cm2_s, z, InterpScale::kLog, spec.extrapolation);
      case EddyForm::kDensityPower: {
        const double n0 = bg.edge_air_density_cm3.front();
        std::vector<double> k(z.size());
        for (std::size_t i = 0; i < z.size(); ++i) {
          k[i] = spec.eddy_cm2_s * std::pow(n0 / na[i], spec.eddy_exponent);
          if (spec.eddy_max_cm2_s > 0.0) k[i] = std::min(k[i], spec.eddy_max_cm2_s);
        }
        return k;
      }
    }
    throw std::logic_error("unhandled eddy diffusion form");
  };
  bg.eddy_cm2_s = eddy(zc, bg.air_density_cm3);
  bg.edge_eddy_cm2_s = eddy(ze, bg.edge_air_density_cm3);
  return bg;
}

}  // namespace colchem
