// Every load-time check of a mechanism file, each with a bad mechanism and the message it
// must produce (file, line, reaction text). Expected messages are colchem's own wording
// (analytic: they are what the checks are specified to report).
#include <catch2/catch.hpp>

#include <fstream>

#include "io/chemistry_section.hpp"
#include "io/config_node.hpp"
#include "io/mechanism_loader.hpp"
#include "io/scenario.hpp"

using namespace colchem;
using Catch::Matchers::Contains;
using Catch::Matchers::Matches;

namespace {

// The reaction under test starts at line 17 (its id; equation on line 18, rate on line 19).
std::string with_reaction(const std::string& reaction, const std::string& param_line =
                                                          "  - {name: beta, default: 0.5, min: 0, max: 1}") {
  return "mechanism: {name: bad}\n"
         "species:\n"
         "  - {name: O}\n"
         "  - {name: O2}\n"
         "  - {name: O3}\n"
         "  - {name: OH}\n"
         "  - {name: HO2}\n"
         "  - {name: N2}\n"
         "parameters:\n" +
         param_line +
         "\n"
         "modules:\n"
         "  - name: base\n"
         "    reactions:\n"
         "      - id: o_o3\n        equation: O + O3 -> 2 O2\n"
         "        rate: {arrhenius: {A: 8.0e-12, E: 2060}}\n" +
         reaction;
}

struct Outcome {
  std::string message;
  ExitCode code = ExitCode::kOk;
};

Outcome load(const std::string& text) {
  const UnitSystem units;
  try {
    const auto m = load_mechanism_text(text, "bad.yaml", units);
    check_rates(*m, std::vector<double>{298.0, 200.0}, std::vector<double>{2.5e19, 1e15},
                {{"N2", 1.0}});
  } catch (const InputError& e) {
    return {e.what(), e.code()};
  }
  return {"no error", ExitCode::kOk};
}

}  // namespace

TEST_CASE("the reference mechanism of these tests loads", "[chem][checks]") {
  const auto out = load(with_reaction(""));
  CHECK(out.message == "no error");
}

TEST_CASE("element balance is checked, sinks exempt", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: o_o3_2\n        equation: O + O3 -> O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK(out.code == ExitCode::kInputData);
  CHECK_THAT(out.message, Contains("bad.yaml:18:"));
  CHECK_THAT(out.message, Contains("reaction 'O + O3 -> O2' changing O -2"));
  const auto sink =
      load(with_reaction("      - id: o3\n        equation: O3 ->\n"
                         "        rate: {first_order: {k: 1e-6}}\n"
                         "        sink: true\n"));
  CHECK(sink.message == "no error");
  const auto unmarked =
      load(with_reaction("      - id: o3_2\n        equation: O3 ->\n"
                         "        rate: {first_order: {k: 1e-6}}\n"));
  CHECK_THAT(unmarked.message, Contains("bad.yaml:18:"));
  CHECK_THAT(unmarked.message, Contains("`sink: true` for a reaction without products"));
}

TEST_CASE("undeclared species are named with a suggestion", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: oh_o3\n        equation: OH + O3 -> HO3 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK(out.code == ExitCode::kInputData);
  CHECK_THAT(out.message, Matches("bad.yaml:18:[0-9]+: .*undeclared 'HO3' in reaction "
                                  "'OH \\+ O3 -> HO3 \\+ O2'; did you mean 'O3'\\?"));
}

TEST_CASE("reaction ids are required, short words and unique", "[chem][checks]") {
  // Two reactions with one equation are allowed: their ids tell them apart.
  const auto same =
      load(with_reaction("      - id: o3_o\n        equation: O3 + O -> O2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK(same.message == "no error");
  const auto twice =
      load(with_reaction("      - id: o_o3\n        equation: O3 + O -> O2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK(twice.code == ExitCode::kInputData);
  CHECK_THAT(twice.message,
             Contains("bad.yaml:17:13: 'modules.0.reactions.1.id': expected a reaction id "
                      "used once, found 'o_o3' for reaction 'O3 + O -> O2 + O2', already "
                      "at line 14 for 'O + O3 -> 2 O2'"));
  const auto missing =
      load(with_reaction("      - equation: O3 + O -> O2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK_THAT(missing.message,
             Contains("bad.yaml:17:9: 'modules.0.reactions.1': expected an `id` for every "
                      "reaction (short and unique in the file, e.g. 'o_o3'), found none "
                      "for 'O3 + O -> O2 + O2'"));
  for (const std::string bad :
       {"1o3", "o3 o", "_o3", "o3/o", "abcdefghijklmnopqrstuvwxyz0123456"}) {
    const auto out = load(with_reaction("      - id: \"" + bad +
                                        "\"\n        equation: O3 + O -> O2 + O2\n"
                                        "        rate: {arrhenius: {A: 1e-12}}\n"));
    CHECK_THAT(out.message,
               Contains("'modules.0.reactions.1.id': expected a reaction id: a letter, then at "
                        "most 31 letters, digits, '_', '.' or '-', found '" +
                        bad + "'"));
  }
  // The longest id allowed (32 characters) and every allowed character.
  const auto longest =
      load(with_reaction("      - id: abcdefghijklmnopqrstuvwxyz012.-_\n"
                         "        equation: O3 + O -> O2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"));
  CHECK(longest.message == "no error");
}

TEST_CASE("keys of earlier schemas are refused with their replacement", "[chem][checks]") {
  const auto dup =
      load(with_reaction("      - id: o3_o\n        equation: O3 + O -> O2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"
                         "        duplicate: true\n"));
  CHECK(dup.code == ExitCode::kInputData);
  CHECK_THAT(dup.message, Contains("bad.yaml:20:20: 'modules.0.reactions.1.duplicate': expected no "
                                   "`duplicate` key: reactions with one equation are told apart by "
                                   "their `id`s"));
  const auto eff =
      load(with_reaction("      - id: o_o2_m\n        equation: O + O2 + M -> O3 + M\n"
                         "        rate: {arrhenius: {A: 6e-34}}\n"
                         "        efficiencies: {N2: 1.2}\n"));
  CHECK_THAT(eff.message, Contains("bad.yaml:20:23: 'modules.0.reactions.1.efficiencies': expected "
                                   "`third_body_weights` (`efficiencies` was renamed "
                                   "`third_body_weights`)"));
  const UnitSystem units;
  const auto m = load_mechanism_text(
      with_reaction("      - id: o_o2_m\n        equation: O + O2 + M -> O3 + M\n"
                    "        rate: {arrhenius: {A: 6e-34}}\n"
                    "        third_body_weights: {N2: 1.2}\n"),
      "ok.yaml", units);
  REQUIRE(m->reactions[1].efficiencies.size() == 1);
  CHECK(m->reactions[1].efficiencies[0].eps == 1.2);
  CHECK(m->reactions[1].id == "o_o2_m");
}

TEST_CASE("negative, NaN and absurd rate constants are rejected", "[chem][checks]") {
  // Thresholds: common practice, no source.
  const auto neg =
      load(with_reaction("      - id: oh_o3_2\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: -1.7e-12, E: 940}}\n"));
  CHECK(neg.code == ExitCode::kInputData);
  CHECK_THAT(
      neg.message,
      Matches("bad.yaml:17:[0-9]+: 'rate': expected a finite, non-negative rate "
              "constant for reaction 'OH \\+ O3 -> HO2 \\+ O2', found -7.*at T = 298.0 K.*"));
  // A NaN cannot be written as a parameter (the reader wants a finite number)...
  const auto nan =
      load(with_reaction("      - id: oh_o3_3\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: .nan}}\n"));
  CHECK_THAT(
      nan.message,
      Contains("bad.yaml:19:31: 'modules.0.reactions.1.rate.arrhenius.A': expected a number"));
  // ...but parameters can overflow at the column's temperatures.
  const auto inf =
      load(with_reaction("      - id: oh_o3_4\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12, E: -1e6}}\n"));
  CHECK_THAT(inf.message, Contains("bad.yaml:17:9: 'rate': expected a finite, non-negative rate "
                                   "constant for reaction 'OH + O3 -> HO2 + O2', found inf"));
  const auto big2 =
      load(with_reaction("      - id: oh_o3_5\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-6}}\n"));
  CHECK_THAT(big2.message, Contains("bad.yaml:17:"));
  CHECK_THAT(big2.message, Contains("a bimolecular rate constant below 1e-08 cm3 s-1 for reaction 'OH + O3 -> HO2 + O2'"));
  const auto big3 = load(
      with_reaction("      - id: o_o2_m\n        equation: O + O2 + M -> O3 + M\n"
                    "        rate: {falloff: {k0_300: 1e-20, n: 2, kinf_300: 1e-11, m: 0}}\n"));
  CHECK_THAT(big3.message, Contains("a low-pressure limit k0 below 1e-22 cm6 s-1 for reaction 'O + O2 + M -> O3 + M'"));
  const auto big1 =
      load(with_reaction("      - id: o3_3\n        equation: O3 -> O + O2\n"
                         "        rate: {first_order: {k: 1e25}}\n"));
  CHECK_THAT(big1.message, Contains("a first-order rate constant below 1e+20 s-1 for reaction 'O3 -> O + O2'"));
  const auto bigM =
      load(with_reaction("      - id: o_o_m\n        equation: O + O + M -> O2 + M\n"
                         "        rate: {arrhenius: {A: 1e-21}}\n"));
  CHECK_THAT(bigM.message, Contains("a termolecular rate constant below 1e-22 cm6 s-1 for reaction 'O + O + M -> O2 + M'"));
}

TEST_CASE("rate units are checked against the order and converted", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: oh_o3_6\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {constant: {k: 1e-12}, units: cm6 s-1}\n"));
  CHECK(out.code == ExitCode::kInputData);
  CHECK_THAT(out.message,
             Matches("bad.yaml:19:[0-9]+: 'modules.0.reactions.1.rate.units': expected "
                     "'cm3 s-1' \\(or a unit convertible to it\\) for the order-2 reaction "
                     "'OH \\+ O3 -> HO2 \\+ O2', found 'cm6 s-1'"));
  const UnitSystem units;
  // m3 s-1 -> cm3 s-1 is a factor 1e6 (analytic); k0 of a fall-off form (m6 s-1) 1e12.
  const auto m = load_mechanism_text(
      with_reaction(
          "      - id: oh_o3_7\n        equation: OH + O3 -> HO2 + O2\n"
          "        rate: {constant: {k: 1e-18}, units: m3 s-1}\n"
          "      - id: o_o2_m_2\n        equation: O + O2 + M -> O3 + M\n"
          "        rate: {falloff: {k0_300: 6e-46, n: 0, kinf_300: 3e-17, m: 0}, units: m3 s-1}\n"
          "      - id: o3_4\n        equation: O3 -> O + O2\n"
          "        rate: {first_order: {k: 2}, units: min-1}\n"),
      "units.yaml", units);
  CHECK(m->reactions[1].rate.arrhenius.A == Approx(1e-12));
  CHECK(m->reactions[2].rate.k0_300 == Approx(6e-34));
  CHECK(m->reactions[2].rate.kinf_300 == Approx(3e-11));
  CHECK(m->reactions[3].rate.arrhenius.A == Approx(2.0 / 60.0));
}

TEST_CASE("scale factors name declared parameters", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: oh_o3_8\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"
                         "        scale: [\"1 - betta\"]\n"));
  CHECK_THAT(out.message, Matches("bad.yaml:20:[0-9]+: .*unknown parameter 'betta' in reaction "
                                  "'OH \\+ O3 -> HO2 \\+ O2'; did you mean 'beta'\\?"));
  const UnitSystem units;
  const auto m = load_mechanism_text(
      with_reaction("      - id: oh_o3_9\n        equation: OH + O3 -> HO2 + O2\n"
                    "        rate: {arrhenius: {A: 1e-12}}\n"
                    "        scale: [beta, \"1 - beta\"]\n"),
      "ok.yaml", units);
  REQUIRE(m->reactions[1].scale.size() == 2);
  CHECK_FALSE(m->reactions[1].scale[0].complement);
  CHECK(m->reactions[1].scale[1].complement);
}

TEST_CASE("parameter defaults must lie within their bounds", "[chem][checks]") {
  const auto out = load(with_reaction("", "  - {name: beta, default: 1.5, min: 0, max: 1}"));
  CHECK_THAT(out.message, Matches("bad.yaml:10:[0-9]+: 'parameters.0.default': expected a default "
                                  "within \\[0, 1\\] for parameter 'beta', found 1.5"));
}

TEST_CASE("photolysis needs hv and hv needs photolysis", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: o3_5\n        equation: O3 -> O + O2\n"
                         "        rate: {photolysis: {channel: O3}}\n"));
  CHECK_THAT(out.message, Contains("bad.yaml:19:"));
  CHECK_THAT(out.message, Contains("expected 'hv' among the reactants of a photolysis reaction, found reaction 'O3 -> O + O2'"));
  const auto thermal =
      load(with_reaction("      - id: o3_photo\n        equation: O3 + hv -> O + O2\n"
                         "        rate: {arrhenius: {A: 1e-3}}\n"));
  CHECK_THAT(thermal.message, Contains("expected a photolysis rate for a reaction with 'hv', found reaction 'O3 + hv -> O + O2'"));
}

TEST_CASE("unknown keys are rejected with a suggestion", "[chem][checks]") {
  const auto out =
      load(with_reaction("      - id: oh_o3_10\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arrhenius: {A: 1e-12}}\n"
                         "        sorce: JPL\n"));
  CHECK(out.code == ExitCode::kInputData);
  CHECK_THAT(out.message,
             Matches("bad.yaml:20:[0-9]+: 'modules.0.reactions.1.sorce': .*unknown key "
                     "'sorce'; did you mean 'source'\\?"));
  const auto form =
      load(with_reaction("      - id: oh_o3_11\n        equation: OH + O3 -> HO2 + O2\n"
                         "        rate: {arhenius: {A: 1e-12}}\n"));
  CHECK_THAT(form.message, Contains("did you mean 'arrhenius'?"));
}

TEST_CASE("module requirements name modules of the file", "[chem][checks]") {
  const auto out = load(with_reaction("  - name: extra\n"
                                      "    requires: [bsae]\n"
                                      "    reactions: []\n"));
  CHECK_THAT(out.message,
             Matches("bad.yaml:18:[0-9]+: .*unknown module 'bsae'; did you mean 'base'\\?"));
}

TEST_CASE("scenario chemistry: unknown modules, parameters and out-of-bounds overrides",
          "[chem][checks]") {
  const std::string file = COLCHEM_TEST_OUTPUT_DIR "/checks_mechanism.yaml";
  std::ofstream(file) << with_reaction("  - name: extra\n    requires: [base]\n    reactions: []\n");
  const UnitSystem units;
  auto error = [&](const std::string& section) -> Outcome {
    const ConfigDocument doc = ConfigDocument::from_text(section, "scenario.yaml");
    std::vector<InputFile> inputs;
    try {
      (void)load_chemistry_spec(doc.root().child("chemistry"), units, inputs, true);
    } catch (const InputError& e) {
      return {e.what(), e.code()};
    }
    return {"no error", ExitCode::kOk};
  };
  const std::string head = "chemistry:\n  mechanism: " + file + "\n";
  const auto mod = error(head + "  modules: [bse]\n");
  CHECK(mod.code == ExitCode::kConfig);
  CHECK_THAT(mod.message, Matches("scenario.yaml:3:[0-9]+: 'chemistry.modules.0': expected a module of "
                                  "mechanism 'bad', found unknown module 'bse'; did you mean 'base'\\?"));
  const auto req = error(head + "  modules: [extra]\n");
  CHECK_THAT(req.message, Contains("module 'extra' without 'base'"));
  const auto par = error(head + "  parameters: {beta: 3}\n");
  CHECK(par.code == ExitCode::kConfig);
  CHECK_THAT(par.message, Matches("scenario.yaml:3:[0-9]+: 'chemistry.parameters.beta': expected a value "
                                  "of 'beta' within \\[0, 1\\], found 3"));
  const auto unk = error(head + "  parameters: {bta: 0.3}\n");
  CHECK_THAT(unk.message, Contains("unknown parameter 'bta'; did you mean 'beta'?"));
  const auto ok = error(head + "  modules: [base, extra]\n  parameters: {beta: 0.3}\n");
  CHECK(ok.message == "no error");
}
