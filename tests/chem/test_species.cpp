// Species properties from the mechanism file: composition from the name (labels share the
// base composition), diffusion and thermal-diffusion defaults and overrides.
#include <catch2/catch.hpp>

#include "io/mechanism_loader.hpp"

using namespace colchem;

TEST_CASE("species: composition, labels and per-species diffusion data", "[chem][species]") {
  const UnitSystem units;
  const auto m = load_mechanism(COLCHEM_SOURCE_DIR "/configs/mechanisms/test_soh.yaml", units);
  const Species& so2 = m->species[*m->species_index("SO2")];
  const Species& t3 = m->species[*m->species_index("SO2(a3B1)")];
  // An excited state shares its base composition (analytic).
  CHECK(t3.composition == so2.composition);
  // M(SO2) = 32.06 + 2 x 15.999 = 64.058 g/mol (IUPAC weights, from memory, as in core).
  CHECK(so2.molar_mass_g_mol == Approx(64.058).epsilon(1e-6));
  // Default b = 1.52e18 sqrt(1/64.058 + 1/43.449) = 1.52e18 * 0.196536 = 2.98734e17
  // (Banks and Kockarts 1973, Aeronomy Part B, ch. 15; coefficient from memory), s = 0.5.
  const DiffusionParams d = so2.diffusion_params(43.449);
  CHECK(d.A == Approx(2.98734e17).epsilon(1e-5));
  CHECK(d.s == 0.5);
  // Override from the file (invented values).
  const DiffusionParams h2so4 = m->species[*m->species_index("H2SO4")].diffusion_params(43.449);
  CHECK(h2so4.A == 1.0e17);
  CHECK(h2so4.s == 0.75);
  // alpha_T: -0.38 for H and H2, 0 otherwise (from memory).
  CHECK(m->species[*m->species_index("H2")].thermal_diffusion_factor() == -0.38);
  CHECK(m->species[*m->species_index("H")].thermal_diffusion_factor() == -0.38);
  CHECK(m->species[*m->species_index("H2O")].thermal_diffusion_factor() == 0.0);
  CHECK(m->species[*m->species_index("O")].thermal_diffusion_factor() == 0.0);
  CHECK(m->species[*m->species_index("CO2")].fixed);
  CHECK_FALSE(m->species[*m->species_index("SO2")].fixed);
}

TEST_CASE("species: a `formula` override gives the composition of a non-formula name",
          "[chem][species]") {
  const UnitSystem units;
  const auto m = load_mechanism_text(R"(
mechanism: {name: f}
species:
  - {name: aerosol_S, formula: H2SO4}
  - {name: SO3}
  - {name: H2O}
modules:
  - name: m
    reactions:
      - {id: so3_h2o, equation: SO3 + H2O -> aerosol_S, rate: {constant: {k: 1e-15}}}
)", "f.yaml", units);
  // Balanced only because aerosol_S has the composition of H2SO4 (analytic).
  CHECK(m->species[0].composition.atoms.at("S") == 1);
  CHECK(m->species[0].composition.atoms.at("O") == 4);
  try {
    (void)load_mechanism_text("mechanism: {name: f}\nspecies:\n  - {name: aerosol_S}\nmodules: []\n",
                              "g.yaml", units);
    FAIL("a name that is not a formula was accepted");
  } catch (const InputError& e) {
    CHECK_THAT(e.what(), Catch::Matchers::Contains("g.yaml:3:") &&
                             Catch::Matchers::Contains("give `formula:` for a name that is not one"));
  }
}
