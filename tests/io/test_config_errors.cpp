// Every class of configuration error carries file, line, column, key path, what was
// expected and what was found (acceptance of the foundation; messages are our own format).
#include <catch2/catch.hpp>

#include "../test_support.hpp"

#include <optional>

#include "io/config_node.hpp"

using namespace colchem;

using colchem_test::error_of;

TEST_CASE("unknown keys are rejected with the nearest valid key", "[config]") {
  const auto doc = ConfigDocument::from_text("grid:\n  bottom: 1 km\n  levles: 5\n", "s.yaml");
  const auto grid = doc.root().child("grid");
  (void)grid.find("levels");
  (void)grid.find("bottom");
  const auto msg = error_of([&] { grid.done(); });
  CHECK(msg == "s.yaml:3:3: 'grid.levles': expected a known key in 'grid', found unknown key "
               "'levles'; did you mean 'levels'?");
}

TEST_CASE("a missing required key names the section and its line", "[config]") {
  const auto doc = ConfigDocument::from_text("planet:\n  name: x\n", "p.yaml");
  const auto msg = error_of([&] { (void)doc.root().child("planet").child("radius"); });
  CHECK(msg == "p.yaml:2:3: 'planet': expected a key 'radius' here, found none; add 'radius:' "
               "to this section");
}

TEST_CASE("a misspelt required key is reported as the misspelling", "[config]") {
  const auto doc = ConfigDocument::from_text("planet:\n  name: x\n  radus: 5 km\n", "p.yaml");
  const auto msg = error_of([&] { (void)doc.root().child("planet").child("radius"); });
  CHECK(msg == "p.yaml:3:3: 'planet.radus': expected a known key in 'planet', found unknown "
               "key 'radus'; did you mean 'radius'?");
}

TEST_CASE("type errors: numbers, whole numbers, booleans, choices", "[config]") {
  const auto doc = ConfigDocument::from_text(
      "a: five\nb: 2.5\nc: maybe\nd: hold_end\ne: 3 km\nf: {x: 1}\n", "t.yaml");
  const auto r = doc.root();
  CHECK(error_of([&] { (void)r.child("a").number(); }) ==
        "t.yaml:1:4: 'a': expected a number, found 'five'");
  CHECK(error_of([&] { (void)r.child("b").integer(); }) ==
        "t.yaml:2:4: 'b': expected a whole number, found '2.5'");
  CHECK(error_of([&] { (void)r.child("c").boolean(); }) ==
        "t.yaml:3:4: 'c': expected true or false, found 'maybe'");
  CHECK(error_of([&] { (void)r.child("d").choice({"forbid", "hold_ends"}); }) ==
        "t.yaml:4:4: 'd': expected one of: forbid, hold_ends, found 'hold_end'; did you mean "
        "'hold_ends'?");
  CHECK(error_of([&] { (void)r.child("e").number(); }) ==
        "t.yaml:5:4: 'e': expected a plain number (this key takes no unit), found '3 km'");
  CHECK(error_of([&] { (void)r.child("f").text(); }) ==
        "t.yaml:6:4: 'f': expected a single value, found a map");
}

TEST_CASE("quantities carry units, converted by UDUNITS-2", "[config][units]") {
  const UnitSystem units;
  const auto doc = ConfigDocument::from_text(
      "p: 92 bar\nq: 920 mbar\nz: 5 km\nbare: 6050\nwrong: 3 bar\nbogus: 3 furlongz\n"
      "list: \"[0, 5, 10] km\"\nlist2: [1 m, 2 km]\nlist3: {values: [1, 2], unit: mm}\n",
      "u.yaml");
  const auto r = doc.root();
  // 1 bar = 1e5 Pa = 1e6 dyn cm^-2 (SI Brochure, definition of the bar).
  CHECK(r.child("p").quantity(units, "Pa", "1 bar") == Approx(9.2e6));
  CHECK(r.child("q").quantity(units, "g cm-1 s-2", "1 bar") == Approx(9.2e5));
  CHECK(r.child("z").quantity(units, "cm", "1 km") == Approx(5e5));
  CHECK(error_of([&] { (void)r.child("bare").quantity(units, "cm", "6050 km"); }) ==
        "u.yaml:4:7: 'bare': expected a number with a unit, such as '6050 km', found '6050' "
        "with no unit; every dimensional value carries its unit");
  CHECK(error_of([&] { (void)r.child("wrong").quantity(units, "cm", "5 km"); }) ==
        "u.yaml:5:8: 'wrong': expected a unit convertible to 'cm', such as '5 km', found 'bar'");
  CHECK(error_of([&] { (void)r.child("bogus").quantity(units, "cm", "5 km"); }) ==
        "u.yaml:6:8: 'bogus': expected a unit that UDUNITS-2 knows (convertible to 'cm'), "
        "found 'furlongz'");
  const auto l = r.child("list").quantity_list(units, "km", "1 km");
  REQUIRE(l.size() == 3);
  CHECK(l[2] == Approx(10.0));
  const auto l2 = r.child("list2").quantity_list(units, "m", "1 m");
  CHECK(l2[1] == Approx(2000.0));
  CHECK(r.child("list3").quantity_list(units, "m", "1 m")[1] == Approx(0.002));
}

TEST_CASE("YAML syntax errors give the position", "[config]") {
  const auto msg = error_of([] { (void)ConfigDocument::from_text("a: [1, 2\nb: 3\n", "y.yaml"); });
  CHECK_THAT(msg, Catch::StartsWith("y.yaml:"));
  CHECK_THAT(msg, Catch::Contains("expected valid YAML, found a syntax error"));
}

TEST_CASE("command-line overrides edit the tree and are named as the origin", "[config]") {
  auto doc = ConfigDocument::from_text("grid:\n  cells: 10\n", "o.yaml");
  doc.apply_override("grid.cells=120");
  doc.apply_override("planet.radius=6050 km");
  const auto r = doc.root();
  CHECK(r.child("grid").child("cells").integer() == 120);
  CHECK(r.child("planet").child("radius").text() == "6050 km");
  doc.apply_override("grid.cells=many");
  CHECK(error_of([&] { (void)doc.root().child("grid").child("cells").integer(); }) ==
        "--set grid.cells=many: 'grid.cells': expected a whole number, found 'many'");
  CHECK_THAT(doc.resolved_text(), Catch::Contains("cells: many"));
  CHECK_THAT(error_of([&] { doc.apply_override("grid.cells"); }),
             Catch::Contains("expected KEY.PATH=VALUE"));
  CHECK_THAT(error_of([&] { doc.apply_override("grid..x=1"); }),
             Catch::Contains("expected dot-separated keys, found an empty key"));
}

TEST_CASE("overrides address list elements by index", "[config]") {
  auto doc = ConfigDocument::from_text("levels: [1, 2, 3]\n", "o.yaml");
  doc.apply_override("levels.1=20");
  CHECK(doc.root().child("levels").number_list()[1] == 20.0);
  CHECK_THAT(error_of([&] { doc.apply_override("levels.7=1"); }),
             Catch::Contains("expected an index below 3"));
}

TEST_CASE("file paths are relative to the file that names them", "[config]") {
  const auto doc = ConfigDocument::from_text("t: ../profiles/a.csv\n", "configs/s.yaml");
  CHECK(doc.root().child("t").path() == std::filesystem::path("configs/../profiles/a.csv"));
}

TEST_CASE("missing files are input errors, not crashes", "[config]") {
  CHECK_THAT(error_of([] { (void)ConfigDocument::load("no/such/file.yaml"); }),
             Catch::Contains("no/such/file.yaml: expected a readable YAML file"));
}

TEST_CASE("suggestions come only for near misses", "[config]") {
  CHECK(nearest_word("cels", {"cells", "bottom", "top"}) == std::optional<std::string>("cells"));
  CHECK_FALSE(nearest_word("xyzzy", {"cells", "bottom", "top"}).has_value());
  // Levenshtein distances (hand-counted).
  CHECK(edit_distance("kitten", "sitting") == 3);
  CHECK(edit_distance("", "abc") == 3);
}

TEST_CASE("a key repeated in one map is refused with both lines", "[config]") {
  const auto msg = error_of([] {
    (void)ConfigDocument::from_text("grid:\n  cells: 5\n  top: 1 km\n  cells: 6\n", "d.yaml");
  });
  CHECK(msg ==
        "d.yaml:4:3: 'grid.cells': expected each key once in a map, found 'cells' again "
        "(first at line 2); remove one of the two; the first would otherwise win silently");
  // Inside lists too, and for whole sections.
  CHECK_THROWS_AS(ConfigDocument::from_text("a:\n  - {x: 1, x: 2}\n", "l.yaml"), InputError);
  CHECK_THROWS_AS(ConfigDocument::from_text("s: 1\nt: 2\ns: 3\n", "t.yaml"), InputError);
}

TEST_CASE("lists and maps used as keys are refused", "[config]") {
  CHECK(error_of([] { (void)ConfigDocument::from_text("grid:\n  [a, b]: 1\n", "k.yaml"); }) ==
        "k.yaml:2:3: 'grid': expected a key that is a single word or value, found a list used "
        "as a key; write the key as plain text (quote it if it contains ':' or brackets)");
  CHECK_THROWS_AS(ConfigDocument::from_text("? {a: 1}\n: 2\n", "m.yaml"), InputError);
}

TEST_CASE("override paths that cannot be followed are usage errors, not crashes", "[config]") {
  auto doc = ConfigDocument::from_text("grid:\n  cells: 5\nlist: [a, b]\n", "o.yaml");
  const auto code_of = [&](const std::string& set) {
    try {
      doc.apply_override(set);
    } catch (const InputError& e) {
      return static_cast<int>(e.code());
    }
    return 0;
  };
  CHECK(code_of("list.99999999999999999999999=c") == 2);
  CHECK(code_of("list.2=c") == 2);
  CHECK(code_of("list.x=c") == 2);
  CHECK(code_of("grid.cells.x=1") == 2);
  CHECK(code_of("grid.cells.x.y=1") == 2);
  CHECK(code_of("grid={[a]: 1}") == 2);
  CHECK(code_of("grid={a: 1, a: 2}") == 2);
  CHECK(code_of("list.1=c") == 0);
  CHECK(doc.root().child("list").text_list() == std::vector<std::string>{"a", "c"});
}

TEST_CASE("wrong-case units get the spelling UDUNITS-2 converts", "[config][units]") {
  // Candidates are checked against UDUNITS-2's database itself; the expected spellings are
  // the SI and IAU symbols (BIPM SI Brochure, 9th ed. 2019, tables 2, 4, 8; IAU 2012
  // resolution B2 for "au").
  const UnitSystem units;
  CHECK(units.case_respelling("AU", "cm") == std::optional<std::string>("au"));
  CHECK(units.case_respelling("KM", "cm") == std::optional<std::string>("km"));
  CHECK(units.case_respelling("PA", "Pa") ==
        std::optional<std::string>("Pa"));  // PA parses (petaampere)
  CHECK(units.case_respelling("hPA", "Pa") == std::optional<std::string>("hPa"));
  CHECK(units.case_respelling("K", "K") == std::nullopt);          // already right
  CHECK(units.case_respelling("furlongz", "cm") == std::nullopt);  // nothing close
  const auto doc = ConfigDocument::from_text(
      "d: 1.3 AU\np: 920 PA\nl: {values: [1, 2], unit: KM}\nq: 1 hPA\n", "c.yaml");
  const auto r = doc.root();
  CHECK(error_of([&] { (void)r.child("d").quantity(units, "cm", "1 au"); }) ==
        "c.yaml:1:4: 'd': expected a unit that UDUNITS-2 knows (convertible to 'cm'), found "
        "'AU'; did you mean 'au'? (unit symbols are case-sensitive)");
  CHECK(error_of([&] { (void)r.child("p").quantity(units, "Pa", "1 bar"); }) ==
        "c.yaml:2:4: 'p': expected a unit convertible to 'Pa', such as '1 bar', found 'PA'; did "
        "you mean 'Pa'? (unit symbols are case-sensitive)");
  CHECK_THAT(error_of([&] { (void)r.child("l").quantity_list(units, "cm", "1 km"); }),
             Catch::Contains("found 'KM'; did you mean 'km'?"));
  CHECK_THAT(error_of([&] { (void)r.child("q").quantity(units, "Pa", "1 bar"); }),
             Catch::Contains("found 'hPA'; did you mean 'hPa'?"));
}
