// Bin averaging, energy-to-photon conversion, overtone bands and the Planck spectrum.
#include <catch2/catch.hpp>

#include <cmath>

#include "core/constants.hpp"
#include "photo/photon_energy.hpp"
#include "photo/spectral_binning.hpp"

using namespace colchem;

TEST_CASE("bin averaging conserves the integral of a piecewise-linear table", "[photo]") {
  // An uneven table and bins that straddle its points and its ends.
  TabulatedSpectrum t{{200.0, 203.5, 207.0, 211.2, 215.0}, {1.0, 4.0, 2.0, 6.0, 3.0}, "invented"};
  const std::vector<double> edges{195.0, 201.0, 202.0, 205.5, 209.0, 214.0, 220.0};
  const auto v = bin_average(t, edges);
  double binned = 0.0;
  for (std::size_t b = 0; b < v.size(); ++b) binned += v[b] * (edges[b + 1] - edges[b]);
  // Analytic: the trapezoid sum of the table (the bins cover the whole table).
  double exact = 0.0;
  for (std::size_t i = 0; i + 1 < t.value.size(); ++i) {
    exact += 0.5 * (t.value[i] + t.value[i + 1]) * (t.wavelength_nm[i + 1] - t.wavelength_nm[i]);
  }
  CHECK(binned == Approx(exact).epsilon(1e-13));  // analytic
  // First bin: zero below 200 nm, the table from 200 to 201 nm: (1 + 1 + 3/3.5) / 2 over 6 nm.
  CHECK(v[0] == Approx(0.5 * (1.0 + (1.0 + 3.0 / 3.5)) * 1.0 / 6.0).epsilon(1e-13));  // analytic
  // A bin wholly outside the table is zero.
  const std::vector<double> outside{300.0, 310.0};
  CHECK(bin_average(t, outside)[0] == 0.0);  // analytic (zero outside the table)
}

TEST_CASE("energy fluxes become photon fluxes with E = h c / lambda", "[photo]") {
  // Constant energy flux E over [400, 500] nm: photons = E / (h c) * int lambda dlambda.
  const double E = 1000.0;  // erg cm-2 s-1 nm-1
  const auto t = TabulatedSpectrum{{400.0, 500.0}, {E, E}, "invented"};
  const std::vector<double> edges{400.0, 450.0, 500.0};
  const auto p = bin_average_photons_from_energy(t, edges);
  const double hc = constants::kPlanck * constants::kSpeedOfLight;
  // analytic: mean wavelength of the bin is its centre for a constant E
  CHECK(p[0] == Approx(E * 425e-7 / hc).epsilon(1e-13));
  CHECK(p[1] == Approx(E * 475e-7 / hc).epsilon(1e-13));
}

TEST_CASE("an overtone band's integrated cross section round-trips from f", "[photo]") {
  // S = pi e^2 / (m_e c^2) f = 8.85e-13 f cm (Hilborn 1982, Am. J. Phys. 50, 982, from
  // memory; classical electron radius times pi: 2.818e-13 cm * pi = 8.853e-13 cm, CODATA 2018).
  CHECK(band_strength_from_oscillator(1.0) == Approx(8.853e-13).epsilon(1e-3));
  const double f = 3.0e-9;
  for (BandShape shape : {BandShape::kGaussian, BandShape::kLorentzian}) {
    OvertoneBandSpec band{"invented v=5 band", 610.0, 120.0, shape,
                          band_strength_from_oscillator(f)};
    std::vector<double> edges;
    for (double l = 400.0; l <= 1000.0 + 1e-9; l += 1.0) edges.push_back(l);
    const auto s = band_onto_bins(band, edges);
    double integral = 0.0;  // sum sigma_b dnu~_b
    for (std::size_t b = 0; b < s.size(); ++b) integral += s[b] * (1e7 / edges[b] - 1e7 / edges[b + 1]);
    // Analytic: the whole strength for a Gaussian; a Lorentzian loses its far wings outside
    // 10000-25000 cm-1: (1/pi)(atan(x1/g) + atan(x2/g)) with g = 60 cm-1.
    const double nu0 = 1e7 / 610.0;
    const double inside =
        shape == BandShape::kGaussian
            ? 1.0
            : (std::atan((25000.0 - nu0) / 60.0) + std::atan((nu0 - 10000.0) / 60.0)) / constants::kPi;
    CHECK(integral == Approx(8.853e-13 * f * inside).epsilon(2e-3));     // Hilborn 1982 (above)
    CHECK(integral == Approx(band.strength_cm * inside).epsilon(1e-9));  // analytic
    // Peak value of a Gaussian: S / (sigma sqrt(2 pi)), sigma = FWHM / 2.3548 (analytic).
    if (shape == BandShape::kGaussian) {
      const std::size_t peak = 210;  // bin 610-611 nm
      const double sd = 120.0 / (2.0 * std::sqrt(2.0 * std::log(2.0)));
      const double nu_c = 1e7 / 610.5;
      const double g = std::exp(-0.5 * std::pow((nu_c - nu0) / sd, 2)) / (sd * std::sqrt(2 * constants::kPi));
      // The bin holds the average over its 27 cm-1; curvature makes it differ from the
      // centre value by (dnu~/sd)^2 / 24, about 1.2 % here (analytic).
      CHECK(s[peak] == Approx(band.strength_cm * g).epsilon(0.02));
      CHECK(s[peak] < band.strength_cm * g);
    }
  }
}

TEST_CASE("threshold fractions of a bin", "[photo]") {
  CHECK(fraction_below(200.0, 210.0, 0.0) == 1.0);    // analytic: no threshold
  CHECK(fraction_below(200.0, 210.0, 219.0) == 1.0);  // analytic: bin wholly short of it
  CHECK(fraction_below(220.0, 230.0, 219.0) == 0.0);  // analytic: wholly beyond
  CHECK(fraction_below(215.0, 225.0, 219.0) == Approx(0.4));  // analytic
}

TEST_CASE("Planck photon flux integrates to the analytic photon and energy totals", "[photo]") {
  // Photon flux at 1 au from a black body of radius R:
  //   int F dlambda = (R/au)^2 * 4 pi zeta(3) (k T / (h c))^3 c,
  //   int F h c / lambda dlambda = (R/au)^2 sigma_SB T^4     (analytic; Rybicki and Lightman 1979).
  const double T = 5772.0;
  const double R = 6.957e10;
  std::vector<double> edges{20.0};
  while (edges.back() < 2.0e6) edges.push_back(edges.back() * 1.01);
  const auto F = planck_photon_flux_1au(T, R, edges);
  double photons = 0.0;
  double energy = 0.0;
  const double hc = constants::kPlanck * constants::kSpeedOfLight;
  for (std::size_t b = 0; b < F.size(); ++b) {
    const double w = edges[b + 1] - edges[b];
    photons += F[b] * w;
    energy += F[b] * w * hc / (std::sqrt(edges[b] * edges[b + 1]) * 1e-7);
  }
  const double dil = std::pow(R / constants::kAstronomicalUnit, 2);
  const double zeta3 = 1.2020569031595942;
  const double x = constants::kBoltzmann * T / hc;
  const double photons_exact = dil * 4.0 * constants::kPi * zeta3 * x * x * x * constants::kSpeedOfLight;
  const double sigma_sb = 2.0 * std::pow(constants::kPi, 5) * std::pow(constants::kBoltzmann, 4) *
                          constants::kSpeedOfLight / (15.0 * std::pow(hc, 3));
  CHECK(photons == Approx(photons_exact).epsilon(1e-4));  // analytic
  // Energy uses the bin's geometric-mean wavelength (1 % wide bins): accurate to ~1e-5.
  CHECK(energy == Approx(dil * sigma_sb * std::pow(T, 4)).epsilon(1e-4));  // analytic
  // The Sun's constant at 1 au for 5772 K and 1 R_sun: 1361 W m-2 (IAU 2015 nominal
  // solar constant), i.e. 1.361e6 erg cm-2 s-1.
  CHECK(energy == Approx(1.361e6).epsilon(2e-3));
}

TEST_CASE("uniform bin edges take whole bins only; bad edge lists are named", "[photo]") {
  const auto e = uniform_bin_edges(100.0, 110.0, 2.5);
  REQUIRE(e.size() == 5);
  CHECK(e[1] == Approx(102.5));
  CHECK(e.back() == 110.0);
  CHECK(uniform_bin_edges(100.0, 110.0, 3.0).empty());  // 3.33 bins
  CHECK(uniform_bin_edges(100.0, 300100.0, 1.0).empty());  // 300000 bins, above 200000
  CHECK(bin_edges_problem(std::vector<double>{1.0}).first == "at least two bin edges");
  const auto decrease = bin_edges_problem(std::vector<double>{1.0, 2.0, 2.0});
  CHECK(decrease.first == "edges increasing strictly");
  CHECK(decrease.second == "a decrease at entry 2");
  CHECK(bin_edges_problem(std::vector<double>{0.0, 2.0}).first == "positive wavelengths");
  CHECK(bin_edges_problem(std::vector<double>{100.0, 200.0}).first.empty());
}

TEST_CASE("energy units convert to wavenumbers; other units are refused", "[photo]") {
  const UnitSystem units;
  // 1 kcal/mol = 349.76 cm^-1 (thermochemical calorie; from memory).
  CHECK(*wavenumber_per_energy_unit(units, "kcal/mol") == Approx(349.76).epsilon(1e-4));
  CHECK(*wavenumber_per_energy_unit(units, "kJ/mol") == Approx(349.76 / 4.184).epsilon(1e-4));
  CHECK(*wavenumber_per_energy_unit(units, "eV") == Approx(8065.54).epsilon(1e-5));
  CHECK(*wavenumber_per_energy_unit(units, "cm-1") == 1.0);
  CHECK_FALSE(wavenumber_per_energy_unit(units, "nm").has_value());
}
