// A chemical mechanism as typed, validated data: species, named parameters, modules and
// reactions. io/mechanism_loader.hpp builds it from a mechanism file (schema in
// README.md, section Configuration reference); physics code (kinetics.hpp) compiles the active part
// into a network.
//
// Reaction rate R_r = s_r k_r(T, [M]) prod_s n_s^nu_s (cm^-3 s^-1), with the scale
// s_r = prod over the reaction's scale list of p or (1 - p) (named parameters, e.g.
// branching ratios). [M] = n_air sum_j eps_j x_j over the bulk gases of the background.
#pragma once

#include <cstddef>
#include <filesystem>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "chem/condensation.hpp"
#include "chem/rate_law.hpp"
#include "chem/species.hpp"
#include "core/error.hpp"

namespace colchem {

struct StoichEntry {
  std::size_t species = 0;
  int count = 1;
};

struct Parameter {
  std::string name;
  double default_value = 0.0;
  double min = 0.0;
  double max = 1.0;
  std::string meaning;
  SourceLocation where;
};

/// One factor of a reaction's scale: p, or (1 - p) when `complement`.
struct ScaleFactor {
  std::size_t parameter = 0;
  bool complement = false;
};

struct Efficiency {
  std::size_t species = 0;
  double eps = 1.0;
};

/// How uncertain a rate constant is: the JPL evaluation's form, an uncertainty factor at
/// 298 K and a temperature coefficient g (K), f(T) = f298 exp|g (1/T - 1/298)|
/// (Burkholder et al. 2019, JPL Publication 19-5, section "uncertainty estimates"). For a
/// photolysis reaction f298 is the factor of its J (cross section times quantum yield) and
/// g is 0. Reactions without a stated value get a default by kind (default_uncertainty).
struct RateUncertainty {
  double f298 = 1.0;
  double g_K = 0.0;
  bool stated = false;  ///< given in the mechanism file (else a documented default)
  std::string source;   ///< where a stated value comes from (may be empty)
  /// f(T); 1 means exact.
  [[nodiscard]] double factor(double T_K) const;
};

struct Reaction {
  std::string id;        ///< short, unique in the mechanism; names the reaction to the user
  std::string equation;  ///< as written in the file
  std::vector<StoichEntry> reactants, products;  ///< without M and hv
  bool third_body = false;                       ///< "+ M" on both sides
  bool photon = false;                           ///< "hv" among the reactants
  RateLaw rate;                                  ///< parameters already converted to cgs
  std::vector<Efficiency> efficiencies;          ///< third-body efficiencies (default 1)
  std::vector<ScaleFactor> scale;
  std::string source;
  RateUncertainty uncertainty;  ///< stated, or default_uncertainty() after loading
  bool sink = false;  ///< no products; exempt from element balance
  std::size_t module = 0;
  SourceLocation where;

  /// True when [M] multiplies the rate product (a "+ M" reaction with a non-fall-off law).
  [[nodiscard]] bool multiplies_third_body() const {
    return third_body && !rate.folds_third_body();
  }
  /// Sum of reactant counts (M and hv excluded).
  [[nodiscard]] int molecularity() const;
  /// Order of k: the molecularity, plus one when [M] multiplies the product.
  [[nodiscard]] int rate_order() const {
    return molecularity() + (multiplies_third_body() ? 1 : 0);
  }
};

struct Mechanism;

/// The third-body weight sum_j eps_j x_j of reaction rx over the bulk gases (mole fractions
/// by species name; eps = 1 for a gas the reaction gives no efficiency): [M] = n_air times
/// this. The one place [M] is formed (kinetics and the loader's rate checks use it).
double third_body_weight(const Mechanism& mech, const Reaction& rx,
                         const std::map<std::string, double>& bulk_mole_fraction);

/// Net stoichiometry nu'_s - nu_s of reaction rx over `species_count` species (dense; M and
/// hv excluded; held-fixed species included). The one place it is formed.
std::vector<double> net_stoichiometry(const Reaction& rx, std::size_t species_count);

/// The uncertainty of a reaction whose mechanism states none (common practice, no source;
/// README.md, "Rate-uncertainty ensembles"): a reaction whose source calls it invented or
/// an estimate, f298 = 3; photolysis, 1.3; a first-order or equilibrium law, 2; a
/// bimolecular reaction, 1.3 with g = 100 K; a termolecular or fall-off reaction, 1.5 with
/// g = 100 K.
RateUncertainty default_uncertainty(const Reaction& rx);

struct Module {
  std::string name;
  std::string description;
  std::vector<std::size_t> requires_modules;
  std::vector<std::size_t> reactions;  ///< indices into Mechanism::reactions
  SourceLocation where;
};

struct Mechanism {
  std::string name;
  std::string description;
  std::filesystem::path file;
  std::string text;  ///< the file as read, for provenance
  std::vector<Species> species;
  std::vector<Parameter> parameters;
  std::vector<Module> modules;
  std::vector<Reaction> reactions;

  [[nodiscard]] std::optional<std::size_t> species_index(const std::string& name) const;
  [[nodiscard]] std::optional<std::size_t> parameter_index(const std::string& name) const;
  [[nodiscard]] std::optional<std::size_t> module_index(const std::string& name) const;
  /// The reaction a user names: its id, or its equation as written in the file when exactly
  /// one reaction has that equation. Otherwise nullopt, and `why` (if given) says what was
  /// found: the ids to choose from for an equation several reactions share.
  [[nodiscard]] std::optional<std::size_t> find_reaction(const std::string& ref,
                                                         std::string* why = nullptr) const;
  [[nodiscard]] std::vector<double> default_parameters() const;
  /// The reaction as "A + B -> C" rebuilt from the typed data (for summaries).
  [[nodiscard]] std::string equation_text(std::size_t reaction) const;
};

/// Thresholds of "absurd" rate constants that check_rates (chem/rate_checks.hpp) refuses
/// at load (common practice, no source); a scenario or box configuration may set them in
/// `chemistry.rate_limits` where a real world needs wider ones.
struct RateLimits {
  double first_order_s = 1e20;      ///< s^-1
  double bimolecular_cm3_s = 1e-8;  ///< cm^3 s^-1 (also bimolecular-equivalent k)
  /// cm^6 s^-1 (k0 of fall-off forms). Not lower: SO3 + 2 H2O -> H2SO4 + H2O (Lovejoy et
  /// al. 1996), extrapolated as planetary models do to 170 K, reaches a few 1e-24 through its
  /// water-complex route.
  double termolecular_cm6_s = 1e-22;
};

/// What a scenario asks of the chemistry: the mechanism, the active modules, the
/// parameter values (index as Mechanism::parameters) and the scenario-level exchanges with a
/// condensed phase (chem/condensation.hpp; held profiles are added by the column model).
struct ChemistrySpec {
  std::shared_ptr<const Mechanism> mechanism;  ///< null when the scenario has no chemistry
  std::vector<std::size_t> modules;            ///< active modules, with their requirements
  std::vector<double> parameters;
  std::vector<CondensationExchange> exchanges;
  RateLimits rate_limits;  ///< checked at load only
};

}  // namespace colchem
