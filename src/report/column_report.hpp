// The parts every column file shares, as Dataset entries (core/dataset.hpp): CF global
// attributes and provenance, the background column (altitude coordinates with CF bounds and
// the background profiles), the species profiles of a state, and the reaction diagnostics.
// The builders of each command's file (report/*_report.hpp) start from these.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/dataset.hpp"
#include "solve/scenario.hpp"

namespace colchem {

/// UTC now in ISO 8601 ("2026-12-02T04:30:00Z").
std::string utc_timestamp();

/// CF global attributes: Conventions, title, institution-free provenance (program version,
/// git revision, creation time, command line), and the resolved scenario and its included
/// files as text so that the file reproduces its run.
void add_provenance(Dataset& ds, const Scenario& sc, const std::string& command_line);

/// The altitude coordinates ("altitude" at cell centres, "altitude_edge" at edges, with CF
/// bounds), the background profiles and the planet's global numbers.
void add_background(Dataset& ds, const Background& bg);

/// Species profiles: a `species` dimension with `species_name`, `number_density(species,
/// altitude)` (cm-3), `mole_fraction(species, altitude)` ("1"), `column_density(species)`
/// (cm-2) and, for the gases CF names, `mole_fraction_<GAS>(altitude)`.
/// n is the column state, cell-major: n[j*S + s].
void add_species(Dataset& ds, const Background& bg, const std::vector<std::string>& species,
                 std::span<const double> n);

/// Reaction diagnostics: `reaction_id(reaction)`, `reaction_equation(reaction)`,
/// `net_stoichiometry(reaction, species)` (products minus reactants), `reaction_rate(reaction,
/// altitude)` (cm-3 s-1) and the tendencies `chemical_tendency`, `transport_tendency`,
/// `net_tendency` (species, altitude) in cm-3 s-1. Arrays: rates [r][j], stoichiometry [r][s],
/// tendencies [s][j].
struct ReactionData {
  std::vector<std::string> ids;
  std::vector<std::string> equations;
  std::vector<double> net_stoichiometry;
  std::vector<double> rate;
  std::vector<double> chemical_tendency, transport_tendency, net_tendency;
};
void add_reactions(Dataset& ds, const ReactionData& d);

/// What a file of results about one state adds after the background and species (fit,
/// sensitivity, ensemble, resolution): its dimensions, then its string variables, then its
/// numeric variables (each with a NaN fill value unless integer).
struct ResultFields {
  std::vector<std::pair<std::string, std::size_t>> dimensions;
  std::vector<DatasetVariable> texts;
  std::vector<DatasetVariable> numbers;
};
void add_result_fields(Dataset& ds, ResultFields f);

/// The body of a file about one column state (fit, sensitivity): background, species
/// profiles of `n`, then `f`. Provenance and the file's own global attributes go first.
void add_state(Dataset& ds, const Background& bg, const std::vector<std::string>& species,
               std::span<const double> n, ResultFields f);

}  // namespace colchem
