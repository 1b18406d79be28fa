#include "io/output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <ctime>
#include <limits>
#include <string_view>
#include <utility>

#include "analysis/budget.hpp"
#include "colchem/version.hpp"
#include "core/column_state.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"

namespace colchem {

std::string utc_timestamp() {
  const std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

void write_provenance(NcWriter& nc, const Scenario& sc, const std::string& command_line) {
  nc.global_text("Conventions", "CF-1.10");
  nc.global_text("title", "colchem column: " + sc.name);
  if (!sc.description.empty()) nc.global_text("comment", sc.description);
  nc.global_text("source", std::string("colchem ") + kVersion + " (git " + kGitRevision + ")");
  nc.global_text("history", utc_timestamp() + " " + command_line);
  nc.global_text("colchem_version", kVersion);
  nc.global_text("colchem_git_revision", kGitRevision);
  nc.global_text("date_created", utc_timestamp());
  nc.global_text("planet", sc.background.planet.name);
  nc.global_text("colchem_scenario_file", sc.file.string());
  // The long texts are scalar string variables, not global attributes: `ncdump -h` and
  // every tool's header listing stay short, and the run is still reproducible from the file.
  nc.text_variable("provenance_scenario", "the scenario after every --set override (YAML)",
                   sc.resolved_yaml);
  std::string overrides;
  for (const auto& o : sc.overrides) overrides += o + "\n";
  nc.text_variable("provenance_overrides", "the --set overrides, one a line", overrides);
  std::string inputs;
  for (const auto& f : sc.inputs) {
    inputs += "### " + f.role + ": " + f.path.string() + "\n" + f.text;
    if (!f.text.empty() && f.text.back() != '\n') inputs += "\n";
  }
  nc.text_variable("provenance_input_files", "the text of every table and file the scenario read",
                   inputs);
}

void define_background(NcWriter& nc, const Background& bg) {
  nc.dimension("altitude", bg.grid.cells());
  nc.dimension("altitude_edge", bg.grid.cells() + 1);
  nc.dimension("nv", 2);
  nc.variable("altitude", {"altitude"},
              {"km",
               "altitude of cell centre above the reference radius",
               "altitude",
               {{"positive", "up"}, {"axis", "Z"}, {"bounds", "altitude_bounds"}}});
  nc.variable("altitude_bounds", {"altitude", "nv"}, {"km", "cell edges", "", {}});
  nc.variable("altitude_edge", {"altitude_edge"},
              {"km", "altitude of cell edge", "altitude", {{"positive", "up"}}});
  nc.variable("temperature", {"altitude"}, {"K", "temperature", "air_temperature", {}});
  nc.variable("pressure", {"altitude"}, {"Pa", "pressure", "air_pressure", {}});
  nc.variable("air_number_density", {"altitude"},
              {"cm-3", "total number density of air molecules", "", {}});
  nc.variable("gravity", {"altitude"}, {"m s-2", "gravitational acceleration", "", {}});
  nc.variable("scale_height", {"altitude"},
              {"km", "pressure scale height of the mean air molecule", "", {}});
  nc.variable("eddy_diffusion", {"altitude"},
              {"cm2 s-1", "eddy diffusion coefficient at cell centres", "", {}});
  nc.variable("edge_eddy_diffusion", {"altitude_edge"},
              {"cm2 s-1", "eddy diffusion coefficient at cell edges", "", {}});
  nc.variable("edge_temperature", {"altitude_edge"},
              {"K", "temperature at cell edges", "air_temperature", {}});
  nc.variable("edge_pressure", {"altitude_edge"},
              {"Pa", "pressure at cell edges", "air_pressure", {}});
  nc.variable("edge_air_number_density", {"altitude_edge"},
              {"cm-3", "total number density of air molecules at cell edges", "", {}});
  nc.global_number("mean_molecular_mass_amu", bg.molecule_mass_g / constants::kAtomicMassUnit);
  nc.global_number("planet_radius_km", bg.planet.radius_cm / constants::kCmPerKm);
  nc.global_number("surface_gravity_m_s2", bg.planet.surface_gravity_cm_s2 / 100.0);
  nc.global_number("star_distance_au", bg.planet.star_distance_au);
}

namespace {
std::vector<double> scaled(const std::vector<double>& v, double f) {
  std::vector<double> out(v.size());
  for (std::size_t i = 0; i < v.size(); ++i) out[i] = v[i] * f;
  return out;
}
}  // namespace

void write_background_data(NcWriter& nc, const Background& bg) {
  const double km = 1.0 / constants::kCmPerKm;
  nc.put("altitude", scaled(bg.grid.center_cm, km));
  std::vector<double> bounds;
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    bounds.push_back(bg.grid.edge_cm[j] * km);
    bounds.push_back(bg.grid.edge_cm[j + 1] * km);
  }
  nc.put("altitude_bounds", bounds);
  nc.put("altitude_edge", scaled(bg.grid.edge_cm, km));
  nc.put("temperature", bg.temperature_K);
  nc.put("pressure", scaled(bg.pressure_dyn_cm2, constants::kPaPerBarye));
  nc.put("air_number_density", bg.air_density_cm3);
  nc.put("gravity", scaled(bg.gravity_cm_s2, 0.01));
  nc.put("scale_height", scaled(bg.scale_height_cm, km));
  nc.put("eddy_diffusion", bg.eddy_cm2_s);
  nc.put("edge_eddy_diffusion", bg.edge_eddy_cm2_s);
  nc.put("edge_temperature", bg.edge_temperature_K);
  nc.put("edge_pressure", scaled(bg.edge_pressure_dyn_cm2, constants::kPaPerBarye));
  nc.put("edge_air_number_density", bg.edge_air_density_cm3);
}

}  // namespace colchem

namespace colchem {

namespace {
/// CF standard names of the form mole_fraction_of_X_in_air for the gases that have one (CF
/// Standard Name Table; names from memory of the table, version 84 era), keyed by colchem's
/// species notation. A species not listed has no CF name and is only in mole_fraction.
constexpr std::pair<std::string_view, std::string_view> kCfGasNames[] = {
    {"O3", "ozone"},
    {"SO2", "sulfur_dioxide"},
    {"CO", "carbon_monoxide"},
    {"CO2", "carbon_dioxide"},
    {"OH", "hydroxyl_radical"},
    {"HO2", "hydroperoxyl_radical"},
    {"H2O2", "hydrogen_peroxide"},
    {"H2", "molecular_hydrogen"},
    {"HCl", "hydrogen_chloride"},
    {"ClO", "chlorine_monoxide"},
    {"OClO", "chlorine_dioxide"},
    {"Cl2O2", "dichlorine_peroxide"},
    {"HOCl", "hypochlorous_acid"},
    {"OCS", "carbonyl_sulfide"},
    {"CH4", "methane"},
    {"N2O", "nitrous_oxide"},
    {"NO", "nitrogen_monoxide"},
    {"NO2", "nitrogen_dioxide"},
    {"HNO3", "nitric_acid"},
};

std::string_view cf_gas_name(const std::string& species) {
  for (const auto& [sp, cf] : kCfGasNames) {
    if (sp == species) return cf;
  }
  return {};
}
}  // namespace

void define_species(NcWriter& nc, const std::vector<std::string>& species) {
  nc.dimension("species", species.size());
  nc.string_variable("species_name", "species", "species name (colchem notation)");
  nc.variable("number_density", {"species", "altitude"},
              {"cm-3", "number density at cell centres", "", {}});
  nc.variable("mole_fraction", {"species", "altitude"},
              {"1", "mole fraction (number density over air number density)", "", {}});
  nc.variable("column_density", {"species"},
              {"cm-2", "vertical column density over the model domain", "", {}});
  // The gases CF names, once more as their own profile with the CF standard name (a CF name
  // belongs to one gas, so mole_fraction(species, altitude) cannot carry one).
  for (const auto& sp : species) {
    const std::string_view cf = cf_gas_name(sp);
    if (cf.empty()) continue;
    nc.variable("mole_fraction_" + sp, {"altitude"},
                {"1",
                 sp + " mole fraction (the row of mole_fraction)",
                 "mole_fraction_of_" + std::string(cf) + "_in_air",
                 {}});
  }
}

void write_species_data(NcWriter& nc, const Background& bg, const std::vector<std::string>& species,
                        std::span<const double> n) {
  const std::size_t S = species.size();
  const std::vector<double> nd = species_major(n, S);
  const std::vector<double> f = mole_fractions(n, bg.air_density_cm3);
  const std::vector<double> col = column_densities(n, S, bg.grid);
  nc.put_strings("species_name", species);
  nc.put("number_density", nd);
  nc.put("mole_fraction", f);
  nc.put("column_density", col);
  const std::size_t N = bg.grid.cells();
  for (std::size_t s = 0; s < S; ++s) {
    if (cf_gas_name(species[s]).empty()) continue;
    nc.put("mole_fraction_" + species[s],
           std::vector<double>(f.begin() + static_cast<std::ptrdiff_t>(s * N),
                               f.begin() + static_cast<std::ptrdiff_t>((s + 1) * N)));
  }
}

std::size_t ModelColumn::index(const std::string& name) const {
  for (std::size_t s = 0; s < species.size(); ++s) {
    if (species[s] == name) return s;
  }
  return std::numeric_limits<std::size_t>::max();
}

namespace {

// Checks on the NetCDF inputs colchem reads back (run files, checkpoints): every variable of
// the shape its dimensions promise, finite, altitudes strictly increasing. A file that fails
// is refused (exit 4) naming the file, the variable, what was expected and what was found,
// before any value is used.
[[noreturn]] void refuse(const NcReader& nc, const std::string& var, const std::string& expected,
                         const std::string& found) {
  throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, var, expected, found);
}

std::string shape_text(const std::vector<std::size_t>& shape) {
  if (shape.empty()) return "a single value";
  std::string s = "(";
  for (std::size_t i = 0; i < shape.size(); ++i) s += (i ? ", " : "") + std::to_string(shape[i]);
  return s + ")";
}

/// Reads `var` after checking that its shape is `want` (named by `dims` in the message).
std::vector<double> read_shaped(const NcReader& nc, const std::string& var,
                                const std::vector<std::size_t>& want, const std::string& dims) {
  const auto got = nc.shape(var);
  if (got != want) {
    refuse(nc, var, "a (" + dims + ") variable of shape " + shape_text(want),
           "shape " + shape_text(got));
  }
  std::vector<double> v = nc.read(var);
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (!std::isfinite(v[i])) {
      refuse(nc, var, "finite values", fmt::format("{} at index {}", v[i], i));
    }
  }
  return v;
}

void require_increasing(const NcReader& nc, const std::string& var, const std::vector<double>& v) {
  for (std::size_t i = 1; i < v.size(); ++i) {
    if (!(v[i] > v[i - 1])) {
      refuse(nc, var, "strictly increasing values (bottom to top)",
             fmt::format("{} after {} at index {}", v[i], v[i - 1], i));
    }
  }
}

/// The altitude grid (km in the file): at least one cell, centres and edges increasing,
/// one more edge than centres.
void read_grid(const NcReader& nc, std::vector<double>& centre_cm, std::vector<double>& edge_cm,
               bool centres) {
  const std::size_t N = nc.dimension("altitude");
  if (N == 0) refuse(nc, "altitude", "at least one altitude cell", "a zero-length dimension");
  if (centres) {
    const auto z = read_shaped(nc, "altitude", {N}, "altitude");
    require_increasing(nc, "altitude", z);
    for (double v : z) centre_cm.push_back(v * constants::kCmPerKm);
  }
  const auto e = read_shaped(nc, "altitude_edge", {N + 1}, "altitude + 1");
  require_increasing(nc, "altitude_edge", e);
  for (double v : e) edge_cm.push_back(v * constants::kCmPerKm);
}

std::vector<std::string> read_names(const NcReader& nc, const std::string& var,
                                    const std::string& dim) {
  const std::size_t n = nc.dimension(dim);
  auto names = nc.read_strings(var);
  if (names.size() != n) {
    refuse(nc, var, fmt::format("one name per '{}' ({})", dim, n), std::to_string(names.size()));
  }
  if (n == 0) refuse(nc, var, "at least one " + dim, "none");
  return names;
}

}  // namespace

void refuse_output_onto_input(
    const std::filesystem::path& output,
    const std::vector<std::pair<std::string, std::filesystem::path>>& inputs) {
  std::error_code ec;
  if (output.empty() || !std::filesystem::exists(output, ec)) return;
  for (const auto& [what, in] : inputs) {
    if (in.empty()) continue;
    if (std::filesystem::equivalent(output, in, ec) && !ec) {
      throw InputError(ExitCode::kOutput, SourceLocation{output.string()}, "-o/--output",
                       "an output path that is not one of the inputs",
                       what + " '" + in.string() + "'",
                       "writing it would overwrite the input; choose another output path");
    }
  }
}

ModelColumn read_model_column(const NcReader& nc) {
  ModelColumn m;
  read_grid(nc, m.altitude_cm, m.edge_cm, true);
  m.species = read_names(nc, "species_name", "species");
  const std::size_t S = m.species.size(), N = m.cells();
  m.number_density = read_shaped(nc, "number_density", {S, N}, "species, altitude");
  m.mole_fraction = read_shaped(nc, "mole_fraction", {S, N}, "species, altitude");
  // Number densities are not negative; round-off below zero (a millionth of the species'
  // largest value, common practice, no source) is tolerated.
  for (std::size_t s = 0; s < S; ++s) {
    double top = 0.0;
    for (std::size_t j = 0; j < N; ++j) top = std::max(top, m.number_density[s * N + j]);
    for (std::size_t j = 0; j < N; ++j) {
      const double v = m.number_density[s * N + j];
      if (v < 0.0 && !(v >= -1e-6 * top)) {
        refuse(nc, "number_density",
               "number densities of at least zero (round-off to -1e-6 of the species' largest)",
               fmt::format("{:.6g} cm-3 for {} at altitude index {}", v, m.species[s], j));
      }
    }
  }
  return m;
}

}  // namespace colchem

namespace colchem {

void define_reactions(NcWriter& nc, std::size_t reactions) {
  nc.dimension("reaction", reactions);
  nc.string_variable("reaction_id", "reaction",
                     "reaction id as in the mechanism (exchange terms: exchange_X, held_X)");
  nc.string_variable("reaction_equation", "reaction", "reaction as written in the mechanism");
  nc.variable("net_stoichiometry", {"reaction", "species"},
              {"1", "net stoichiometric coefficient (products minus reactants)", "", {}});
  nc.variable("reaction_rate", {"reaction", "altitude"},
              {"cm-3 s-1", "reaction rate at cell centres", "", {}});
  nc.variable("chemical_tendency", {"species", "altitude"},
              {"cm-3 s-1", "chemical production minus loss (reactions and sinks)", "", {}});
  nc.variable("transport_tendency", {"species", "altitude"},
              {"cm-3 s-1", "transport tendency -dPhi/dz", "", {}});
  nc.variable("net_tendency", {"species", "altitude"},
              {"cm-3 s-1", "total tendency dn/dt of the final state", "", {}});
}

void write_reaction_data(NcWriter& nc, const ReactionData& d) {
  nc.put_strings("reaction_id", d.ids);
  nc.put_strings("reaction_equation", d.equations);
  nc.put("net_stoichiometry", d.net_stoichiometry);
  nc.put("reaction_rate", d.rate);
  nc.put("chemical_tendency", d.chemical_tendency);
  nc.put("transport_tendency", d.transport_tendency);
  nc.put("net_tendency", d.net_tendency);
}

BudgetInputs read_budget_inputs(const NcReader& nc) {
  BudgetInputs in;
  for (const char* v :
       {"reaction_rate", "net_stoichiometry", "transport_tendency", "net_tendency"}) {
    if (!nc.has_variable(v)) {
      throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, v,
                       "a run file with reaction diagnostics (written by colchem run)",
                       "no variable '" + std::string(v) + "'");
    }
  }
  std::vector<double> unused;
  read_grid(nc, unused, in.edge_cm, false);
  in.species = read_names(nc, "species_name", "species");
  in.equations = read_names(nc, "reaction_equation", "reaction");
  // Run files written before reactions had ids have no reaction_id: the tables then show
  // the equations alone.
  if (nc.has_variable("reaction_id")) in.reaction_ids = read_names(nc, "reaction_id", "reaction");
  in.reaction_ids.resize(in.equations.size());
  const std::size_t S = in.species.size(), N = in.edge_cm.size() - 1, R = in.equations.size();
  in.net_stoichiometry = read_shaped(nc, "net_stoichiometry", {R, S}, "reaction, species");
  in.reaction_rate = read_shaped(nc, "reaction_rate", {R, N}, "reaction, altitude");
  in.transport_tendency = read_shaped(nc, "transport_tendency", {S, N}, "species, altitude");
  in.net_tendency = read_shaped(nc, "net_tendency", {S, N}, "species, altitude");
  return in;
}

void write_fields(NcWriter& nc, const Background& bg, const std::vector<NcTextField>& texts,
                  const std::vector<NcField>& fields) {
  for (const auto& t : texts) nc.string_variable(t.name, t.dim, t.long_name);
  for (const auto& f : fields) {
    nc.variable(f.name, f.dims, f.attrs);
    if (!f.attrs.integer && f.attrs.flag_values.empty()) {
      nc.var_number(f.name, "_FillValue", std::numeric_limits<double>::quiet_NaN());
    }
  }
  nc.end_definitions();
  write_background_data(nc, bg);
  for (const auto& t : texts) nc.put_strings(t.name, t.data);
  for (const auto& f : fields) nc.put(f.name, f.data);
}

void write_state_file(NcWriter& nc, const Background& bg, const std::vector<std::string>& species,
                      std::span<const double> n, const NcStateFile& f) {
  define_background(nc, bg);
  define_species(nc, species);
  for (const auto& [name, size] : f.dimensions) nc.dimension(name, size);
  write_fields(nc, bg, f.texts, f.fields);
  write_species_data(nc, bg, species, n);
  nc.commit();
}

}  // namespace colchem
