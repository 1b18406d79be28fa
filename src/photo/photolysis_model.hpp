// Photolysis rates from the attenuated direct stellar beam.
//
//   F(lambda, z) = F_1au(lambda) / r^2 exp(-tau_s(lambda, z))           (direct beam)
//   tau_s = slant path through sum_i sigma_i(lambda, T) n_i + sigma_R n_gas + beta_aer
//   J_c(z) = sum_b sigma_c,b phi_c,b f_c,b F_b(z)     (F_b photons cm^-2 s^-1 in bin b)
// (Brasseur and Solomon 2005, Aeronomy of the Middle Atmosphere, ch. 4; Chapman 1931).
// Column discretisation (cell-centred): the vertical optical depth at the centre of cell j
// is half the own cell's optical thickness plus all cells above plus the column above the
// model top, n_top,edge H_top, with n_top,edge = n_N exp(-dz_N / (2 H_N)) and H_N the air
// scale height of the top cell (exact for a species in hydrostatic mixing). This is the
// midpoint rule on each cell: second order in dz (tests/photo/test_chapman.cpp).
// Plane-parallel slant: tau_s = tau / mu0. Spherical: the exact ray through the grid's
// spherical shells and the Chapman function Ch(X_top, chi_top) for the column above the top.
// f_c,b is the fraction of bin b short of the channel's threshold wavelength.
// Units: cm^-3, cm^2, s^-1, nm.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "photo/photolysis_spec.hpp"
#include "photo/slant_path.hpp"

namespace colchem {

class PhotolysisModel {
 public:
  /// Bins all data onto the spectral grid and precomputes the slant-path geometry.
  /// Absorbers are looked up in `species_names`; one that is not a model species but a
  /// bulk gas of the background uses its bulk mole fraction times the air density; any
  /// other is an InputError. Rayleigh gases absent from both contribute nothing.
  PhotolysisModel(const PhotolysisSpec& spec, const Background& bg,
                  const std::vector<std::string>& species_names);

  /// Channel names in order (J is laid out channel-major in this order).
  [[nodiscard]] const std::vector<std::string>& channels() const { return channel_names_; }
  [[nodiscard]] const std::vector<std::string>& channel_products() const { return products_; }
  [[nodiscard]] std::size_t levels() const { return levels_; }
  [[nodiscard]] std::size_t bins() const { return bins_; }
  [[nodiscard]] const std::vector<double>& bin_edges_nm() const { return edges_; }
  /// Photons cm^-2 s^-1 per bin arriving at the top of the atmosphere (at the planet).
  [[nodiscard]] const std::vector<double>& top_photons_per_bin() const { return top_flux_; }
  /// Index of a channel, or -1.
  [[nodiscard]] int channel_index(const std::string& name) const;

  /// J[c * N + j] (s^-1) for densities n[j * S + s] (cm^-3; S = species count given at
  /// construction). When `actinic_flux` is not empty it receives the illumination-averaged
  /// direct-beam flux F[j * B + b] in photons cm^-2 s^-1 nm^-1. Allocates nothing; not
  /// safe to call concurrently on one object (it reuses its workspace).
  void compute(std::span<const double> n, std::span<double> J,
               std::span<double> actinic_flux = {});

 private:
  struct Attenuator {  // an absorber's or a Rayleigh gas's extinction
    int species = -1;            ///< index into n, or -1 for a bulk gas
    double bulk_fraction = 0.0;  ///< used when species < 0
    bool per_level = false;      ///< sigma stored per level (temperature-dependent)
    std::vector<double> sigma;   ///< [j * B + b] or [b], cm^2
    std::size_t lo = 0, hi = 0;  ///< bins where sigma may be non-zero
  };
  struct Channel {
    bool per_level = false;
    std::vector<double> sigma_phi;  ///< [j * B + b] or [b], cm^2 (yield, threshold included)
    std::size_t lo = 0, hi = 0;
  };

  [[nodiscard]] double density(const Attenuator& a, std::span<const double> n,
                               std::size_t j) const;

  std::size_t levels_ = 0, bins_ = 0, species_ = 0;
  std::vector<double> edges_, widths_, centers_;
  std::vector<double> top_flux_;  ///< photons cm^-2 s^-1 per bin at the planet
  std::vector<Attenuator> attenuators_;
  std::vector<Channel> chans_;
  std::vector<std::string> channel_names_, products_;
  std::vector<double> air_density_, dz_, top_column_factor_;
  double top_height_ = 0.0;  ///< n_top,edge H_top / n_N (cm)
  std::vector<double> aerosol_dtau_;  ///< [j * B + b]
  std::vector<IlluminationNode> nodes_;
  bool spherical_ = false;
  /// Spherical: air-mass factors path_k / dz_k for the ray from centre j, [node][j * N + k],
  /// and Ch(X_top, chi_top) for the column above the top, [node][j].
  std::vector<std::vector<double>> path_factor_, top_factor_;
  // Workspace (sized at construction).
  std::vector<double> dtau_, vtau_, tau_top_, beam_;
};

}  // namespace colchem
