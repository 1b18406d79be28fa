// Helpers shared by the photolysis tests: small backgrounds and hand-built specs.
#pragma once

#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "photo/photolysis_spec.hpp"

namespace colchem::test {

/// An isothermal column on a planet so large that gravity is constant: the air is an exact
/// exponential atmosphere of scale height k T / (m g).
inline Background flat_isothermal(std::size_t cells, double top_km, double T = 250.0,
                                  double star_au = 1.0) {
  BackgroundSpec s;
  s.planet.name = "flat test planet (invented)";
  s.planet.radius_cm = 1.0e15;
  s.planet.surface_gravity_cm_s2 = 980.0;
  s.planet.star_distance_au = star_au;
  s.grid = Grid::uniform(0.0, top_km * constants::kCmPerKm, cells);
  s.temperature_K.altitude_cm = {0.0, top_km * constants::kCmPerKm};
  s.temperature_K.value = {T, T};
  s.temperature_K.source = "isothermal";
  s.base_pressure_dyn_cm2 = 1.0e6;
  s.bulk_mole_fraction = {{"N2", 1.0}};
  s.mean_molecular_mass_amu = 28.0;
  s.eddy_cm2_s = 1.0e5;
  return build_background(s);
}

/// A table of a constant value over [lo, hi] nm.
inline TabulatedSpectrum flat_table(double lo, double hi, double v) {
  return TabulatedSpectrum{{lo, hi}, {v, v}, "flat test table (invented)"};
}

/// A channel with yield 1 (built by construction: GCC 12 warns falsely (-Wrestrict) on
/// assigning short literals to members here).
inline ChannelSpec make_channel(std::string name, std::string absorber, double threshold_nm = 0.0) {
  ChannelSpec c{std::move(name), std::move(absorber), {}, {}, 1.0, threshold_nm};
  return c;
}

inline std::filesystem::path write_file(const std::string& name, const std::string& text) {
  const std::filesystem::path dir = std::filesystem::path(COLCHEM_TEST_OUTPUT_DIR) / "photo";
  std::filesystem::create_directories(dir);
  const auto p = dir / name;
  std::ofstream(p) << text;
  return p;
}

}  // namespace colchem::test
