// The column's chemistry operator, f = P - L - C per cell (cm^-3 s^-1): equations, units and
// sources in chem/chemistry_operator.hpp; the mass-action kernel is Kinetics::mass_action
// (chem/kinetics.hpp), the exchange kernel exchange_tendency (chem/condensation.hpp).
#include "chem/chemistry_operator.hpp"

#include <algorithm>
#include <stdexcept>

#include "core/constants.hpp"

namespace colchem {

namespace {
const ChemistrySpec& require_mechanism(const ChemistrySpec& spec) {
  if (!spec.mechanism) {
    throw std::invalid_argument("ChemistryOperator: the chemistry spec has no mechanism");
  }
  return spec;
}
}  // namespace

ChemistryOperator::ChemistryOperator(const ChemistrySpec& spec, const Background& bg,
                                     StiffOptions options)
    : kin_(require_mechanism(spec).mechanism, spec.modules, spec.parameters),
      integrator_(spec.mechanism->species.size(), options) {
  init(spec, bg.temperature_K, bg.air_density_cm3, bg.grid.center_cm, bg.bulk_mole_fraction);
}

ChemistryOperator::ChemistryOperator(const ChemistrySpec& spec,
                                     std::span<const double> temperature_K,
                                     std::span<const double> air_cm3,
                                     std::span<const double> altitude_cm,
                                     const std::map<std::string, double>& bulk,
                                     StiffOptions options)
    : kin_(require_mechanism(spec).mechanism, spec.modules, spec.parameters),
      integrator_(spec.mechanism->species.size(), options) {
  init(spec, temperature_K, air_cm3, altitude_cm, bulk);
}

void ChemistryOperator::init(const ChemistrySpec& spec, std::span<const double> T,
                             std::span<const double> air, std::span<const double> z,
                             const std::map<std::string, double>& bulk) {
  kin_.set_conditions(T, air, bulk);
  const std::size_t S = kin_.species_count();
  const std::size_t N = T.size();
  const Mechanism& m = *spec.mechanism;
  work_.assign(S, 0.0);
  fixed_n_.assign(N * S, 0.0);
  fixed_mask_.assign(S, 0.0);
  for (std::size_t s = 0; s < S; ++s) {
    if (!m.species[s].fixed) continue;
    fixed_mask_[s] = 1.0;
    const auto it = bulk.find(m.species[s].name);
    const double x = it == bulk.end() ? 0.0 : it->second;
    for (std::size_t j = 0; j < N; ++j) fixed_n_[j * S + s] = x * air[j];
  }
  exchanges_ = spec.exchanges;
  for (std::size_t k = 0; k < exchanges_.size(); ++k) {
    const double mass_g = m.species[exchanges_[k].species].molar_mass_g_mol / constants::kAvogadro;
    for (const auto& c : colchem::exchange_cells(exchanges_[k], k, T, air, z, mass_g)) {
      cells_x_.push_back(c);
    }
  }
  std::stable_sort(cells_x_.begin(), cells_x_.end(),
                   [](const ExchangeCell& a, const ExchangeCell& b) { return a.cell < b.cell; });
  cell_first_.assign(N + 1, 0);
  for (const auto& c : cells_x_) ++cell_first_[c.cell + 1];
  for (std::size_t j = 0; j < N; ++j) cell_first_[j + 1] += cell_first_[j];
  base_n_eq_.clear();
  for (const auto& c : cells_x_) base_n_eq_.push_back(c.n_eq);
}

namespace {
bool is_held_profile(const CondensationExchange& e) {
  return e.saturation == CondensationExchange::Saturation::kHeldProfile;
}
}  // namespace

bool ChemistryOperator::has_held_profile(std::size_t s) const {
  return std::any_of(exchanges_.begin(), exchanges_.end(), [&](const CondensationExchange& e) {
    return e.species == s && is_held_profile(e);
  });
}

void ChemistryOperator::scale_held_profile(std::size_t s, double factor) {
  for (std::size_t i = 0; i < cells_x_.size(); ++i) {
    ExchangeCell& c = cells_x_[i];
    if (c.species == s && is_held_profile(exchanges_[c.term])) c.n_eq = factor * base_n_eq_[i];
  }
}

void ChemistryOperator::add_held_profile_derivative(std::size_t s, std::span<const double> n,
                                                    std::span<double> out) const {
  const std::size_t S = species_count();
  for (std::size_t i = 0; i < cells_x_.size(); ++i) {
    const ExchangeCell& c = cells_x_[i];
    if (c.species != s || !is_held_profile(exchanges_[c.term])) continue;
    const std::size_t at = c.cell * S + c.species;
    out[at] -= exchange_tendency(c, n[at]).dfdn * base_n_eq_[i];
  }
}

void ChemistryOperator::impose_fixed(std::span<double> n) const {
  const std::size_t S = species_count();
  for (std::size_t i = 0; i < n.size(); ++i) {
    if (fixed_mask_[i % S] != 0.0) n[i] = fixed_n_[i];
  }
}

void ChemistryOperator::cell_rhs(std::size_t j, const double* n, double* f) const {
  std::fill(f, f + species_count(), 0.0);
  kin_.add_tendency(j, n, f);
  for (std::size_t i = cell_first_[j]; i < cell_first_[j + 1]; ++i) {
    const ExchangeCell& c = cells_x_[i];
    f[c.species] += exchange_tendency(c, n[c.species]).f;
  }
}

void ChemistryOperator::cell_jacobian(std::size_t j, const double* n, double* block) const {
  const std::size_t S = species_count();
  std::fill(block, block + S * S, 0.0);
  kin_.add_jacobian_dense(j, n, block);
  for (std::size_t i = cell_first_[j]; i < cell_first_[j + 1]; ++i) {
    const ExchangeCell& c = cells_x_[i];
    block[c.species * S + c.species] += exchange_tendency(c, n[c.species]).dfdn;
  }
}

void ChemistryOperator::add_photolysis_tendency(std::span<const double> n,
                                                std::span<const double> dJ,
                                                std::span<double> out) const {
  const std::size_t S = species_count(), N = cells(), C = kin_.channels().size();
  std::vector<double> cell_dJ(C);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t c = 0; c < C; ++c) cell_dJ[c] = dJ[c * N + j];
    kin_.add_photolysis_tendency(n.data() + j * S, cell_dJ.data(), out.data() + j * S);
  }
}

void ChemistryOperator::add_tendency(std::span<const double> n, double /*t*/,
                                     std::span<double> tendency) {
  const std::size_t S = species_count();
  for (std::size_t j = 0; j < cells(); ++j) {
    kin_.add_tendency(j, n.data() + j * S, tendency.data() + j * S);
  }
  for (const auto& c : cells_x_) {
    tendency[c.cell * S + c.species] += exchange_tendency(c, n[c.cell * S + c.species]).f;
  }
}

void ChemistryOperator::add_jacobian(std::span<const double> n, double /*t*/,
                                     BlockTridiagonal& jac) {
  const std::size_t S = species_count();
  if (jac.species != S || jac.cells != cells()) {
    throw std::invalid_argument("ChemistryOperator::add_jacobian: block shape mismatch");
  }
  for (std::size_t j = 0; j < cells(); ++j) {
    kin_.add_jacobian_dense(j, n.data() + j * S, jac.diag.data() + j * S * S);
  }
  for (const auto& c : cells_x_) {
    jac.d(c.cell, c.species, c.species) += exchange_tendency(c, n[c.cell * S + c.species]).dfdn;
  }
}

bool ChemistryOperator::implicit_step(std::span<double> n, double t, double dt) {
  const std::size_t S = species_count();
  std::vector<double> saved(n.begin(), n.end());
  for (std::size_t j = 0; j < cells(); ++j) {
    const CellRhs f = [this, j](const double* x, double* out) { cell_rhs(j, x, out); };
    const CellJacobian J = [this, j](const double* x, double* out) { cell_jacobian(j, x, out); };
    if (!integrator_.integrate(n.subspan(j * S, S), t, t + dt, f, J)) {
      std::copy(saved.begin(), saved.end(), n.begin());
      return false;
    }
  }
  return true;
}

void ChemistryOperator::reaction_rates(std::span<const double> n, std::span<double> R) const {
  const std::size_t S = species_count();
  const std::size_t NR = kin_.reaction_count();
  if (R.size() != cells() * NR) throw std::invalid_argument("reaction_rates: size cells * R");
  for (std::size_t j = 0; j < cells(); ++j)
    kin_.reaction_rates(j, n.data() + j * S, R.data() + j * NR);
}

void ChemistryOperator::condensation_rates(std::span<const double> n, std::span<double> C) const {
  const std::size_t S = species_count();
  std::fill(C.begin(), C.end(), 0.0);
  for (const auto& c : cells_x_) {
    C[c.cell * S + c.species] -= exchange_tendency(c, n[c.cell * S + c.species]).f;
  }
}

void ChemistryOperator::exchange_rates(std::span<const double> n, std::span<double> out) const {
  const std::size_t S = species_count(), N = cells();
  if (out.size() != exchanges_.size() * N)
    throw std::invalid_argument("exchange_rates: size terms * cells");
  std::fill(out.begin(), out.end(), 0.0);
  for (const auto& c : cells_x_) {
    out[c.term * N + c.cell] -= exchange_tendency(c, n[c.cell * S + c.species]).f;
  }
}

void ChemistryOperator::parameter_sensitivities(std::span<const double> n,
                                                std::span<double> out) const {
  const std::size_t S = species_count();
  const std::size_t N = cells();
  const std::size_t NR = kin_.reaction_count();
  const std::size_t P = kin_.mechanism().parameters.size();
  if (out.size() != P * N * S) throw std::invalid_argument("parameter_sensitivities: size P*N*S");
  std::fill(out.begin(), out.end(), 0.0);
  std::vector<double> dk(P * NR * N), dk_cell(NR);
  kin_.rate_constant_sensitivities(dk);
  for (std::size_t q = 0; q < P; ++q) {
    for (std::size_t j = 0; j < N; ++j) {
      // d f / d p = sum_r nu_r (d k_r / d p) prod n: the mass-action kernel with d k / d p.
      for (std::size_t r = 0; r < NR; ++r) dk_cell[r] = dk[(q * NR + r) * N + j];
      kin_.add_mass_action(n.data() + j * S, dk_cell, out.data() + (q * N + j) * S);
    }
  }
}

}  // namespace colchem
