// Per-species column settings as typed values: initial profiles n = f n_a (cm^-3, f
// interpolated log-linearly), boundary conditions, and injections, a global amount spread
// over the planet's surface, N = amount / (4 pi R^2) (cm^-2), then uniformly in n over
// [bottom, top]: see transport/column_species.hpp.
#include "transport/column_species.hpp"

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/interp.hpp"

namespace colchem {

const SpeciesColumnSettings* ColumnSpeciesSpec::find(const std::string& name) const {
  for (const auto& s : species) {
    if (s.name == name) return &s;
  }
  return nullptr;
}

void apply_species_settings(const ColumnSpeciesSpec& spec, std::vector<TransportSpecies>& sp) {
  for (auto& s : sp) {
    if (!spec.molecular_diffusion) s.diffusion_A = 0.0;  // b = 0: no molecular or thermal flux
    const SpeciesColumnSettings* c = spec.find(s.name);
    if (c == nullptr) continue;
    if (c->fixed) s.fixed = *c->fixed;
    if (c->diffusion_A) s.diffusion_A = *c->diffusion_A;
    if (c->diffusion_s) s.diffusion_s = *c->diffusion_s;
    if (c->thermal_diffusion) s.thermal_diffusion = *c->thermal_diffusion;
  }
}

std::vector<SpeciesBoundaries> boundaries_for(const ColumnSpeciesSpec& spec,
                                              const std::vector<TransportSpecies>& sp) {
  std::vector<SpeciesBoundaries> out(sp.size());
  for (std::size_t s = 0; s < sp.size(); ++s) {
    if (const SpeciesColumnSettings* c = spec.find(sp[s].name)) out[s] = c->boundaries;
  }
  return out;
}

namespace {
std::vector<double> profile_at_centres(const InitialProfile& p, const Grid& grid,
                                       const std::string& name) {
  const std::size_t n = grid.cells();
  if (!p.from_table) return std::vector<double>(n, p.mixing_ratio);
  std::size_t bad = 0;
  auto v = interpolate(p.table.altitude_cm, p.table.value, grid.center_cm, InterpScale::kLog,
                       p.extrapolation, &bad);
  if (!v) {
    throw std::out_of_range("initial profile of " + name + ": altitude " +
                            std::to_string(grid.center_cm[bad] / constants::kCmPerKm) +
                            " km lies outside the table " + p.table.source);
  }
  return *v;
}
}  // namespace

std::vector<double> initial_state(const ColumnSpeciesSpec& spec, const Background& bg,
                                  const std::vector<TransportSpecies>& sp,
                                  const std::vector<double>& fixed_mixing_ratio) {
  const std::size_t N = bg.grid.cells();
  const std::size_t S = sp.size();
  if (fixed_mixing_ratio.size() != S) {
    throw std::invalid_argument("initial_state: one fixed mixing ratio per species expected");
  }
  std::vector<double> n(N * S, 0.0);
  const std::vector<double> fallback = profile_at_centres(spec.default_initial, bg.grid, "default");
  for (std::size_t s = 0; s < S; ++s) {
    std::vector<double> f;
    if (sp[s].fixed) {
      f.assign(N, fixed_mixing_ratio[s]);
    } else if (const SpeciesColumnSettings* c = spec.find(sp[s].name); c && c->initial) {
      f = profile_at_centres(*c->initial, bg.grid, sp[s].name);
    } else {
      f = fallback;
    }
    for (std::size_t j = 0; j < N; ++j) n[j * S + s] = f[j] * bg.air_density_cm3[j];
  }
  return n;
}

std::vector<Injection> resolve_injections(const ColumnSpeciesSpec& spec, const Background& bg,
                                          const std::vector<TransportSpecies>& sp) {
  std::vector<Injection> out;
  const double R = bg.planet.radius_cm;
  const double area = 4.0 * constants::kPi * R * R;
  for (const auto& inj : spec.injections) {
    auto it = std::find_if(sp.begin(), sp.end(),
                           [&](const TransportSpecies& t) { return t.name == inj.species; });
    if (it == sp.end()) {
      throw InputError(ExitCode::kConfig, inj.where, "injections", "a species of the mechanism",
                       "unknown species '" + inj.species + "'");
    }
    const double lo = bg.grid.edge_cm.front();
    const double hi = bg.grid.edge_cm.back();
    if (!(inj.top_cm > lo && inj.bottom_cm < hi)) {
      auto km = [](double cm) { return std::to_string(cm / constants::kCmPerKm); };
      throw InputError(ExitCode::kConfig, inj.where, "injections",
                       "an altitude range overlapping the column (" + km(lo) + " to " + km(hi) +
                           " km)",
                       km(inj.bottom_cm) + " to " + km(inj.top_cm) + " km");
    }
    Injection r;
    r.species = static_cast<std::size_t>(it - sp.begin());
    r.time_s = inj.time_s;
    r.bottom_cm = inj.bottom_cm;
    r.top_cm = inj.top_cm;
    switch (inj.amount_kind) {
      case InjectionAmount::kColumn:
        r.column_cm2 = inj.amount;
        break;
      case InjectionAmount::kGlobalMolecules:
        r.column_cm2 = inj.amount / area;
        break;
      case InjectionAmount::kGlobalMass:
        r.column_cm2 = inj.amount / it->mass_g / area;
        break;
    }
    out.push_back(r);
  }
  return out;
}

std::size_t apply_injections(const std::vector<Injection>& injections, const Grid& grid,
                             std::size_t n_species, double t_from, double t_to,
                             std::span<double> n) {
  std::size_t applied = 0;
  const std::size_t N = grid.cells();
  for (const auto& inj : injections) {
    if (!(inj.time_s >= t_from && inj.time_s < t_to)) continue;
    // Clip the range to the column so that the whole amount lands inside it.
    const double lo = std::max(inj.bottom_cm, grid.edge_cm.front());
    const double hi = std::min(inj.top_cm, grid.edge_cm.back());
    if (!(hi > lo)) continue;
    const double dn = inj.column_cm2 / (hi - lo);
    for (std::size_t j = 0; j < N; ++j) {
      const double overlap = std::min(hi, grid.edge_cm[j + 1]) - std::max(lo, grid.edge_cm[j]);
      if (overlap > 0.0) n[j * n_species + inj.species] += dn * overlap / grid.width_cm(j);
    }
    ++applied;
  }
  return applied;
}

}  // namespace colchem
