// PhotolysisModel: hand sums, scaling, temperature interpolation, thresholds, bands.
#include <catch2/catch.hpp>

#include <cmath>
#include <vector>

#include "core/error.hpp"
#include "photo/photolysis_model.hpp"
#include "photo/spectral_binning.hpp"
#include "photo_test_support.hpp"

using namespace colchem;

namespace {

/// Three bins, a linear cross section and a linear spectrum (bin averages are then the
/// values at the bin centres).
PhotolysisSpec small_spec() {
  PhotolysisSpec s;
  s.bin_edges_nm = {200.0, 201.0, 203.0, 206.0};
  s.spectrum.table = TabulatedSpectrum{{200.0, 206.0}, {1.0e12, 4.0e12}, "invented"};
  AbsorberSpec a;
  a.species = "A";
  a.cross_section.tables.push_back(TabulatedSpectrum{{200.0, 206.0}, {1.0e-18, 4.0e-18}, "invented"});
  s.absorbers.push_back(a);
  auto ch = test::make_channel("A_products", "A", 204.5);
  ch.quantum_yield.value = 0.5;
  s.channels.push_back(ch);
  s.illumination.zenith_angle_rad = 0.0;
  return s;
}

double lin(double a, double b, double x) { return a + (b - a) * (x - 200.0) / 6.0; }

}  // namespace

TEST_CASE("unattenuated J equals the hand sum of sigma phi F", "[photo]") {
  const Background bg = test::flat_isothermal(4, 40.0);
  PhotolysisModel m(small_spec(), bg, {"A"});
  REQUIRE(m.channels() == std::vector<std::string>{"A_products"});
  std::vector<double> n(4, 0.0), J(4);
  m.compute(n, J);
  // Hand sum (analytic): centres 200.5, 202, 204.5 nm; widths 1, 2, 3 nm; phi = 0.5; the
  // last bin lies half short of the 204.5 nm threshold.
  double hand = 0.0;
  const double c[3] = {200.5, 202.0, 204.5}, w[3] = {1.0, 2.0, 3.0}, f[3] = {1.0, 1.0, 0.5};
  for (int b = 0; b < 3; ++b) hand += lin(1e-18, 4e-18, c[b]) * 0.5 * f[b] * lin(1e12, 4e12, c[b]) * w[b];
  for (double j : J) CHECK(j == Approx(hand).epsilon(1e-12));

  // 1/r^2: the same star seen from 2 au (analytic).
  PhotolysisModel far(small_spec(), test::flat_isothermal(4, 40.0, 250.0, 2.0), {"A"});
  far.compute(n, J);
  CHECK(J[0] == Approx(hand / 4.0).epsilon(1e-12));

  // The day fraction multiplies J and the actinic flux (analytic).
  auto half = small_spec();
  half.illumination.day_fraction = 0.5;
  PhotolysisModel hm(half, bg, {"A"});
  std::vector<double> F(4 * 3);
  hm.compute(n, J, F);
  CHECK(J[3] == Approx(0.5 * hand).epsilon(1e-12));
  CHECK(F[3 * 3 + 1] == Approx(0.5 * lin(1e12, 4e12, 202.0)).epsilon(1e-12));
}

TEST_CASE("attenuation follows Beer-Lambert along the slant path", "[photo]") {
  // Uniform absorber density in a 2-cell column, no column above the top (zero density in
  // the top cell): tau at the centre of the bottom cell is n sigma (dz/2) (analytic).
  const Background bg = test::flat_isothermal(2, 2.0);
  auto s = small_spec();
  s.illumination.zenith_angle_rad = std::acos(0.25);
  PhotolysisModel m(s, bg, {"A"});
  const double n_bottom = 1.0e13;
  std::vector<double> n{n_bottom, 0.0}, J(2);
  m.compute(n, J);
  double expect = 0.0;
  const double c[3] = {200.5, 202.0, 204.5}, w[3] = {1.0, 2.0, 3.0}, f[3] = {1.0, 1.0, 0.5};
  for (int b = 0; b < 3; ++b) {
    const double sigma = lin(1e-18, 4e-18, c[b]);
    const double tau = sigma * n_bottom * 0.5e5 / 0.25;
    expect += sigma * 0.5 * f[b] * lin(1e12, 4e12, c[b]) * w[b] * std::exp(-tau);
  }
  CHECK(J[0] == Approx(expect).epsilon(1e-12));
}

TEST_CASE("cross sections interpolate linearly in temperature, clamped to the range", "[photo]") {
  PhotolysisSpec s = small_spec();
  s.absorbers[0].cross_section.temperature_K = {200.0, 300.0};
  s.absorbers[0].cross_section.tables = {test::flat_table(190.0, 210.0, 1.0e-18),
                                         test::flat_table(190.0, 210.0, 3.0e-18)};
  s.channels[0].threshold_nm = 0.0;
  s.channels[0].quantum_yield.value = 1.0;
  std::vector<double> n(2, 0.0), J(2);
  auto j_at = [&](double T) {
    PhotolysisModel m(s, test::flat_isothermal(2, 10.0, T), {"A"});
    m.compute(n, J);
    return J[0];
  };
  // Photons in the three bins: int of the linear spectrum over 200-206 nm = 1.5e13.
  const double photons = 0.5 * (1e12 + 4e12) * 6.0;
  CHECK(j_at(250.0) == Approx(2.0e-18 * photons).epsilon(1e-12));  // analytic: midway
  CHECK(j_at(225.0) == Approx(1.5e-18 * photons).epsilon(1e-12));  // analytic
  CHECK(j_at(150.0) == Approx(1.0e-18 * photons).epsilon(1e-12));  // clamped (documented)
  CHECK(j_at(400.0) == Approx(3.0e-18 * photons).epsilon(1e-12));  // clamped (documented)
}

TEST_CASE("overtone bands photolyse only short of the threshold but always absorb", "[photo]") {
  // An invented band at 600 nm on 10 nm bins; a flat spectrum of 1e14 cm-2 s-1 nm-1.
  PhotolysisSpec s;
  for (double l = 500.0; l <= 700.0 + 1e-9; l += 10.0) s.bin_edges_nm.push_back(l);
  s.spectrum.table = test::flat_table(400.0, 800.0, 1.0e14);
  AbsorberSpec a;
  a.species = "B";
  a.bands.push_back(OvertoneBandSpec{"invented", 600.0, 50.0, BandShape::kGaussian,
                                     band_strength_from_oscillator(1e-6)});
  s.absorbers.push_back(a);
  AbsorberSpec c;
  c.species = "C";
  c.cross_section.tables.push_back(test::flat_table(400.0, 800.0, 1.0e-22));
  s.absorbers.push_back(c);
  s.channels.push_back(test::make_channel("B_below", "B", 550.0));  // band beyond threshold
  s.channels.push_back(test::make_channel("B_above", "B", 650.0));  // band short of it
  s.channels.push_back(test::make_channel("C_flat", "C"));
  const Background bg = test::flat_isothermal(3, 30.0);
  PhotolysisModel m(s, bg, {"B", "C"});
  std::vector<double> n(6, 0.0), J(9);
  m.compute(n, J);
  // Energy conservation: the photon must carry the dissociation energy (analytic).
  CHECK(J[0] == 0.0);
  // Short of the threshold the band photolyses with its whole strength:
  // J = sum_b sigma_b F dlambda_b ~ F S lambda0^2 (S in wavenumber space, lambda0 in cm; the
  // bins are 10 nm wide, so the wavenumber-to-wavelength Jacobian varies ~3 % across a bin).
  const double S = band_strength_from_oscillator(1e-6);
  CHECK(J[3] == Approx(1.0e14 * S * std::pow(600e-7, 2) * 1e7).epsilon(0.01));  // analytic
  // With much B in the top cell the band attenuates the light that C sees near 600 nm.
  n = {0.0, 0.0, 0.0, 0.0, 1.0e18, 0.0};
  std::vector<double> J2(9);
  m.compute(n, J2);
  CHECK(J2[2 * 3 + 0] < 0.95 * J[2 * 3 + 0]);
}

TEST_CASE("bulk gases absorb by mole fraction, other missing absorbers are errors", "[photo]") {
  const Background bg = test::flat_isothermal(5, 50.0);  // bulk: N2 = 1
  PhotolysisSpec s = small_spec();
  s.absorbers[0].species = std::string("N2");
  s.channels[0] = test::make_channel("A_products", "N2", 204.5);
  s.channels[0].quantum_yield.value = 0.5;
  PhotolysisModel bulk(s, bg, {});
  std::vector<double> none, Jb(5);
  bulk.compute(none, Jb);
  // The same as a model species "N2" given the air density (analytic identity).
  PhotolysisModel explicit_model(s, bg, {"N2"});
  std::vector<double> J(5);
  explicit_model.compute(bg.air_density_cm3, J);
  for (std::size_t j = 0; j < 5; ++j) CHECK(Jb[j] == Approx(J[j]).epsilon(1e-12));

  s.absorbers[0].species = std::string("Q");
  s.channels[0] = test::make_channel("A_products", "Q");
  CHECK_THROWS_AS(PhotolysisModel(s, bg, {"A"}), InputError);
}

TEST_CASE("Rayleigh extinction scales as lambda^-4", "[photo]") {
  // Transmission of the bottom cell centre through a pure Rayleigh atmosphere: the actinic
  // flux there is F exp(-sigma_R(lambda) N) with N the air column (analytic, bin average of
  // lambda^-4 taken exactly).
  const Background bg = test::flat_isothermal(50, 100.0);
  PhotolysisSpec s = small_spec();
  s.bin_edges_nm = {399.0, 401.0, 799.0, 801.0};
  s.spectrum.table = test::flat_table(300.0, 900.0, 1.0e14);
  s.absorbers.clear();
  s.channels.clear();
  s.rayleigh.push_back(RayleighSpec{"N2", 4.6e-27, 550.0, 4.0});  // from memory (N2 at 550 nm)
  PhotolysisModel m(s, bg, {});
  std::vector<double> none, J, F(50 * 3);
  m.compute(none, J, F);
  const double t400 = -std::log(F[0] / 1.0e14);
  const double t800 = -std::log(F[2] / 1.0e14);
  CHECK(t400 / t800 == Approx(16.0).epsilon(1e-4));  // analytic: (800/400)^4
}

TEST_CASE("prescribed J replaces the computed channel and has no state derivative",
          "[photo][prescribed]") {
  const Background bg = test::flat_isothermal(4, 40.0);
  auto spec = small_spec();
  spec.channels.push_back(test::make_channel("A_other", "A", 204.5));
  PhotolysisModel computed(spec, bg, {"A"});
  std::vector<double> n{1e13, 5e12, 2e12, 1e12}, J(8);
  computed.compute(n, J);

  // Channel 0 held at a value; channel 1 prescribed from a table that is linear in altitude
  // and covers the cells: linear interpolation reproduces it exactly (analytic).
  PrescribedJSpec held;
  held.channel = "A_products";
  held.channel_index = 0;
  held.held = true;
  held.value_s1 = 3.25e-6;
  PrescribedJSpec table;
  table.channel = "A_other";
  table.channel_index = 1;
  table.altitude_cm = {0.0, 100e5};
  table.j_s1 = {1e-6, 3e-6};
  table.source = "j.csv";
  auto pspec = spec;
  pspec.prescribed = {held, table};
  PhotolysisModel pm(pspec, bg, {"A"});
  CHECK(pm.prescribed(0));
  CHECK(pm.prescribed(1));
  std::vector<double> Jp(8);
  pm.compute(n, Jp);
  for (std::size_t j = 0; j < 4; ++j) {
    CHECK(Jp[j] == 3.25e-6);  // exactly the held value
    const double z = bg.grid.center_cm[j];
    CHECK(Jp[4 + j] == Approx(1e-6 + 2e-6 * z / 100e5).epsilon(1e-14));
  }
  // A prescribed J does not depend on the densities: the transposed Jacobian's product is 0.
  std::vector<double> u(8, 1.0), out(4, 0.0);
  pm.add_transpose_product(n, u, out);
  for (double v : out) CHECK(v == 0.0);
  // ... while the computed one does depend on them (the check can fail).
  std::vector<double> out_c(4, 0.0);
  computed.add_transpose_product(n, u, out_c);
  CHECK(out_c[3] != 0.0);

  // A table that does not cover the cell centres is an input error naming the file.
  table.altitude_cm = {0.0, 20e5};
  pspec.prescribed = {table};
  try {
    PhotolysisModel bad(pspec, bg, {"A"});
    FAIL("no error");
  } catch (const InputError& e) {
    CHECK_THAT(std::string(e.what()),
               Catch::StartsWith("j.csv: 'altitude': expected altitudes "
                                 "covering the model's cell centres (5 to 35 km)"));
  }
}
