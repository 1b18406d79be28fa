// The column model, dn/dt = f_transport(n) + f_chemistry(n; J(n)): see solve/column_model.hpp.
#include "solve/column_model.hpp"

#include <algorithm>
#include <cmath>
#include <limits>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/interp.hpp"
#include "solve/residual_norm.hpp"

namespace colchem {

namespace {

/// The chemistry with each held profile as an exchange with an unlimited reservoir at the
/// held mixing ratio.
ChemistrySpec with_held_profiles(const ChemistrySpec& chemistry, const ColumnSpeciesSpec& setup) {
  const Mechanism& mech = *chemistry.mechanism;
  ChemistrySpec chem = chemistry;
  for (const auto& entry : setup.species) {
    const auto idx = mech.species_index(entry.name);
    if (!entry.hold || !idx) continue;  // unknown names are reported by the caller
    if (mech.species[*idx].fixed || entry.fixed.value_or(false)) {
      throw InputError(ExitCode::kConfig, entry.where, "species." + entry.name + ".hold",
                       "a species that is not held fixed", "'" + entry.name + "' is fixed");
    }
    CondensationExchange h;
    h.species = *idx;
    h.saturation = CondensationExchange::Saturation::kHeldProfile;
    h.held_mixing_ratio = entry.hold->mixing_ratio;
    h.rate = CondensationExchange::Rate::kTimescale;
    h.timescale_s = entry.hold->timescale_s;
    h.above_cm = entry.hold->from_cm;
    h.below_cm = entry.hold->to_cm;
    chem.exchanges.push_back(h);
  }
  return chem;
}

/// What the transport operator needs of a mechanism species (before the scenario's
/// per-species settings).
TransportSpecies transport_species_of(const Species& sp, double air_amu) {
  TransportSpecies ts = default_transport_species(sp.name, sp.molar_mass_g_mol, air_amu);
  const DiffusionParams d = sp.diffusion_params(air_amu);
  ts.diffusion_A = d.A;
  ts.diffusion_s = d.s;
  ts.thermal_diffusion = sp.thermal_diffusion_factor();
  ts.fixed = sp.fixed;
  return ts;
}

/// Every species the scenario configures must be a species of the mechanism.
void check_species_known(const ColumnSpeciesSpec& setup, const std::vector<std::string>& names) {
  for (const auto& entry : setup.species) {
    bool known = false;
    for (const auto& n : names) known = known || n == entry.name;
    if (!known) {
      std::string list;
      for (const auto& n : names) list += (list.empty() ? "" : ", ") + n;
      throw InputError(ExitCode::kConfig, entry.where, "species." + entry.name,
                       names.empty() ? std::string("a chemistry section declaring the species")
                                     : "a species of the mechanism (" + list + ")",
                       "'" + entry.name + "'");
    }
  }
}

/// The photolysis model of the scenario and, per chemistry channel, its photolysis channel.
std::unique_ptr<PhotolysisModel> build_photolysis(const Scenario& sc, const Background& bg,
                                                  const std::vector<std::string>& names,
                                                  const std::vector<std::string>& channels,
                                                  std::vector<std::size_t>& channel_map) {
  if (!sc.has_photolysis) {
    throw InputError(
        ExitCode::kConfig, SourceLocation{sc.file.string()}, "photolysis",
        "a photolysis section (the mechanism has photolysis channel '" + channels.front() + "')",
        "none");
  }
  auto photo = std::make_unique<PhotolysisModel>(sc.photolysis, bg, names, sc.chemistry.parameters);
  for (const auto& c : channels) {
    const int pc = photo->channel_index(c);
    if (pc < 0) {
      throw InputError(ExitCode::kInputData, SourceLocation{sc.photolysis.data_source}, "channels",
                       "a channel named '" + c + "' (used by the mechanism)", "none");
    }
    channel_map.push_back(static_cast<std::size_t>(pc));
  }
  return photo;
}

}  // namespace

ColumnModel::ColumnModel(const Scenario& sc) : bg_(build_background(sc.background)) {
  species_setup_ = sc.species_setup;
  // 1. Chemistry (held profiles as exchanges) and the species' transport properties.
  const double air_amu = bg_.molecule_mass_g / constants::kAtomicMassUnit;
  if (sc.chemistry.mechanism) {
    chemistry_ =
        std::make_unique<ChemistryOperator>(with_held_profiles(sc.chemistry, species_setup_), bg_);
    for (const auto& sp : sc.chemistry.mechanism->species) {
      names_.push_back(sp.name);
      held_.push_back(sp.fixed);
      transport_species_.push_back(transport_species_of(sp, air_amu));
    }
  }
  // 2. The scenario's per-species settings.
  check_species_known(species_setup_, names_);
  apply_species_settings(species_setup_, transport_species_);
  for (std::size_t s = 0; s < names_.size(); ++s) {
    held_[s] = transport_species_[s].fixed;
    const auto it = bg_.bulk_mole_fraction.find(names_[s]);
    held_mixing_ratio_.push_back(it == bg_.bulk_mole_fraction.end() ? 0.0 : it->second);
  }
  if (names_.empty()) return;

  // 3. Transport with its boundary conditions, and the injections.
  try {
    boundaries_ = boundaries_for(species_setup_, transport_species_);
    transport_ = std::make_unique<TransportOperator>(bg_, transport_species_, boundaries_);
  } catch (const std::invalid_argument& e) {
    throw InputError(ExitCode::kConfig, SourceLocation{sc.file.string()}, "species",
                     "boundary conditions that fit their boundary", e.what());
  }
  injections_ = resolve_injections(species_setup_, bg_, transport_species_);

  // 4. Photolysis, when the mechanism has photolysis channels.
  const auto& channels = chemistry_->photolysis_channels();
  if (!channels.empty()) {
    photo_spec_ = sc.photolysis;
    photo_ = build_photolysis(sc, bg_, names_, channels, channel_map_);
    J_.assign(photo_->channels().size() * cells(), 0.0);
  }
}

ColumnSystem ColumnModel::system() {
  ColumnSystem sys;
  sys.cells = cells();
  sys.species = species_count();
  if (photo_) sys.coupling = this;
  sys.species_names = names_;
  for (double z : bg_.grid.center_cm) sys.altitude_km.push_back(z * 1e-5);
  if (transport_) sys.operators.push_back(transport_.get());
  if (chemistry_) sys.operators.push_back(chemistry_.get());
  return sys;
}

void ColumnModel::impose_held(std::span<double> n) const {
  if (chemistry_) chemistry_->impose_fixed(n);
}

std::vector<double> ColumnModel::initial_state() const {
  std::vector<double> n =
      colchem::initial_state(species_setup_, bg_, transport_species_, held_mixing_ratio_);
  impose_held(n);
  return n;
}

std::size_t ColumnModel::take_restart(const ModelColumn& old, std::vector<double>& n) const {
  const std::size_t S = species_count(), N = cells();
  std::size_t taken = 0;
  for (std::size_t s = 0; s < S; ++s) {
    const std::size_t o = old.index(names_[s]);
    if (o >= old.species.size()) continue;
    std::vector<double> y(old.cells());
    const double floor = 1e-30;  // log interpolation needs positive values
    for (std::size_t j = 0; j < old.cells(); ++j) {
      y[j] = std::max(old.number_density[o * old.cells() + j], floor);
    }
    const auto v = *interpolate(old.altitude_cm, y, bg_.grid.center_cm, InterpScale::kLog,
                                Extrapolation::kHoldEnds);
    for (std::size_t j = 0; j < N; ++j) n[j * S + s] = v[j];
    ++taken;
  }
  impose_held(n);
  return taken;
}

void ColumnModel::refresh_photolysis(std::span<const double> n) {
  if (!photo_) return;
  photo_->compute(n, J_);
  const std::size_t N = cells();
  for (std::size_t c = 0; c < channel_map_.size(); ++c) {
    chemistry_->set_photolysis_rates(c,
                                     std::span<const double>(J_.data() + channel_map_[c] * N, N));
  }
}

void ColumnModel::add_jacobian_product(std::span<const double> x, std::span<const double> v,
                                       std::span<double> out) {
  if (!photo_) return;
  const std::size_t S = species_count(), N = cells();
  double vmax = 0.0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (!held_[i % S]) vmax = std::max(vmax, std::abs(v[i]) / (std::abs(x[i]) + 1.0));
  }
  if (!(vmax > 0.0) || !std::isfinite(vmax)) return;
  const double h = 1e-7 / vmax;
  x_shifted_.assign(x.begin(), x.end());
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (!held_[i % S]) x_shifted_[i] += h * v[i];
  }
  J_shifted_.resize(J_.size());
  photo_->compute(x_shifted_, J_shifted_);
  // Channels in the chemistry's order, the J difference quotient of each.
  dJ_.assign(channel_map_.size() * N, 0.0);
  for (std::size_t c = 0; c < channel_map_.size(); ++c) {
    const std::size_t pc = channel_map_[c] * N;
    for (std::size_t j = 0; j < N; ++j) dJ_[c * N + j] = (J_shifted_[pc + j] - J_[pc + j]) / h;
  }
  chemistry_->add_photolysis_tendency(x, dJ_, out);
}

void ColumnModel::rebuild_transport(const Background& bg, std::vector<SpeciesBoundaries> bcs) {
  transport_ = std::make_unique<TransportOperator>(bg, transport_species_, bcs);
  boundaries_ = std::move(bcs);
}

void ColumnModel::set_parameter(std::size_t q, double value) {
  Kinetics& kin = chemistry_->kinetics();
  kin.set_parameter(q, value);
  if (photo_ && photo_->acts_on(q)) {
    const auto p = kin.parameters();
    photo_ = std::make_unique<PhotolysisModel>(photo_spec_, bg_, names_,
                                               std::vector<double>(p.begin(), p.end()));
  }
}

void ColumnModel::parameter_tendency(std::size_t q, std::span<const double> x,
                                     std::span<double> out) {
  const std::size_t S = species_count(), N = cells();
  const std::size_t P = chemistry_->kinetics().parameters().size();
  std::vector<double> all(P * N * S);
  chemistry_->parameter_sensitivities(x, all);
  std::copy(all.begin() + static_cast<std::ptrdiff_t>(q * N * S),
            all.begin() + static_cast<std::ptrdiff_t>((q + 1) * N * S), out.begin());
  if (photo_ && photo_->acts_on(q)) {
    std::vector<double> dJ(J_.size());
    photo_->parameter_derivative(q, x, dJ);
    std::vector<double> dJc(channel_map_.size() * N, 0.0);
    for (std::size_t c = 0; c < channel_map_.size(); ++c) {
      for (std::size_t j = 0; j < N; ++j) dJc[c * N + j] = dJ[channel_map_[c] * N + j];
    }
    chemistry_->add_photolysis_tendency(x, dJc, out);
  }
  for (std::size_t i = 0; i < out.size(); ++i) {
    if (held_[i % S]) out[i] = 0.0;
  }
}

ColumnModel::PhotolysisJacobian ColumnModel::photolysis_jacobian(std::span<const double> x) {
  PhotolysisJacobian pj;
  if (!photo_) return pj;
  const std::size_t S = species_count(), N = cells(), C = channel_map_.size();
  pj.channels = C;
  pj.B.assign(C * N * S, 0.0);
  std::vector<double> unit(C * N, 0.0);
  for (std::size_t c = 0; c < C; ++c) {
    std::fill(unit.begin(), unit.end(), 0.0);
    std::fill(unit.begin() + static_cast<std::ptrdiff_t>(c * N),
              unit.begin() + static_cast<std::ptrdiff_t>((c + 1) * N), 1.0);
    chemistry_->add_photolysis_tendency(x, unit, std::span<double>(pj.B.data() + c * N * S, N * S));
  }
  for (std::size_t i = 0; i < pj.B.size(); ++i) {
    if (held_[i % S]) pj.B[i] = 0.0;
  }
  if (!photo_->two_stream()) {
    pj.reverse = true;
    return pj;
  }
  std::vector<std::size_t> absorbers;
  for (std::size_t a : photo_->absorber_species()) {
    if (!held_[a]) absorbers.push_back(a);
  }
  x_shifted_.assign(x.begin(), x.end());
  J_shifted_.resize(J_.size());
  J_minus_.resize(J_.size());
  for (std::size_t a : absorbers) {
    for (std::size_t k = 0; k < N; ++k) {
      const std::size_t i = k * S + a;
      const double h = 1e-7 * (std::abs(x[i]) + 1.0);
      x_shifted_[i] = x[i] + h;
      photo_->compute(x_shifted_, J_shifted_);
      x_shifted_[i] = x[i] - h;
      photo_->compute(x_shifted_, J_minus_);
      x_shifted_[i] = x[i];
      pj.columns.push_back(i);
      const std::size_t off = pj.dJ.size();
      pj.dJ.resize(off + C * N);
      for (std::size_t c = 0; c < C; ++c) {
        const std::size_t pc = channel_map_[c] * N;
        for (std::size_t j = 0; j < N; ++j) {
          pj.dJ[off + c * N + j] = (J_shifted_[pc + j] - J_minus_[pc + j]) / (2.0 * h);
        }
      }
    }
  }
  return pj;
}

void ColumnModel::add_photolysis_transpose(std::span<const double> x, std::span<const double> u,
                                           std::span<double> out) {
  const std::size_t S = species_count(), N = cells();
  std::vector<double> up(J_.size(), 0.0), tmp(x.size(), 0.0);
  for (std::size_t c = 0; c < channel_map_.size(); ++c) {
    for (std::size_t j = 0; j < N; ++j) up[channel_map_[c] * N + j] += u[c * N + j];
  }
  photo_->add_transpose_product(x, up, tmp);
  for (std::size_t i = 0; i < x.size(); ++i) {
    if (!held_[i % S]) out[i] += tmp[i];
  }
}

ColumnBalance ColumnModel::column_balance(std::span<const double> x, double t,
                                          double absolute_density_cm3, double reference_time_s) {
  const std::size_t S = species_count(), N = cells();
  ColumnBalance out;
  std::vector<double> f(N * S, 0.0), cond(N * S, 0.0), gross(S, 0.0), imbalance(S, 0.0),
      exchange(S, 0.0);
  transport_->add_tendency(x, t, f);
  if (chemistry_) {
    chemistry_->add_tendency(x, t, f);
    chemistry_->condensation_rates(x, cond);
    const Kinetics& kin = chemistry_->kinetics();
    std::vector<double> P(S), L(S), R(kin.reaction_count());
    for (std::size_t j = 0; j < N; ++j) {
      kin.production_loss(j, x.data() + j * S, P.data(), L.data(), R.data());
      for (std::size_t s = 0; s < S; ++s) {
        gross[s] += (P[s] + L[s] + std::abs(cond[j * S + s])) * bg_.grid.width_cm(j);
      }
    }
  }
  BlockTridiagonal jac(N, S);
  evaluate_jacobian(system(), x, t, jac);
  std::vector<double> w(N * S);
  ResidualScale scale;
  scale.absolute_density_cm3 = absolute_density_cm3;
  scale.reference_time_s = reference_time_s;
  residual_weights(jac, x, scale, w);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t s = 0; s < S; ++s) {
      imbalance[s] += std::abs(f[j * S + s]) * bg_.grid.width_cm(j);
      exchange[s] += w[j * S + s] * bg_.grid.width_cm(j);
    }
  }
  const auto ends = transport_->boundary_fluxes(x, t);
  const double height = bg_.grid.edge_cm.back() - bg_.grid.edge_cm.front();
  for (std::size_t s = 0; s < S; ++s) {
    if (held_[s]) continue;
    const double ref = gross[s] + std::abs(ends[s].bottom) + std::abs(ends[s].top) +
                       absolute_density_cm3 * height / reference_time_s;
    const double roundoff = 1e3 * std::numeric_limits<double>::epsilon() * exchange[s];
    const double b = std::max(0.0, imbalance[s] - roundoff) / ref;
    if (!(b <= out.worst)) {  // NaN wins
      out.worst = b;
      out.worst_species = s;
    }
    for (std::size_t j = 0; j < N; ++j) {
      const double mf = x[j * S + s] / bg_.air_density_cm3[j];
      if (!(mf <= out.max_mole_fraction)) {
        out.max_mole_fraction = mf;
        out.max_species = s;
        out.max_cell = j;
      }
    }
  }
  return out;
}

std::vector<ExchangeReport> ColumnModel::exchange_report(std::span<const double> n) const {
  std::vector<ExchangeReport> out;
  if (!chemistry_) return out;
  const std::size_t S = species_count(), N = cells();
  for (const auto& x : chemistry_->exchanges()) {
    ExchangeReport r;
    r.species = x.species;
    r.equation = exchange_equation(names_[x.species], x);
    r.held_profile = x.saturation == CondensationExchange::Saturation::kHeldProfile;
    r.n_eq.assign(N, 0.0);
    r.k.assign(N, 0.0);
    r.reservoir.assign(N, 0);
    out.push_back(std::move(r));
  }
  for (const auto& c : chemistry_->exchange_cells()) {
    ExchangeReport& r = out[c.term];
    r.n_eq[c.cell] = c.n_eq;
    r.k[c.cell] = c.k;
    r.reservoir[c.cell] = c.reservoir ? 1 : 0;
    if (!c.reservoir) continue;
    const double ratio = n[c.cell * S + c.species] / c.n_eq;
    ++r.reservoir_cells;
    if (ratio <= 10.0) ++r.within_10x;
    r.worst_ratio = std::max(r.worst_ratio, ratio);
  }
  return out;
}

ColumnDiagnostics ColumnModel::diagnostics(std::span<const double> n, double t) {
  ColumnDiagnostics d;
  const std::size_t S = species_count(), N = cells();
  const Kinetics& kin = chemistry_->kinetics();
  const Mechanism& mech = kin.mechanism();
  const std::size_t R = kin.reaction_count();
  // Exchanges with a condensed phase and held profiles appear as pseudo-reactions (rate =
  // loss from the gas, negative where it is supplied) so that budgets list every term.
  const auto& terms = chemistry_->exchanges();
  std::vector<double> xrate(terms.size() * N, 0.0);
  chemistry_->exchange_rates(n, xrate);
  const std::size_t RR = R + terms.size();
  d.net_stoichiometry.assign(RR * S, 0.0);
  for (std::size_t r = 0; r < R; ++r) {
    const Reaction& rx = mech.reactions[kin.mechanism_reaction(r)];
    d.equations.push_back(rx.equation);
    d.reaction_ids.push_back(rx.id);
    const std::vector<double> nu = net_stoichiometry(rx, S);
    std::copy(nu.begin(), nu.end(),
              d.net_stoichiometry.begin() + static_cast<std::ptrdiff_t>(r * S));
  }
  for (std::size_t k = 0; k < terms.size(); ++k) {
    d.equations.push_back(exchange_equation(names_[terms[k].species], terms[k]));
    const bool held = terms[k].saturation == CondensationExchange::Saturation::kHeldProfile;
    d.reaction_ids.push_back((held ? "held_" : "exchange_") + names_[terms[k].species]);
    d.net_stoichiometry[(R + k) * S + terms[k].species] = -1.0;
  }
  std::vector<double> rates(N * R);
  chemistry_->reaction_rates(n, rates);
  d.reaction_rate.assign(RR * N, 0.0);
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t r = 0; r < R; ++r) d.reaction_rate[r * N + j] = rates[j * R + r];
    for (std::size_t k = 0; k < terms.size(); ++k)
      d.reaction_rate[(R + k) * N + j] = xrate[k * N + j];
  }
  std::vector<double> fc(N * S, 0.0), ft(N * S, 0.0);
  chemistry_->add_tendency(n, t, fc);
  transport_->add_tendency(n, t, ft);
  d.chemical_tendency.resize(S * N);
  d.transport_tendency.resize(S * N);
  d.net_tendency.resize(S * N);
  for (std::size_t s = 0; s < S; ++s) {
    for (std::size_t j = 0; j < N; ++j) {
      d.chemical_tendency[s * N + j] = fc[j * S + s];
      d.transport_tendency[s * N + j] = ft[j * S + s];
      d.net_tendency[s * N + j] = fc[j * S + s] + ft[j * S + s];
    }
  }
  d.edge_flux.resize(S * (N + 1));
  transport_->edge_fluxes(n, t, d.edge_flux);
  d.eddy_flux.resize(S * (N + 1));
  d.molecular_flux.resize(S * (N + 1));
  for (std::size_t s = 0; s < S; ++s) {
    const EdgeFluxParts p = transport_->edge_flux_parts(n, t, s);
    for (std::size_t e = 0; e <= N; ++e) {
      d.eddy_flux[s * (N + 1) + e] = p.eddy[e];
      d.molecular_flux[s * (N + 1) + e] = p.molecular[e];
    }
  }
  for (const auto& b : transport_->boundary_fluxes(n, t)) {
    d.bottom_flux.push_back(b.bottom);
    d.top_flux.push_back(b.top);
  }
  return d;
}

}  // namespace colchem
