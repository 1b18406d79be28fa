// Mechanism file loader. Schema (README.md, "Mechanism files"): mechanism {name,
// description}, species [..], parameters [..], modules [{name, description, requires, reactions
// [..]}]. The rules beyond the syntax are chem/mechanism_rules.hpp's.
#include "io/mechanism_loader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <limits>
#include <map>
#include <sstream>

#include "chem/mechanism_rules.hpp"
#include "io/config_node.hpp"
#include "io/key_table.hpp"

namespace colchem {

std::size_t named_or_fail(const ConfigNode& where, std::optional<std::size_t> index,
                          const std::string& name, const std::vector<std::string>& names,
                          const std::string& expected, const std::string& found,
                          const std::string& otherwise) {
  if (index) return *index;
  const auto near = nearest_word(name, names);
  where.fail(expected, found, near ? "did you mean '" + *near + "'?" : otherwise);
}

namespace {

constexpr ExitCode kCode = ExitCode::kInputData;
constexpr double kInf = std::numeric_limits<double>::infinity();
// The largest stoichiometric coefficient of a term (common practice, no source: elementary
// and lumped reactions use single digits; three digits leave room and keep every element
// balance far from integer overflow).
constexpr int kMaxCoefficient = 999;

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t");
  if (b == std::string::npos) return {};
  const auto e = s.find_last_not_of(" \t");
  return s.substr(b, e - b + 1);
}

std::string quoted(const Reaction& rx) {
  return "reaction '" + rx.equation + "'";
}

struct Side {
  std::vector<std::pair<std::string, int>> terms;
  bool M = false;
  bool hv = false;
};

/// The coefficient `c` of a term of equation `eq`: whole, from 1 to kMaxCoefficient (checked
/// on the digits, before any conversion can overflow).
int read_coefficient(const std::string& c, const ConfigNode& where, const std::string& eq) {
  const bool digits = !c.empty() && std::all_of(c.begin(), c.end(), [](char ch) {
    return std::isdigit(static_cast<unsigned char>(ch)) != 0;
  });
  if (!digits) {
    where.fail("a whole-number stoichiometric coefficient before a species",
               "'" + c + "' in '" + eq + "'", "coefficients are integers only");
  }
  const auto first = c.find_first_not_of('0');
  const std::string value = first == std::string::npos ? "0" : c.substr(first);
  if (value.size() > 3) {
    where.fail(fmt::format("a stoichiometric coefficient from 1 to {}", kMaxCoefficient),
               "'" + c + "' in '" + eq + "'");
  }
  const int count = std::stoi(value);
  if (count < 1) where.fail("a positive coefficient", "'" + c + "' in '" + eq + "'");
  return count;
}

Side parse_side(const std::string& text, const ConfigNode& where, const std::string& eq) {
  Side side;
  if (trim(text).empty()) return side;
  std::stringstream ss(text);
  std::string term;
  while (std::getline(ss, term, '+')) {
    term = trim(term);
    if (term.empty()) where.fail("terms separated by ' + '", "an empty term in '" + eq + "'");
    int count = 1;
    std::string name = term;
    if (const auto sp = term.find_first_of(" \t"); sp != std::string::npos) {
      count = read_coefficient(term.substr(0, sp), where, eq);
      name = trim(term.substr(sp));
    }
    if (name == "M") {
      side.M = true;
    } else if (name == "hv") {
      side.hv = true;
    } else {
      side.terms.emplace_back(name, count);
    }
  }
  return side;
}

void read_species(const ConfigNode& list, Mechanism& m, const UnitSystem& units) {
  for (const auto& item : list.items()) {
    Species sp;
    sp.where = item.location();
    const auto nm = item.child("name");
    sp.name = nm.text();
    if (sp.name == "M" || sp.name == "hv")
      nm.fail("a species name", "the reserved name '" + sp.name + "'");
    if (m.species_index(sp.name)) nm.fail("a species declared once", "'" + sp.name + "' again");
    if (auto d = item.find("description")) sp.description = d->text();
    const Key keys[] = {
        flag("fixed", &sp.fixed),
        number("thermal_diffusion", &sp.thermal_diffusion, -kInf, kInf, "a finite number"),
    };
    read_keys(item, units, keys);
    const auto fnode = item.find("formula");
    const std::string formula = fnode ? fnode->text() : sp.name;
    std::string why;
    const auto parsed = parse_formula(formula, &why);
    if (!parsed)
      (fnode ? *fnode : nm)
          .fail("a chemical formula", "'" + formula + "' (" + why + ")",
                "give `formula:` for a name that is not one");
    sp.composition = parsed->composition;
    sp.molar_mass_g_mol = sp.composition.molar_mass_g_mol();
    if (auto d = item.find("diffusion")) {
      sp.diffusion.emplace();
      const Key diffusion[] = {
          number("A", &sp.diffusion->A, 0.0, kInf,
                 "a positive diffusion coefficient A (cm-1 s-1 K^-s)")
              .above_lo()
              .needed(),
          number("s", &sp.diffusion->s, -kInf, kInf, "a finite number"),
      };
      read_keys(*d, units, diffusion);
      d->done();
    }
    item.done();
    m.species.push_back(std::move(sp));
  }
}

void read_parameters(const ConfigNode& list, Mechanism& m) {
  for (const auto& item : list.items()) {
    Parameter p;
    p.where = item.location();
    p.name = item.child("name").text();
    if (m.parameter_index(p.name))
      item.child("name").fail("a parameter declared once", "'" + p.name + "' again");
    p.default_value = item.child("default").number();
    if (auto v = item.find("min")) p.min = v->number();
    if (auto v = item.find("max")) p.max = v->number();
    if (auto v = item.find("meaning")) p.meaning = v->text();
    if (!(p.min <= p.max)) item.fail("min <= max", fmt::format("min {} > max {}", p.min, p.max));
    if (!(p.default_value >= p.min && p.default_value <= p.max)) {
      item.child("default").fail(
          fmt::format("a default within [{}, {}] for parameter '{}'", p.min, p.max, p.name),
          fmt::format("{}", p.default_value));
    }
    item.done();
    m.parameters.push_back(std::move(p));
  }
}

ArrheniusParams read_arrhenius(const ConfigNode& n) {
  ArrheniusParams a;
  a.A = n.child("A").number();
  if (auto b = n.find("b")) a.b = b->number();
  if (auto e = n.find("E")) a.E = e->number();
  n.done();
  return a;
}

constexpr RateForm kForms[] = {RateForm::kArrhenius,
                               RateForm::kFalloff,
                               RateForm::kTroe,
                               RateForm::kChemicalActivation,
                               RateForm::kEquilibriumReverse,
                               RateForm::kConstant,
                               RateForm::kFirstOrder,
                               RateForm::kPhotolysis};

/// The one form key of a rate map, as its form and its node.
std::pair<RateForm, ConfigNode> read_form(const ConfigNode& rate) {
  std::vector<RateForm> present;
  std::vector<std::string> names;
  for (const RateForm f : kForms) {
    names.emplace_back(rate_form_name(f));
    if (rate.has(names.back())) present.push_back(f);
  }
  if (present.size() != 1) {
    rate.done();  // a misspelt form key explains a missing one
    rate.fail(fmt::format("exactly one rate form ({})", fmt::join(names, ", ")),
              present.empty() ? std::string("none") : std::to_string(present.size()) + " forms");
  }
  return {present.front(), rate.child(rate_form_name(present.front()))};
}

/// Reads the one form of a rate map (equilibrium_reverse's forward reuses this).
RateLaw read_law(const ConfigNode& rate, bool thermal_only) {
  RateLaw law;
  const auto [form, n] = read_form(rate);
  law.form = form;
  switch (form) {
    case RateForm::kArrhenius:
      law.arrhenius = read_arrhenius(n);
      return law;
    case RateForm::kFalloff:
    case RateForm::kChemicalActivation:
      law.k0_300 = n.child("k0_300").number();
      law.n = n.child("n").number();
      law.kinf_300 = n.child("kinf_300").number();
      law.m = n.child("m").number();
      if (form == RateForm::kFalloff) {
        if (auto fc = n.find("Fc")) law.Fc = fc->number();
        if (!(law.Fc > 0.0 && law.Fc <= 1.0))
          n.child("Fc").fail("a broadening factor Fc in (0, 1]");
      } else if (!(law.kinf_300 > 0.0)) {
        n.child("kinf_300").fail("a positive kinf_300 (s-1) for a chemical-activation channel");
      }
      break;
    case RateForm::kTroe:
      law.k0 = read_arrhenius(n.child("k0"));
      law.kinf = read_arrhenius(n.child("kinf"));
      law.alpha = n.child("alpha").number();
      law.T3 = n.child("T3").number();
      law.T1 = n.child("T1").number();
      if (auto t2 = n.find("T2")) {
        law.T2 = t2->number();
        law.has_T2 = true;
      }
      if (!(law.T3 > 0.0)) n.child("T3").fail("a positive T3 (K)");
      if (!(law.T1 > 0.0)) n.child("T1").fail("a positive T1 (K)");
      break;
    case RateForm::kEquilibriumReverse: {
      if (thermal_only) n.fail("a forward rate of a thermal form, not another equilibrium_reverse");
      law.K_A = n.child("A").number();
      law.K_B = n.child("B").number();
      if (!(law.K_A > 0.0)) n.child("A").fail("a positive equilibrium-constant factor A (cm3)");
      const auto fw = n.child("forward");
      law.forward.push_back(read_law(fw, true));
      fw.done();
      break;
    }
    case RateForm::kConstant:
    case RateForm::kFirstOrder:
      law.arrhenius.A = n.child("k").number();
      break;
    case RateForm::kPhotolysis:
      if (thermal_only) n.fail("a thermal rate form, not photolysis");
      law.channel = n.child("channel").text();
      break;
  }
  n.done();
  return law;
}

void read_units(const ConfigNode& u, Reaction& rx, const UnitSystem& units) {
  const std::string given = u.text();
  const bool reverse = rx.rate.form == RateForm::kEquilibriumReverse;
  if (rx.rate.form == RateForm::kPhotolysis) u.fail("no units on a photolysis rate (J is in s-1)");
  // For equilibrium_reverse the units are those of the forward rate (one order higher).
  const int order = rx.rate_order() + (reverse ? 1 : 0);
  if (order < 1 || order > 3)
    u.fail("a reaction of order 1 to 3", std::to_string(order) + " for " + quoted(rx));
  const std::string expected = rate_constant_units(order);
  if (!units.parses(given)) u.fail("a UDUNITS unit such as '" + expected + "'", "'" + given + "'");
  const auto f = units.convert(1.0, given, expected);
  if (!f) {
    u.fail("'" + expected + "' (or a unit convertible to it) for the order-" +
               std::to_string(order) + " " + quoted(rx),
           "'" + given + "'");
  }
  // The volume in k times time (cm3 for a bimolecular k) converts k0 and kinf of the
  // fall-off forms; for other orders it is 1.
  const auto f3 = units.convert(1.0, "(" + given + ") s", "cm3");
  convert_rate_units(reverse ? rx.rate.forward.front() : rx.rate, *f, f3.value_or(1.0));
}

void merge(std::vector<StoichEntry>& v, std::size_t s, int count) {
  for (auto& e : v) {
    if (e.species == s) {
      e.count += count;
      return;
    }
  }
  v.push_back(StoichEntry{s, count});
}

// Keys of earlier versions of the schema, each refused with what replaces it.
void refuse_renamed_keys(const ConfigNode& item) {
  const std::array<std::array<const char*, 3>, 2> renamed = {{
      {"duplicate", "no `duplicate` key: reactions with one equation are told apart by their `id`s",
       "remove it and give each reaction its own `id`"},
      {"efficiencies", "`third_body_weights` (`efficiencies` was renamed `third_body_weights`)",
       "rename the key; the map (species -> weight) is unchanged"},
  }};
  for (const auto& [key, expected, hint] : renamed) {
    if (auto n = item.find(key)) n->fail(expected, fmt::format("`{}`", key), hint);
  }
}

std::string read_id(const ConfigNode& item) {
  const auto node = item.find("id");
  if (!node) {
    const auto eq = item.find("equation");
    item.fail("an `id` for every reaction (short and unique in the file, e.g. 'o_o3')",
              eq ? "none for '" + trim(eq->text()) + "'" : std::string("none"));
  }
  const std::string id = node->text();
  if (!is_reaction_id(id)) {
    node->fail(
        fmt::format("a reaction id: a letter, then at most {} letters, digits, '_', '.' or '-'",
                    kMaxReactionIdLength - 1),
        "'" + id + "'");
  }
  return id;
}

/// The equation "A + B -> C + D" into rx (reactants, products, third body, photon),
/// each species declared in the mechanism.
void read_equation(const ConfigNode& eqn, const Mechanism& m, Reaction& rx) {
  rx.equation = trim(eqn.text());
  const auto arrow = rx.equation.find("->");
  if (arrow == std::string::npos) eqn.fail("an equation 'A + B -> C + D'", "'" + rx.equation + "'");
  const Side left = parse_side(rx.equation.substr(0, arrow), eqn, rx.equation);
  const Side right = parse_side(rx.equation.substr(arrow + 2), eqn, rx.equation);
  if (left.M != right.M) eqn.fail("'M' on both sides or on neither", quoted(rx));
  if (right.hv) eqn.fail("'hv' only among the reactants", quoted(rx));
  rx.third_body = left.M;
  rx.photon = left.hv;
  for (const auto& [side, out] :
       {std::pair{&left, &rx.reactants}, std::pair{&right, &rx.products}}) {
    for (const auto& [name, count] : side->terms) {
      merge(*out,
            named_or_fail(eqn, m.species_index(name), name, names_of(m.species),
                          "species declared under 'species'",
                          "undeclared '" + name + "' in " + quoted(rx)),
            count);
    }
  }
  if (rx.reactants.empty()) eqn.fail("at least one reactant", quoted(rx));
}

/// `uncertainty: {f298, g, source}`.
void read_uncertainty(const ConfigNode& u, Reaction& rx, const UnitSystem& units) {
  const Key keys[] = {
      number("f298", &rx.uncertainty.f298, 1.0, kInf,
             "an uncertainty factor f298 >= 1 (1: exact) for " + quoted(rx))
          .below_hi()
          .needed(),
      number("g", &rx.uncertainty.g_K, 0.0, kInf,
             "a temperature coefficient g >= 0 (K) for " + quoted(rx))
          .below_hi(),
  };
  read_keys(u, units, keys);
  if (auto s = u.find("source")) rx.uncertainty.source = s->text();
  u.done();
  rx.uncertainty.stated = true;
}

/// `third_body_weights: {SPECIES: weight}` and `scale: [PARAMETER or 1 - PARAMETER, ...]`.
void read_weights_and_scale(const ConfigNode& item, const Mechanism& m, Reaction& rx) {
  if (auto eff = item.find("third_body_weights")) {
    for (const auto& [name, v] : eff->entries()) {
      const std::size_t s = named_or_fail(v, m.species_index(name), name, names_of(m.species),
                                          "a declared species as a third-body weight key",
                                          "'" + name + "' in " + quoted(rx));
      const double e = v.number();
      if (!(e >= 0.0)) v.fail("a non-negative third-body weight");
      rx.efficiencies.push_back(Efficiency{s, e});
    }
  }
  const auto sc = item.find("scale");
  if (!sc) return;
  for (const auto& f : sc->is_sequence() ? sc->items() : std::vector<ConfigNode>{*sc}) {
    std::string t = trim(f.text());
    ScaleFactor factor;
    if (t.size() > 1 && t[0] == '1' && trim(t.substr(1)).rfind('-', 0) == 0) {
      factor.complement = true;
      t = trim(trim(t.substr(1)).substr(1));
    }
    factor.parameter = named_or_fail(f, m.parameter_index(t), t, names_of(m.parameters),
                                     "a parameter declared under 'parameters' (or '1 - NAME')",
                                     "unknown parameter '" + t + "' in " + quoted(rx));
    rx.scale.push_back(factor);
  }
}

Reaction read_reaction(const ConfigNode& item, Mechanism& m, std::size_t module,
                       const UnitSystem& units) {
  Reaction rx;
  rx.where = item.location();
  rx.module = module;
  refuse_renamed_keys(item);
  rx.id = read_id(item);
  const auto eqn = item.child("equation");
  read_equation(eqn, m, rx);
  const auto rate = item.child("rate");
  rx.rate = read_law(rate, false);
  if (auto s = item.find("source")) rx.source = s->text();
  if (auto s = item.find("sink")) rx.sink = s->boolean();
  if (auto u = item.find("uncertainty")) read_uncertainty(*u, rx, units);
  if (const auto shape = rate_shape_problem(rx); !shape.empty()) rate.fail(shape, quoted(rx));
  if (rx.products.empty() && !rx.sink) {
    eqn.fail("products, or `sink: true` for a reaction without products", quoted(rx));
  }
  if (rx.sink && !rx.products.empty()) {
    item.child("sink").fail("no products in a reaction marked sink", quoted(rx));
  }
  if (auto u = rate.find("units")) read_units(*u, rx, units);
  rate.done();
  if (!rx.uncertainty.stated) rx.uncertainty = default_uncertainty(rx);
  read_weights_and_scale(item, m, rx);
  item.done();
  if (const auto off = rx.sink ? std::string{} : element_imbalance(m, rx); !off.empty()) {
    eqn.fail("a reaction balanced in every element (or `sink: true`)",
             quoted(rx) + " changing " + off + " (products minus reactants)");
  }
  return rx;
}

/// A module's entry (not its reactions); `requires` is resolved once every module is read.
Module read_module(const ConfigNode& item, const Mechanism& m) {
  Module mod;
  mod.where = item.location();
  mod.name = item.child("name").text();
  if (m.module_index(mod.name))
    item.child("name").fail("a module name used once", "'" + mod.name + "' again");
  if (auto d = item.find("description")) mod.description = d->text();
  return mod;
}

/// Each module's `requires` (its node, when given) as module indices; the requirements form
/// no cycle.
void resolve_requirements(const std::vector<std::optional<ConfigNode>>& nodes, Mechanism& m) {
  for (std::size_t i = 0; i < m.modules.size(); ++i) {
    if (!nodes[i]) continue;
    for (const auto& nm : nodes[i]->text_list()) {
      m.modules[i].requires_modules.push_back(
          named_or_fail(*nodes[i], m.module_index(nm), nm, names_of(m.modules),
                        "a module defined in this file", "unknown module '" + nm + "'"));
    }
  }
  if (const auto cycle = requirement_cycle(m); !cycle.empty()) {
    std::vector<std::string> names;
    for (const auto i : cycle) names.push_back(m.modules[i].name);
    nodes[cycle.front()]->fail("module requirements without a cycle",
                               fmt::format("the cycle {}", fmt::join(names, " -> ")));
  }
}

std::shared_ptr<Mechanism> build(const ConfigDocument& doc, const UnitSystem& units) {
  auto m = std::make_shared<Mechanism>();
  const ConfigNode root = doc.root();
  const auto meta = root.child("mechanism");
  m->name = meta.child("name").text();
  if (auto d = meta.find("description")) m->description = d->text();
  meta.done();
  read_species(root.child("species"), *m, units);
  if (auto p = root.find("parameters")) read_parameters(*p, *m);
  std::vector<std::optional<ConfigNode>> requires_nodes;
  std::map<std::string, std::size_t> seen;
  for (const auto& item : root.child("modules").items()) {
    m->modules.push_back(read_module(item, *m));
    requires_nodes.push_back(item.find("requires"));
    for (const auto& ri : item.child("reactions").items()) {
      Reaction rx = read_reaction(ri, *m, m->modules.size() - 1, units);
      m->modules.back().reactions.push_back(m->reactions.size());
      if (const auto it = seen.find(rx.id); it != seen.end()) {
        const Reaction& first = m->reactions[it->second];
        ri.child("id").fail("a reaction id used once",
                            "'" + rx.id + "' for " + quoted(rx) + ", already at line " +
                                std::to_string(first.where.line) + " for '" + first.equation + "'");
      }
      seen[rx.id] = m->reactions.size();
      m->reactions.push_back(std::move(rx));
    }
    item.done();
  }
  resolve_requirements(requires_nodes, *m);
  root.done();
  return m;
}

}  // namespace

std::shared_ptr<Mechanism> load_mechanism(const std::filesystem::path& file,
                                          const UnitSystem& units) {
  const ConfigDocument doc = ConfigDocument::load(file, kCode);
  auto m = build(doc, units);
  m->file = file;
  m->text = doc.resolved_text();
  return m;
}

std::shared_ptr<Mechanism> load_mechanism_text(const std::string& text, const std::string& name,
                                               const UnitSystem& units) {
  const ConfigDocument doc = ConfigDocument::from_text(text, name, kCode);
  auto m = build(doc, units);
  m->file = name;
  m->text = text;
  return m;
}

}  // namespace colchem
