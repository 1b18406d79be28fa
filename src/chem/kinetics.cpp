// Mass-action kinetics R_r = k_r prod n (cm^-3 s^-1) and its analytic Jacobian: equations
// and units in chem/kinetics.hpp.
#include "chem/kinetics.hpp"

#include <algorithm>
#include <stdexcept>

namespace colchem {

Kinetics::Kinetics(std::shared_ptr<const Mechanism> mech, std::span<const std::size_t> modules,
                   std::span<const double> parameters)
    : mech_(std::move(mech)), params_(parameters.begin(), parameters.end()) {
  const Mechanism& m = *mech_;
  S_ = m.species.size();
  if (params_.size() != m.parameters.size()) {
    throw std::invalid_argument("Kinetics: parameter count does not match the mechanism");
  }
  fixed_.resize(S_);
  for (std::size_t s = 0; s < S_; ++s) fixed_[s] = m.species[s].fixed ? 1 : 0;

  std::vector<char> on(m.modules.size(), 0);
  for (auto mod : modules) on.at(mod) = 1;
  for (std::size_t r = 0; r < m.reactions.size(); ++r) {
    if (on[m.reactions[r].module] != 0) reactions_.push_back(r);
  }

  // Occurrences, products and net stoichiometry.
  const std::size_t R = reactions_.size();
  occ_start_.assign(1, 0);
  prod_start_.assign(1, 0);
  std::vector<std::vector<double>> net(R);  // dense per reaction over touched species
  std::vector<std::vector<std::size_t>> touched(R);
  for (std::size_t a = 0; a < R; ++a) {
    const Reaction& rx = m.reactions[reactions_[a]];
    for (const auto& e : rx.reactants) {
      for (int c = 0; c < e.count; ++c) {
        occ_species_.push_back(e.species);
        occ_reaction_.push_back(a);
      }
    }
    for (const auto& e : rx.products) prod_.push_back(e);
    occ_start_.push_back(occ_species_.size());
    prod_start_.push_back(prod_.size());
    const std::vector<double> delta = net_stoichiometry(rx, S_);
    for (std::size_t s = 0; s < S_; ++s) {
      if (delta[s] != 0.0 && fixed_[s] == 0) {
        touched[a].push_back(s);
        net[a].push_back(delta[s]);
      }
    }
  }

  jt_start_.assign(1, 0);
  for (std::size_t a = 0; a < R; ++a) {
    for (std::size_t o = occ_start_[a]; o < occ_start_[a + 1]; ++o) {
      for (std::size_t t = 0; t < touched[a].size(); ++t) {
        jt_dense_.push_back(touched[a][t] * S_ + occ_species_[o]);
        jt_coeff_.push_back(net[a][t]);
      }
      jt_start_.push_back(jt_dense_.size());
    }
  }
  for (auto r : reactions_) laws_.push_back(m.reactions[r].rate);

  // Photolysis channels.
  reaction_channel_.assign(R, npos);
  for (std::size_t a = 0; a < R; ++a) {
    const RateLaw& law = m.reactions[reactions_[a]].rate;
    if (law.form != RateForm::kPhotolysis) continue;
    std::size_t c = channel_index(law.channel);
    if (c == npos) {
      c = channels_.size();
      channels_.push_back(law.channel);
    }
    reaction_channel_[a] = c;
  }
  scale_.assign(R, 1.0);
  rescale();
}

std::size_t Kinetics::channel_index(const std::string& name) const {
  for (std::size_t c = 0; c < channels_.size(); ++c) {
    if (channels_[c] == name) return c;
  }
  return npos;
}

void Kinetics::set_conditions(std::span<const double> temperature_K,
                              std::span<const double> air_cm3,
                              const std::map<std::string, double>& bulk) {
  if (temperature_K.size() != air_cm3.size()) {
    throw std::invalid_argument("Kinetics::set_conditions: T and n_air sizes differ");
  }
  const Mechanism& m = *mech_;
  const std::size_t N = temperature_K.size();
  const std::size_t R = reactions_.size();
  const bool resized = N != levels_;
  levels_ = N;
  M_.resize(R * N);
  std::vector<double>& M = M_;
  for (std::size_t a = 0; a < R; ++a) {
    const Reaction& rx = m.reactions[reactions_[a]];
    // [M] = n_air sum_j eps_j x_j over the bulk gases (eps = 1 unless given).
    const double eff = third_body_weight(m, rx, bulk);
    for (std::size_t j = 0; j < N; ++j) M[a * N + j] = eff * air_cm3[j];
  }
  std::vector<double> old = resized ? std::vector<double>{} : k_base_;
  k_base_.assign(R * N, 0.0);
  colchem::rate_constants(laws_, temperature_K, M, k_base_);
  for (std::size_t a = 0; a < R; ++a) {
    const Reaction& rx = m.reactions[reactions_[a]];
    if (rx.multiplies_third_body()) {
      for (std::size_t j = 0; j < N; ++j) k_base_[a * N + j] *= M[a * N + j];
    }
    // Keep J values already set when only the conditions change.
    if (reaction_channel_[a] != npos && !old.empty()) {
      std::copy_n(old.begin() + static_cast<std::ptrdiff_t>(a * N), N,
                  k_base_.begin() + static_cast<std::ptrdiff_t>(a * N));
    }
  }
  k_.assign(R * N, 0.0);
  if (resized || factor_.size() != R * N) factor_.assign(R * N, 1.0);
  rescale();
}

void Kinetics::set_rate_factors(std::size_t r, std::span<const double> factor) {
  if (r >= reactions_.size() || factor.size() != levels_) {
    throw std::invalid_argument("Kinetics::set_rate_factors: reaction or level count");
  }
  std::copy(factor.begin(), factor.end(),
            factor_.begin() + static_cast<std::ptrdiff_t>(r * levels_));
  rescale();
}

void Kinetics::set_parameter(std::size_t p, double value) {
  params_.at(p) = value;
  rescale();
}

void Kinetics::rescale() {
  const Mechanism& m = *mech_;
  const std::size_t N = levels_;
  for (std::size_t a = 0; a < reactions_.size(); ++a) {
    double s = 1.0;
    for (const auto& f : m.reactions[reactions_[a]].scale) {
      s *= f.complement ? 1.0 - params_[f.parameter] : params_[f.parameter];
    }
    scale_[a] = s;
    for (std::size_t j = 0; j < N; ++j) {
      k_[a * N + j] = s * factor_[a * N + j] * k_base_[a * N + j];
    }
  }
}

void Kinetics::set_photolysis_rate(std::size_t channel, std::size_t level, double J) {
  if (channel >= channels_.size() || level >= levels_) {
    throw std::out_of_range("Kinetics::set_photolysis_rate: channel or level out of range");
  }
  const std::size_t N = levels_;
  for (std::size_t a = 0; a < reactions_.size(); ++a) {
    if (reaction_channel_[a] != channel) continue;
    k_base_[a * N + level] = J;
    k_[a * N + level] = scale_[a] * factor_[a * N + level] * J;
  }
}

void Kinetics::set_photolysis_rates(std::size_t channel, std::span<const double> J) {
  if (J.size() != levels_) {
    throw std::invalid_argument("Kinetics::set_photolysis_rates: one J per level expected");
  }
  for (std::size_t j = 0; j < levels_; ++j) set_photolysis_rate(channel, j, J[j]);
}

void Kinetics::rate_constant_sensitivities(std::span<double> out) const {
  const Mechanism& m = *mech_;
  const std::size_t N = levels_;
  const std::size_t R = reactions_.size();
  if (out.size() != params_.size() * R * N) {
    throw std::invalid_argument("rate_constant_sensitivities: size P * R * levels expected");
  }
  std::fill(out.begin(), out.end(), 0.0);
  for (std::size_t a = 0; a < R; ++a) {
    const auto& scale = m.reactions[reactions_[a]].scale;
    for (std::size_t i = 0; i < scale.size(); ++i) {
      // d/dp prod_m f_m = sum over factors naming p of (+-1) prod_{m != i} f_m.
      double others = scale[i].complement ? -1.0 : 1.0;
      for (std::size_t q = 0; q < scale.size(); ++q) {
        if (q == i) continue;
        others *= scale[q].complement ? 1.0 - params_[scale[q].parameter]
                                      : params_[scale[q].parameter];
      }
      double* o = out.data() + (scale[i].parameter * R + a) * N;
      for (std::size_t j = 0; j < N; ++j) {
        o[j] += others * factor_[a * N + j] * k_base_[a * N + j];
      }
    }
  }
}

double Kinetics::mass_action(std::size_t r, double k, const double* n, std::size_t skip) const {
  double p = k;
  for (std::size_t o = occ_start_[r]; o < occ_start_[r + 1]; ++o) {
    if (o != skip) p *= n[occ_species_[o]];
  }
  return p;
}

void Kinetics::reaction_rates(std::size_t cell, const double* n, double* R) const {
  const std::size_t N = levels_;
  // k (prod n), the product formed by the kernel with k = 1 (the rates as reported since the
  // first version; the tendency multiplies k in first, a difference of round-off only).
  for (std::size_t a = 0; a < reactions_.size(); ++a) R[a] = k_[a * N + cell] * rate_product(a, n);
}

void Kinetics::production_loss(std::size_t cell, const double* n, double* P, double* L,
                               double* R) const {
  reaction_rates(cell, n, R);
  std::fill(P, P + S_, 0.0);
  std::fill(L, L + S_, 0.0);
  for (std::size_t a = 0; a < reactions_.size(); ++a) {
    for (std::size_t o = occ_start_[a]; o < occ_start_[a + 1]; ++o) L[occ_species_[o]] += R[a];
    for (std::size_t i = prod_start_[a]; i < prod_start_[a + 1]; ++i) {
      P[prod_[i].species] += prod_[i].count * R[a];
    }
  }
  for (std::size_t s = 0; s < S_; ++s) {
    if (fixed_[s] != 0) P[s] = L[s] = 0.0;
  }
}

template <class RateConstant>
void Kinetics::accumulate(const double* n, RateConstant k_of, double* tendency) const {
  for (std::size_t a = 0; a < reactions_.size(); ++a) {
    const double k = k_of(a);
    if (k == 0.0) continue;
    const double r = mass_action(a, k, n);
    for (std::size_t o = occ_start_[a]; o < occ_start_[a + 1]; ++o) {
      const std::size_t s = occ_species_[o];
      if (fixed_[s] == 0) tendency[s] -= r;
    }
    for (std::size_t i = prod_start_[a]; i < prod_start_[a + 1]; ++i) {
      const std::size_t s = prod_[i].species;
      if (fixed_[s] == 0) tendency[s] += prod_[i].count * r;
    }
  }
}

void Kinetics::add_tendency(std::size_t cell, const double* n, double* tendency) const {
  const std::size_t N = levels_;
  accumulate(n, [&](std::size_t a) { return k_[a * N + cell]; }, tendency);
}

void Kinetics::add_mass_action(const double* n, std::span<const double> k, double* tendency) const {
  accumulate(
      n, [&](std::size_t a) { return k[a]; }, tendency);
}

void Kinetics::add_photolysis_tendency(const double* n, const double* dJ,
                                       double* tendency) const {
  accumulate(
      n,
      [&](std::size_t a) {
        const std::size_t c = reaction_channel_[a];
        return c == npos ? 0.0 : scale_[a] * dJ[c];
      },
      tendency);
}

void Kinetics::rate_gradient(std::size_t cell, std::size_t r, const double* n, double* dR) const {
  std::fill(dR, dR + S_, 0.0);
  const double k = k_[r * levels_ + cell];
  for (std::size_t o = occ_start_[r]; o < occ_start_[r + 1]; ++o) {
    dR[occ_species_[o]] += partial(o, k, n);
  }
}

double Kinetics::partial(std::size_t occurrence, double k, const double* n) const {
  // d(k prod n)/dn_o: the product over the other occurrences (the product rule).
  return mass_action(occ_reaction_[occurrence], k, n, occurrence);
}

void Kinetics::add_jacobian_dense(std::size_t cell, const double* n, double* block) const {
  const std::size_t N = levels_;
  for (std::size_t o = 0; o < occ_species_.size(); ++o) {
    const double d = partial(o, k_[occ_reaction_[o] * N + cell], n);
    for (std::size_t t = jt_start_[o]; t < jt_start_[o + 1]; ++t) block[jt_dense_[t]] += jt_coeff_[t] * d;
  }
}

}  // namespace colchem
