// The run's CF-1.10 NetCDF file: conventions, provenance, the background column.
// Later stages (species, J-values, rates, budgets) add their variables through the same
// NcWriter before commit().
#pragma once

#include <filesystem>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include "core/background.hpp"
#include "io/netcdf_file.hpp"
#include "io/scenario.hpp"

namespace colchem {

/// CF global attributes: Conventions, title, institution-free provenance (program version,
/// git revision, creation time, command line), and the resolved scenario and its included
/// files as text so that the file reproduces its run.
void write_provenance(NcWriter& nc, const Scenario& sc, const std::string& command_line);

/// Defines the altitude coordinates ("altitude" at cell centres, "altitude_edge" at edges,
/// with CF bounds) and the background profiles; call write_background_data after
/// end_definitions().
/// A variable spelt once: its definition and its data together (numbers, NaN fill).
struct NcField {
  std::string name;
  std::vector<std::string> dims;
  NcVarAttrs attrs;
  std::vector<double> data;
};
/// A string variable along one dimension.
struct NcTextField {
  std::string name, dim, long_name;
  std::vector<std::string> data;
};
/// Defines the fields (dimensions already defined), ends the definitions, writes the
/// background's data and then every field's.
void write_fields(NcWriter& nc, const Background& bg, const std::vector<NcTextField>& texts,
                  const std::vector<NcField>& fields);

/// The variables of a file that holds one column state and what was found of it (fit,
/// sensitivity): dimensions of its own, text fields and number fields.
struct NcStateFile {
  std::vector<std::pair<std::string, std::size_t>> dimensions;
  std::vector<NcTextField> texts;
  std::vector<NcField> fields;
};
/// Defines the background, the species profiles of the state `n` (cell-major, n[j*S + s])
/// and `f`'s dimensions and fields, writes them all (write_fields, write_species_data) and
/// commits. Provenance and global attributes go first, before the call.
void write_state_file(NcWriter& nc, const Background& bg, const std::vector<std::string>& species,
                      std::span<const double> n, const NcStateFile& f);

void define_background(NcWriter& nc, const Background& bg);
void write_background_data(NcWriter& nc, const Background& bg);

/// Species profiles: a `species` coordinate of names, `number_density(species, altitude)`
/// (cm-3), `mole_fraction(species, altitude)` ("1") and `column_density(species)` (cm-2).
/// n is the column state, cell-major: n[j*S + s].
void define_species(NcWriter& nc, const std::vector<std::string>& species);
void write_species_data(NcWriter& nc, const Background& bg, const std::vector<std::string>& species,
                        std::span<const double> n);

/// Refuses (exit 6, before anything is computed) an output path that names one of the
/// inputs (`inputs`: what the file is, e.g. "the scenario file", and its path): writing it
/// would overwrite the input. Paths are compared as files (links and relative paths
/// resolved), so "./a.yaml" and "a.yaml" are the same; inputs that do not exist are skipped.
void refuse_output_onto_input(
    const std::filesystem::path& output,
    const std::vector<std::pair<std::string, std::filesystem::path>>& inputs);

/// The species profiles of a run file (read back for compare, restart and budgets).
struct ModelColumn {
  std::vector<double> altitude_cm;  ///< cell centres
  std::vector<double> edge_cm;      ///< cell edges
  std::vector<std::string> species;
  std::vector<double> number_density;  ///< [s][j]
  std::vector<double> mole_fraction;   ///< [s][j]
  [[nodiscard]] std::size_t cells() const { return altitude_cm.size(); }
  /// Index of a species, or npos.
  [[nodiscard]] std::size_t index(const std::string& name) const;
};
ModelColumn read_model_column(const NcReader& nc);

/// Reaction diagnostics: `reaction_id(reaction)`, `reaction_equation(reaction)`,
/// `net_stoichiometry(reaction, species)` (products minus reactants), `reaction_rate(reaction,
/// altitude)` (cm-3 s-1) and the tendencies `chemical_tendency`, `transport_tendency`,
/// `net_tendency` (species, altitude) in cm-3 s-1. Arrays: rates [r][j], stoichiometry [r][s],
/// tendencies [s][j].
void define_reactions(NcWriter& nc, std::size_t reactions);
struct ReactionData {
  std::vector<std::string> ids;
  std::vector<std::string> equations;
  std::vector<double> net_stoichiometry;
  std::vector<double> rate;
  std::vector<double> chemical_tendency, transport_tendency, net_tendency;
};
void write_reaction_data(NcWriter& nc, const ReactionData& d);

/// What `colchem budget` needs from a run file.
struct BudgetInputs;
BudgetInputs read_budget_inputs(const NcReader& nc);

/// UTC now in ISO 8601 ("2026-12-02T04:30:00Z").
std::string utc_timestamp();

}  // namespace colchem
