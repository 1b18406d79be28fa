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

void load_planet(const ConfigNode& n, LoadContext& ctx) {
  PlanetSpec& p = ctx.scenario.background.planet;
  p.name = n.child("name").text();
  p.radius_cm = n.child("radius").quantity(ctx.units, "cm", "6050 km");
  if (p.radius_cm <= 0.0) n.child("radius").fail("a positive radius");
  const auto g = n.find("surface_gravity");
  const auto mass = n.find("mass");
  if (g && mass) {
    mass->fail("either 'surface_gravity' or 'mass', not both", "both");
  } else if (g) {
    p.surface_gravity_cm_s2 = g->quantity(ctx.units, "cm s-2", "8.87 m s-2");
    if (p.surface_gravity_cm_s2 <= 0.0) g->fail("a positive gravity");
  } else if (mass) {
    const double m_g = mass->quantity(ctx.units, "g", "4.87e24 kg");
    if (m_g <= 0.0) mass->fail("a positive mass");
    p.surface_gravity_cm_s2 = surface_gravity_from_mass(m_g, p.radius_cm);
  } else {
    n.fail("'surface_gravity' or 'mass'", "neither");
  }
  const auto d = n.child("star_distance");
  p.star_distance_au = d.quantity(ctx.units, "au", "0.72 au");
  if (p.star_distance_au <= 0.0) d.fail("a positive distance");
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

/// A profile given as a table file (string) or {table: FILE, column: NAME}.
ProfileSpec load_profile_table(const ConfigNode& n, LoadContext& ctx, const std::string& role,
                               const std::string& default_column, const std::string& target_unit) {
  const TableRef ref = table_ref(n, TableRefForm::altitude(default_column, true));
  if (!n.is_scalar()) n.done();
  const Table t = ref.read();
  auto p = ref.profile(t, ctx.units, "cm", target_unit);
  ctx.scenario.inputs.push_back(InputFile{role, ref.file, t.text()});
  return ProfileSpec{std::move(p.axis), std::move(p.value), std::move(p.source)};
}

void require_positive(const ProfileSpec& p, const std::string& what) {
  for (std::size_t i = 0; i < p.value.size(); ++i) {
    if (!(p.value[i] > 0.0)) {
      throw InputError(ExitCode::kInputData, SourceLocation{p.source}, what, "positive values",
                       std::to_string(p.value[i]) + " in data row " + std::to_string(i + 1));
    }
  }
}

/// Every value of a table within [lo, hi] (bounds of physical sense, core/physical_bounds.hpp).
void require_within(const ProfileSpec& p, const std::string& what, double lo, double hi,
                    const std::string& expected) {
  for (std::size_t i = 0; i < p.value.size(); ++i) {
    if (!(p.value[i] >= lo && p.value[i] <= hi)) {
      throw InputError(ExitCode::kInputData, SourceLocation{p.source}, what, expected,
                       fmt::format("{:g} in data row {}", p.value[i], i + 1),
                       "bounds of physical sense: common practice, no source");
    }
  }
}

void check_covers(const ProfileSpec& p, const ConfigNode& n, const Grid& g, Extrapolation e) {
  if (e == Extrapolation::kHoldEnds) return;
  const double lo = g.edge_cm.front();
  const double hi = g.edge_cm.back();
  const double tol = 1e-6 * (hi - lo);
  if (p.altitude_cm.front() > lo + tol || p.altitude_cm.back() < hi - tol) {
    auto km = [](double cm) { return std::to_string(cm / constants::kCmPerKm); };
    n.fail("a table covering the grid (" + km(lo) + " to " + km(hi) + " km)",
           "a table from " + km(p.altitude_cm.front()) + " to " + km(p.altitude_cm.back()) +
               " km in " + p.source,
           "extend the table, or set atmosphere.extrapolation: hold_ends");
  }
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
  if (auto m = n.find("mean_molecular_mass")) {
    bg.mean_molecular_mass_amu = m->quantity(ctx.units, "g mol-1", "43.4 g/mol");
    if (bg.mean_molecular_mass_amu <= 0.0) m->fail("a positive molar mass");
  } else {
    bg.mean_molecular_mass_amu = mass_sum / sum;
  }
}

/// Temperature: a table, or isothermal.
void load_temperature(const ConfigNode& tn, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  if (tn.is_map() && tn.has("isothermal")) {
    const double T = tn.child("isothermal").quantity(ctx.units, "K", "250 K");
    if (!(T >= bounds::kMinTemperatureK && T <= bounds::kMaxTemperatureK)) {
      tn.child("isothermal").fail("a temperature from 1 K to 1e5 K (common practice, no source)");
    }
    bg.temperature_K.altitude_cm = {bg.grid.edge_cm.front(), bg.grid.edge_cm.back()};
    bg.temperature_K.value = {T, T};
    bg.temperature_K.source = "isothermal";
    tn.done();
  } else {
    bg.temperature_K = load_profile_table(tn, ctx, "temperature table", "temperature", "K");
    require_positive(bg.temperature_K, "temperature");
    require_within(bg.temperature_K, "temperature", bounds::kMinTemperatureK,
                   bounds::kMaxTemperatureK, "temperatures from 1 K to 1e5 K");
    check_covers(bg.temperature_K, tn, bg.grid, bg.extrapolation);
  }
}

/// Pressure: hydrostatic from a base value, or a table.
void load_pressure(const ConfigNode& pn, LoadContext& ctx) {
  BackgroundSpec& bg = ctx.scenario.background;
  if (auto h = pn.find("hydrostatic")) {
    if (pn.has("table")) pn.fail("either 'hydrostatic' or 'table'", "both");
    bg.pressure_mode = PressureMode::kHydrostatic;
    bg.base_pressure_dyn_cm2 = h->child("base").quantity(ctx.units, "g cm-1 s-2", "190 mbar");
    if (!(bg.base_pressure_dyn_cm2 > 0.0)) h->child("base").fail("a positive pressure");
    if (!(bg.base_pressure_dyn_cm2 <= bounds::kMaxPressureDynCm2)) {
      h->child("base").fail("a pressure of at most 1e5 bar (common practice, no source)");
    }
    bg.base_altitude_cm = bg.grid.edge_cm.front();
    if (auto at = h->find("at")) bg.base_altitude_cm = at->quantity(ctx.units, "cm", "58 km");
    h->done();
  } else if (auto tab = pn.find("table")) {
    bg.pressure_mode = PressureMode::kTable;
    bg.pressure_dyn_cm2 = load_profile_table(pn, ctx, "pressure table", "pressure", "g cm-1 s-2");
    require_positive(bg.pressure_dyn_cm2, "pressure");
    require_within(bg.pressure_dyn_cm2, "pressure", 0.0, bounds::kMaxPressureDynCm2,
                   "pressures of at most 1e5 bar");
    check_covers(bg.pressure_dyn_cm2, pn, bg.grid, bg.extrapolation);
  } else {
    pn.fail("'hydrostatic: {base: ..., at: ...}' or 'table: FILE'");
  }
  if (pn.is_map() && !pn.has("table")) pn.done();
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
  if (kc) {
    bg.eddy_form = EddyForm::kConstant;
    bg.eddy_cm2_s = kc->quantity(ctx.units, "cm2 s-1", "1e6 cm2 s-1");
    if (!(bg.eddy_cm2_s >= 0.0)) kc->fail("a non-negative diffusion coefficient");
    if (!(bg.eddy_cm2_s <= bounds::kMaxEddyCm2S)) {
      kc->fail("a diffusion coefficient of at most 1e12 cm2 s-1 (common practice, no source)");
    }
    kn.done();
  } else if (kt) {
    bg.eddy_form = EddyForm::kTable;
    bg.eddy_table_cm2_s =
        load_profile_table(kn, ctx, "eddy diffusion table", "eddy_diffusion", "cm2 s-1");
    require_positive(bg.eddy_table_cm2_s, "eddy_diffusion");
    require_within(bg.eddy_table_cm2_s, "eddy_diffusion", 0.0, bounds::kMaxEddyCm2S,
                   "diffusion coefficients of at most 1e12 cm2 s-1");
    check_covers(bg.eddy_table_cm2_s, kn, bg.grid, bg.extrapolation);
  } else {
    bg.eddy_form = EddyForm::kDensityPower;
    const double inf = std::numeric_limits<double>::infinity();
    const Key keys[] = {
        quantity("bottom", &bg.eddy_cm2_s, "cm2 s-1", "1e5 cm2 s-1", 0.0, bounds::kMaxEddyCm2S,
                 "a positive diffusion coefficient")
            .above_lo()
            .above_message(
                "a diffusion coefficient of at most 1e12 cm2 s-1 (common practice, no source)")
            .needed(),
        number("exponent", &bg.eddy_exponent, -inf, inf, "a finite number").needed(),
        quantity("max", &bg.eddy_max_cm2_s, "cm2 s-1", "1e8 cm2 s-1", 0.0, bounds::kMaxEddyCm2S,
                 "a positive diffusion coefficient of at most 1e12 cm2 s-1 (common practice, "
                 "no source)")
            .above_lo(),
    };
    read_keys(*kp, ctx.units, keys);
    kp->done();
    kn.done();
  }
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
