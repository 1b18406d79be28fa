// The box configuration loader: quantities for the initial state, defaults, and errors.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include "chem/box_model.hpp"
#include "io/chemistry_section.hpp"

using namespace colchem;
using Catch::Matchers::Contains;

namespace {

// Each test case writes into its own folder: CTest runs the cases as parallel processes.
std::string write(const std::string& name, const std::string& text) {
  const std::filesystem::path path = std::filesystem::path(COLCHEM_TEST_OUTPUT_DIR) / name;
  std::filesystem::create_directories(path.parent_path());
  std::ofstream(path) << text;
  return path.string();
}

const char* kMech = R"(
mechanism: {name: small}
species: [{name: SO2}, {name: SO2(a3B1)}, {name: H2O}, {name: H2SO3}, {name: CO2, fixed: true}, {name: N2}]
parameters: [{name: beta, default: 0.1, min: 0, max: 1}]
modules:
  - name: base
    reactions:
      - {id: so2_photo, equation: SO2 + hv -> SO2(a3B1), rate: {photolysis: {channel: SO2_excite}}}
      - {id: so2t_h2o, equation: SO2(a3B1) + H2O -> H2SO3, rate: {arrhenius: {A: 1e-12}}, scale: beta}
      - {id: so2t, equation: SO2(a3B1) -> SO2, rate: {first_order: {k: 1e3}}}
)";

}  // namespace

TEST_CASE("box config: initial amounts as mixing ratios, percent, ppm and densities",
          "[chem][box]") {
  write("box_amounts/box_small_mech.yaml", kMech);
  const auto cfg = write("box_amounts/box_small.yaml", R"(
scenario: {name: small-box}
box:
  temperature: 298 K
  pressure: 1 bar
  duration: 1 h
  outputs: 5
  spacing: linear
  bulk_composition: {CO2: 0.96, N2: 0.04}
  initial: {SO2: 1 ppm, H2O: 1 %, SO2(a3B1): 2.5e3 cm-3, H2SO3: 1e-12}
  photolysis: {SO2_excite: 1e-3 s-1}
chemistry: {mechanism: box_small_mech.yaml, parameters: {beta: 0.2}}
)");
  const UnitSystem units;
  const BoxSpec box = load_box_config(cfg, {}, units);
  // n_air = p / (k_B T) = 1e6 / (1.380649e-16 * 298) = 2.43053e19 cm-3 (analytic).
  CHECK(box.air_cm3 == Approx(2.43053e19).epsilon(1e-5));
  const Mechanism& m = *box.chemistry.mechanism;
  CHECK(box.initial_cm3[*m.species_index("SO2")] == Approx(1e-6 * box.air_cm3));
  CHECK(box.initial_cm3[*m.species_index("H2O")] == Approx(1e-2 * box.air_cm3));
  CHECK(box.initial_cm3[*m.species_index("SO2(a3B1)")] == Approx(2.5e3));
  CHECK(box.initial_cm3[*m.species_index("H2SO3")] == Approx(1e-12 * box.air_cm3));
  // Fixed species start from the bulk composition (analytic: 0.96 n_air).
  CHECK(box.initial_cm3[*m.species_index("CO2")] == Approx(0.96 * box.air_cm3));
  CHECK(box.chemistry.parameters[0] == 0.2);
  CHECK(box.duration_s == 3600.0);
  CHECK_FALSE(box.log_spacing);
  CHECK(box.output_file == "small-box.nc");
  // Overrides by key path reach parameters and the initial state.
  const BoxSpec over =
      load_box_config(cfg, {"chemistry.parameters.beta=0.5", "box.initial.SO2=2 ppm"}, units);
  CHECK(over.chemistry.parameters[0] == 0.5);
  CHECK(over.initial_cm3[*m.species_index("SO2")] == Approx(2e-6 * over.air_cm3));
}

TEST_CASE("box config: errors name the key", "[chem][box]") {
  write("box_errors/box_small_mech.yaml", kMech);
  const UnitSystem units;
  auto error = [&](const std::string& box_lines) {
    const auto cfg = write("box_errors/box_bad.yaml",
                           "scenario: {name: b}\nbox:\n  temperature: 298 K\n"
                           "  pressure: 1 bar\n  duration: 1 h\n"
                           "  bulk_composition: {N2: 1.0}\n" +
                               box_lines + "chemistry: {mechanism: box_small_mech.yaml}\n");
    try {
      (void)load_box_config(cfg, {}, units);
    } catch (const InputError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  CHECK_THAT(error("  initial: {SO3: 1 ppm}\n"),
             Contains("'box.initial.SO3': expected a species of mechanism 'small'"));
  CHECK_THAT(error("  initial: {SO2: 1 K}\n"), Contains("expected a mixing ratio"));
  CHECK_THAT(error("  photolysis: {SO2_exc: 1e-3 s-1}\n"),
             Contains("a photolysis channel named by a reaction, found 'SO2_exc'"));
  CHECK_THAT(error("  spacing: logarithmic\n"), Contains("expected one of: log, linear"));
  CHECK(error("") == "no error");
}

TEST_CASE("box: photo-excitation and a named branching ratio reach steady state", "[chem][box]") {
  write("box_branching/box_small_mech.yaml", kMech);
  const auto cfg = write("box_branching/box_ss.yaml", R"(
scenario: {name: ss}
box:
  temperature: 298 K
  pressure: 1 bar
  duration: 10 s
  outputs: 10
  bulk_composition: {CO2: 0.96, N2: 0.04}
  initial: {SO2: 1 ppm, H2O: 1 %}
  photolysis: {SO2_excite: 1e-3 s-1}
chemistry: {mechanism: box_small_mech.yaml, parameters: {beta: 0.2}}
)");
  const UnitSystem units;
  const BoxSpec box = load_box_config(cfg, {}, units);
  BoxProblem pb = box_problem(box);
  pb.solver.rtol = 1e-7;
  const BoxResult r = run_box(pb);
  const Mechanism& m = *box.chemistry.mechanism;
  const std::size_t S = r.species, last = r.times_s.size() - 1;
  // Triplet steady state (analytic): n* = J [SO2] / (A + beta k [H2O]); over 10 s SO2 changes
  // by < 1e-2 relative, so n* uses the final SO2.
  const double so2 = r.n_cm3[last * S + *m.species_index("SO2")];
  const double h2o = 1e-2 * box.air_cm3;
  const double expected = 1e-3 * so2 / (1e3 + 0.2 * 1e-12 * h2o);
  CHECK(r.n_cm3[last * S + *m.species_index("SO2(a3B1)")] == Approx(expected).epsilon(1e-4));
}
