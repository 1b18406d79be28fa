// Provenance, background, species profiles and reaction diagnostics as Dataset entries
// (report/column_report.hpp).
#include "report/column_report.hpp"

#include <chrono>
#include <ctime>
#include <string_view>
#include <utility>

#include "colchem/version.hpp"
#include "core/column_state.hpp"
#include "core/constants.hpp"

namespace colchem {

std::string utc_timestamp() {
  const std::time_t t = std::chrono::system_clock::to_time_t(std::chrono::system_clock::now());
  std::tm tm{};
  gmtime_r(&t, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%SZ", &tm);
  return buf;
}

void add_provenance(Dataset& ds, const Scenario& sc, const std::string& command_line) {
  ds.global_text("Conventions", "CF-1.10");
  ds.global_text("title", "colchem column: " + sc.name);
  if (!sc.description.empty()) ds.global_text("comment", sc.description);
  ds.global_text("source", std::string("colchem ") + kVersion + " (git " + kGitRevision + ")");
  ds.global_text("history", utc_timestamp() + " " + command_line);
  ds.global_text("colchem_version", kVersion);
  ds.global_text("colchem_git_revision", kGitRevision);
  ds.global_text("date_created", utc_timestamp());
  ds.global_text("planet", sc.background.planet.name);
  ds.global_text("colchem_scenario_file", sc.file.string());
  // The long texts are scalar string variables, not global attributes: `ncdump -h` and
  // every tool's header listing stay short, and the run is still reproducible from the file.
  ds.text("provenance_scenario", "the scenario after every --set override (YAML)",
          sc.resolved_yaml);
  std::string overrides;
  for (const auto& o : sc.overrides) overrides += o + "\n";
  ds.text("provenance_overrides", "the --set overrides, one a line", overrides);
  std::string inputs;
  for (const auto& f : sc.inputs) {
    inputs += "### " + f.role + ": " + f.path.string() + "\n" + f.text;
    if (!f.text.empty() && f.text.back() != '\n') inputs += "\n";
  }
  ds.text("provenance_input_files", "the text of every table and file the scenario read", inputs);
}

namespace {
std::vector<double> scaled(const std::vector<double>& v, double f) {
  std::vector<double> out(v.size());
  for (std::size_t i = 0; i < v.size(); ++i) out[i] = v[i] * f;
  return out;
}
}  // namespace

void add_background(Dataset& ds, const Background& bg) {
  const double km = 1.0 / constants::kCmPerKm;
  const double Pa = constants::kPaPerBarye;
  ds.dimension("altitude", bg.grid.cells());
  ds.dimension("altitude_edge", bg.grid.cells() + 1);
  ds.dimension("nv", 2);
  std::vector<double> bounds;
  for (std::size_t j = 0; j < bg.grid.cells(); ++j) {
    bounds.push_back(bg.grid.edge_cm[j] * km);
    bounds.push_back(bg.grid.edge_cm[j + 1] * km);
  }
  ds.variable("altitude", {"altitude"},
              {"km",
               "altitude of cell centre above the reference radius",
               "altitude",
               {{"positive", "up"}, {"axis", "Z"}, {"bounds", "altitude_bounds"}}},
              scaled(bg.grid.center_cm, km));
  ds.variable("altitude_bounds", {"altitude", "nv"}, {"km", "cell edges", "", {}}, bounds);
  ds.variable("altitude_edge", {"altitude_edge"},
              {"km", "altitude of cell edge", "altitude", {{"positive", "up"}}},
              scaled(bg.grid.edge_cm, km));
  ds.variable("temperature", {"altitude"}, {"K", "temperature", "air_temperature", {}},
              bg.temperature_K);
  ds.variable("pressure", {"altitude"}, {"Pa", "pressure", "air_pressure", {}},
              scaled(bg.pressure_dyn_cm2, Pa));
  ds.variable("air_number_density", {"altitude"},
              {"cm-3", "total number density of air molecules", "", {}}, bg.air_density_cm3);
  ds.variable("gravity", {"altitude"}, {"m s-2", "gravitational acceleration", "", {}},
              scaled(bg.gravity_cm_s2, 0.01));
  ds.variable("scale_height", {"altitude"},
              {"km", "pressure scale height of the mean air molecule", "", {}},
              scaled(bg.scale_height_cm, km));
  ds.variable("eddy_diffusion", {"altitude"},
              {"cm2 s-1", "eddy diffusion coefficient at cell centres", "", {}}, bg.eddy_cm2_s);
  ds.variable("edge_eddy_diffusion", {"altitude_edge"},
              {"cm2 s-1", "eddy diffusion coefficient at cell edges", "", {}}, bg.edge_eddy_cm2_s);
  ds.variable("edge_temperature", {"altitude_edge"},
              {"K", "temperature at cell edges", "air_temperature", {}}, bg.edge_temperature_K);
  ds.variable("edge_pressure", {"altitude_edge"},
              {"Pa", "pressure at cell edges", "air_pressure", {}},
              scaled(bg.edge_pressure_dyn_cm2, Pa));
  ds.variable("edge_air_number_density", {"altitude_edge"},
              {"cm-3", "total number density of air molecules at cell edges", "", {}},
              bg.edge_air_density_cm3);
  ds.global_number("mean_molecular_mass_amu", bg.molecule_mass_g / constants::kAtomicMassUnit);
  ds.global_number("planet_radius_km", bg.planet.radius_cm / constants::kCmPerKm);
  ds.global_number("surface_gravity_m_s2", bg.planet.surface_gravity_cm_s2 / 100.0);
  ds.global_number("star_distance_au", bg.planet.star_distance_au);
}

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

void add_species(Dataset& ds, const Background& bg, const std::vector<std::string>& species,
                 std::span<const double> n) {
  const std::size_t S = species.size(), N = bg.grid.cells();
  const std::vector<double> f = mole_fractions(n, bg.air_density_cm3);
  ds.dimension("species", S);
  ds.strings("species_name", "species", "species name (colchem notation)", species);
  ds.variable("number_density", {"species", "altitude"},
              {"cm-3", "number density at cell centres", "", {}}, species_major(n, S));
  ds.variable("mole_fraction", {"species", "altitude"},
              {"1", "mole fraction (number density over air number density)", "", {}}, f);
  ds.variable("column_density", {"species"},
              {"cm-2", "vertical column density over the model domain", "", {}},
              column_densities(n, S, bg.grid));
  // The gases CF names, once more as their own profile with the CF standard name (a CF name
  // belongs to one gas, so mole_fraction(species, altitude) cannot carry one).
  for (std::size_t s = 0; s < S; ++s) {
    const std::string_view cf = cf_gas_name(species[s]);
    if (cf.empty()) continue;
    ds.variable("mole_fraction_" + species[s], {"altitude"},
                {"1",
                 species[s] + " mole fraction (the row of mole_fraction)",
                 "mole_fraction_of_" + std::string(cf) + "_in_air",
                 {}},
                std::vector<double>(f.begin() + static_cast<std::ptrdiff_t>(s * N),
                                    f.begin() + static_cast<std::ptrdiff_t>((s + 1) * N)));
  }
}

void add_reactions(Dataset& ds, const ReactionData& d) {
  ds.dimension("reaction", d.equations.size());
  ds.strings("reaction_id", "reaction",
             "reaction id as in the mechanism (exchange terms: exchange_X, held_X)", d.ids);
  ds.strings("reaction_equation", "reaction", "reaction as written in the mechanism", d.equations);
  ds.variable("net_stoichiometry", {"reaction", "species"},
              {"1", "net stoichiometric coefficient (products minus reactants)", "", {}},
              d.net_stoichiometry);
  ds.variable("reaction_rate", {"reaction", "altitude"},
              {"cm-3 s-1", "reaction rate at cell centres", "", {}}, d.rate);
  ds.variable("chemical_tendency", {"species", "altitude"},
              {"cm-3 s-1", "chemical production minus loss (reactions and sinks)", "", {}},
              d.chemical_tendency);
  ds.variable("transport_tendency", {"species", "altitude"},
              {"cm-3 s-1", "transport tendency -dPhi/dz", "", {}}, d.transport_tendency);
  ds.variable("net_tendency", {"species", "altitude"},
              {"cm-3 s-1", "total tendency dn/dt of the final state", "", {}}, d.net_tendency);
}

void add_result_fields(Dataset& ds, ResultFields f) {
  for (const auto& [name, size] : f.dimensions) ds.dimension(name, size);
  for (auto& t : f.texts) ds.add(std::move(t));
  for (auto& v : f.numbers) {
    if (!v.attrs.integer && v.attrs.flag_values.empty()) v.nan_fill();
    ds.add(std::move(v));
  }
}

void add_state(Dataset& ds, const Background& bg, const std::vector<std::string>& species,
               std::span<const double> n, ResultFields f) {
  add_background(ds, bg);
  add_species(ds, bg, species, n);
  add_result_fields(ds, std::move(f));
}

}  // namespace colchem
