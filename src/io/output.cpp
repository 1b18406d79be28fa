#include "io/output.hpp"

#include <chrono>
#include <ctime>
#include <limits>

#include "analysis/budget.hpp"
#include "colchem/version.hpp"
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
  nc.global_text("colchem_scenario", sc.resolved_yaml);
  std::string overrides;
  for (const auto& o : sc.overrides) overrides += o + "\n";
  nc.global_text("colchem_overrides", overrides);
  std::string inputs;
  for (const auto& f : sc.inputs) {
    inputs += "### " + f.role + ": " + f.path.string() + "\n" + f.text;
    if (!f.text.empty() && f.text.back() != '\n') inputs += "\n";
  }
  nc.global_text("colchem_input_files", inputs);
}

void define_background(NcWriter& nc, const Background& bg) {
  nc.dimension("altitude", bg.grid.cells());
  nc.dimension("altitude_edge", bg.grid.cells() + 1);
  nc.dimension("nv", 2);
  nc.variable("altitude", {"altitude"},
              {"km", "altitude of cell centre above the reference radius", "altitude",
               {{"positive", "up"}, {"axis", "Z"}, {"bounds", "altitude_bounds"}}});
  nc.variable("altitude_bounds", {"altitude", "nv"}, {"km", "cell edges", "", {}});
  nc.variable("altitude_edge", {"altitude_edge"},
              {"km", "altitude of cell edge", "altitude", {{"positive", "up"}}});
  nc.variable("temperature", {"altitude"}, {"K", "temperature", "air_temperature", {}});
  nc.variable("pressure", {"altitude"}, {"Pa", "pressure", "air_pressure", {}});
  nc.variable("air_number_density", {"altitude"},
              {"cm-3", "total number density of air molecules", "", {}});
  nc.variable("gravity", {"altitude"},
              {"m s-2", "gravitational acceleration", "", {}});
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

void define_species(NcWriter& nc, const std::vector<std::string>& species) {
  nc.dimension("species", species.size());
  nc.string_variable("species", "species", "species name (colchem notation)");
  nc.variable("number_density", {"species", "altitude"},
              {"cm-3", "number density at cell centres", "", {}});
  nc.variable("mole_fraction", {"species", "altitude"},
              {"1", "mole fraction (number density over air number density)", "", {}});
  nc.variable("column_density", {"species"},
              {"cm-2", "vertical column density over the model domain", "", {}});
}

void write_species_data(NcWriter& nc, const Background& bg, const std::vector<std::string>& species,
                        std::span<const double> n) {
  const std::size_t S = species.size();
  const std::size_t N = bg.grid.cells();
  std::vector<double> nd(S * N), f(S * N), col(S, 0.0);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) {
      nd[s * N + j] = n[j * S + s];
      f[s * N + j] = n[j * S + s] / bg.air_density_cm3[j];
      col[s] += n[j * S + s] * bg.grid.width_cm(j);
    }
  }
  nc.put_strings("species", species);
  nc.put("number_density", nd);
  nc.put("mole_fraction", f);
  nc.put("column_density", col);
}

std::size_t ModelColumn::index(const std::string& name) const {
  for (std::size_t s = 0; s < species.size(); ++s) {
    if (species[s] == name) return s;
  }
  return std::numeric_limits<std::size_t>::max();
}

ModelColumn read_model_column(const NcReader& nc) {
  ModelColumn m;
  for (double z : nc.read("altitude")) m.altitude_cm.push_back(z * constants::kCmPerKm);
  for (double z : nc.read("altitude_edge")) m.edge_cm.push_back(z * constants::kCmPerKm);
  m.species = nc.read_strings("species");
  m.number_density = nc.read("number_density");
  m.mole_fraction = nc.read("mole_fraction");
  if (m.mole_fraction.size() != m.species.size() * m.cells()) {
    throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, "mole_fraction",
                     "a (species, altitude) variable", "a different shape");
  }
  return m;
}

}  // namespace colchem

namespace colchem {

void define_reactions(NcWriter& nc, std::size_t reactions) {
  nc.dimension("reaction", reactions);
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
  nc.put_strings("reaction_equation", d.equations);
  nc.put("net_stoichiometry", d.net_stoichiometry);
  nc.put("reaction_rate", d.rate);
  nc.put("chemical_tendency", d.chemical_tendency);
  nc.put("transport_tendency", d.transport_tendency);
  nc.put("net_tendency", d.net_tendency);
}

BudgetInputs read_budget_inputs(const NcReader& nc) {
  BudgetInputs in;
  for (const char* v : {"reaction_rate", "net_stoichiometry", "transport_tendency", "net_tendency"}) {
    if (!nc.has_variable(v)) {
      throw InputError(ExitCode::kInputData, SourceLocation{nc.path().string()}, v,
                       "a run file with reaction diagnostics (written by colchem run)",
                       "no variable '" + std::string(v) + "'");
    }
  }
  for (double z : nc.read("altitude_edge")) in.edge_cm.push_back(z * constants::kCmPerKm);
  in.species = nc.read_strings("species");
  in.equations = nc.read_strings("reaction_equation");
  in.net_stoichiometry = nc.read("net_stoichiometry");
  in.reaction_rate = nc.read("reaction_rate");
  in.transport_tendency = nc.read("transport_tendency");
  in.net_tendency = nc.read("net_tendency");
  return in;
}

void write_fields(NcWriter& nc, const Background& bg, const std::vector<NcTextField>& texts,
                  const std::vector<NcField>& fields) {
  for (const auto& t : texts) nc.string_variable(t.name, t.dim, t.long_name);
  for (const auto& f : fields) {
    nc.variable(f.name, f.dims, f.attrs);
    nc.var_number(f.name, "_FillValue", std::numeric_limits<double>::quiet_NaN());
  }
  nc.end_definitions();
  write_background_data(nc, bg);
  for (const auto& t : texts) nc.put_strings(t.name, t.data);
  for (const auto& f : fields) nc.put(f.name, f.data);
}

}  // namespace colchem
