// PhotolysisModel with the two-stream scheme: pure absorption reproduces the direct beam,
// a Lambertian surface under a transparent atmosphere gives 1 + 2 A mu0, J is a smooth
// function of the densities, and the radiative_transfer keys load (and fail) as documented.
#include <catch2/catch.hpp>

#include <cmath>
#include <functional>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "io/config_node.hpp"
#include "io/photolysis_loader.hpp"
#include "photo/photolysis_model.hpp"
#include "photo_test_support.hpp"
#include "../test_support.hpp"

using namespace colchem;

namespace {

/// Two absorbers with invented smooth cross sections over 200-400 nm in 20 bins.
PhotolysisSpec absorbing_spec() {
  PhotolysisSpec s;
  for (int i = 0; i <= 20; ++i) s.bin_edges_nm.push_back(200.0 + 10.0 * i);
  s.spectrum.table = TabulatedSpectrum{{200.0, 400.0}, {1e12, 4e14}, "invented"};
  for (const char* name : {"A", "B"}) {
    AbsorberSpec a;
    a.species = name;
    const double scale = name[0] == 'A' ? 1e-18 : 3e-20;
    a.cross_section.tables.push_back(
        TabulatedSpectrum{{200.0, 300.0, 400.0}, {scale, 0.2 * scale, 0.01 * scale}, "invented"});
    s.absorbers.push_back(a);
    s.channels.push_back(test::make_channel(std::string(name) + "_photo", name));
  }
  s.illumination.zenith_angle_rad = std::acos(0.6);
  s.illumination.day_fraction = 0.5;
  return s;
}

std::vector<double> state(const Background& bg) {
  std::vector<double> n(bg.grid.cells() * 2);
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    n[2 * j] = 1e-8 * bg.air_density_cm3[j];
    n[2 * j + 1] = 1e-6 * bg.air_density_cm3[j];
  }
  return n;
}

}  // namespace

TEST_CASE("two-stream J equals direct-beam J without scattering", "[photo][two_stream]") {
  // No Rayleigh gas, an aerosol with omega = 0 and a black surface: the diffuse field is
  // zero and J is the direct-beam J to round-off (analytic), for plane-parallel and
  // spherical paths and a diurnal quadrature.
  const Background bg = test::flat_isothermal(20, 60.0);
  for (int geometry = 0; geometry < 3; ++geometry) {
    PhotolysisSpec s = absorbing_spec();
    s.aerosols.emplace_back().present = true;
    s.aerosols.back().altitude_cm = {0.0, 60e5};
    s.aerosols.back().extinction_cm1 = {2e-6, 1e-8};
    s.aerosols.back().has_optical_properties = true;
    if (geometry == 1) s.slant_path = SlantPath::kSpherical;
    if (geometry == 2) {
      s.illumination.form = IlluminationForm::kDiurnal;
      s.illumination.latitude_rad = 0.4;
      s.illumination.hour_angle_points = 6;
    }
    PhotolysisModel direct(s, bg, {"A", "B"});
    s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
    s.aerosols.back().asymmetry.value = 0.7;  // delta scaling leaves a non-scattering aerosol alone
    PhotolysisModel two(s, bg, {"A", "B"});
    const auto n = state(bg);
    std::vector<double> Jd(40), Jt(40);
    direct.compute(n, Jd);
    two.compute(n, Jt);
    for (std::size_t i = 0; i < Jd.size(); ++i) {
      INFO("geometry " << geometry << " entry " << i);
      CHECK(Jd[i] > 0.0);
      CHECK(Jt[i] == Approx(Jd[i]).epsilon(1e-13));
    }
  }
}

TEST_CASE("two-stream actinic flux over a Lambertian surface is 1 + 2 A mu0 times the beam",
          "[photo][two_stream]") {
  // A transparent column (absorbers absent) over a surface of albedo A, sun at mu0 = 0.6:
  // every level sees the beam plus the isotropic reflected flux, F_act = F (1 + 2 A mu0)
  // (analytic); J scales by the same factor.
  const Background bg = test::flat_isothermal(10, 30.0);
  PhotolysisSpec s = absorbing_spec();
  s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
  for (auto closure : {TwoStreamClosure::kEddington, TwoStreamClosure::kQuadrature,
                       TwoStreamClosure::kHemisphericMean}) {
    s.radiative_transfer.closure = closure;
    s.radiative_transfer.surface_albedo = 0.75;
    PhotolysisModel m(s, bg, {"A", "B"});
    std::vector<double> n(20, 0.0), J(20), F(10 * 20);
    m.compute(n, J, F);
    s.radiative_transfer.surface_albedo = 0.0;
    PhotolysisModel black(s, bg, {"A", "B"});
    std::vector<double> J0(20), F0(10 * 20);
    black.compute(n, J0, F0);
    for (std::size_t i = 0; i < F.size(); ++i)
      CHECK(F[i] / F0[i] == Approx(1.0 + 2.0 * 0.75 * 0.6).epsilon(1e-13));
    for (std::size_t i = 0; i < J.size(); ++i) CHECK(J[i] / J0[i] == Approx(1.9).epsilon(1e-13));
    // The diagnostics: F+ = A mu0 F everywhere, F- = 0 (analytic).
    CHECK(m.diffuse_up()[5 * 20 + 3] == Approx(0.75 * 0.6 * F0[5 * 20 + 3]).epsilon(1e-13));
    CHECK(m.diffuse_down()[5 * 20 + 3] == 0.0);
  }
}

TEST_CASE("two-stream J is a smooth function of the densities", "[photo][two_stream]") {
  // The Newton solver differentiates J(n) by finite differences: central differences with
  // relative steps 1e-4 and 1e-5 must agree to the O(h^2) truncation of a smooth function
  // (analytic: Taylor), with Rayleigh scattering, a scattering aerosol and a bright surface.
  const Background bg = test::flat_isothermal(12, 60.0);
  PhotolysisSpec s = absorbing_spec();
  s.rayleigh.push_back(RayleighSpec{"N2", 4.6e-27, 550.0, 4.0});  // from memory (N2 at 550 nm)
  s.aerosols.emplace_back().present = true;
  s.aerosols.back().altitude_cm = {0.0, 60e5};
  s.aerosols.back().extinction_cm1 = {3e-6, 1e-8};
  s.aerosols.back().has_optical_properties = true;
  s.aerosols.back().single_scattering_albedo.value = 0.99;
  s.aerosols.back().asymmetry.value = 0.7;
  s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
  s.radiative_transfer.surface_albedo = 0.6;
  PhotolysisModel m(s, bg, {"A", "B"});
  const auto n0 = state(bg);
  std::vector<double> Jp(24), Jm(24), J(24);
  m.compute(n0, J);
  auto derivative = [&](std::size_t idx, double rel, std::size_t out) {
    auto n = n0;
    const double h = rel * n0[idx];
    n[idx] = n0[idx] + h;
    m.compute(n, Jp);
    n[idx] = n0[idx] - h;
    m.compute(n, Jm);
    return (Jp[out] - Jm[out]) / (2.0 * h);
  };
  // B's density in cell 3 against J of A in cell 1 (below: shading and scattering) and J of
  // B in cell 3 itself.
  for (std::size_t out : {std::size_t{1}, std::size_t{12 + 3}}) {
    const double d1 = derivative(2 * 3 + 1, 1e-4, out);
    const double d2 = derivative(2 * 3 + 1, 1e-5, out);
    CHECK(d1 != 0.0);
    CHECK(d2 == Approx(d1).epsilon(1e-6));
  }
  // Deterministic: the same state gives the same J (no hidden state between calls).
  std::vector<double> again(24);
  m.compute(n0, again);
  for (std::size_t i = 0; i < J.size(); ++i) CHECK(again[i] == J[i]);
}

namespace {

PhotolysisSpec load_rt(const std::string& name, const std::string& rt,
                       const std::string& aerosol = "") {
  const UnitSystem units;
  const std::string src = COLCHEM_SOURCE_DIR;
  const auto table = test::write_file(
      name + "_aer.csv",
      "# invented\naltitude [km], extinction [km-1], ssa [1]\n0, 1.0, 0.99\n100, 0.0, 0.9\n");
  const auto albedo = test::write_file(
      name + "_alb.csv", "# invented\nwavelength [nm], albedo [1]\n200, 0.2\n400, 0.8\n");
  std::string yaml =
      "photolysis:\n"
      "  data: " +
      src +
      "/configs/photolysis/representative_data.yaml\n"
      "  spectrum: {table: " +
      src + "/configs/photolysis/solar_1au.csv}\n" + rt;
  if (!aerosol.empty()) yaml += "  aerosol: {table: " + table.string() + ", " + aerosol + "}\n";
  const auto file = test::write_file(name + ".yaml", yaml);
  (void)albedo;
  const ConfigDocument doc = ConfigDocument::load(file);
  return load_photolysis(doc.root().child("photolysis"), units);
}

}  // namespace

TEST_CASE("radiative_transfer keys load and fail as documented", "[photo][io][two_stream]") {
  const std::string dir = std::string(COLCHEM_TEST_OUTPUT_DIR) + "/photo/";
  const auto s = load_rt("rt_ok",
                         "  radiative_transfer: {scheme: two_stream, closure: eddington, "
                         "surface_albedo: {table: " +
                             dir + "rt_ok_alb.csv}}\n",
                         "single_scattering_albedo: {column: ssa}, asymmetry: 0.7");
  CHECK(s.radiative_transfer.scheme == RadiativeTransferScheme::kTwoStream);
  CHECK(s.radiative_transfer.closure == TwoStreamClosure::kEddington);
  CHECK(s.radiative_transfer.delta_scaling);
  CHECK(s.radiative_transfer.surface_albedo_table.value.size() == 2);
  CHECK(s.aerosols.back().single_scattering_albedo.form == OpticalPropertyForm::kAltitude);
  CHECK(s.aerosols.back().single_scattering_albedo.by_altitude[1] == 0.9);  // the table's value
  CHECK(s.aerosols.back().asymmetry.value == 0.7);
  const auto gtable =
      test::write_file("rt_g.csv", "# invented\nwavelength [um], value [1]\n0.2, 0.6\n0.8, 0.8\n");
  const auto w =
      load_rt("rt_wl", "  radiative_transfer: {scheme: two_stream}\n",
              "single_scattering_albedo: 1, asymmetry: {table: " + gtable.string() + "}");
  CHECK(w.aerosols.at(0).asymmetry.form == OpticalPropertyForm::kWavelength);
  CHECK(w.aerosols.at(0).asymmetry.by_wavelength.wavelength_nm[1] == Approx(800.0));  // um -> nm
  CHECK(w.radiative_transfer.closure == TwoStreamClosure::kQuadrature);        // the default
  const auto d = load_rt("rt_default", "");
  CHECK(d.radiative_transfer.scheme == RadiativeTransferScheme::kDirectBeam);

  CHECK_THAT(colchem_test::located_error_of([] {
               (void)load_rt("rt_e1",
                             "  radiative_transfer: {scheme: direct_beam, surface_albedo: 0.5}\n");
             }),
             Catch::Contains("no two-stream settings"));
  CHECK_THAT(colchem_test::located_error_of([] {
               (void)load_rt("rt_e2",
                             "  radiative_transfer: {scheme: two_stream, surface_albedo: 1.5}\n");
             }),
             Catch::Contains("albedo from 0 to 1"));
  CHECK_THAT(colchem_test::located_error_of([] {
               (void)load_rt("rt_e3",
                             "  radiative_transfer: {scheme: two_stream, closure: delta}\n");
             }),
             Catch::Contains("quadrature"));
  CHECK_THAT(colchem_test::located_error_of([] {
               (void)load_rt("rt_e4", "  radiative_transfer: {scheme: two_stream}\n",
                             "wavelength_exponent: 1");
             }),
             Catch::Contains("single_scattering_albedo"));
  CHECK_THAT(colchem_test::located_error_of([] {
               (void)load_rt("rt_e5", "  radiative_transfer: {scheme: two_stream}\n",
                             "single_scattering_albedo: 1.2, asymmetry: 0.5");
             }),
             Catch::Contains("single-scattering albedo from 0 to 1"));
}

TEST_CASE("two-stream spherical paths reduce to plane-parallel on a flat planet",
          "[photo][two_stream]") {
  // On a planet of radius 1e15 cm the rays through the shells are straight lines, so the
  // pseudo-spherical beam (rays from every edge and centre) equals tau/mu0 (analytic
  // geometry, to the curvature of 1e-8 over the 60 km column), with Rayleigh scattering and
  // a reflecting surface.
  const Background bg = test::flat_isothermal(12, 60.0);
  PhotolysisSpec s = absorbing_spec();
  s.rayleigh.push_back(RayleighSpec{"N2", 4.6e-27, 550.0, 4.0});  // from memory (N2 at 550 nm)
  s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
  s.radiative_transfer.surface_albedo = 0.5;
  PhotolysisModel plane(s, bg, {"A", "B"});
  s.slant_path = SlantPath::kSpherical;
  PhotolysisModel sphere(s, bg, {"A", "B"});
  const auto n = state(bg);
  std::vector<double> Jp(24), Js(24);
  plane.compute(n, Jp);
  sphere.compute(n, Js);
  for (std::size_t i = 0; i < Jp.size(); ++i) CHECK(Js[i] == Approx(Jp[i]).epsilon(1e-6));
}

TEST_CASE("aerosol optical properties as a function of altitude and wavelength",
          "[photo][two_stream]") {
  // A table of spectra at several altitudes reduces to the one-dimensional forms when it
  // does not vary along one of its axes (analytic identity: bin averages of a constant, and
  // linear interpolation in altitude of identical spectra); varying along both, it differs
  // from either.
  const Background bg = test::flat_isothermal(12, 60.0);
  PhotolysisSpec s = absorbing_spec();
  s.rayleigh.push_back(RayleighSpec{"N2", 4.6e-27, 550.0, 4.0});  // from memory (N2 at 550 nm)
  s.aerosols.emplace_back().present = true;
  s.aerosols.back().altitude_cm = {0.0, 30e5, 60e5};
  s.aerosols.back().extinction_cm1 = {3e-6, 1e-6, 1e-8};
  s.aerosols.back().has_optical_properties = true;
  s.aerosols.back().asymmetry.value = 0.7;
  s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
  s.radiative_transfer.surface_albedo = 0.4;
  const auto n = state(bg);
  auto jvalues = [&](const OpticalPropertySpec& ssa) {
    PhotolysisSpec t = s;
    t.aerosols.back().single_scattering_albedo = ssa;
    PhotolysisModel m(t, bg, {"A", "B"});
    std::vector<double> J(24);
    m.compute(n, J);
    return J;
  };
  const TabulatedSpectrum spectrum{{200.0, 300.0, 400.0}, {0.6, 0.95, 0.8}, "invented"};
  OpticalPropertySpec by_wl;
  by_wl.form = OpticalPropertyForm::kWavelength;
  by_wl.by_wavelength = spectrum;
  OpticalPropertySpec by_z;
  by_z.form = OpticalPropertyForm::kAltitude;
  by_z.by_altitude = {0.5, 0.9, 0.99};
  OpticalPropertySpec flat_z;  // the same spectrum at three altitudes
  flat_z.form = OpticalPropertyForm::kAltitudeWavelength;
  flat_z.grid_altitude_cm = {0.0, 30e5, 60e5};
  flat_z.spectra = {spectrum, spectrum, spectrum};
  OpticalPropertySpec flat_wl;  // a constant spectrum at each altitude
  flat_wl.form = OpticalPropertyForm::kAltitudeWavelength;
  flat_wl.grid_altitude_cm = {0.0, 30e5, 60e5};
  for (double v : by_z.by_altitude) {
    flat_wl.spectra.push_back(TabulatedSpectrum{{150.0, 450.0}, {v, v}, "invented"});
  }
  OpticalPropertySpec both = flat_z;
  both.spectra[2].value = {0.3, 0.5, 0.7};
  const auto J_wl = jvalues(by_wl), J_z = jvalues(by_z);
  const auto J_flat_z = jvalues(flat_z), J_flat_wl = jvalues(flat_wl), J_both = jvalues(both);
  double differs = 0.0;
  for (std::size_t i = 0; i < J_wl.size(); ++i) {
    CHECK(J_flat_z[i] == Approx(J_wl[i]).epsilon(1e-13));
    CHECK(J_flat_wl[i] == Approx(J_z[i]).epsilon(1e-13));
    differs = std::max(differs, std::abs(J_both[i] / J_wl[i] - 1.0));
  }
  CHECK(differs > 1e-3);
}

TEST_CASE("altitude-wavelength optical property tables load and fail as documented",
          "[photo][io][two_stream]") {
  const auto good = test::write_file(
      "ssa_zw.csv",
      "# invented\naltitude [km], wavelength [nm], ssa [1]\n0, 200, 0.9\n0, 400, 0.95\n"
      "50, 200, 0.8\n50, 300, 0.85\n50, 400, 0.99\n");
  const auto s = load_rt("rt_zw", "  radiative_transfer: {scheme: two_stream}\n",
                         "single_scattering_albedo: {table: " + good.string() +
                             ", column: ssa, altitude_column: altitude}, asymmetry: 0.6");
  const auto& p = s.aerosols.back().single_scattering_albedo;
  CHECK(p.form == OpticalPropertyForm::kAltitudeWavelength);
  REQUIRE(p.grid_altitude_cm.size() == 2);
  CHECK(p.grid_altitude_cm[1] == Approx(50e5));  // km -> cm
  CHECK(p.spectra[1].value.size() == 3);
  CHECK(p.spectra[1].value[2] == 0.99);
  const auto bad_order = test::write_file(
      "ssa_zw_bad.csv",
      "# invented\naltitude [km], wavelength [nm], ssa [1]\n0, 200, 0.9\n0, 400, 0.95\n"
      "50, 400, 0.8\n50, 300, 0.85\n");
  CHECK_THAT(colchem_test::located_error_of([&] {
               (void)load_rt("rt_zw_e1", "  radiative_transfer: {scheme: two_stream}\n",
                             "single_scattering_albedo: {table: " + bad_order.string() +
                                 ", column: ssa, altitude_column: altitude}, asymmetry: 0.6");
             }),
             Catch::Contains("wavelengths increasing within an altitude"));
  const auto bad_value = test::write_file(
      "ssa_zw_range.csv",
      "# invented\naltitude [km], wavelength [nm], ssa [1]\n0, 200, 0.9\n10, 200, 1.5\n");
  CHECK_THAT(colchem_test::located_error_of([&] {
               (void)load_rt("rt_zw_e2", "  radiative_transfer: {scheme: two_stream}\n",
                             "single_scattering_albedo: {table: " + bad_value.string() +
                                 ", column: ssa, altitude_column: altitude}, asymmetry: 0.6");
             }),
             Catch::Contains("single-scattering albedo from 0 to 1"));
}

TEST_CASE("aerosol populations add: a haze and a cloud deck", "[photo][two_stream]") {
  // One population split into two halves of its extinction with the same omega and g gives
  // the same J (optical depths and scattering add; analytic identity). Two populations with
  // different g: the order of the list does not matter (a sum), and each counts (the J
  // differ from those of either alone at twice its extinction).
  const Background bg = test::flat_isothermal(12, 60.0);
  PhotolysisSpec s = absorbing_spec();
  s.radiative_transfer.scheme = RadiativeTransferScheme::kTwoStream;
  s.radiative_transfer.surface_albedo = 0.3;
  AerosolSpec a;
  a.present = true;
  a.altitude_cm = {0.0, 60e5};
  a.extinction_cm1 = {4e-6, 1e-8};
  a.has_optical_properties = true;
  a.single_scattering_albedo.value = 0.95;
  a.asymmetry.value = 0.6;
  const auto n = state(bg);
  auto jvalues = [&](const std::vector<AerosolSpec>& pops) {
    PhotolysisSpec t = s;
    t.aerosols = pops;
    PhotolysisModel m(t, bg, {"A", "B"});
    std::vector<double> J(24);
    m.compute(n, J);
    return J;
  };
  AerosolSpec half = a;
  half.extinction_cm1 = {2e-6, 0.5e-8};
  const auto J_one = jvalues({a}), J_two = jvalues({half, half});
  for (std::size_t i = 0; i < J_one.size(); ++i) CHECK(J_two[i] == Approx(J_one[i]).epsilon(1e-12));
  AerosolSpec forward = half, back = half;
  forward.asymmetry.value = 0.85;
  back.asymmetry.value = 0.0;
  AerosolSpec forward_all = a, back_all = a;
  forward_all.asymmetry.value = 0.85;
  back_all.asymmetry.value = 0.0;
  const auto J_mix = jvalues({forward, back}), J_swap = jvalues({back, forward});
  const auto J_f = jvalues({forward_all}), J_b = jvalues({back_all});
  double from_f = 0.0, from_b = 0.0;
  for (std::size_t i = 0; i < J_mix.size(); ++i) {
    CHECK(J_swap[i] == Approx(J_mix[i]).epsilon(1e-14));
    from_f = std::max(from_f, std::abs(J_mix[i] / J_f[i] - 1.0));
    from_b = std::max(from_b, std::abs(J_mix[i] / J_b[i] - 1.0));
  }
  CHECK(from_f > 1e-3);
  CHECK(from_b > 1e-3);
}

TEST_CASE("a list of aerosol populations loads, and each needs its optical properties",
          "[photo][io][two_stream]") {
  const UnitSystem units;
  const std::string src = COLCHEM_SOURCE_DIR;
  const auto table = test::write_file(
      "pops_aer.csv", "# invented\naltitude [km], extinction [km-1]\n0, 1.0\n100, 0.0\n");
  auto load = [&](const std::string& name, const std::string& second) {
    const std::string yaml = "photolysis:\n  data: " + src +
                             "/configs/photolysis/representative_data.yaml\n"
                             "  spectrum: {table: " +
                             src +
                             "/configs/photolysis/solar_1au.csv}\n"
                             "  radiative_transfer: {scheme: two_stream}\n"
                             "  aerosol:\n"
                             "    - {table: " +
                             table.string() +
                             ", single_scattering_albedo: 0.99, asymmetry: 0.7}\n"
                             "    - {table: " +
                             table.string() + second + "}\n";
    const auto file = test::write_file(name + ".yaml", yaml);
    const ConfigDocument doc = ConfigDocument::load(file);
    return load_photolysis(doc.root().child("photolysis"), units);
  };
  const auto s = load("pops_ok", ", single_scattering_albedo: 1, asymmetry: 0.8");
  REQUIRE(s.aerosols.size() == 2);
  CHECK(s.aerosols[0].asymmetry.value == 0.7);
  CHECK(s.aerosols[1].asymmetry.value == 0.8);
  const std::string err = colchem_test::located_error_of([&] { (void)load("pops_bad", ""); });
  CHECK_THAT(err, Catch::Contains("'single_scattering_albedo' and 'asymmetry'"));
  CHECK_THAT(err, Catch::Contains("pops_bad.yaml:7"));  // the second population's line
  CHECK_THAT(err, Catch::Contains("'photolysis.aerosol.1'"));
}
