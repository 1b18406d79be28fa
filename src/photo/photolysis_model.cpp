// Photolysis rates J_c(z) = sum_b sigma_c,b phi_c,b f_c,b F_b(z) (s^-1) from the direct
// beam F_b = F_b,top exp(-tau_s,b) (photons cm^-2 s^-1 per bin; tau_s the slant optical
// depth of the absorbers, Rayleigh gases and aerosol), with the two-stream diffuse field
// when asked: equations, units and published sources (Brasseur and Solomon 2005; Chapman
// 1931; Joseph, Wiscombe and Weinman 1976) in photo/photolysis_model.hpp.
#include "photo/photolysis_model.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <stdexcept>

#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/interp.hpp"
#include "photo/spectral_binning.hpp"

namespace colchem {

namespace {

/// Exact bin average of (lambda_ref / lambda)^e over [a, b].
double power_law_average(double ref, double e, double a, double b) {
  if (e == 0.0) return 1.0;
  if (std::abs(e - 1.0) < 1e-12) return ref * std::log(b / a) / (b - a);
  return std::pow(ref, e) * (std::pow(b, 1.0 - e) - std::pow(a, 1.0 - e)) / ((1.0 - e) * (b - a));
}

/// First and one-past-last bin with a non-zero value in any level.
void nonzero_range(const std::vector<double>& v, std::size_t bins, std::size_t& lo,
                   std::size_t& hi) {
  lo = bins;
  hi = 0;
  for (std::size_t i = 0; i < v.size(); ++i) {
    if (v[i] != 0.0) {
      const std::size_t b = i % bins;
      lo = std::min(lo, b);
      hi = std::max(hi, b + 1);
    }
  }
  if (lo > hi) lo = hi = 0;
}

/// The absorbers' cross sections and the channels' sigma phi f on the bins, for a spec
/// whose parameters are already written in.
struct BinnedData {
  std::vector<std::vector<double>> absorber_sigma;  ///< [j * B + b] or [b], cm^2
  std::vector<bool> absorber_per_level;
  std::vector<std::vector<double>> channel_sigma_phi;  ///< [j * B + b] or [b], cm^2
  std::vector<bool> channel_per_level;
};

/// A table's cross section on the bins: one row per table temperature, times the scale.
/// With several tables, interpolated linearly in T per level (clamped): [j * B + b];
/// otherwise [b].
std::vector<double> bin_tables(const CrossSectionSpec& cs, const Background& bg,
                               std::span<const double> edges, bool& per_level) {
  const std::size_t N = bg.grid.cells();
  const std::size_t B = edges.size() - 1;
  std::vector<std::vector<double>> binned;
  for (const auto& t : cs.tables) {
    binned.push_back(bin_average(t, edges));
    for (auto& v : binned.back()) v *= cs.scale;
  }
  per_level = binned.size() > 1;
  std::vector<double> table(per_level ? N * B : B, 0.0);
  if (per_level) {
    const auto& Ts = cs.temperature_K;
    for (std::size_t j = 0; j < N; ++j) {
      const double T = std::clamp(bg.temperature_K[j], Ts.front(), Ts.back());
      std::size_t k = 1;
      while (k + 1 < Ts.size() && Ts[k] < T) ++k;
      const double w = (T - Ts[k - 1]) / (Ts[k] - Ts[k - 1]);
      for (std::size_t b = 0; b < B; ++b) {
        table[j * B + b] = (1.0 - w) * binned[k - 1][b] + w * binned[k][b];
      }
    }
  } else if (!binned.empty()) {
    table = binned[0];
  }
  return table;
}

/// A channel's quantum yield times its scale and branching on the bins.
std::vector<double> bin_quantum_yield(const ChannelSpec& ch, std::span<const double> edges) {
  const std::size_t B = edges.size() - 1;
  const auto& q = ch.quantum_yield;
  std::vector<double> phi(B, q.value);
  if (q.form == YieldForm::kTable) {
    phi = bin_average_held(q.table, edges);
  } else if (q.form == YieldForm::kStep) {
    for (std::size_t b = 0; b < B; ++b) {
      const double f = fraction_below(edges[b], edges[b + 1], q.step_nm);
      phi[b] = f * q.below_value + (1.0 - f) * q.above_value;
    }
  }
  for (std::size_t b = 0; b < B; ++b) phi[b] *= q.scale * ch.branching;
  return phi;
}

/// A channel's sigma phi f: (table sigma x onset average + bands integrated above the
/// threshold) x phi x branching; `table` is its absorber's tables alone.
std::vector<double> bin_channel(const ChannelSpec& ch, const AbsorberSpec& absorber,
                                const std::vector<double>& table, std::span<const double> edges) {
  const std::size_t B = edges.size() - 1;
  const std::vector<double> phi = bin_quantum_yield(ch, edges);
  std::vector<double> onset(B), bands(B, 0.0);
  for (std::size_t b = 0; b < B; ++b) {
    onset[b] = onset_average(edges[b], edges[b + 1], ch.threshold_nm, ch.onset_width_cm1);
  }
  for (const auto& band : absorber.bands) {
    const auto v = band_onto_bins_above(band, edges, ch.threshold_nm, ch.onset_width_cm1);
    for (std::size_t b = 0; b < B; ++b) bands[b] += v[b];
  }
  std::vector<double> sp = table;
  for (std::size_t i = 0; i < sp.size(); ++i) {
    const std::size_t b = i % B;
    sp[i] = (sp[i] * onset[b] + bands[b]) * phi[b];
  }
  return sp;
}

BinnedData bin_spectral_data(const PhotolysisSpec& spec, const Background& bg,
                             std::span<const double> edges, const SourceLocation& where) {
  const std::size_t B = edges.size() - 1;
  BinnedData out;
  // Absorbers: tables (interpolated in T per level, clamped, times their scale) plus
  // overtone bands. The tables alone are kept for the channels.
  std::vector<std::vector<double>> tables_only;
  for (const auto& ab : spec.absorbers) {
    bool per_level = false;
    std::vector<double> table = bin_tables(ab.cross_section, bg, edges, per_level);
    std::vector<double> bands(B, 0.0);
    for (const auto& band : ab.bands) {
      const auto v = band_onto_bins(band, edges);
      for (std::size_t b = 0; b < B; ++b) bands[b] += v[b];
    }
    std::vector<double> sigma = table;
    for (std::size_t i = 0; i < sigma.size(); ++i) sigma[i] += bands[i % B];
    out.absorber_sigma.push_back(std::move(sigma));
    out.absorber_per_level.push_back(per_level);
    tables_only.push_back(std::move(table));
  }
  for (const auto& ch : spec.channels) {
    std::size_t ai = spec.absorbers.size();
    for (std::size_t i = 0; i < spec.absorbers.size(); ++i) {
      if (spec.absorbers[i].species == ch.absorber) ai = i;
    }
    if (ai == spec.absorbers.size()) {
      throw InputError(ExitCode::kConfig, where, "channels." + ch.name, "a declared absorber",
                       "'" + ch.absorber + "'");
    }
    out.channel_sigma_phi.push_back(bin_channel(ch, spec.absorbers[ai], tables_only[ai], edges));
    out.channel_per_level.push_back(out.absorber_per_level[ai]);
  }
  return out;
}

/// An aerosol optical property (single-scattering albedo or asymmetry) at the cell centres
/// and bins, [j * B + b]: constant, linear in z (end values held), bin-averaged in lambda,
/// or both (bin-averaged per tabulated altitude, then linear in z).
std::vector<double> aerosol_property(const OpticalPropertySpec& p, const AerosolSpec& ae,
                                     const Background& bg, std::span<const double> edges) {
  const std::size_t N = bg.grid.cells();
  const std::size_t B = edges.size() - 1;
  std::vector<double> v(N * B, p.value);
  if (p.form == OpticalPropertyForm::kAltitudeWavelength) {
    const std::size_t K = p.spectra.size();
    std::vector<double> binned(K * B), column(K);  // [k * B + b]
    for (std::size_t k = 0; k < K; ++k) {
      const auto avg = bin_average_held(p.spectra[k], edges);
      std::copy(avg.begin(), avg.end(), binned.begin() + static_cast<std::ptrdiff_t>(k * B));
    }
    for (std::size_t b = 0; b < B; ++b) {
      for (std::size_t k = 0; k < K; ++k) column[k] = binned[k * B + b];
      for (std::size_t j = 0; j < N; ++j) {
        v[j * B + b] = interp_linear_hold(p.grid_altitude_cm, column, bg.grid.center_cm[j]);
      }
    }
    return v;
  }
  const std::vector<double> by_bin = p.form == OpticalPropertyForm::kWavelength
                                         ? bin_average_held(p.by_wavelength, edges)
                                         : std::vector<double>{};
  for (std::size_t j = 0; j < N; ++j) {
    const double at_z =
        p.form == OpticalPropertyForm::kAltitude
            ? interp_linear_hold(ae.altitude_cm, p.by_altitude, bg.grid.center_cm[j])
            : p.value;
    for (std::size_t b = 0; b < B; ++b) v[j * B + b] = by_bin.empty() ? at_z : by_bin[b];
  }
  return v;
}

/// The spherical ray from radius r0 (a cell centre or edge) towards the sun: path[k] for
/// k >= first is the ray's length through cell k over dz_k, and the return value the
/// Chapman factor of the column above the top (slant_path.hpp).
double ray_path_factors(const Background& bg, std::span<const double> dz, double r0, double mu0,
                        double sin_chi, std::size_t first, double H_top, double* path) {
  const std::size_t N = bg.grid.cells();
  const double R = bg.planet.radius_cm;
  const double r_top = R + bg.grid.edge_cm[N];
  const double p2 = std::pow(r0 * sin_chi, 2);
  auto chord = [&](double r) { return std::sqrt(std::max(0.0, r * r - p2)); };
  double below = r0 * mu0;  // distance from the tangent point to r0
  for (std::size_t k = first; k < N; ++k) {
    const double above = chord(R + bg.grid.edge_cm[k + 1]);
    path[k] = (above - below) / dz[k];
    below = above;
  }
  const double sin_top = std::min(1.0, r0 * sin_chi / r_top);
  return chapman_function(r_top / H_top, std::asin(sin_top));
}

}  // namespace

PhotolysisModel::PhotolysisModel(const PhotolysisSpec& spec, const Background& bg,
                                 const std::vector<std::string>& species_names,
                                 std::span<const double> parameters) {
  // 1. Wavelength bins and the stellar photons per bin at the planet.
  levels_ = bg.grid.cells();
  species_ = species_names.size();
  set_bins(spec, bg);
  // 2. The column: air density, cell widths, the column above the top.
  const std::size_t N = levels_;
  air_density_ = bg.air_density_cm3;
  for (std::size_t j = 0; j < N; ++j) dz_.push_back(bg.grid.width_cm(j));
  const double H_top = bg.scale_height_cm[N - 1];
  top_height_ = H_top * std::exp(-0.5 * dz_[N - 1] / H_top);
  // 3. Absorbers and channels binned with the parameters' values written into the data, and
  //    their derivatives with respect to the parameters the data refer to.
  const SourceLocation where{spec.data_source};
  set_absorbers_and_channels(spec, bg, species_names, parameters, where);
  set_parameter_derivatives(spec, bg, parameters, where);
  // 4. Scatterers: Rayleigh gases, aerosols, the surface.
  add_rayleigh(spec, bg, species_names, where);
  set_aerosols(spec, bg);
  if (two_stream_) {
    const auto& rt = spec.radiative_transfer;
    albedo_ = rt.surface_albedo_table.value.empty()
                  ? std::vector<double>(bins_, rt.surface_albedo)
                  : bin_average_held(rt.surface_albedo_table, edges_);
  }
  // 5. Sun positions and slant paths; 6. workspace; 7. prescribed channels.
  set_geometry(spec, bg);
  size_workspace();
  set_prescribed(spec, bg);
}

void PhotolysisModel::set_bins(const PhotolysisSpec& spec, const Background& bg) {
  edges_ = spec.bin_edges_nm.empty() ? default_bin_edges() : spec.bin_edges_nm;
  if (edges_.size() < 2) throw std::invalid_argument("photolysis: fewer than two bin edges");
  bins_ = edges_.size() - 1;
  const std::size_t B = bins_;
  for (std::size_t b = 0; b < B; ++b) {
    widths_.push_back(edges_[b + 1] - edges_[b]);
    centers_.push_back(0.5 * (edges_[b] + edges_[b + 1]));
  }
  // Stellar photons per bin at the planet: F_1au / r^2 times the bin width.
  std::vector<double> per_nm;
  switch (spec.spectrum.form) {
    case SpectrumForm::kTable:
      per_nm = spec.spectrum.energy ? bin_average_photons_from_energy(spec.spectrum.table, edges_)
                                    : bin_average(spec.spectrum.table, edges_);
      break;
    case SpectrumForm::kPlanck:
      per_nm = planck_photon_flux_1au(spec.spectrum.temperature_K, spec.spectrum.radius_cm, edges_);
      break;
  }
  const double r2 = bg.planet.star_distance_au * bg.planet.star_distance_au;
  top_flux_.resize(B);
  for (std::size_t b = 0; b < B; ++b) top_flux_[b] = per_nm[b] * widths_[b] / r2;
}

bool PhotolysisModel::locate(const std::string& name, const std::vector<std::string>& species_names,
                             const Background& bg, Attenuator& a, bool required,
                             const SourceLocation& where) {
  for (std::size_t s = 0; s < species_names.size(); ++s) {
    if (species_names[s] == name) {
      a.species = static_cast<int>(s);
      return true;
    }
  }
  auto it = bg.bulk_mole_fraction.find(name);
  if (it != bg.bulk_mole_fraction.end()) {
    a.bulk_fraction = it->second;
    return true;
  }
  if (required) {
    throw InputError(ExitCode::kConfig, where, "absorbers",
                     "absorber '" + name + "' to be a model species or a bulk gas", "neither",
                     "remove it from the photolysis data or add the species");
  }
  return false;
}

void PhotolysisModel::set_absorbers_and_channels(const PhotolysisSpec& spec, const Background& bg,
                                                 const std::vector<std::string>& species_names,
                                                 std::span<const double> parameters,
                                                 const SourceLocation& where) {
  const std::size_t B = bins_;
  const BinnedData data = bin_spectral_data(with_parameters(spec, parameters), bg, edges_, where);
  for (std::size_t i = 0; i < spec.absorbers.size(); ++i) {
    Attenuator a;
    locate(spec.absorbers[i].species, species_names, bg, a, true, where);
    a.per_level = data.absorber_per_level[i];
    a.sigma = data.absorber_sigma[i];
    nonzero_range(a.sigma, B, a.lo, a.hi);
    attenuators_.push_back(std::move(a));
  }
  for (std::size_t c = 0; c < spec.channels.size(); ++c) {
    Channel ch;
    ch.per_level = data.channel_per_level[c];
    ch.sigma_phi = data.channel_sigma_phi[c];
    nonzero_range(ch.sigma_phi, B, ch.lo, ch.hi);
    chans_.push_back(std::move(ch));
    channel_names_.push_back(spec.channels[c].name);
    products_.push_back(spec.channels[c].products);
  }
}

void PhotolysisModel::set_parameter_derivatives(const PhotolysisSpec& spec, const Background& bg,
                                                std::span<const double> parameters,
                                                const SourceLocation& where) {
  for (const auto& u : spec.parameter_uses) {
    const bool seen =
        std::any_of(derivs_.begin(), derivs_.end(),
                    [&](const ParameterDerivative& d) { return d.parameter == u.parameter; });
    if (seen) continue;
    ParameterDerivative d;
    d.parameter = u.parameter;
    d.value = parameters[u.parameter];
    d.step = kParameterStep * std::max(std::abs(d.value), 1e-3);
    std::vector<double> lo(parameters.begin(), parameters.end());
    std::vector<double> hi = lo;
    lo[u.parameter] -= d.step;
    hi[u.parameter] += d.step;
    const BinnedData m = bin_spectral_data(with_parameters(spec, lo), bg, edges_, where);
    const BinnedData p = bin_spectral_data(with_parameters(spec, hi), bg, edges_, where);
    auto diff = [&](const std::vector<double>& a, const std::vector<double>& b) {
      std::vector<double> out(a.size());
      bool any = false;
      for (std::size_t i = 0; i < a.size(); ++i) {
        out[i] = (b[i] - a[i]) / (2.0 * d.step);
        any = any || out[i] != 0.0;
      }
      return any ? out : std::vector<double>{};
    };
    for (std::size_t i = 0; i < spec.absorbers.size(); ++i) {
      d.dsigma.push_back(diff(m.absorber_sigma[i], p.absorber_sigma[i]));
    }
    for (std::size_t c = 0; c < spec.channels.size(); ++c) {
      d.dsigma_phi.push_back(diff(m.channel_sigma_phi[c], p.channel_sigma_phi[c]));
    }
    derivs_.push_back(std::move(d));
  }
}

void PhotolysisModel::add_rayleigh(const PhotolysisSpec& spec, const Background& bg,
                                   const std::vector<std::string>& species_names,
                                   const SourceLocation& where) {
  // Rayleigh scattering of bulk gases: exact bin average of the lambda^-e law.
  const std::size_t B = bins_;
  for (const auto& r : spec.rayleigh) {
    Attenuator a;
    if (!locate(r.gas, species_names, bg, a, false, where)) continue;
    a.sigma.resize(B);
    for (std::size_t b = 0; b < B; ++b) {
      a.sigma[b] = r.cross_section_cm2 *
                   power_law_average(r.reference_nm, r.exponent, edges_[b], edges_[b + 1]);
    }
    a.lo = 0;
    a.hi = B;
    a.scatters = true;
    attenuators_.push_back(std::move(a));
  }
}

void PhotolysisModel::set_aerosols(const PhotolysisSpec& spec, const Background& bg) {
  // Aerosol: extinction at cell centres (linear in z, end values held) times dz. The
  // two-stream scheme scatters the fraction omega of it and delta-scales the forward peak.
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  two_stream_ = spec.radiative_transfer.scheme == RadiativeTransferScheme::kTwoStream;
  closure_ = spec.radiative_transfer.closure;
  aerosol_dtau_.assign(N * B, 0.0);
  aerosol_sca_.assign(two_stream_ ? N * B : 0, 0.0);
  aerosol_gsca_.assign(two_stream_ ? N * B : 0, 0.0);
  for (const AerosolSpec& ae : spec.aerosols) {  // populations add
    if (!ae.present) continue;
    std::vector<double> omega, asym;
    if (two_stream_) {
      omega = aerosol_property(ae.single_scattering_albedo, ae, bg, edges_);
      asym = aerosol_property(ae.asymmetry, ae, bg, edges_);
    }
    for (std::size_t j = 0; j < N; ++j) {
      const double beta =
          interp_linear_hold(ae.altitude_cm, ae.extinction_cm1, bg.grid.center_cm[j]);
      for (std::size_t b = 0; b < B; ++b) {
        const std::size_t i = j * B + b;
        const double dtau =
            beta * dz_[j] *
            power_law_average(ae.reference_nm, ae.wavelength_exponent, edges_[b], edges_[b + 1]);
        if (!two_stream_) {
          aerosol_dtau_[i] += dtau;
          continue;
        }
        DeltaScaled d{dtau, omega[i], asym[i]};
        if (spec.radiative_transfer.delta_scaling) d = delta_scale(d.dtau, d.omega, d.g);
        aerosol_dtau_[i] += d.dtau;
        aerosol_sca_[i] += d.omega * d.dtau;
        aerosol_gsca_[i] += d.g * d.omega * d.dtau;
      }
    }
  }
}

void PhotolysisModel::set_geometry(const PhotolysisSpec& spec, const Background& bg) {
  const std::size_t N = levels_;
  nodes_ = illumination_nodes(spec.illumination);
  spherical_ = spec.slant_path == SlantPath::kSpherical;
  if (!spherical_) return;
  const double R = bg.planet.radius_cm;
  const double H_top = bg.scale_height_cm[N - 1];
  for (const auto& node : nodes_) {
    const double sin_chi = std::sqrt(std::max(0.0, 1.0 - node.mu0 * node.mu0));
    std::vector<double> pf(N * N, 0.0);
    std::vector<double> tf(N, 0.0);
    for (std::size_t j = 0; j < N; ++j) {
      tf[j] = ray_path_factors(bg, dz_, R + bg.grid.center_cm[j], node.mu0, sin_chi, j, H_top,
                               pf.data() + j * N);
    }
    path_factor_.push_back(std::move(pf));
    top_factor_.push_back(std::move(tf));
    if (!two_stream_) continue;
    // The same from every edge, for the pseudo-spherical source of the diffuse field.
    std::vector<double> epf(N * N + N, 0.0);
    std::vector<double> etf(N + 1, 0.0);
    for (std::size_t e = 0; e <= N; ++e) {
      etf[e] = ray_path_factors(bg, dz_, R + bg.grid.edge_cm[e], node.mu0, sin_chi, e, H_top,
                                epf.data() + e * N);
    }
    edge_path_factor_.push_back(std::move(epf));
    edge_top_factor_.push_back(std::move(etf));
  }
}

void PhotolysisModel::size_workspace() {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  dtau_.assign(N * B, 0.0);
  vtau_.assign(N * B, 0.0);
  tau_top_.assign(B, 0.0);
  beam_.assign(B, 0.0);
  column_.assign(B, 0.0);
  if (!two_stream_) return;
  ray_dtau_.assign(N * B, 0.0);
  ray_top_.assign(B, 0.0);
  const std::size_t LB = (N + 1) * B;  // layers: the column above the top, then the cells
  for (auto* v : {&lay_dtau_, &lay_w_, &lay_g_, &upm_, &downm_, &act_}) v->assign(LB, 0.0);
  for (auto* v : {&up_, &down_}) v->assign(LB + B, 0.0);
  slant_.assign(spherical_ ? LB + B : 0, 0.0);
  diag_up_.assign(N * B, 0.0);
  diag_down_.assign(N * B, 0.0);
  // Size every scratch vector once, so that compute() allocates nothing.
  const std::vector<double> zeros(LB, 0.0), ones(B, 1.0);
  const TwoStreamLayers ly{B, zeros, zeros, zeros, albedo_, closure_};
  two_stream_optics(ly, optics_);
  two_stream_fluxes(ly, optics_, TwoStreamSun{1.0, ones, {}}, ts_ws_,
                    TwoStreamFluxes{up_, down_, upm_, downm_, act_});
}

void PhotolysisModel::set_prescribed(const PhotolysisSpec& spec, const Background& bg) {
  // Prescribed channels: J at the cell centres, fixed for the run.
  const std::size_t N = levels_;
  prescribed_.assign(chans_.size(), {});
  for (const PrescribedJSpec& p : spec.prescribed) {
    if (p.channel_index >= chans_.size()) {
      throw std::invalid_argument("photolysis: prescribed channel index out of range");
    }
    auto& J = prescribed_[p.channel_index];
    if (p.held) {
      J.assign(N, p.value_s1);
      continue;
    }
    std::size_t bad = 0;
    auto at = interpolate(p.altitude_cm, p.j_s1, bg.grid.center_cm, InterpScale::kLinear,
                          Extrapolation::kForbid, &bad);
    if (!at) {
      throw InputError(
          ExitCode::kInputData, SourceLocation{p.source}, "altitude",
          fmt::format("altitudes covering the model's cell centres ({:.6g} to {:.6g} km) for "
                      "the prescribed J of channel '{}'",
                      bg.grid.center_cm.front() / constants::kCmPerKm,
                      bg.grid.center_cm.back() / constants::kCmPerKm, p.channel),
          fmt::format("{:.6g} to {:.6g} km (cell centre {:.6g} km outside)",
                      p.altitude_cm.front() / constants::kCmPerKm,
                      p.altitude_cm.back() / constants::kCmPerKm,
                      bg.grid.center_cm[bad] / constants::kCmPerKm));
    }
    J = std::move(*at);
  }
}

std::vector<std::size_t> PhotolysisModel::absorber_species() const {
  std::vector<std::size_t> out;
  for (const auto& a : attenuators_) {
    if (a.species >= 0) out.push_back(static_cast<std::size_t>(a.species));
  }
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

int PhotolysisModel::channel_index(const std::string& name) const {
  for (std::size_t c = 0; c < channel_names_.size(); ++c) {
    if (channel_names_[c] == name) return static_cast<int>(c);
  }
  return -1;
}

double PhotolysisModel::density(const Attenuator& a, std::span<const double> n,
                                std::size_t j) const {
  // Negative densities (undershoots of a solver iterate) must not amplify the beam.
  if (a.species >= 0) return std::max(0.0, n[j * species_ + static_cast<std::size_t>(a.species)]);
  return a.bulk_fraction * air_density_[j];
}

void PhotolysisModel::compute(std::span<const double> n, std::span<double> J,
                              std::span<double> actinic_flux) {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  if (n.size() != N * species_ || J.size() != chans_.size() * N ||
      (!actinic_flux.empty() && actinic_flux.size() != N * B)) {
    throw std::invalid_argument("PhotolysisModel::compute: span sizes do not match the model");
  }

  compute_depths(n);

  // 2. Attenuated beam and J for every sun position, weighted into the average.
  std::fill(J.begin(), J.end(), 0.0);
  std::fill(actinic_flux.begin(), actinic_flux.end(), 0.0);
  const bool diagnose = two_stream_ && !actinic_flux.empty();
  if (diagnose) {
    std::fill(diag_up_.begin(), diag_up_.end(), 0.0);
    std::fill(diag_down_.begin(), diag_down_.end(), 0.0);
  }
  if (two_stream_) layer_optics();
  for (std::size_t k = 0; k < nodes_.size(); ++k) {
    const double w = nodes_[k].weight;
    if (two_stream_) diffuse_field(k, diagnose ? w : 0.0);
    for (std::size_t j = 0; j < N; ++j) {
      if (two_stream_ && !spherical_) {  // the two-stream solve's actinic flux (direct + diffuse)
        std::copy_n(act_.data() + (N - j) * B, B, beam_.data());
      } else {
        slant_depth(k, j, dtau_, tau_top_, vtau_, beam_);
        for (std::size_t b = 0; b < B; ++b) beam_[b] = top_flux_[b] * std::exp(-beam_[b]);
      }
      if (two_stream_ && spherical_) {  // the actinic flux: direct beam plus 2 (F+ + F-)
        const double* up = upm_.data() + (N - j) * B;
        const double* down = downm_.data() + (N - j) * B;
        for (std::size_t b = 0; b < B; ++b) beam_[b] += 2.0 * (up[b] + down[b]);
      }
      for (std::size_t c = 0; c < chans_.size(); ++c) {
        const Channel& ch = chans_[c];
        const double* sp = ch.sigma_phi.data() + (ch.per_level ? j * B : 0);
        double sum = 0.0;
        for (std::size_t b = ch.lo; b < ch.hi; ++b) sum += sp[b] * beam_[b];
        J[c * N + j] += w * sum;
      }
      if (!actinic_flux.empty()) {
        double* F = actinic_flux.data() + j * B;
        for (std::size_t b = 0; b < B; ++b) F[b] += w * beam_[b] / widths_[b];
      }
    }
  }
  apply_prescribed(J);
}

void PhotolysisModel::apply_prescribed(std::span<double> J) const {
  const std::size_t N = levels_;
  for (std::size_t c = 0; c < prescribed_.size(); ++c) {
    if (!prescribed_[c].empty())
      std::copy(prescribed_[c].begin(), prescribed_[c].end(),
                J.begin() + static_cast<std::ptrdiff_t>(c * N));
  }
}

bool PhotolysisModel::prescribed(std::size_t channel) const {
  return channel < prescribed_.size() && !prescribed_[channel].empty();
}

void PhotolysisModel::add_transpose_product(std::span<const double> n, std::span<const double> u,
                                            std::span<double> out) {
  if (two_stream_) {
    throw std::logic_error("PhotolysisModel::add_transpose_product: direct beam only");
  }
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  if (n.size() != N * species_ || u.size() != chans_.size() * N || out.size() != n.size()) {
    throw std::invalid_argument("PhotolysisModel::add_transpose_product: span sizes");
  }
  compute_depths(n);
  // Reverse sweep of compute(): g_dtau[j*B + b] = d(u.J)/d dtau_j,b, g_top[b] likewise for
  // the column above the top; J_c(z_i) = sum_k w_k sum_b sp_c,b(i) F_b exp(-tau_s,k(i, b)).
  std::vector<double> g_dtau(N * B, 0.0), g_top(B, 0.0), g_slant(B), g_v(N * B, 0.0);
  for (std::size_t k = 0; k < nodes_.size(); ++k) {
    const double w = nodes_[k].weight;
    for (std::size_t i = 0; i < N; ++i) {
      slant_depth(k, i, dtau_, tau_top_, vtau_, beam_);
      std::fill(g_slant.begin(), g_slant.end(), 0.0);
      for (std::size_t c = 0; c < chans_.size(); ++c) {
        const double uc = u[c * N + i];
        if (uc == 0.0 || prescribed(c)) continue;  // a prescribed J does not depend on n
        const Channel& ch = chans_[c];
        const double* sp = ch.sigma_phi.data() + (ch.per_level ? i * B : 0);
        for (std::size_t b = ch.lo; b < ch.hi; ++b) g_slant[b] += uc * sp[b];
      }
      // d/d tau_s of w F exp(-tau_s) sum_c u sp.
      for (std::size_t b = 0; b < B; ++b) {
        g_slant[b] *= -w * top_flux_[b] * std::exp(-beam_[b]);
      }
      if (!spherical_) {  // tau_s = vtau / mu0
        const double inv_mu = 1.0 / nodes_[k].mu0;
        for (std::size_t b = 0; b < B; ++b) g_v[i * B + b] += g_slant[b] * inv_mu;
      } else {  // tau_s = tau_top tf + sum_{kk >= i} pf dtau_kk
        const double tf = top_factor_[k][i];
        const double* pf = path_factor_[k].data() + i * N;
        for (std::size_t b = 0; b < B; ++b) g_top[b] += g_slant[b] * tf;
        for (std::size_t kk = i; kk < N; ++kk) {
          double* g = g_dtau.data() + kk * B;
          for (std::size_t b = 0; b < B; ++b) g[b] += pf[kk] * g_slant[b];
        }
      }
    }
  }
  if (!spherical_) {
    // vtau_i = tau_top + sum_{kk > i} dtau_kk + dtau_i / 2 (vertical_depth).
    std::vector<double> above(B, 0.0);  // sum of g_v over the cells below kk
    for (std::size_t kk = 0; kk < N; ++kk) {
      for (std::size_t b = 0; b < B; ++b) {
        g_dtau[kk * B + b] += above[b] + 0.5 * g_v[kk * B + b];
        above[b] += g_v[kk * B + b];
      }
    }
    for (std::size_t b = 0; b < B; ++b) g_top[b] += above[b];
  }
  // dtau_j,b = sum_a sigma_a,b(j) n_a,j dz_j (+ aerosol); tau_top += sigma(N-1) n_a,N-1 H_top.
  for (const auto& a : attenuators_) {
    if (a.species < 0) continue;
    const auto s = static_cast<std::size_t>(a.species);
    for (std::size_t j = 0; j < N; ++j) {
      if (!(n[j * species_ + s] > 0.0)) continue;  // density() floors at 0
      const double* sig = a.sigma.data() + (a.per_level ? j * B : 0);
      double sum = 0.0;
      for (std::size_t b = a.lo; b < a.hi; ++b) sum += sig[b] * g_dtau[j * B + b];
      out[j * species_ + s] += sum * dz_[j];
      if (j + 1 == N) {
        double top = 0.0;
        for (std::size_t b = a.lo; b < a.hi; ++b) top += sig[b] * g_top[b];
        out[j * species_ + s] += top * top_height_;
      }
    }
  }
}

void PhotolysisModel::compute_depths(std::span<const double> n) {
  // 1. Optical thickness of every cell and of the column above the top, per bin.
  std::copy(aerosol_dtau_.begin(), aerosol_dtau_.end(), dtau_.begin());
  std::fill(tau_top_.begin(), tau_top_.end(), 0.0);
  std::fill(ray_dtau_.begin(), ray_dtau_.end(), 0.0);
  std::fill(ray_top_.begin(), ray_top_.end(), 0.0);
  for (const auto& a : attenuators_) {
    add_thickness(a, a.sigma, n, dtau_, tau_top_);
    if (two_stream_ && a.scatters) add_thickness(a, a.sigma, n, ray_dtau_, ray_top_);
  }
  // (the two-stream solve carries its own beam)
  if (!spherical_ && !two_stream_) vertical_depth(dtau_, tau_top_, vtau_);
}

void PhotolysisModel::add_thickness(const Attenuator& a, const std::vector<double>& sigma,
                                    std::span<const double> n, std::vector<double>& dtau,
                                    std::vector<double>& tau_top) const {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  for (std::size_t j = 0; j < N; ++j) {
    const double col = density(a, n, j) * dz_[j];
    if (col == 0.0) continue;
    const double* s = sigma.data() + (a.per_level ? j * B : 0);
    double* d = dtau.data() + j * B;
    for (std::size_t b = a.lo; b < a.hi; ++b) d[b] += s[b] * col;
  }
  const double col_top = density(a, n, N - 1) * top_height_;
  const double* s = sigma.data() + (a.per_level ? (N - 1) * B : 0);
  for (std::size_t b = a.lo; b < a.hi; ++b) tau_top[b] += s[b] * col_top;
}

void PhotolysisModel::vertical_depth(const std::vector<double>& dtau,
                                     const std::vector<double>& tau_top,
                                     std::vector<double>& vtau) {
  // Vertical optical depth at cell centres: half the own cell plus everything above.
  const std::size_t B = bins_;
  std::copy(tau_top.begin(), tau_top.end(), column_.begin());
  for (std::size_t jj = levels_; jj-- > 0;) {
    for (std::size_t b = 0; b < B; ++b) {
      const double d = dtau[jj * B + b];
      vtau[jj * B + b] = column_[b] + 0.5 * d;
      column_[b] += d;
    }
  }
}

void PhotolysisModel::slant_depth(std::size_t node, std::size_t j, const std::vector<double>& dtau,
                                  const std::vector<double>& tau_top,
                                  const std::vector<double>& vtau, std::vector<double>& out) const {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  if (!spherical_) {
    const double inv_mu = 1.0 / nodes_[node].mu0;
    const double* v = vtau.data() + j * B;
    for (std::size_t b = 0; b < B; ++b) out[b] = v[b] * inv_mu;
    return;
  }
  const double tf = top_factor_[node][j];
  for (std::size_t b = 0; b < B; ++b) out[b] = tau_top[b] * tf;
  const double* pf = path_factor_[node].data() + j * N;
  for (std::size_t kk = j; kk < N; ++kk) {
    const double f = pf[kk];
    const double* d = dtau.data() + kk * B;
    for (std::size_t b = 0; b < B; ++b) out[b] += f * d[b];
  }
}

bool PhotolysisModel::acts_on(std::size_t parameter) const {
  return std::any_of(derivs_.begin(), derivs_.end(),
                     [&](const ParameterDerivative& d) { return d.parameter == parameter; });
}

void PhotolysisModel::parameter_derivative(std::size_t parameter, std::span<const double> n,
                                           std::span<double> dJ) {
  computed_parameter_derivative(parameter, n, dJ);
  // A prescribed J does not depend on the photolysis data's parameters.
  const std::size_t N = levels_;
  for (std::size_t c = 0; c < prescribed_.size(); ++c) {
    if (prescribed(c)) std::fill_n(dJ.begin() + static_cast<std::ptrdiff_t>(c * N), N, 0.0);
  }
}

void PhotolysisModel::computed_parameter_derivative(std::size_t parameter,
                                                    std::span<const double> n,
                                                    std::span<double> dJ) {
  const std::size_t N = levels_;
  if (dJ.size() != chans_.size() * N) {
    throw std::invalid_argument("PhotolysisModel::parameter_derivative: dJ has the wrong size");
  }
  std::fill(dJ.begin(), dJ.end(), 0.0);
  const auto it = std::find_if(derivs_.begin(), derivs_.end(), [&](const ParameterDerivative& d) {
    return d.parameter == parameter;
  });
  if (it == derivs_.end()) return;  // the parameter does not act on photolysis
  if (two_stream_) {
    two_stream_parameter_derivative(*it, n, dJ);
  } else {
    direct_beam_parameter_derivative(*it, n, dJ);
  }
}

void PhotolysisModel::two_stream_parameter_derivative(const ParameterDerivative& d,
                                                      std::span<const double> n,
                                                      std::span<double> dJ) {
  // Central difference of compute() along the binned data's derivative (the diffuse field
  // depends on every optical depth; see the header).
  const std::size_t B = bins_;
  const double h = d.step;
  std::vector<double> Jp(dJ.size()), Jm(dJ.size());
  for (const double sign : {1.0, -1.0}) {
    std::vector<std::vector<double>> saved_a, saved_c;
    for (std::size_t i = 0; i < d.dsigma.size(); ++i) {
      saved_a.push_back(attenuators_[i].sigma);
      if (d.dsigma[i].empty()) continue;
      for (std::size_t q = 0; q < d.dsigma[i].size(); ++q)
        attenuators_[i].sigma[q] += sign * h * d.dsigma[i][q];
    }
    for (std::size_t c = 0; c < chans_.size(); ++c) {
      saved_c.push_back(chans_[c].sigma_phi);
      if (d.dsigma_phi[c].empty()) continue;
      for (std::size_t q = 0; q < d.dsigma_phi[c].size(); ++q)
        chans_[c].sigma_phi[q] += sign * h * d.dsigma_phi[c][q];
    }
    // The perturbed data may be non-zero in bins the stored ranges skip.
    std::vector<std::size_t> ranges;
    for (auto& a : attenuators_) {
      ranges.insert(ranges.end(), {a.lo, a.hi});
      a.lo = 0;
      a.hi = B;
    }
    for (auto& c : chans_) {
      ranges.insert(ranges.end(), {c.lo, c.hi});
      c.lo = 0;
      c.hi = B;
    }
    compute(n, sign > 0 ? std::span<double>{Jp} : std::span<double>{Jm});
    std::size_t r = 0;
    for (std::size_t i = 0; i < attenuators_.size(); ++i, r += 2) {
      if (i < saved_a.size()) attenuators_[i].sigma = std::move(saved_a[i]);
      attenuators_[i].lo = ranges[r];
      attenuators_[i].hi = ranges[r + 1];
    }
    for (std::size_t c = 0; c < chans_.size(); ++c, r += 2) {
      chans_[c].sigma_phi = std::move(saved_c[c]);
      chans_[c].lo = ranges[r];
      chans_[c].hi = ranges[r + 1];
    }
  }
  for (std::size_t i = 0; i < dJ.size(); ++i) dJ[i] = (Jp[i] - Jm[i]) / (2.0 * h);
}

void PhotolysisModel::direct_beam_parameter_derivative(const ParameterDerivative& d,
                                                       std::span<const double> n,
                                                       std::span<double> dJ) {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  // Direct beam: J_c = sum_k w_k sum_b s_cb F_b exp(-tau_s,b), so
  //   dJ_c/dp = sum_k w_k sum_b (ds_cb/dp - s_cb dtau_s,b/dp) F_b exp(-tau_s,b),
  // with dtau_s/dp the same path integral of the absorbers' dsigma/dp n.
  compute_depths(n);
  std::vector<double> ddtau(N * B, 0.0), dtop(B, 0.0), dvtau(N * B, 0.0), dslant(B);
  for (std::size_t i = 0; i < d.dsigma.size(); ++i) {
    if (d.dsigma[i].empty()) continue;
    Attenuator a = attenuators_[i];
    a.lo = 0;
    a.hi = B;
    add_thickness(a, d.dsigma[i], n, ddtau, dtop);
  }
  if (!spherical_) vertical_depth(ddtau, dtop, dvtau);
  for (std::size_t k = 0; k < nodes_.size(); ++k) {
    const double w = nodes_[k].weight;
    for (std::size_t j = 0; j < N; ++j) {
      slant_depth(k, j, dtau_, tau_top_, vtau_, beam_);
      slant_depth(k, j, ddtau, dtop, dvtau, dslant);
      for (std::size_t b = 0; b < B; ++b) beam_[b] = top_flux_[b] * std::exp(-beam_[b]);
      for (std::size_t c = 0; c < chans_.size(); ++c) {
        const Channel& ch = chans_[c];
        const std::size_t off = ch.per_level ? j * B : 0;
        const double* sp = ch.sigma_phi.data() + off;
        const double* dsp = d.dsigma_phi[c].empty() ? nullptr : d.dsigma_phi[c].data() + off;
        double sum = 0.0;
        for (std::size_t b = 0; b < B; ++b) {
          sum += ((dsp ? dsp[b] : 0.0) - sp[b] * dslant[b]) * beam_[b];
        }
        dJ[c * N + j] += w * sum;
      }
    }
  }
}

void PhotolysisModel::layer_optics() {
  // Layer 0: the column above the top (gases and Rayleigh, no aerosol); layer i: cell N - i.
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  auto set = [&](std::size_t i, double dtau, double sca, double gsca) {
    lay_dtau_[i] = dtau;
    // |gsca| <= sca <= dtau, so the floors only turn 0/0 into 0 (and keep the loop free of
    // branches).
    lay_w_[i] = sca / std::max(dtau, 1e-300);
    lay_g_[i] = gsca / std::max(sca, 1e-300);
  };
  for (std::size_t b = 0; b < B; ++b) set(b, tau_top_[b], ray_top_[b], 0.0);
  const bool aerosol = !aerosol_sca_.empty();
  for (std::size_t j = 0; j < N; ++j) {
    const std::size_t layer = (N - j) * B;
    for (std::size_t b = 0; b < B; ++b) {
      const std::size_t jb = j * B + b;
      set(layer + b, dtau_[jb], ray_dtau_[jb] + (aerosol ? aerosol_sca_[jb] : 0.0),
          aerosol ? aerosol_gsca_[jb] : 0.0);
    }
  }
  two_stream_optics(TwoStreamLayers{B, lay_dtau_, lay_w_, lay_g_, albedo_, closure_}, optics_);
}

void PhotolysisModel::diffuse_field(std::size_t node, double diag_weight) {
  const std::size_t N = levels_;
  const std::size_t B = bins_;
  if (spherical_) {  // slant optical depth of the beam at every layer edge (model edge N + 1 - i)
    std::fill_n(slant_.begin(), B, 0.0);
    for (std::size_t e = 0; e <= N; ++e) {
      double* out = slant_.data() + (N + 1 - e) * B;
      const double tf = edge_top_factor_[node][e];
      for (std::size_t b = 0; b < B; ++b) out[b] = tau_top_[b] * tf;
      const double* pf = edge_path_factor_[node].data() + e * N;
      for (std::size_t kk = e; kk < N; ++kk) {
        const double f = pf[kk];
        const double* d = dtau_.data() + kk * B;
        for (std::size_t b = 0; b < B; ++b) out[b] += f * d[b];
      }
    }
  }
  // Plane-parallel: the solve's actinic flux is used (its direct beam is the model's to
  // round-off); spherical: its diffuse part is added to the direct beam of each centre's ray.
  two_stream_fluxes(
      TwoStreamLayers{B, lay_dtau_, lay_w_, lay_g_, albedo_, closure_}, optics_,
      TwoStreamSun{nodes_[node].mu0, top_flux_,
                   spherical_ ? std::span<const double>{slant_} : std::span<const double>{}},
      ts_ws_,
      TwoStreamFluxes{up_, down_, upm_, downm_,
                      spherical_ ? std::span<double>{} : std::span<double>{act_}});
  if (diag_weight > 0.0) {
    for (std::size_t j = 0; j < N; ++j) {
      for (std::size_t b = 0; b < B; ++b) {
        const std::size_t i = (N - j) * B + b;
        diag_up_[j * B + b] += diag_weight * upm_[i] / widths_[b];
        diag_down_[j * B + b] += diag_weight * downm_[i] / widths_[b];
      }
    }
  }
}

}  // namespace colchem
