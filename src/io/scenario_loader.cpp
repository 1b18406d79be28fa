// Scenario loader: YAML -> Scenario. Every section has one function here; every key it
// accepts is documented in README.md "Configuration reference".
#include <fmt/format.h>

#include <cmath>
#include <limits>

#include "core/composition.hpp"
#include "core/constants.hpp"
#include "core/physical_bounds.hpp"
#include "io/amount.hpp"
#include "io/chemistry_section.hpp"
#include "io/config_node.hpp"
#include "io/key_table.hpp"
#include "io/photolysis_loader.hpp"
#include "io/scenario.hpp"
#include "io/solver_section.hpp"
#include "io/species_section.hpp"
#include "io/table.hpp"

namespace colchem {

namespace {

struct LoadContext {
  const UnitSystem& units;
  Scenario& scenario;
};

constexpr double kInf = std::numeric_limits<double>::infinity();

/// A quantity that must be positive, with its own message.
Key positive_quantity(const char* key, Key::Target target, const char* unit, const char* example,
                      const char* expected) {
  return quantity(key, target, unit, example, 0.0, kInf, expected).above_lo();
}

void load_planet(const ConfigNode& n, LoadContext& ctx) {
  PlanetSpec& p = ctx.scenario.background.planet;
  p.name = n.child("name").text();
  std::optional<double> g;
  std::optional<double> mass;
  const Key keys[] = {
      positive_quantity("radius", &p.radius_cm, "cm", "6050 km", "a positive radius").needed(),
      positive_quantity("surface_gravity", &g, "cm s-2", "8.87 m s-2", "a positive gravity"),
      positive_quantity("mass", &mass, "g", "4.87e24 kg", "a positive mass"),
      positive_quantity("star_distance", &p.star_distance_au, "au", "0.72 au",
                        "a positive distance")
          .needed(),
  };
  read_keys(n, ctx.units, keys);
  if (g && mass) n.child("mass").fail("either 'surface_gravity' or 'mass', not both", "both");
  if (!g && !mass) n.fail("'surface_gravity' or 'mass'", "neither");
  p.surface_gravity_cm_s2 = g ? *g : surface_gravity_from_mass(*mass, p.radius_cm);
  n.done();
}

void load_grid(const ConfigNode& n, LoadContext& ctx) {
  const auto edges = n.find("edges");
  const auto bottom = n.find("bottom");
  const auto top = n.find("top");
  const auto cells = n.find("cells");
  n.done();  // unknown (misspelt) keys first: they explain an incomplete grid
  if (edges) {
    if (bottom || top || cells) {
      edges->fail("either 'edges' or 'bottom', 'top' and 'cells'", "both forms");
    }
    auto e = edges->quantity_list(ctx.units, "cm", "58 km");
    if (e.size() < 2) edges->fail("at least two edges");
    for (std::size_t j = 1; j < e.size(); ++j) {
      if (!(e[j] > e[j - 1]))
        edges->fail("edges increasing strictly upward", "a decrease at entry " + std::to_string(j));
    }
    ctx.scenario.background.grid = Grid::from_edges(std::move(e));
  } else {
    if (!bottom || !top || !cells) {
      n.fail("'bottom', 'top' and 'cells' (or a list of 'edges')", "an incomplete grid");
    }
    const double b = bottom->quantity(ctx.units, "cm", "58 km");
    const double t = top->quantity(ctx.units, "cm", "112 km");
    const long c = cells->integer();
    if (!(t > b)) top->fail("a top above the bottom");
    if (c < 1 || c > 100000) cells->fail("a number of cells from 1 to 100000");
    ctx.scenario.background.grid = Grid::uniform(b, t, static_cast<std::size_t>(c));
  }
}

/// A profile table of the background and its bounds of physical sense
/// (core/physical_bounds.hpp): the values must be positive and within [lo, hi].
struct ProfileRow {
  const char* role;    ///< the input file's role in the output's provenance
  const char* column;  ///< the default value column, also the key in messages
  const char* unit;
  double lo;
  double hi;
  const char* expected;  ///< message when outside [lo, hi]
};
enum ProfileKind { kTemperatureTable, kPressureTable, kEddyTable };
const ProfileRow kProfileRows[] = {
    {"temperature table", "temperature", "K", bounds::kMinTemperatureK, bounds::kMaxTemperatureK,
     "temperatures from 1 K to 1e5 K"},
    {"pressure table", "pressure", "g cm-1 s-2", 0.0, bounds::kMaxPressureDynCm2,
     "pressures of at most 1e5 bar"},
    {"eddy diffusion table", "eddy_diffusion", "cm2 s-1", 0.0, bounds::kMaxEddyCm2S,
     "diffusion coefficients of at most 1e12 cm2 s-1"},
};

/// A profile given as a table file (string) or {table: FILE, column: NAME}: read, checked
/// against the row's bounds and, unless the ends are held, required to cover the grid.
ProfileSpec load_profile_table(const ConfigNode& n, LoadContext& ctx, ProfileKind kind) {
  const ProfileRow& row = kProfileRows[kind];
  const TableRef ref = table_ref(n, TableRefForm::altitude(row.column, true));
  if (!n.is_scalar()) n.done();
  const Table t = ref.read();
  auto tp = ref.profile(t, ctx.units, "cm", row.unit);
  ctx.scenario.inputs.push_back(InputFile{row.role, ref.file, t.text()});
  ProfileSpec p{std::move(tp.axis), std::move(tp.value), std::move(tp.source)};
  const SourceLocation at{p.source};
  for (std::size_t i = 0; i < p.value.size(); ++i) {
    if (!(p.value[i] > 0.0)) {
      throw InputError(ExitCode::kInputData, at, row.column, "positive values",
                       std::to_string(p.value[i]) + " in data row " + std::to_string(i + 1));
    }
  }
  for (std::size_t i = 0; i < p.value.size(); ++i) {
    if (!(p.value[i] >= row.lo && p.value[i] <= row.hi)) {
      throw InputError(ExitCode::kInputData, at, row.column, row.expected,
                       fmt::format("{:g} in data row {}", p.value[i], i + 1),
                       "bounds of physical sense: common practice, no source");
    }
  }
  const BackgroundSpec& bg = ctx.scenario.background;
  if (bg.extrapolation == Extrapolation::kHoldEnds) return p;
  const double lo = bg.grid.edge_cm.front();
  const double hi = bg.grid.edge_cm.back();
  const double tol = 1e-6 * (hi - lo);
  if (p.altitude_cm.front() > lo + tol || p.altitude_cm.back() < hi - tol) {
    auto km = [](double cm) { return std::to_string(cm / constants::kCmPerKm); };
    n.fail("a table covering the grid (" + km(lo) + " to " + km(hi) + " km)",
           "a table from " + km(p.altitude_cm.front()) + " to " + km(p.altitude_cm.back()) +
               " km in " + p.source,
           "extend the table, or set atmosphere.extrapolation: hold_ends");
  }
  return p;
}

/// Bulk composition and mean molecular mass.
void load_bulk_composition(const ConfigNode& n, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  const auto comp = n.child("bulk_composition");
  bg.bulk_mole_fraction = read_bulk_composition(comp);
  double sum = 0.0;
  double mass_sum = 0.0;
  for (const auto& [species, x] : bg.bulk_mole_fraction) {
    std::string why;
    auto f = parse_formula(species, &why);
    if (!f)
      comp.child(species).fail("a chemical formula as the key", "'" + species + "' (" + why + ")");
    sum += x;
    mass_sum += x * f->composition.molar_mass_g_mol();
  }
  std::optional<double> given;
  const Key row = positive_quantity("mean_molecular_mass", &given, "g mol-1", "43.4 g/mol",
                                    "a positive molar mass");
  read_keys(n, ctx.units, {&row, 1});
  bg.mean_molecular_mass_amu = given ? *given : mass_sum / sum;
}

/// Temperature: a table, or isothermal.
void load_temperature(const ConfigNode& tn, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  if (!tn.is_map() || !tn.has("isothermal")) {
    bg.temperature_K = load_profile_table(tn, ctx, kTemperatureTable);
    return;
  }
  double T = 0.0;
  const Key row =
      quantity("isothermal", &T, "K", "250 K", bounds::kMinTemperatureK, bounds::kMaxTemperatureK,
               "a temperature from 1 K to 1e5 K (common practice, no source)");
  read_keys(tn, ctx.units, {&row, 1});
  bg.temperature_K =
      ProfileSpec{{bg.grid.edge_cm.front(), bg.grid.edge_cm.back()}, {T, T}, "isothermal"};
  tn.done();
}

/// Pressure: hydrostatic from a base value, or a table.
void load_pressure(const ConfigNode& pn, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  if (auto h = pn.find("hydrostatic")) {
    if (pn.has("table")) pn.fail("either 'hydrostatic' or 'table'", "both");
    bg.pressure_mode = PressureMode::kHydrostatic;
    bg.base_altitude_cm = bg.grid.edge_cm.front();
    const Key keys[] = {
        quantity("base", &bg.base_pressure_dyn_cm2, "g cm-1 s-2", "190 mbar", 0.0,
                 bounds::kMaxPressureDynCm2, "a positive pressure")
            .above_lo()
            .above_message("a pressure of at most 1e5 bar (common practice, no source)")
            .needed(),
        quantity("at", &bg.base_altitude_cm, "cm", "58 km", -kInf, kInf, ""),
    };
    read_keys(*h, ctx.units, keys);
    h->done();
    pn.done();
  } else if (pn.find("table")) {
    bg.pressure_mode = PressureMode::kTable;
    bg.pressure_dyn_cm2 = load_profile_table(pn, ctx, kPressureTable);
  } else {
    pn.fail("'hydrostatic: {base: ..., at: ...}' or 'table: FILE'");
  }
}

/// Eddy diffusion: constant, table or a power of the air density.
void load_eddy_diffusion(const ConfigNode& kn, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  const auto kc = kn.find("constant");
  const auto kt = kn.find("table");
  const auto kp = kn.find("density_power");
  if ((kc ? 1 : 0) + (kt ? 1 : 0) + (kp ? 1 : 0) != 1) {
    kn.fail("exactly one of 'constant', 'table', 'density_power'");
  }
  const std::string at_most =
      "a diffusion coefficient of at most 1e12 cm2 s-1 (common practice, no source)";
  if (kt) {
    bg.eddy_form = EddyForm::kTable;
    bg.eddy_table_cm2_s = load_profile_table(kn, ctx, kEddyTable);
    return;
  }
  if (kc) {
    bg.eddy_form = EddyForm::kConstant;
    const Key row = quantity("constant", &bg.eddy_cm2_s, "cm2 s-1", "1e6 cm2 s-1", 0.0,
                             bounds::kMaxEddyCm2S, "a non-negative diffusion coefficient")
                        .above_message(at_most);
    read_keys(kn, ctx.units, {&row, 1});
  } else {
    bg.eddy_form = EddyForm::kDensityPower;
    const Key keys[] = {
        quantity("bottom", &bg.eddy_cm2_s, "cm2 s-1", "1e5 cm2 s-1", 0.0, bounds::kMaxEddyCm2S,
                 "a positive diffusion coefficient")
            .above_lo()
            .above_message(at_most)
            .needed(),
        number("exponent", &bg.eddy_exponent, -kInf, kInf, "a finite number").needed(),
        quantity("max", &bg.eddy_max_cm2_s, "cm2 s-1", "1e8 cm2 s-1", 0.0, bounds::kMaxEddyCm2S,
                 "a positive diffusion coefficient of at most 1e12 cm2 s-1 (common practice, "
                 "no source)")
            .above_lo(),
    };
    read_keys(*kp, ctx.units, keys);
    kp->done();
  }
  kn.done();
}

void load_atmosphere(const ConfigNode& n, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  if (auto e = n.find("extrapolation")) {
    bg.extrapolation = e->choice({"forbid", "hold_ends"}) == "forbid" ? Extrapolation::kForbid
                                                                      : Extrapolation::kHoldEnds;
  }
  load_bulk_composition(n, ctx);
  load_temperature(n.child("temperature"), ctx);
  load_pressure(n.child("pressure"), ctx);
  load_eddy_diffusion(n.child("eddy_diffusion"), ctx);
  n.done();
}

void load_output(const ConfigNode& n, LoadContext& ctx) {
  if (auto f = n.find("file")) ctx.scenario.output.file = f->text();
  n.done();
}

}  // namespace

Scenario load_scenario(const std::filesystem::path& file, const std::vector<std::string>& overrides,
                       const UnitSystem& units) {
  const ConfigDocument doc = ConfigDocument::load(file, overrides);

  Scenario sc;
  sc.file = file;
  sc.overrides = overrides;
  sc.resolved_yaml = doc.resolved_text();
  LoadContext ctx{units, sc};
  const ConfigNode root = doc.root();

  const auto meta = root.child("scenario");
  sc.name = meta.child("name").text();
  if (auto d = meta.find("description")) sc.description = d->text();
  meta.done();

  load_planet(root.child("planet"), ctx);
  load_grid(root.child("grid"), ctx);
  load_atmosphere(root.child("atmosphere"), ctx);
  if (auto c = root.find("chemistry")) load_chemistry_section(*c, units, sc);
  if (auto p = root.find("photolysis")) {
    load_photolysis_section(*p, units, sc);
    resolve_photolysis_parameters(sc.photolysis, sc.chemistry.mechanism.get());
  }
  if (auto o = root.find("output")) load_output(*o, ctx);
  if (auto o = root.find("observations")) sc.observations = o->path();
  if (auto s = root.find("species")) load_species_section(*s, units, sc.species_setup, &sc.inputs);
  if (auto i = root.find("injections")) load_injections_section(*i, units, sc.species_setup);
  if (auto s = root.find("solver")) sc.solver = load_solver_section(*s, units);
  if (sc.output.file.empty()) sc.output.file = sc.name + ".nc";
  root.done();
  return sc;
}

}  // namespace colchem
