#include "io/chemistry_section.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <limits>

#include "chem/mechanism_rules.hpp"
#include "core/background.hpp"
#include "core/ideal_gas.hpp"
#include "core/physical_bounds.hpp"
#include "io/amount.hpp"
#include "io/config_node.hpp"
#include "io/key_table.hpp"
#include "io/mechanism_loader.hpp"
#include "io/scenario.hpp"
#include "io/table.hpp"

namespace colchem {

namespace {

std::vector<std::size_t> read_modules(const ConfigNode& n, const Mechanism& m) {
  const std::vector<std::string> names = names_of(m.modules);
  std::vector<std::size_t> active;
  for (const auto& item : n.items()) {
    const std::string name = item.text();
    const std::size_t idx = named_or_fail(
        item, m.module_index(name), name, names, "a module of mechanism '" + m.name + "'",
        "unknown module '" + name + "'", fmt::format("modules: {}", fmt::join(names, ", ")));
    if (std::find(active.begin(), active.end(), idx) == active.end()) active.push_back(idx);
  }
  if (const auto miss = missing_requirement(m, active)) {
    const std::string& required = m.modules[miss->second].name;
    n.fail("every module that an active module requires",
           "module '" + m.modules[miss->first].name + "' without '" + required + "'",
           "add '" + required + "' to the list");
  }
  return active;
}

/// {table: FILE, column: NAME} (altitude column "altitude") in `unit` (as written when empty);
/// the table is recorded in `inputs`.
ProfileSpec altitude_table(const ConfigNode& n, const UnitSystem& units, const std::string& unit,
                           const std::string& role, std::vector<InputFile>& inputs) {
  const TableRef ref = table_ref(n, TableRefForm::altitude_column_required());
  n.done();
  const Table t = ref.read();
  auto p = ref.profile(t, units, "cm", unit);
  inputs.push_back(InputFile{role, ref.file, t.text()});
  return ProfileSpec{std::move(p.axis), std::move(p.value), std::move(p.source)};
}

/// A value per altitude: a quantity in `unit`, or {table: FILE, column: NAME} (altitude
/// column "altitude"); the table is recorded in `inputs`.
AltitudeValue read_altitude_value(const ConfigNode& n, const UnitSystem& units,
                                  const std::string& unit, const std::string& example,
                                  const std::string& role, std::vector<InputFile>& inputs) {
  AltitudeValue v;
  if (!n.is_map()) {
    v.constant = unit == "1" ? n.number() : n.quantity(units, unit, example);
    return v;
  }
  v.table = altitude_table(n, units, unit, role, inputs);
  return v;
}

void require_range(const ConfigNode& n, const AltitudeValue& v, double lo, double hi,
                   const std::string& expected) {
  const auto bad = [&](double x) { return !(x >= lo && x <= hi); };
  if (!v.from_table()) {
    if (bad(v.constant)) n.fail(expected, fmt::format("'{}'", n.text()));
    return;
  }
  for (double x : v.table.value) {
    if (bad(x)) n.fail(expected + " in every row of " + v.table.source, fmt::format("{}", x));
  }
}

CondensationExchange read_exchange(const ConfigNode& n, const Mechanism& m, const UnitSystem& units,
                                   std::vector<InputFile>& inputs) {
  using X = CondensationExchange;
  X s;
  const auto sp = n.child("species");
  const auto idx = m.species_index(sp.text());
  if (!idx) sp.fail("a species of the mechanism", "'" + sp.text() + "'");
  if (m.species[*idx].fixed) sp.fail("a species that is not held fixed", "'" + sp.text() + "'");
  s.species = *idx;
  const std::string name = sp.text();
  const auto sat = n.child("saturation");
  if (sat.is_scalar()) {
    (void)sat.choice({"h2so4_ayers1980"});
    s.saturation = X::Saturation::kH2SO4Ayers1980;
  } else if (auto aq = sat.find("h2so4_aqueous")) {
    s.saturation = X::Saturation::kH2SO4Aqueous;
    const auto w = aq->child("weight_fraction");
    s.weight_fraction =
        read_altitude_value(w, units, "1", "0.75", "acid weight fraction for " + name, inputs);
    require_range(w, s.weight_fraction, kH2SO4ActivityMinWeight, 1.0,
                  "an acid weight fraction from 0.4 to 1 (the activity table's range)");
    aq->done();
    sat.done();
  } else {
    const auto cc = sat.child("clausius_clapeyron");
    s.saturation = X::Saturation::kClausiusClapeyron;
    s.cc_A = cc.child("A").number();
    s.cc_B = cc.child("B").number();
    cc.done();
    sat.done();
  }
  const auto tau = n.find("timescale");
  const auto kinetic = n.find("kinetic");
  if ((tau ? 1 : 0) + (kinetic ? 1 : 0) != 1) {
    n.fail("exactly one of 'timescale' and 'kinetic'", tau ? "both" : "neither");
  }
  if (tau) {
    s.rate = X::Rate::kTimescale;
    const AltitudeValue v =
        read_altitude_value(*tau, units, "s", "1 d", "exchange timescale for " + name, inputs);
    require_range(*tau, v, 1e-300, std::numeric_limits<double>::infinity(), "a positive timescale");
    s.timescale_s = v.constant;
    s.timescale_table = v.table;
  } else {
    s.rate = X::Rate::kKinetic;
    if (auto a = kinetic->find("accommodation")) {
      s.accommodation = a->number();
      if (!(s.accommodation > 0.0 && s.accommodation <= 1.0)) {
        a->fail("an accommodation coefficient in (0, 1]");
      }
    }
    const auto area = kinetic->child("surface_area");
    s.surface_area_cm2_cm3 = read_altitude_value(area, units, "cm2 cm-3", "1e-6 cm2 cm-3",
                                                 "aerosol surface area for " + name, inputs);
    require_range(area, s.surface_area_cm2_cm3, 0.0, std::numeric_limits<double>::infinity(),
                  "a non-negative surface area");
    kinetic->done();
  }
  if (auto c = n.find("condensed")) {
    if (!c->is_map()) c->fail("{table: FILE, column: NAME} (present where the value is > 0)");
    // Any unit: only where the amount is positive matters.
    s.has_condensed = true;
    s.condensed.table = altitude_table(*c, units, "", "condensed phase for " + name, inputs);
  }
  if (auto b = n.find("below")) s.below_cm = b->quantity(units, "cm", "70 km");
  if (auto a = n.find("above")) {
    s.above_cm = a->quantity(units, "cm", "58 km");
    if (!(s.above_cm < s.below_cm)) a->fail("an altitude below 'below'", "'" + a->text() + "'");
  }
  n.done();
  return s;
}

/// `chemistry.rate_limits`: the thresholds of check_rates, each a positive, finite quantity;
/// the ones not given keep their defaults (RateLimits).
RateLimits read_rate_limits(const ConfigNode& n, const UnitSystem& units) {
  RateLimits lim;
  if (!n.is_map()) {
    n.fail("a map of limits {first_order: ..., bimolecular: ..., termolecular: ...}");
  }
  const auto limit = [](const char* key, double* target, const char* unit, const char* example) {
    return quantity(key, target, unit, example, 0.0, std::numeric_limits<double>::infinity(),
                    std::string("a positive, finite limit in ") + unit)
        .above_lo()
        .below_hi();
  };
  const Key keys[] = {
      limit("first_order", &lim.first_order_s, "s-1", "1e20 s-1"),
      limit("bimolecular", &lim.bimolecular_cm3_s, "cm3 s-1", "1e-8 cm3 s-1"),
      limit("termolecular", &lim.termolecular_cm6_s, "cm6 s-1", "1e-22 cm6 s-1"),
  };
  read_keys(n, units, keys);
  n.done();
  return lim;
}

}  // namespace

ChemistrySpec load_chemistry_spec(const ConfigNode& n, const UnitSystem& units,
                                  std::vector<InputFile>& inputs, bool allow_sinks) {
  ChemistrySpec spec;
  const auto file = n.child("mechanism").path();
  auto mech = load_mechanism(file, units);
  inputs.push_back(InputFile{"mechanism", file, mech->text});
  if (auto mods = n.find("modules")) {
    spec.modules = read_modules(*mods, *mech);
  } else {
    for (std::size_t i = 0; i < mech->modules.size(); ++i) spec.modules.push_back(i);
  }
  spec.parameters = mech->default_parameters();
  if (auto ps = n.find("parameters")) {
    for (const auto& [name, v] : ps->entries()) {
      const std::size_t idx = named_or_fail(
          v, mech->parameter_index(name), name, names_of(mech->parameters),
          "a parameter of mechanism '" + mech->name + "'", "unknown parameter '" + name + "'");
      const Parameter& p = mech->parameters[idx];
      const double x = v.number();
      if (!(x >= p.min && x <= p.max)) {
        v.fail(fmt::format("a value of '{}' within [{}, {}]", name, p.min, p.max),
               fmt::format("{}", x));
      }
      spec.parameters[idx] = x;
    }
  }
  for (const char* key : {"condensation", "sinks"}) {  // "sinks": the earlier name
    if (auto list = n.find(key)) {
      if (!allow_sinks) list->fail("no condensation in box mode (there is no column)");
      if (!spec.exchanges.empty()) list->fail("one of 'condensation' and 'sinks'", "both");
      if (!list->is_sequence()) list->fail("a list of exchanges {species: NAME, saturation: ...}");
      for (const auto& item : list->items()) {
        spec.exchanges.push_back(read_exchange(item, *mech, units, inputs));
      }
    }
  }
  if (auto rl = n.find("rate_limits")) spec.rate_limits = read_rate_limits(*rl, units);
  n.done();
  spec.mechanism = std::move(mech);
  return spec;
}

void load_chemistry_section(const ConfigNode& n, const UnitSystem& units, Scenario& sc) {
  sc.chemistry = load_chemistry_spec(n, units, sc.inputs, true);
  const Background bg = build_background(sc.background);
  check_rates(*sc.chemistry.mechanism, bg.temperature_K, bg.air_density_cm3, bg.bulk_mole_fraction,
              sc.chemistry.rate_limits);
}

/// The box's flat keys (temperature, pressure, duration, output times): a key table.
void read_box_keys(const ConfigNode& b, const UnitSystem& units, BoxSpec& box) {
  const double inf = std::numeric_limits<double>::infinity();
  const Key keys[] = {
      quantity("temperature", &box.temperature_K, "K", "298 K", bounds::kMinTemperatureK,
               bounds::kMaxTemperatureK,
               "a temperature from 1 K to 1e5 K (common practice, no source)")
          .needed(),
      quantity("pressure", &box.pressure_dyn_cm2, "g cm-1 s-2", "1 bar", 0.0,
               bounds::kMaxPressureDynCm2, "a positive pressure")
          .above_lo()
          .above_message("a pressure of at most 1e5 bar (common practice, no source)")
          .needed(),
      quantity("duration", &box.duration_s, "s", "1 h", 0.0, inf, "a positive duration")
          .above_lo()
          .needed(),
      count("outputs", &box.outputs, 1, 1000000, "a number of output times from 1 to 1000000"),
  };
  read_keys(b, units, keys);
  box.air_cm3 = ideal_gas_density(box.pressure_dyn_cm2, box.temperature_K);
  if (auto s = b.find("spacing")) box.log_spacing = s->choice({"log", "linear"}) == "log";
  box.first_output_s = 1e-6 * box.duration_s;
  if (auto f = b.find("first_output")) {
    box.first_output_s = f->quantity(units, "s", "1 s");
    if (!(box.first_output_s > 0.0 && box.first_output_s <= box.duration_s)) {
      f->fail("a first output time in (0, duration]");
    }
  }
}

/// The box's initial densities (fixed species from the bulk composition, `initial:` for
/// the others), photolysis rates and reported reactions.
void read_box_state(const ConfigNode& b, const UnitSystem& units, BoxSpec& box) {
  const Mechanism& m = *box.chemistry.mechanism;
  // Initial state: fixed species start from the bulk composition; the rest from zero.
  box.initial_cm3.assign(m.species.size(), 0.0);
  for (std::size_t s = 0; s < m.species.size(); ++s) {
    const auto it = box.bulk_mole_fraction.find(m.species[s].name);
    if (it != box.bulk_mole_fraction.end()) box.initial_cm3[s] = it->second * box.air_cm3;
  }
  if (auto init = b.find("initial")) {
    for (const auto& [name, v] : init->entries()) {
      const std::size_t idx =
          named_or_fail(v, m.species_index(name), name, names_of(m.species),
                        "a species of mechanism '" + m.name + "'", "'" + name + "'");
      const Amount a =
          read_amount(v, units, {AmountKind::kFraction, AmountKind::kDensity},
                      "a mixing ratio ('1e-6', '1 ppm', '1 %') or a density ('2.5e13 cm-3')");
      const double n_cm3 = a.kind == AmountKind::kDensity ? a.value : a.value * box.air_cm3;
      if (!(n_cm3 >= 0.0)) v.fail("a non-negative amount");
      box.initial_cm3[idx] = n_cm3;
    }
  }
  if (auto ph = b.find("photolysis")) {
    for (const auto& [channel, v] : ph->entries()) {
      const double J = v.quantity(units, "s-1", "1e-3 s-1");
      if (!(J >= 0.0)) v.fail("a non-negative photolysis rate");
      const std::string& name = channel;  // clang 14 cannot capture a structured binding
      const auto named = [&](const Reaction& rx) { return rx.rate.channel == name; };
      if (std::none_of(m.reactions.begin(), m.reactions.end(), named))
        v.fail("a photolysis channel named by a reaction", "'" + channel + "'");
      box.photolysis.emplace_back(channel, J);
    }
  }
  if (auto rep = b.find("report")) {
    const std::vector<ConfigNode> items =
        rep->is_sequence() ? rep->items() : std::vector<ConfigNode>{*rep};
    for (const auto& item : items) {
      const std::string ref = item.text();
      std::string why;
      const auto r = m.find_reaction(ref, &why);
      if (!r)
        item.fail(
            "a reaction of the mechanism: its id (or its equation, when no other "
            "reaction has that equation)",
            why);
      box.report.push_back(m.reactions[*r].id);
    }
  }
}

BoxSpec load_box_config(const std::filesystem::path& file,
                        const std::vector<std::string>& overrides, const UnitSystem& units) {
  const ConfigDocument doc = ConfigDocument::load(file, overrides);
  BoxSpec box;
  box.file = file;
  box.overrides = overrides;
  box.resolved_yaml = doc.resolved_text();
  const ConfigNode root = doc.root();
  const auto meta = root.child("scenario");
  box.name = meta.child("name").text();
  if (auto d = meta.find("description")) box.description = d->text();
  meta.done();

  std::vector<InputFile> inputs;
  box.chemistry = load_chemistry_spec(root.child("chemistry"), units, inputs, false);
  const Mechanism& m = *box.chemistry.mechanism;

  const auto b = root.child("box");
  read_box_keys(b, units, box);
  box.bulk_mole_fraction = read_bulk_composition(b.child("bulk_composition"));
  read_box_state(b, units, box);
  b.done();

  if (auto s = root.find("solver")) {
    const Key keys[] = {
        number("rtol", &box.solver.rtol, 0.0, 1.0,
               "a relative tolerance between 0 and 1 (exclusive)")
            .above_lo()
            .below_hi(),
        quantity("atol", &box.solver.atol, "cm-3", "1e-3 cm-3", 0.0,
                 std::numeric_limits<double>::infinity(), "a positive absolute tolerance")
            .above_lo(),
    };
    read_keys(*s, units, keys);
    s->done();
  } else {
    box.solver.atol = std::max(1e-20 * box.air_cm3, 1e-30);
  }
  box.output_file = box.name + ".nc";
  if (auto o = root.find("output")) {
    if (auto f = o->find("file")) box.output_file = f->text();
    o->done();
  }
  root.done();
  check_rates(m, std::vector<double>{box.temperature_K}, std::vector<double>{box.air_cm3},
              box.bulk_mole_fraction, box.chemistry.rate_limits);
  return box;
}

}  // namespace colchem
