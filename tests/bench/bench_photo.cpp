// Benchmark (not a test): J-values for L levels x B bins x 30 absorbers (one channel each),
// plane-parallel and spherical, fixed sun and an 8-point diurnal quadrature. Reports the
// time per compute() call and the scaling when bins or levels double, then the two-stream
// scheme (CO2 Rayleigh scattering, surface albedo 0.5) against the direct beam, both timed
// in the same run, alternately.
//   build/tests/bench/bench_photo
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/constants.hpp"
#include "photo/photolysis_model.hpp"

using namespace colchem;

namespace {

std::string species_name(int a) {
  std::string s = std::to_string(a);
  s.insert(s.begin(), 'S');  // (GCC 12 warns falsely on "S" + std::to_string(a))
  return s;
}

Background column(std::size_t levels) {
  BackgroundSpec s;
  s.planet = PlanetSpec{"bench planet (invented)", 6.05e8, 887.0, 0.72};
  s.grid = Grid::uniform(58e5, 178e5, levels);
  s.temperature_K = ProfileSpec{{58e5, 178e5}, {260.0, 170.0}, "invented"};
  s.base_pressure_dyn_cm2 = 3e5;
  s.base_altitude_cm = 58e5;
  s.bulk_mole_fraction = {{"CO2", 0.965}, {"N2", 0.035}};
  s.mean_molecular_mass_amu = 43.4;
  s.eddy_cm2_s = 1e5;
  return build_background(s);
}

PhotolysisSpec spec(std::size_t bins, SlantPath path, bool diurnal, bool two_stream = false) {
  PhotolysisSpec p;
  for (std::size_t b = 0; b <= bins; ++b) p.bin_edges_nm.push_back(100.0 + 900.0 * static_cast<double>(b) / static_cast<double>(bins));
  p.spectrum.table = TabulatedSpectrum{{100.0, 400.0, 1000.0}, {1e10, 1e15, 5e14}, "invented"};
  for (int a = 0; a < 30; ++a) {
    AbsorberSpec ab;
    ab.species = species_name(a);
    // Invented smooth cross sections; two temperatures for every third absorber.
    std::vector<double> wl, v1, v2;
    for (double l = 100.0; l <= 1000.0; l += 5.0) {
      wl.push_back(l);
      v1.push_back(1e-18 * std::exp(-std::pow((l - 150.0 - 20.0 * a) / 60.0, 2)) + 1e-24);
      v2.push_back(1.2 * v1.back());
    }
    ab.cross_section.tables.push_back(TabulatedSpectrum{wl, v1, "invented"});
    if (a % 3 == 0) {
      ab.cross_section.temperature_K = {200.0, 300.0};
      ab.cross_section.tables.push_back(TabulatedSpectrum{wl, v2, "invented"});
    }
    p.absorbers.push_back(ab);
    ChannelSpec ch;
    ch.name = ab.species;
    ch.name.append("_photo");
    ch.absorber = ab.species;
    ch.threshold_nm = 300.0 + 10.0 * a;
    p.channels.push_back(ch);
  }
  p.rayleigh.push_back(RayleighSpec{"CO2", 1.1e-26, 550.0, 4.0});
  p.slant_path = path;
  if (two_stream) {
    p.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
    p.radiative_transfer.surface_albedo = 0.5;
  }
  if (diurnal) {
    p.illumination.form = IlluminationForm::kDiurnal;
    p.illumination.latitude_rad = 0.3;
    p.illumination.hour_angle_points = 8;
  } else {
    p.illumination.zenith_angle_rad = 1.0;
    p.illumination.day_fraction = 0.5;
  }
  return p;
}

struct Setup {
  Background bg;
  PhotolysisModel model;
  std::vector<double> n, J;
  Setup(std::size_t levels, std::size_t bins, SlantPath path, bool diurnal, bool two_stream)
      : bg(column(levels)),
        model(spec(bins, path, diurnal, two_stream), bg, names()),
        n(levels * 30),
        J(30 * levels) {
    for (std::size_t j = 0; j < levels; ++j) {
      for (std::size_t s = 0; s < 30; ++s)
        n[j * 30 + s] =
            1e9 * bg.air_density_cm3[j] / bg.air_density_cm3[0] * (1.0 + static_cast<double>(s));
    }
    model.compute(n, J);  // warm up
  }
  static std::vector<std::string> names() {
    std::vector<std::string> v;
    for (int a = 0; a < 30; ++a) v.push_back(species_name(a));
    return v;
  }
  /// Seconds per compute() call, over calls lasting at least `seconds` in all.
  double time(double seconds) {
    int reps = 0;
    const auto t0 = std::chrono::steady_clock::now();
    double elapsed = 0.0;
    do {
      model.compute(n, J);
      ++reps;
      elapsed = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    } while (elapsed < seconds);
    return elapsed / reps;
  }
};

double time_call(std::size_t levels, std::size_t bins, SlantPath path, bool diurnal,
                 bool two_stream = false) {
  Setup s(levels, bins, path, diurnal, two_stream);
  return s.time(0.5);
}

double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}

}  // namespace

int main() {
  std::printf("PhotolysisModel::compute, 30 absorbers and 30 channels\n");
  std::printf("%-22s %7s %6s %12s\n", "case", "levels", "bins", "ms per call");
  struct Case { const char* name; SlantPath path; bool diurnal; };
  const Case cases[] = {{"plane-parallel, fixed", SlantPath::kPlaneParallel, false},
                        {"plane-parallel, 8 h", SlantPath::kPlaneParallel, true},
                        {"spherical, fixed", SlantPath::kSpherical, false}};
  for (const auto& c : cases) {
    const double base = time_call(120, 500, c.path, c.diurnal);
    const double bins2 = time_call(120, 1000, c.path, c.diurnal);
    const double levels2 = time_call(240, 500, c.path, c.diurnal);
    std::printf("%-22s %7d %6d %12.3f\n", c.name, 120, 500, 1e3 * base);
    std::printf("%-22s %7d %6d %12.3f  (x%.2f for 2x bins)\n", c.name, 120, 1000, 1e3 * bins2, bins2 / base);
    std::printf("%-22s %7d %6d %12.3f  (x%.2f for 2x levels)\n", c.name, 240, 500, 1e3 * levels2, levels2 / base);
  }
  // Both models built once and timed alternately, 7 rounds of at least 0.2 s each, so that
  // a change of the machine's load falls on both alike; the ratio is that of the rounds'
  // medians (min and max of the per-round ratios beside it).
  std::printf(
      "\ntwo-stream against direct beam, 120 levels x 500 bins x 30 absorbers, "
      "7 alternating rounds\n");
  std::printf("%-22s %12s %12s %8s %16s\n", "case", "direct ms", "2-stream ms", "ratio",
              "round ratios");
  for (const auto& c : cases) {
    Setup direct(120, 500, c.path, c.diurnal, false);
    Setup two(120, 500, c.path, c.diurnal, true);
    std::vector<double> td, tt, r;
    for (int round = 0; round < 7; ++round) {
      td.push_back(direct.time(0.2));
      tt.push_back(two.time(0.2));
      r.push_back(tt.back() / td.back());
    }
    const double md = median(td), mt = median(tt);
    std::printf("%-22s %12.3f %12.3f %8.2f %7.2f-%-7.2f\n", c.name, 1e3 * md, 1e3 * mt, mt / md,
                *std::min_element(r.begin(), r.end()), *std::max_element(r.begin(), r.end()));
  }
  return 0;
}
