// Mechanism file loader. Schema (README.md, section Configuration reference): mechanism {name,
// description}, species [..], parameters [..], modules [{name, description, requires, reactions
// [..]}].
#include "io/mechanism_loader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <functional>
#include <limits>
#include <sstream>

#include "io/config_node.hpp"
#include "io/key_table.hpp"

namespace colchem {

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
    const auto sp = term.find_first_of(" \t");
    if (sp != std::string::npos) {
      const std::string c = term.substr(0, sp);
      name = trim(term.substr(sp));
      const bool digits = std::all_of(c.begin(), c.end(), [](char ch) {
        return std::isdigit(static_cast<unsigned char>(ch)) != 0;
      });
      if (!digits || c.empty()) {
        where.fail("a whole-number stoichiometric coefficient before a species",
                   "'" + c + "' in '" + eq + "'", "coefficients are integers only");
      }
      // At most kMaxCoefficient (checked on the digits, before any conversion can overflow).
      const auto first = c.find_first_not_of('0');
      const std::string digits_only = first == std::string::npos ? "0" : c.substr(first);
      if (digits_only.size() > 3) {
        where.fail(fmt::format("a stoichiometric coefficient from 1 to {}", kMaxCoefficient),
                   "'" + c + "' in '" + eq + "'");
      }
      count = std::stoi(digits_only);
      if (count < 1) where.fail("a positive coefficient", "'" + c + "' in '" + eq + "'");
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

DiffusionParams read_diffusion(const ConfigNode& n) {
  DiffusionParams d;
  d.A = n.child("A").number();
  if (auto s = n.find("s")) d.s = s->number();
  if (!(d.A > 0.0)) n.child("A").fail("a positive diffusion coefficient A (cm-1 s-1 K^-s)");
  n.done();
  return d;
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
    std::string formula = sp.name;
    const auto fnode = item.find("formula");
    if (fnode) formula = fnode->text();
    std::string why;
    auto parsed = parse_formula(formula, &why);
    if (!parsed)
      (fnode ? *fnode : nm)
          .fail("a chemical formula", "'" + formula + "' (" + why + ")",
                "give `formula:` for a name that is not one");
    sp.composition = parsed->composition;
    sp.molar_mass_g_mol = sp.composition.molar_mass_g_mol();
    if (auto d = item.find("diffusion")) sp.diffusion = read_diffusion(*d);
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

/// Reads the one form key of a rate map (equilibrium_reverse's forward reuses this).
RateLaw read_law(const ConfigNode& rate, bool thermal_only) {
  static const std::vector<std::string> forms = {
      "arrhenius",           "falloff",  "troe",        "chemical_activation",
      "equilibrium_reverse", "constant", "first_order", "photolysis"};
  std::vector<std::string> present;
  for (const auto& f : forms) {
    if (rate.has(f)) present.push_back(f);
  }
  if (present.size() != 1) {
    rate.done();  // a misspelt form key explains a missing one
    std::string list;
    for (const auto& f : forms) list += (list.empty() ? "" : ", ") + f;
    rate.fail("exactly one rate form (" + list + ")",
              present.empty() ? std::string("none") : std::to_string(present.size()) + " forms");
  }
  const std::string form = present.front();
  const ConfigNode n = rate.child(form);
  RateLaw law;
  if (form == "arrhenius") {
    law.form = RateForm::kArrhenius;
    law.arrhenius = read_arrhenius(n);
  } else if (form == "falloff" || form == "chemical_activation") {
    law.form = form == "falloff" ? RateForm::kFalloff : RateForm::kChemicalActivation;
    law.k0_300 = n.child("k0_300").number();
    law.n = n.child("n").number();
    law.kinf_300 = n.child("kinf_300").number();
    law.m = n.child("m").number();
    if (law.form == RateForm::kFalloff) {
      if (auto fc = n.find("Fc")) law.Fc = fc->number();
      if (!(law.Fc > 0.0 && law.Fc <= 1.0)) n.child("Fc").fail("a broadening factor Fc in (0, 1]");
    } else if (!(law.kinf_300 > 0.0)) {
      n.child("kinf_300").fail("a positive kinf_300 (s-1) for a chemical-activation channel");
    }
    n.done();
  } else if (form == "troe") {
    law.form = RateForm::kTroe;
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
    n.done();
  } else if (form == "equilibrium_reverse") {
    if (thermal_only) n.fail("a forward rate of a thermal form, not another equilibrium_reverse");
    law.form = RateForm::kEquilibriumReverse;
    law.K_A = n.child("A").number();
    law.K_B = n.child("B").number();
    if (!(law.K_A > 0.0)) n.child("A").fail("a positive equilibrium-constant factor A (cm3)");
    const auto fw = n.child("forward");
    law.forward.push_back(read_law(fw, true));
    fw.done();
    n.done();
  } else if (form == "constant" || form == "first_order") {
    law.form = form == "constant" ? RateForm::kConstant : RateForm::kFirstOrder;
    law.arrhenius.A = n.child("k").number();
    n.done();
  } else {
    if (thermal_only) n.fail("a thermal rate form, not photolysis");
    law.form = RateForm::kPhotolysis;
    law.channel = n.child("channel").text();
    n.done();
  }
  return law;
}

/// Converts a law's parameters by f (the unit of k) and f3 (the unit of k times time, a
/// volume; it turns a bimolecular factor into a termolecular one, kinf into s-1, ...).
void convert_law(RateLaw& law, double f, double f3) {
  switch (law.form) {
    case RateForm::kArrhenius:
      law.arrhenius.A *= f;
      break;
    case RateForm::kConstant:
    case RateForm::kFirstOrder:
      law.arrhenius.A *= f;
      break;
    case RateForm::kFalloff:
      law.kinf_300 *= f;
      law.k0_300 *= f * f3;
      break;
    case RateForm::kTroe:
      law.kinf.A *= f;
      law.k0.A *= f * f3;
      break;
    case RateForm::kChemicalActivation:
      law.k0_300 *= f;
      law.kinf_300 *= f / f3;
      break;
    case RateForm::kEquilibriumReverse:
    case RateForm::kPhotolysis:
      break;
  }
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
  double f3 = 1.0;
  if (auto v = units.convert(1.0, "(" + given + ") s", "cm3")) f3 = *v;
  RateLaw& law = reverse ? rx.rate.forward.front() : rx.rate;
  convert_law(law, *f, f3);
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
  if (auto d = item.find("duplicate")) {
    d->fail("no `duplicate` key: reactions with one equation are told apart by their `id`s",
            "`duplicate`", "remove it and give each reaction its own `id`");
  }
  if (auto e = item.find("efficiencies")) {
    e->fail("`third_body_weights` (`efficiencies` was renamed `third_body_weights`)",
            "`efficiencies`", "rename the key; the map (species -> weight) is unchanged");
  }
}

// A reaction id: a letter, then up to 31 letters, digits, '_', '.' or '-' (short enough for
// a table column; common practice, no source).
constexpr std::size_t kMaxIdLength = 32;

std::string read_id(const ConfigNode& node) {
  const std::string id = node.text();
  const auto allowed = [](char ch) {
    return std::isalnum(static_cast<unsigned char>(ch)) != 0 || ch == '_' || ch == '.' || ch == '-';
  };
  const bool ok = !id.empty() && id.size() <= kMaxIdLength &&
                  std::isalpha(static_cast<unsigned char>(id[0])) != 0 &&
                  std::all_of(id.begin(), id.end(), allowed);
  if (!ok) {
    node.fail(
        fmt::format("a reaction id: a letter, then at most {} letters, digits, '_', '.' or '-'",
                    kMaxIdLength - 1),
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
  auto resolve = [&](const Side& side, std::vector<StoichEntry>& out) {
    for (const auto& [name, count] : side.terms) {
      const auto s = m.species_index(name);
      if (!s) {
        std::vector<std::string> names;
        for (const auto& sp : m.species) names.push_back(sp.name);
        const auto near = nearest_word(name, names);
        eqn.fail("species declared under 'species'", "undeclared '" + name + "' in " + quoted(rx),
                 near ? "did you mean '" + *near + "'?" : std::string{});
      }
      merge(out, *s, count);
    }
  };
  resolve(left, rx.reactants);
  resolve(right, rx.products);
  if (rx.reactants.empty()) eqn.fail("at least one reactant", quoted(rx));
}

/// `uncertainty: {f298, g, source}`.
void read_uncertainty(const ConfigNode& u, Reaction& rx) {
  const auto f = u.child("f298");
  rx.uncertainty.f298 = f.number();
  if (!(rx.uncertainty.f298 >= 1.0) || !std::isfinite(rx.uncertainty.f298)) {
    f.fail("an uncertainty factor f298 >= 1 (1: exact)", quoted(rx));
  }
  if (auto g = u.find("g")) {
    rx.uncertainty.g_K = g->number();
    if (!(rx.uncertainty.g_K >= 0.0) || !std::isfinite(rx.uncertainty.g_K)) {
      g->fail("a temperature coefficient g >= 0 (K)", quoted(rx));
    }
  }
  if (auto s = u.find("source")) rx.uncertainty.source = s->text();
  u.done();
  rx.uncertainty.stated = true;
}

/// Checks of the rate law's shape against the equation (hv, M, products, sink).
void check_shape(const Reaction& rx, const ConfigNode& item, const ConfigNode& eqn,
                 const ConfigNode& rate) {
  const bool photolysis = rx.rate.form == RateForm::kPhotolysis;
  if (photolysis && !rx.photon)
    rate.fail("'hv' among the reactants of a photolysis reaction", quoted(rx));
  if (!photolysis && rx.photon) rate.fail("a photolysis rate for a reaction with 'hv'", quoted(rx));
  if (rx.rate.form == RateForm::kFirstOrder && rx.molecularity() != 1) {
    rate.fail("exactly one reactant for a first_order rate", quoted(rx));
  }
  const RateLaw& shape =
      rx.rate.form == RateForm::kEquilibriumReverse ? rx.rate.forward.front() : rx.rate;
  if ((shape.form == RateForm::kFalloff || shape.form == RateForm::kTroe) && !rx.third_body) {
    rate.fail("'+ M' on both sides of a reaction with a fall-off rate", quoted(rx));
  }
  if (rx.products.empty() && !rx.sink) {
    eqn.fail("products, or `sink: true` for a reaction without products", quoted(rx));
  }
  if (rx.sink && !rx.products.empty()) {
    item.child("sink").fail("no products in a reaction marked sink", quoted(rx));
  }
}

/// `third_body_weights: {SPECIES: weight}` and `scale: [PARAMETER or 1 - PARAMETER, ...]`.
void read_weights_and_scale(const ConfigNode& item, const Mechanism& m, Reaction& rx) {
  if (auto eff = item.find("third_body_weights")) {
    for (const auto& [name, v] : eff->entries()) {
      const auto s = m.species_index(name);
      if (!s)
        v.fail("a declared species as a third-body weight key", "'" + name + "' in " + quoted(rx));
      const double e = v.number();
      if (!(e >= 0.0)) v.fail("a non-negative third-body weight");
      rx.efficiencies.push_back(Efficiency{*s, e});
    }
  }
  if (auto sc = item.find("scale")) {
    std::vector<ConfigNode> factors =
        sc->is_sequence() ? sc->items() : std::vector<ConfigNode>{*sc};
    for (const auto& f : factors) {
      std::string t = trim(f.text());
      ScaleFactor factor;
      if (t.size() > 1 && t[0] == '1' && trim(t.substr(1)).rfind('-', 0) == 0) {
        factor.complement = true;
        t = trim(trim(t.substr(1)).substr(1));
      }
      const auto p = m.parameter_index(t);
      if (!p) {
        std::vector<std::string> names;
        for (const auto& q : m.parameters) names.push_back(q.name);
        const auto near = nearest_word(t, names);
        f.fail("a parameter declared under 'parameters' (or '1 - NAME')",
               "unknown parameter '" + t + "' in " + quoted(rx),
               near ? "did you mean '" + *near + "'?" : std::string{});
      }
      factor.parameter = *p;
      rx.scale.push_back(factor);
    }
  }
}

/// Element balance (hv and M carry no atoms); sinks are exempt.
void check_element_balance(const Reaction& rx, const Mechanism& m, const ConfigNode& eqn) {
  std::map<std::string, long long> bal;  // counts <= 9999 times coefficients <= 999
  for (const auto& e : rx.reactants) {
    for (const auto& [el, c] : m.species[e.species].composition.atoms)
      bal[el] += static_cast<long long>(c) * e.count;
  }
  for (const auto& e : rx.products) {
    for (const auto& [el, c] : m.species[e.species].composition.atoms)
      bal[el] -= static_cast<long long>(c) * e.count;
  }
  std::string off;
  for (const auto& [el, c] : bal) {
    if (c != 0) off += fmt::format("{}{} {:+d}", off.empty() ? "" : ", ", el, -c);
  }
  if (!off.empty()) {
    eqn.fail("a reaction balanced in every element (or `sink: true`)",
             quoted(rx) + " changing " + off + " (products minus reactants)");
  }
}

Reaction read_reaction(const ConfigNode& item, Mechanism& m, std::size_t module,
                       const UnitSystem& units) {
  Reaction rx;
  rx.where = item.location();
  rx.module = module;
  refuse_renamed_keys(item);
  const auto id = item.find("id");
  if (!id) {
    const auto eq = item.find("equation");
    item.fail("an `id` for every reaction (short and unique in the file, e.g. 'o_o3')",
              eq ? "none for '" + trim(eq->text()) + "'" : std::string("none"));
  }
  rx.id = read_id(*id);
  const auto eqn = item.child("equation");
  read_equation(eqn, m, rx);
  const auto rate = item.child("rate");
  rx.rate = read_law(rate, false);
  if (auto s = item.find("source")) rx.source = s->text();
  if (auto s = item.find("sink")) rx.sink = s->boolean();
  if (auto u = item.find("uncertainty")) read_uncertainty(*u, rx);
  check_shape(rx, item, eqn, rate);
  if (auto u = rate.find("units")) read_units(*u, rx, units);
  rate.done();
  if (!rx.uncertainty.stated) rx.uncertainty = default_uncertainty(rx);

  read_weights_and_scale(item, m, rx);
  item.done();

  if (!rx.sink) check_element_balance(rx, m, eqn);
  return rx;
}

/// Each module's `requires` (names, with the node that lists them) as module indices; the
/// requirements form no cycle.
void resolve_requirements(
    const std::vector<std::pair<ConfigNode, std::vector<std::string>>>& requires_text,
    Mechanism& m) {
  for (std::size_t i = 0; i < m.modules.size(); ++i) {
    const auto& [node, names] = requires_text[i];
    for (const auto& nm : names) {
      const auto idx = m.module_index(nm);
      if (!idx) {
        std::vector<std::string> all;
        for (const auto& md : m.modules) all.push_back(md.name);
        const auto near = nearest_word(nm, all);
        node.fail("a module defined in this file", "unknown module '" + nm + "'",
                  near ? "did you mean '" + *near + "'?" : std::string{});
      }
      m.modules[i].requires_modules.push_back(*idx);
    }
  }
  // Requirements form no cycle (a module that requires itself, directly or through others):
  // depth-first search, 0 unvisited, 1 on the current path, 2 done.
  {
    std::vector<int> state(m.modules.size(), 0);
    std::vector<std::size_t> path;
    std::function<void(std::size_t)> visit = [&](std::size_t i) {
      state[i] = 1;
      path.push_back(i);
      for (const std::size_t r : m.modules[i].requires_modules) {
        if (state[r] == 1) {
          std::string cycle;
          const auto from = std::find(path.begin(), path.end(), r);
          for (auto it = from; it != path.end(); ++it) cycle += m.modules[*it].name + " -> ";
          cycle += m.modules[r].name;
          requires_text[r].first.fail("module requirements without a cycle", "the cycle " + cycle);
        }
        if (state[r] == 0) visit(r);
      }
      path.pop_back();
      state[i] = 2;
    };
    for (std::size_t i = 0; i < m.modules.size(); ++i) {
      if (state[i] == 0) visit(i);
    }
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

  const auto mods = root.child("modules");
  std::vector<std::pair<ConfigNode, std::vector<std::string>>> requires_text;
  std::map<std::string, std::size_t> seen;
  for (const auto& item : mods.items()) {
    Module mod;
    mod.where = item.location();
    mod.name = item.child("name").text();
    if (m->module_index(mod.name))
      item.child("name").fail("a module name used once", "'" + mod.name + "' again");
    if (auto d = item.find("description")) mod.description = d->text();
    std::vector<std::string> req;
    if (auto r = item.find("requires")) {
      req = r->text_list();
      requires_text.emplace_back(*r, req);
    } else {
      requires_text.emplace_back(item, req);
    }
    const std::size_t index = m->modules.size();
    m->modules.push_back(mod);
    for (const auto& ri : item.child("reactions").items()) {
      Reaction rx = read_reaction(ri, *m, index, units);
      m->modules[index].reactions.push_back(m->reactions.size());
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
  resolve_requirements(requires_text, *m);
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
