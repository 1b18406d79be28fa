#include "app/summary.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/constants.hpp"

namespace colchem::app {

namespace {
std::pair<double, double> range(const std::vector<double>& v) {
  const auto [lo, hi] = std::minmax_element(v.begin(), v.end());
  return {*lo, *hi};
}
}  // namespace

std::string summarize_scenario(const Scenario& sc, const Background& bg) {
  using constants::kCmPerKm;
  std::string s;
  s += fmt::format("scenario   {}\n", sc.name);
  if (!sc.description.empty()) s += fmt::format("           {}\n", sc.description);
  s += fmt::format("planet     {}: radius {:.1f} km, g {:.3f} m/s2, {:.3f} au from its star\n",
                   bg.planet.name, bg.planet.radius_cm / kCmPerKm,
                   bg.planet.surface_gravity_cm_s2 / 100.0, bg.planet.star_distance_au);
  const auto& g = bg.grid;
  s += fmt::format("grid       {} cells, {:.2f} to {:.2f} km", g.cells(),
                   g.edge_cm.front() / kCmPerKm, g.edge_cm.back() / kCmPerKm);
  double wmin = 1e300, wmax = 0.0;
  for (std::size_t j = 0; j < g.cells(); ++j) {
    wmin = std::min(wmin, g.width_cm(j));
    wmax = std::max(wmax, g.width_cm(j));
  }
  s += wmin == wmax ? fmt::format(", dz {:.3f} km\n", wmin / kCmPerKm)
                    : fmt::format(", dz {:.3f} to {:.3f} km\n", wmin / kCmPerKm, wmax / kCmPerKm);
  std::string comp;
  for (const auto& [sp, x] : bg.bulk_mole_fraction) {
    comp += fmt::format("{}{} {:.4g}", comp.empty() ? "" : ", ", sp, x);
  }
  s += fmt::format("bulk       {} (mean mass {:.3f} amu)\n", comp,
                   bg.molecule_mass_g / constants::kAtomicMassUnit);
  const auto [tlo, thi] = range(bg.temperature_K);
  s += fmt::format("T          {:.1f} to {:.1f} K\n", tlo, thi);
  s += fmt::format("p          {:.4g} Pa (bottom cell) to {:.4g} Pa (top cell)\n",
                   bg.pressure_dyn_cm2.front() * constants::kPaPerBarye,
                   bg.pressure_dyn_cm2.back() * constants::kPaPerBarye);
  s += fmt::format("n_air      {:.4g} to {:.4g} cm-3\n", bg.air_density_cm3.front(),
                   bg.air_density_cm3.back());
  const auto [klo, khi] = range(bg.eddy_cm2_s);
  s += fmt::format("K_eddy     {:.3g} to {:.3g} cm2/s\n", klo, khi);
  s += fmt::format("H_air      {:.2f} km (bottom) to {:.2f} km (top)\n",
                   bg.scale_height_cm.front() / kCmPerKm, bg.scale_height_cm.back() / kCmPerKm);
  s += fmt::format("output     {}\n", sc.output.file.string());
  return s;
}

}  // namespace colchem::app
