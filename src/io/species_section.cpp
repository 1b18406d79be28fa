#include "io/species_section.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/constants.hpp"
#include "io/amount.hpp"
#include "io/key_table.hpp"
#include "io/table.hpp"

namespace colchem {

namespace {

/// A mixing ratio or a table profile; the table is recorded in `inputs` (when given) as
/// `role` followed by the species.
InitialProfile load_initial(const ConfigNode& n, const UnitSystem& units,
                            const std::string& species, std::vector<InputFile>* inputs,
                            const std::string& role = "initial profile of ") {
  InitialProfile p;
  if (n.is_scalar()) {
    p.mixing_ratio = read_mixing_ratio(n, units);
    return p;
  }
  TableRefForm form = TableRefForm::altitude(species);
  form.expected = "a mixing ratio or {table: FILE, column: NAME}";
  const TableRef ref = table_ref(n, form);
  const std::string& column = ref.column;
  if (auto e = n.find("extrapolation")) {
    p.extrapolation = e->choice({"hold_ends", "forbid"}) == "forbid" ? Extrapolation::kForbid
                                                                     : Extrapolation::kHoldEnds;
  }
  n.done();
  const Table t = ref.read();
  p.from_table = true;
  auto prof = ref.profile(t, units, "cm", "1");
  p.table = ProfileSpec{std::move(prof.axis), std::move(prof.value), std::move(prof.source)};
  for (std::size_t i = 0; i < p.table.value.size(); ++i) {
    const double v = p.table.value[i];
    // Log-linear interpolation needs positive values.
    if (!(v > 0.0 && v <= 1.0))
      t.fail_row(i, column, "a mixing ratio in (0, 1]", message_number(v));
  }
  if (inputs) inputs->push_back(InputFile{role + species, ref.file, t.text()});
  return p;
}

struct ValueKind {
  const char* unit;  // target unit; nullptr for a mixing ratio
  const char* example;
};

double one_value(const ConfigNode& n, const UnitSystem& units, const ValueKind& k) {
  return k.unit ? n.quantity(units, k.unit, k.example) : read_mixing_ratio(n, units);
}

/// A value, or {schedule: {times: [...], values: [...]}}.
Schedule load_value(const ConfigNode& n, const UnitSystem& units, const ValueKind& k,
                    bool non_negative) {
  Schedule s;
  const auto check = [&](const ConfigNode& where, double v) {
    if (non_negative && v < 0.0) where.fail("a non-negative value", "'" + where.text() + "'");
  };
  if (!n.is_map()) {
    s = Schedule::constant(one_value(n, units, k));
    check(n, s.value.front());
    return s;
  }
  const auto sched = n.child("schedule");
  n.done();
  const auto times = sched.child("times");
  const auto values = sched.child("values");
  sched.done();
  s.time_s = times.quantity_list(units, "s", "30 day");
  if (k.unit) {
    s.value = values.quantity_list(units, k.unit, k.example);
  } else {
    if (!values.is_sequence()) values.fail("a list of mixing ratios");
    for (const auto& item : values.items()) s.value.push_back(read_mixing_ratio(item, units));
  }
  if (s.time_s.empty()) times.fail("at least one time");
  if (s.value.size() != s.time_s.size()) {
    values.fail(std::to_string(s.time_s.size()) + " values (one per time)",
                std::to_string(s.value.size()) + " values");
  }
  for (std::size_t i = 1; i < s.time_s.size(); ++i) {
    if (!(s.time_s[i] > s.time_s[i - 1])) {
      times.fail("times increasing strictly", "a decrease at entry " + std::to_string(i));
    }
  }
  for (double v : s.value) {
    if (non_negative && v < 0.0) values.fail("non-negative values", message_number(v));
  }
  return s;
}

/// The boundary conditions that carry a value (a schedule or a constant): key, kind, value
/// kind, sign, and the boundaries that take them (`jeans` with options is read apart).
struct ValuedBoundary {
  const char* key;
  BoundaryKind kind;
  ValueKind value;
  bool non_negative;
  bool top, bottom;
};
constexpr ValuedBoundary kValuedBoundaries[] = {
    {"mixing_ratio", BoundaryKind::kMixingRatio, {nullptr, ""}, true, true, true},
    {"density", BoundaryKind::kDensity, {"cm-3", "1e10 cm-3"}, true, true, true},
    {"flux", BoundaryKind::kFlux, {"cm-2 s-1", "1e9 cm-2 s-1"}, false, true, true},
    {"deposition_velocity",
     BoundaryKind::kDepositionVelocity,
     {"cm s-1", "0.1 cm s-1"},
     true,
     false,
     true},
    {"escape_velocity", BoundaryKind::kEscapeVelocity, {"cm s-1", "1e3 cm s-1"}, true, true, false},
};

BoundaryCondition load_boundary(const ConfigNode& n, const UnitSystem& units, bool top) {
  const std::vector<std::string> scalars =
      top ? std::vector<std::string>{"zero_flux", "jeans", "diffusion_limited"}
          : std::vector<std::string>{"zero_flux"};
  BoundaryCondition bc;
  if (n.is_scalar()) {
    const std::string c = n.choice(scalars);
    if (c == "jeans") bc.kind = BoundaryKind::kJeans;
    if (c == "diffusion_limited") bc.kind = BoundaryKind::kDiffusionLimited;
    return bc;
  }
  std::vector<std::string> keys;
  for (const auto& row : kValuedBoundaries) {
    if (top ? row.top : row.bottom) keys.emplace_back(row.key);
  }
  if (top) keys.emplace_back("jeans");
  std::string all;
  for (const auto& k : keys) all += (all.empty() ? "" : ", ") + k;
  for (const auto& s : scalars) all += ", " + s;
  const auto entries = n.is_map() ? n.entries() : decltype(n.entries()){};
  if (entries.size() != 1) {
    n.fail("one of: " + all, n.is_map() ? std::to_string(entries.size()) + " keys" : n.describe());
  }
  const auto& [key, v] = entries.front();
  if (std::find(keys.begin(), keys.end(), key) == keys.end()) {
    std::string hint;
    if (auto near = nearest_word(key, keys)) hint = "did you mean '" + *near + "'?";
    if (!top && (key == "escape_velocity" || key == "jeans")) hint = "only a top boundary";
    if (top && key == "deposition_velocity") hint = "only a bottom boundary; use escape_velocity";
    n.fail("one of: " + all, "'" + key + "'", hint);
  }
  for (const auto& row : kValuedBoundaries) {
    if (key != row.key) continue;
    bc.kind = row.kind;
    bc.value = load_value(v, units, row.value, row.non_negative);
    return bc;
  }
  bc.kind = BoundaryKind::kJeans;  // with options
  if (auto t = v.find("exobase_temperature")) {
    bc.exobase_temperature_K = t->quantity(units, "K", "1000 K");
    if (!(bc.exobase_temperature_K > 0.0)) t->fail("a positive temperature");
  }
  v.done();
  return bc;
}

HoldSpec load_hold(const ConfigNode& n, const UnitSystem& units, const std::string& species,
                   std::vector<InputFile>* inputs) {
  if (!n.is_map()) n.fail("{mixing_ratio: VALUE or {table: FILE, column: NAME}, from: Z, to: Z}");
  HoldSpec h;
  const auto x = n.child("mixing_ratio");
  if (x.is_map()) {
    h.mixing_ratio.table = load_initial(x, units, species, inputs, "held profile of ").table;
  } else {
    h.mixing_ratio.constant = read_mixing_ratio(x, units);
  }
  if (auto f = n.find("from")) h.from_cm = f->quantity(units, "cm", "80 km");
  if (auto t = n.find("to")) {
    h.to_cm = t->quantity(units, "cm", "100 km");
    if (!(h.to_cm > h.from_cm)) t->fail("a top above 'from'", "'" + t->text() + "'");
  }
  if (auto tau = n.find("timescale")) {
    h.timescale_s = tau->quantity(units, "s", "100 s");
    if (!(h.timescale_s > 0.0)) tau->fail("a positive timescale");
  }
  n.done();
  return h;
}

void load_species_entry(const std::string& name, const ConfigNode& n, const UnitSystem& units,
                        SpeciesColumnSettings& out, std::vector<InputFile>* inputs) {
  out.name = name;
  out.where = n.location();
  if (n.is_null()) return;
  if (!n.is_map()) n.fail("a map of settings (initial, bottom, top, fixed, ...)");
  if (auto i = n.find("initial")) out.initial = load_initial(*i, units, name, inputs);
  if (auto b = n.find("bottom")) out.boundaries.bottom = load_boundary(*b, units, false);
  if (auto t = n.find("top")) out.boundaries.top = load_boundary(*t, units, true);
  if (auto h = n.find("hold")) out.hold = load_hold(*h, units, name, inputs);
  const double inf = std::numeric_limits<double>::infinity();
  const Key keys[] = {
      flag("fixed", &out.fixed),
      number("thermal_diffusion", &out.thermal_diffusion, -inf, inf, "a finite number"),
  };
  read_keys(n, units, keys);
  if (auto d = n.find("binary_diffusion")) {
    // b = A (T / 1 K)^s: A carries the unit of b.
    const Key diffusion[] = {
        quantity("A", &out.diffusion_A, "cm-1 s-1", "1.52e18 cm-1 s-1", 0.0, inf,
                 "a non-negative coefficient")
            .needed(),
        number("s", &out.diffusion_s, -inf, inf, "a finite number"),
    };
    read_keys(*d, units, diffusion);
    d->done();
  }
  n.done();
}

}  // namespace

void load_species_section(const ConfigNode& n, const UnitSystem& units, ColumnSpeciesSpec& spec,
                          std::vector<InputFile>* inputs) {
  if (!n.is_map()) n.fail("a map from species name to settings");
  for (const auto& [name, value] : n.entries()) {
    if (name == "default") {
      if (!value.is_map()) value.fail("{initial: MIXING_RATIO, molecular_diffusion: BOOL}");
      if (auto m = value.find("molecular_diffusion")) spec.molecular_diffusion = m->boolean();
      if (auto i = value.find("initial")) {
        if (i->is_map() && !i->has("column")) {
          i->fail("'column' naming the table column for the default profile", "no column");
        }
        spec.default_initial = load_initial(*i, units, "default", inputs);
      }
      value.done();
      continue;
    }
    for (const auto& s : spec.species) {
      if (s.name == name) value.fail("each species once", "'" + name + "' again");
    }
    SpeciesColumnSettings entry;
    load_species_entry(name, value, units, entry, inputs);
    spec.species.push_back(std::move(entry));
  }
}

void load_injections_section(const ConfigNode& n, const UnitSystem& units,
                             ColumnSpeciesSpec& spec) {
  if (!n.is_sequence()) n.fail("a list of injections");
  for (const auto& item : n.items()) {
    if (!item.is_map()) item.fail("{species: NAME, amount: ..., time: ..., from: ..., to: ...}");
    InjectionSpec inj;
    inj.where = item.location();
    inj.species = item.child("species").text();
    const auto amount = item.find("amount");
    const auto column = item.find("column");
    if ((amount ? 1 : 0) + (column ? 1 : 0) != 1) {
      item.fail("exactly one of 'amount' (global: molecules, mol or a mass) and 'column' (cm-2)",
                amount ? "both" : "neither");
    }
    if (amount) {
      const Amount a = read_amount(*amount, units, {AmountKind::kMolecules, AmountKind::kMass},
                                   "a mass (such as '10 Tg') or an amount of substance "
                                   "('1e34 molecule', '2 Gmol'), or a plain number of molecules");
      inj.amount_kind = a.kind == AmountKind::kMass ? InjectionAmount::kGlobalMass
                                                    : InjectionAmount::kGlobalMolecules;
      inj.amount = a.value;
      if (!(inj.amount > 0.0) || !std::isfinite(inj.amount)) amount->fail("a positive amount");
    } else {
      // A column carries its unit (cm-2, DU, mol cm-2): quantity() refuses a bare number.
      const auto q = split_quantity(column->text());
      inj.amount = q && !q->unit.empty() && units.convertible(q->unit, "mol cm-2")
                       ? read_amount(*column, units, {AmountKind::kColumn}, "").value
                       : column->quantity(units, "cm-2", "1e16 cm-2");
      inj.amount_kind = InjectionAmount::kColumn;
      if (!(inj.amount > 0.0)) column->fail("a positive column amount");
    }
    inj.time_s = item.child("time").quantity(units, "s", "10 day");
    inj.bottom_cm = item.child("from").quantity(units, "cm", "18 km");
    const auto to = item.child("to");
    inj.top_cm = to.quantity(units, "cm", "22 km");
    if (!(inj.top_cm > inj.bottom_cm)) to.fail("a top above 'from'", "'" + to.text() + "'");
    item.done();
    spec.injections.push_back(inj);
  }
}

}  // namespace colchem
