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
// f_c,b is the bin average of the near-threshold onset rho (for tables: the fraction of bin b
// short of the channel's threshold wavelength when the onset width is 0); overtone bands
// enter sigma_c,b integrated with rho above the threshold only (spectral_binning.hpp).
// Named parameters (photolysis_spec.hpp, ParameterUse) are written into the data before
// binning; dJ/dp (parameter_derivative) for the direct beam:
//   dJ_c/dp = sum_k w_k sum_b (d(sigma phi f)_c,b/dp - (sigma phi f)_c,b dtau_s,b/dp) F_b,
// dtau_s/dp the slant path integral of sum_i (dsigma_i/dp) n_i.
// Two-stream scheme (radiative_transfer.scheme: two_stream; photo/two_stream.hpp): F in J is
// the actinic flux, the direct beam above plus 2 (F+ + F-) of the diffuse field at the cell
// centre, solved per bin and sun position over the column above the top (layer 0: its gas
// and Rayleigh optical depth) and the model's cells, with single-scattering albedo
// w = (dtau_Rayleigh + w_aer dtau_aer) / dtau and asymmetry g = w_aer g_aer dtau_aer /
// (w dtau) (Rayleigh g = 0), the aerosol delta-scaled (Joseph, Wiscombe and Weinman 1976) by
// f = g_aer^2 (also in the direct beam), and a Lambertian lower boundary at the bottom edge.
// With spherical paths the direct beam at every edge follows its own ray (pseudo-spherical).
// Units: cm^-3, cm^2, s^-1, nm.
#pragma once

#include <span>
#include <string>
#include <vector>

#include "core/background.hpp"
#include "core/error.hpp"
#include "photo/photolysis_spec.hpp"
#include "photo/slant_path.hpp"
#include "photo/two_stream.hpp"

namespace colchem {

class PhotolysisModel {
 public:
  /// Bins all data onto the spectral grid and precomputes the slant-path geometry.
  /// Absorbers are looked up in `species_names`; one that is not a model species but a
  /// bulk gas of the background uses its bulk mole fraction times the air density; any
  /// other is an InputError. Rayleigh gases absent from both contribute nothing.
  /// `parameters` are the mechanism's parameter values (index as Mechanism::parameters);
  /// they are required when the spec refers to named parameters (spec.parameter_uses).
  PhotolysisModel(const PhotolysisSpec& spec, const Background& bg,
                  const std::vector<std::string>& species_names,
                  std::span<const double> parameters = {});

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
  /// Whether the channel's J is prescribed (photolysis.prescribed): compute() returns the
  /// prescribed profile for it, and its derivatives (transpose product, parameters) are 0.
  [[nodiscard]] bool prescribed(std::size_t channel) const;

  /// J[c * N + j] (s^-1) for densities n[j * S + s] (cm^-3; S = species count given at
  /// construction). When `actinic_flux` is not empty it receives the illumination-averaged
  /// direct-beam flux F[j * B + b] in photons cm^-2 s^-1 nm^-1. Allocates nothing; not
  /// safe to call concurrently on one object (it reuses its workspace).
  void compute(std::span<const double> n, std::span<double> J, std::span<double> actinic_flux = {});

  /// The model species (indices into n's species) whose densities attenuate the light: the
  /// only ones J depends on. Sorted, each once.
  [[nodiscard]] std::vector<std::size_t> absorber_species() const;

  /// The transposed Jacobian of compute() applied to u (reverse mode; direct beam only,
  /// plane-parallel or spherical): out[j*S + s] += sum_{c,i} u[c*N + i] dJ_c(z_i)/dn_{j,s}
  /// at the densities n, exact (the beam's derivative through the absorbers' optical
  /// depths, the column above the top included). Cost about that of one compute().
  /// Throws std::logic_error with the two-stream scheme. Allocates.
  void add_transpose_product(std::span<const double> n, std::span<const double> u,
                             std::span<double> out);

  /// Whether a named parameter (index as Mechanism::parameters) acts on the photolysis data.
  [[nodiscard]] bool acts_on(std::size_t parameter) const;
  /// dJ[c * N + j] / dp (s^-1 per unit of p) for the named parameter `parameter` at the
  /// densities n (zero when it does not act on the data). The binned data are
  /// differentiated by a central difference of the closed-form bin integrals (step
  /// 1e-5 max(|p|, 1e-3)); direct beam (plane-parallel or spherical): the change of the
  /// light field through the absorbers' optical depths is exact. Two-stream: a central
  /// difference of compute() along the same direction (diffuse field included).
  /// Allocates; not safe to call concurrently with compute() on one object.
  void parameter_derivative(std::size_t parameter, std::span<const double> n, std::span<double> dJ);

  /// Whether the diffuse field is computed (radiative_transfer.scheme: two_stream).
  [[nodiscard]] bool two_stream() const { return two_stream_; }
  /// Diagnostics of the last compute() call that asked for the actinic flux (two-stream
  /// only): illumination-averaged diffuse upward and downward fluxes at the cell centres,
  /// [j * B + b] in photons cm^-2 s^-1 nm^-1. They play no part in J.
  [[nodiscard]] const std::vector<double>& diffuse_up() const { return diag_up_; }
  [[nodiscard]] const std::vector<double>& diffuse_down() const { return diag_down_; }

 private:
  void apply_prescribed(std::span<double> J) const;
  void computed_parameter_derivative(std::size_t parameter, std::span<const double> n,
                                     std::span<double> dJ);

  struct Attenuator {            // an absorber's or a Rayleigh gas's extinction
    int species = -1;            ///< index into n, or -1 for a bulk gas
    double bulk_fraction = 0.0;  ///< used when species < 0
    bool per_level = false;      ///< sigma stored per level (temperature-dependent)
    std::vector<double> sigma;   ///< [j * B + b] or [b], cm^2
    std::size_t lo = 0, hi = 0;  ///< bins where sigma may be non-zero
    bool scatters = false;       ///< Rayleigh: conservative scattering (two-stream)
  };
  struct Channel {
    bool per_level = false;
    std::vector<double> sigma_phi;  ///< [j * B + b] or [b], cm^2 (yield, threshold included)
    std::size_t lo = 0, hi = 0;
  };

  /// d(sigma_phi) and d(sigma) of the binned data with respect to one named parameter.
  struct ParameterDerivative {
    std::size_t parameter = 0;
    double value = 0.0;
    double step = 0.0;
    std::vector<std::vector<double>> dsigma;      ///< per absorber (attenuator index); empty: 0
    std::vector<std::vector<double>> dsigma_phi;  ///< per channel; empty: 0
  };
  static constexpr double kParameterStep = 1e-5;
  void two_stream_parameter_derivative(const ParameterDerivative& d, std::span<const double> n,
                                       std::span<double> dJ);
  void direct_beam_parameter_derivative(const ParameterDerivative& d, std::span<const double> n,
                                        std::span<double> dJ);

  // Construction steps, in the order the constructor takes them.
  void set_bins(const PhotolysisSpec& spec, const Background& bg);
  static bool locate(const std::string& name, const std::vector<std::string>& species_names,
                     const Background& bg, Attenuator& a, bool required,
                     const SourceLocation& where);
  void set_absorbers_and_channels(const PhotolysisSpec& spec, const Background& bg,
                                  const std::vector<std::string>& species_names,
                                  std::span<const double> parameters, const SourceLocation& where);
  void set_parameter_derivatives(const PhotolysisSpec& spec, const Background& bg,
                                 std::span<const double> parameters, const SourceLocation& where);
  void add_rayleigh(const PhotolysisSpec& spec, const Background& bg,
                    const std::vector<std::string>& species_names, const SourceLocation& where);
  void set_aerosols(const PhotolysisSpec& spec, const Background& bg);
  void set_geometry(const PhotolysisSpec& spec, const Background& bg);
  void size_workspace();
  void set_prescribed(const PhotolysisSpec& spec, const Background& bg);

  [[nodiscard]] double density(const Attenuator& a, std::span<const double> n, std::size_t j) const;
  /// Step 1 of compute(): dtau_, tau_top_ (and the Rayleigh parts), and vtau_ (direct beam,
  /// plane-parallel).
  void compute_depths(std::span<const double> n);
  /// Adds sigma n dz of attenuator a to dtau [j * B + b] and sigma n H_top to tau_top [b].
  void add_thickness(const Attenuator& a, const std::vector<double>& sigma,
                     std::span<const double> n, std::vector<double>& dtau,
                     std::vector<double>& tau_top) const;
  /// Vertical optical depth at the cell centres from the cell thicknesses and the top.
  void vertical_depth(const std::vector<double>& dtau, const std::vector<double>& tau_top,
                      std::vector<double>& vtau);
  /// Slant optical depth of the beam to the centre of cell j for sun position `node`.
  void slant_depth(std::size_t node, std::size_t j, const std::vector<double>& dtau,
                   const std::vector<double>& tau_top, const std::vector<double>& vtau,
                   std::vector<double>& out) const;
  /// Two-stream: the layers (the column above the top, then the cells from the top down) of
  /// the current optical depths, and their sun-independent optics.
  void layer_optics();
  /// Two-stream: the fluxes for one sun position into act_ (actinic flux, plane-parallel) or
  /// upm_/downm_ (the diffuse part, spherical); adds diag_weight times the diffuse fluxes
  /// to the diagnostics when diag_weight > 0.
  void diffuse_field(std::size_t node, double diag_weight);

  std::size_t levels_ = 0, bins_ = 0, species_ = 0;
  std::vector<double> edges_, widths_, centers_;
  std::vector<double> top_flux_;  ///< photons cm^-2 s^-1 per bin at the planet
  std::vector<Attenuator> attenuators_;
  std::vector<Channel> chans_;
  std::vector<std::vector<double>> prescribed_;  ///< per channel: J at the cells, or empty
  std::vector<ParameterDerivative> derivs_;
  std::vector<std::string> channel_names_, products_;
  std::vector<double> air_density_, dz_, top_column_factor_;
  double top_height_ = 0.0;           ///< n_top,edge H_top / n_N (cm)
  std::vector<double> aerosol_dtau_;  ///< [j * B + b]
  std::vector<IlluminationNode> nodes_;
  bool spherical_ = false;
  /// Spherical: air-mass factors path_k / dz_k for the ray from centre j, [node][j * N + k],
  /// and Ch(X_top, chi_top) for the column above the top, [node][j].
  std::vector<std::vector<double>> path_factor_, top_factor_;
  // Two-stream: settings, aerosol scattering (delta-scaled) and the albedo per bin.
  bool two_stream_ = false;
  TwoStreamClosure closure_ = TwoStreamClosure::kQuadrature;
  std::vector<double> aerosol_sca_, aerosol_gsca_;  ///< [j * B + b]: w' dtau', g' w' dtau'
  std::vector<double> albedo_;                      ///< [b]
  /// Spherical: factors of the rays from every edge e = 0..N, [node][e * N + k], [node][e].
  std::vector<std::vector<double>> edge_path_factor_, edge_top_factor_;
  // Workspace (sized at construction).
  std::vector<double> dtau_, vtau_, tau_top_, beam_, column_;
  std::vector<double> ray_dtau_, ray_top_;
  /// Layer-major [layer * B + b] (layer 0 above the top, layer N - j = cell j).
  std::vector<double> lay_dtau_, lay_w_, lay_g_, slant_, up_, down_, upm_, downm_, act_;
  TwoStreamOptics optics_;
  std::vector<double> diag_up_, diag_down_;
  TwoStreamWorkspace ts_ws_;
};

}  // namespace colchem
