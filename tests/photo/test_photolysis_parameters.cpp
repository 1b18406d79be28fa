// Named parameters on photolysis data (threshold, onset width, yield, band strength,
// cross-section scale): loading, resolution against the mechanism, equality with the edited
// data, the exact band cut at the threshold, the near-threshold onset and dJ/dp.
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "../test_support.hpp"
#include "chem/mechanism.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/units.hpp"
#include "io/photolysis_loader.hpp"
#include "photo/photolysis_model.hpp"
#include "photo/spectral_binning.hpp"
#include "photo_test_support.hpp"

using namespace colchem;

namespace {

Parameter parameter(const std::string& name, double def, double lo, double hi, int line) {
  Parameter p;
  p.name = name;
  p.default_value = def;
  p.min = lo;
  p.max = hi;
  p.where = SourceLocation{"invented_mechanism.yaml", line, 5};
  return p;
}

/// An invented mechanism that declares the parameters the data below refer to.
Mechanism invented_mechanism() {
  Mechanism m;
  m.name = "invented";
  m.file = "invented_mechanism.yaml";
  m.parameters = {parameter("thr_kcal", 35.0, 30.0, 40.0, 3),
                  parameter("onset_kcal", 1.0, 0.0, 5.0, 4), parameter("phi_h", 0.8, 0.0, 1.0, 5),
                  parameter("band_scale", 1.0, 0.1, 10.0, 6),
                  parameter("k_scale", 1.0, 0.1, 10.0, 7)};
  return m;
}

const char* kParametricData = R"(description: invented absorbers for the parameter tests
absorbers:
  - species: H
    bands:
      - {label: invented, center: 742 nm, width: 200 cm-1, shape: lorentzian, oscillator_strength: {value: 1.0e-5, scale: band_scale}}
  - species: K
    cross_section: {table: k_flat.csv, scale: k_scale}
channels:
  - name: H_band
    absorber: H
    quantum_yield: {parameter: phi_h}
    threshold: {parameter: thr_kcal, unit: kcal/mol}
    onset_width: {parameter: onset_kcal, unit: kcal/mol}
  - {name: K_flat, absorber: K, quantum_yield: 1}
)";

PhotolysisSpec load_data(const std::string& name, const std::string& yaml, const Mechanism* m) {
  test::write_file("k_flat.csv",
                   "# invented\nwavelength [nm], cross_section [cm2]\n400, 1e-24\n1000, 1e-24\n");
  const auto file = test::write_file(name, yaml);
  const UnitSystem units;
  PhotolysisSpec s;
  load_photolysis_data(file, units, s);
  resolve_photolysis_parameters(s, m);
  s.bin_edges_nm.clear();
  for (double l = 500.0; l <= 900.0 + 1e-9; l += 5.0) s.bin_edges_nm.push_back(l);
  s.spectrum.table = test::flat_table(400.0, 1000.0, 1.0e14);
  s.illumination.zenith_angle_rad = 0.9;
  return s;
}

/// H at 1e-6 and K at 0.5 of the air: optical depths of order one in the band and the table.
std::vector<double> densities(const Background& bg) {
  std::vector<double> n;
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    n.push_back(1e-6 * bg.air_density_cm3[j]);
    n.push_back(0.5 * bg.air_density_cm3[j]);
  }
  return n;
}

std::vector<double> j_values(const PhotolysisSpec& s, const Background& bg,
                             const std::vector<double>& p) {
  PhotolysisModel m(s, bg, {"H", "K"}, p);
  std::vector<double> J(m.channels().size() * bg.grid.cells());
  m.compute(densities(bg), J);
  return J;
}

/// Composite Simpson rule of f on [a, b] with 2 k intervals.
template <class F>
double simpson(F f, double a, double b, int k = 20000) {
  const double h = (b - a) / (2.0 * k);
  double s = f(a) + f(b);
  for (int i = 1; i < 2 * k; ++i) s += (i % 2 ? 4.0 : 2.0) * f(a + i * h);
  return s * h / 3.0;
}

}  // namespace

TEST_CASE("a threshold given as an energy is the wavelength h c N_A / E", "[photo]") {
  const auto file = test::write_file("energy_threshold.yaml", R"(absorbers:
  - species: H
    bands: [{center: 742 nm, width: 10 nm, oscillator_strength: 1e-8}]
channels:
  - {name: H_kcal, absorber: H, threshold: 40 kcal/mol}
  - {name: H_kj, absorber: H, threshold: 167.36 kJ/mol}
  - {name: H_nm, absorber: H, threshold: 714.78 nm}
)");
  PhotolysisSpec s;
  load_photolysis_data(file, UnitSystem{}, s);
  // 1 kcal/mol = 349.755 cm-1 (thermochemical calorie; from memory): 1e7 / 13990.2 nm.
  CHECK(s.channels[0].threshold_nm == Approx(1.0e7 / (40.0 * 349.755)).epsilon(1e-5));
  CHECK(s.channels[1].threshold_nm ==
        Approx(s.channels[0].threshold_nm).epsilon(1e-9));  // 40 x 4.184 kJ (analytic)
  CHECK(s.channels[2].threshold_nm == Approx(714.78));
  CHECK(s.parameter_uses.empty());
}

TEST_CASE("a parameter acting on the data gives the J of the data edited to its value", "[photo]") {
  const Mechanism mech = invented_mechanism();
  const PhotolysisSpec param = load_data("parametric.yaml", kParametricData, &mech);
  REQUIRE(param.parameter_uses.size() == 5);
  // The same data with the values written in (threshold 38 kcal/mol, onset 2 kcal/mol, yield
  // 0.6, oscillator strength 1.5e-5, K cross section 2e-24 cm2).
  test::write_file("k_doubled.csv",
                   "# invented\nwavelength [nm], cross_section [cm2]\n400, 2e-24\n1000, 2e-24\n");
  const PhotolysisSpec edited = load_data("edited.yaml", R"(absorbers:
  - species: H
    bands:
      - {label: invented, center: 742 nm, width: 200 cm-1, shape: lorentzian, oscillator_strength: 1.5e-5}
  - species: K
    cross_section: {table: k_doubled.csv}
channels:
  - {name: H_band, absorber: H, quantum_yield: 0.6, threshold: 38 kcal/mol, onset_width: 2 kcal/mol}
  - {name: K_flat, absorber: K, quantum_yield: 1}
)",
                                          nullptr);
  const Background bg = test::flat_isothermal(20, 100.0);
  const std::vector<double> values{38.0, 2.0, 0.6, 1.5, 2.0};
  const auto Jp = j_values(param, bg, values);
  const auto Je = j_values(edited, bg, {});
  for (std::size_t i = 0; i < Jp.size(); ++i) {
    CHECK(Jp[i] == Approx(Je[i]).epsilon(1e-12));  // analytic: the same numbers, round-off
  }
  // And the parameter does act: the default values give another J (analytic: the threshold
  // moves by 3 kcal/mol across the band).
  const auto Jd = j_values(param, bg, mech.default_parameters());
  CHECK(Jd[0] > 1.5 * Jp[0]);
}

TEST_CASE("undeclared and unused parameters are refused with file and line", "[photo]") {
  Mechanism mech = invented_mechanism();
  // A reference to a parameter the mechanism does not declare: at the reference.
  const auto bad = test::write_file("undeclared.yaml", R"(absorbers:
  - species: H
    bands: [{center: 742 nm, width: 10 nm, oscillator_strength: 1e-8}]
channels:
  - {name: H_band, absorber: H, threshold: {parameter: thr_kcall, unit: kcal/mol}}
)");
  PhotolysisSpec s;
  load_photolysis_data(bad, UnitSystem{}, s);
  const std::string msg =
      colchem_test::located_error_of([&] { resolve_photolysis_parameters(s, &mech); });
  CHECK_THAT(msg, Catch::Contains("undeclared.yaml:5"));
  CHECK_THAT(msg, Catch::Contains("did you mean 'thr_kcal'"));
  // A declared parameter that nothing refers to: at its declaration (line 3 of the mechanism).
  PhotolysisSpec partial;
  load_photolysis_data(test::write_file("partial.yaml", R"(absorbers:
  - species: H
    bands: [{center: 742 nm, width: 10 nm, oscillator_strength: 1e-8}]
channels:
  - {name: H_band, absorber: H, threshold: 40 kcal/mol}
)"),
                       UnitSystem{}, partial);
  mech.parameters.resize(1);
  const std::string unused =
      colchem_test::located_error_of([&] { resolve_photolysis_parameters(partial, &mech); });
  CHECK_THAT(unused, Catch::Contains("invented_mechanism.yaml:3"));
  CHECK_THAT(unused, Catch::Contains("used by nothing"));
  try {
    resolve_photolysis_parameters(partial, &mech);
  } catch (const InputError& e) {
    CHECK(e.code() == ExitCode::kInputData);
  }
  // A value that leaves its physical range inside the parameter's bounds: a yield above 1.
  Mechanism wide = invented_mechanism();
  wide.parameters[2].max = 1.5;
  PhotolysisSpec p2;
  test::write_file("k_flat.csv",
                   "# invented\nwavelength [nm], cross_section [cm2]\n400, 1e-24\n1000, 1e-24\n");
  load_photolysis_data(test::write_file("parametric2.yaml", kParametricData), UnitSystem{}, p2);
  const std::string range =
      colchem_test::located_error_of([&] { resolve_photolysis_parameters(p2, &wide); });
  CHECK_THAT(range, Catch::Contains("a quantum yield from 0 to 1 for every value of 'phi_h'"));
}

TEST_CASE("a band is cut exactly at the threshold: the partial integral of its line shape",
          "[photo]") {
  // One 60 nm bin holding the threshold (720 nm) and the short-wave half of an invented
  // Lorentzian at 730 nm (FWHM 200 cm-1); a flat spectrum of 1e14 cm-2 s-1 nm-1, no absorber
  // in the column (unattenuated).
  const double S = band_strength_from_oscillator(1e-6);
  PhotolysisSpec s;
  s.bin_edges_nm = {700.0, 760.0};
  s.spectrum.table = test::flat_table(400.0, 1000.0, 1.0e14);
  AbsorberSpec a;
  a.species = "H";
  a.bands.push_back(OvertoneBandSpec{"invented", 730.0, 200.0, BandShape::kLorentzian, S});
  s.absorbers.push_back(a);
  s.channels.push_back(test::make_channel("H_cut", "H", 720.0));
  const Background bg = test::flat_isothermal(3, 30.0);
  std::vector<double> n(3, 0.0), J(3);
  PhotolysisModel(s, bg, {"H"}).compute(n, J);
  // Analytic: J = F dlambda / dnu~_bin S int_{nu~_t}^{nu~(700)} g, g Lorentzian of half
  // width 100 cm-1: the integral is [atan((nu~ - nu~0)/100)] / pi between the limits.
  const double nu0 = 1e7 / 730.0, nu_t = 1e7 / 720.0, nu_a = 1e7 / 700.0, nu_b = 1e7 / 760.0;
  const double part =
      (std::atan((nu_a - nu0) / 100.0) - std::atan((nu_t - nu0) / 100.0)) / constants::kPi;
  const double expected = 1e14 * 60.0 * S * part / (nu_a - nu_b);
  for (double j : J) CHECK(j == Approx(expected).epsilon(1e-12));

  // Bins wholly longward of the threshold: the band absorbs there (its wing) but photolyses
  // nothing (analytic: rho = 0).
  s.bin_edges_nm = {725.0, 760.0, 800.0};
  PhotolysisModel beyond(s, bg, {"H"});
  beyond.compute(n, J);
  for (double j : J) CHECK(j == 0.0);
  const auto wing = band_onto_bins(s.absorbers[0].bands[0], s.bin_edges_nm);
  CHECK(wing[0] > 0.0);
  CHECK(wing[1] > 0.0);
}

TEST_CASE("the near-threshold onset integrates the line shape times the linear yield", "[photo]") {
  // Independent check by quadrature (composite Simpson, 40000 intervals per bin).
  const std::vector<double> edges{700.0, 710.0, 716.0, 721.0, 740.0, 760.0};
  const double thr = 720.0, w = 150.0;  // nm, cm-1 (invented)
  const double nu_t = 1e7 / thr;
  auto rho = [&](double nu) { return std::clamp((nu - nu_t) / w, 0.0, 1.0); };
  for (const auto shape : {BandShape::kGaussian, BandShape::kLorentzian}) {
    const OvertoneBandSpec band{"invented", 715.0, 120.0, shape, 1.0e-18};
    const double nu0 = 1e7 / band.center_nm;
    auto g = [&](double nu) {
      const double d = nu - nu0;
      if (shape == BandShape::kLorentzian) return 60.0 / constants::kPi / (d * d + 3600.0);
      const double sd = 120.0 / (2.0 * std::sqrt(2.0 * std::log(2.0)));
      return std::exp(-0.5 * d * d / (sd * sd)) / (sd * std::sqrt(2.0 * constants::kPi));
    };
    const auto v = band_onto_bins_above(band, edges, thr, w);
    for (std::size_t b = 0; b + 1 < edges.size(); ++b) {
      const double hi = 1e7 / edges[b], lo = 1e7 / edges[b + 1];
      // rho has kinks at nu_t and nu_t + w: split the quadrature there.
      std::vector<double> cuts{lo};
      for (double c : {nu_t, nu_t + w}) {
        if (c > lo && c < hi) cuts.push_back(c);
      }
      cuts.push_back(hi);
      double q = 0.0;
      for (std::size_t k = 0; k + 1 < cuts.size(); ++k) {
        q += simpson([&](double nu) { return g(nu) * rho(nu); }, cuts[k], cuts[k + 1]);
      }
      CHECK(v[b] == Approx(1.0e-18 * q / (hi - lo)).epsilon(1e-9).margin(1e-40));
      // The wavelength average of rho used for tables (quadrature in wavelength).
      std::vector<double> lc{edges[b]};
      for (double c : {1e7 / (nu_t + w), thr}) {
        if (c > edges[b] && c < edges[b + 1]) lc.push_back(c);
      }
      lc.push_back(edges[b + 1]);
      double r = 0.0;
      for (std::size_t k = 0; k + 1 < lc.size(); ++k) {
        r += simpson([&](double l) { return rho(1e7 / l); }, lc[k], lc[k + 1]);
      }
      CHECK(onset_average(edges[b], edges[b + 1], thr, w) ==
            Approx(r / (edges[b + 1] - edges[b])).epsilon(1e-10).margin(1e-14));
    }
    // Beyond the threshold nothing (analytic).
    CHECK(v[4] == 0.0);
  }
}

TEST_CASE("dJ/dp matches a central difference of J for every parameter kind", "[photo]") {
  const Mechanism mech = invented_mechanism();
  const Background bg = test::flat_isothermal(20, 100.0);
  const std::vector<double> p0 = mech.default_parameters();
  const auto n = densities(bg);
  for (const int scheme : {0, 1, 2}) {  // plane-parallel, spherical, two-stream
    PhotolysisSpec s = load_data("parametric.yaml", kParametricData, &mech);
    if (scheme == 1) s.slant_path = SlantPath::kSpherical;
    if (scheme == 2) {
      s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
      s.radiative_transfer.surface_albedo = 0.3;
      s.rayleigh.push_back(RayleighSpec{"N2", 4.6e-27, 550.0, 4.0});
    }
    PhotolysisModel m(s, bg, {"H", "K"}, p0);
    const std::size_t N = bg.grid.cells();
    std::vector<double> dJ(2 * N);
    for (std::size_t p = 0; p < p0.size(); ++p) {
      INFO("scheme " << scheme << ", parameter " << mech.parameters[p].name);
      CHECK(m.acts_on(p));
      m.parameter_derivative(p, n, dJ);
      const double h = 1e-4 * p0[p];
      auto plus = p0, minus = p0;
      plus[p] += h;
      minus[p] -= h;
      const auto Jp = j_values(s, bg, plus);
      const auto Jm = j_values(s, bg, minus);
      for (std::size_t c = 0; c < 2; ++c) {
        double scale = 0.0;
        for (std::size_t j = 0; j < N; ++j)
          scale = std::max(scale, std::abs((Jp[c * N + j] - Jm[c * N + j]) / (2 * h)));
        for (std::size_t j = 0; j < N; ++j) {
          const double fd = (Jp[c * N + j] - Jm[c * N + j]) / (2 * h);
          // analytic vs central difference (truncation O(h^2), common practice, no source)
          CHECK(dJ[c * N + j] == Approx(fd).epsilon(1e-5).margin(1e-6 * scale + 1e-300));
        }
      }
    }
    // K_flat feels the band strength only through the optical depth: non-zero (analytic).
    m.parameter_derivative(3, n, dJ);
    CHECK(dJ[N + N / 2] < 0.0);
  }
}
