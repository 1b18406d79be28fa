// Typed, validated input of the photolysis module (built by io/photolysis_loader.cpp; the
// physics code never sees YAML). Every quantity is already in internal units: wavelengths
// nm, cross sections cm^2, photon fluxes cm^-2 s^-1 nm^-1 at 1 au, temperatures K,
// lengths cm, band strengths cm (per molecule, integrated over wavenumber in cm^-1).
#pragma once

#include <span>
#include <string>
#include <utility>
#include <vector>

#include "core/error.hpp"
#include "photo/two_stream.hpp"

namespace colchem {

/// A function of wavelength tabulated at strictly increasing points; read as piecewise
/// linear between them and zero outside [front, back].
struct TabulatedSpectrum {
  std::vector<double> wavelength_nm;
  std::vector<double> value;
  std::string source;  ///< file and its '#' label lines, for provenance and messages
};

/// Cross section tables of one absorber at one or more temperatures (increasing). Between
/// temperatures the bin-averaged cross section is interpolated linearly in T; outside the
/// range the end table is used (clamped).
struct CrossSectionSpec {
  std::vector<double> temperature_K;      ///< empty or one entry: temperature-independent
  std::vector<TabulatedSpectrum> tables;  ///< one per temperature (or a single table)
  double scale = 1.0;                     ///< multiplies every table (a named parameter)
};

enum class BandShape { kGaussian, kLorentzian };

/// A weak vibrational-overtone band: sigma(nu~) = S g(nu~ - nu~0) with g a unit-area shape
/// in wavenumber; S = integral of sigma over wavenumber (cm per molecule).
struct OvertoneBandSpec {
  std::string label;
  double center_nm = 0.0;
  double fwhm_cm1 = 0.0;  ///< full width at half maximum in wavenumber (cm^-1)
  BandShape shape = BandShape::kGaussian;
  double strength_cm = 0.0;
};

struct AbsorberSpec {
  std::string species;
  CrossSectionSpec cross_section;  ///< may hold no table when only bands are given
  std::vector<OvertoneBandSpec> bands;
};

enum class YieldForm { kConstant, kTable, kStep };

/// Quantum yield phi(lambda): a constant, a table (held at its end values outside), or a
/// step: `below_value` short of `step_nm`, `above_value` longward of it.
struct QuantumYieldSpec {
  YieldForm form = YieldForm::kConstant;
  double value = 1.0;
  TabulatedSpectrum table;
  double step_nm = 0.0;
  double below_value = 1.0;
  double above_value = 0.0;
  double scale = 1.0;  ///< multiplies the yield of any form (a named parameter)
};

struct ChannelSpec {
  std::string name;      ///< referred to by the mechanism (rate: {photolysis: {channel: ...}})
  std::string absorber;  ///< species of a declared absorber
  std::string products;  ///< text, for output and documentation ("SO + O")
  QuantumYieldSpec quantum_yield;
  double branching = 1.0;     ///< extra constant factor (e.g. beta of a split channel)
  double threshold_nm = 0.0;  ///< photons longward of this do not photolyse; 0 = no limit
  /// Near-threshold onset: the yield is multiplied by rho = min(1, (nu~ - nu~_t) / w) for
  /// photon wavenumbers nu~ >= nu~_t (0 below); w = 0 is a sharp step at the threshold.
  double onset_width_cm1 = 0.0;
};

/// What a named parameter (declared in the mechanism, index Mechanism::parameters) acts on.
enum class ParameterTarget {
  kThreshold,          ///< ChannelSpec::threshold_nm
  kOnsetWidth,         ///< ChannelSpec::onset_width_cm1
  kYieldValue,         ///< QuantumYieldSpec::value (constant form)
  kYieldScale,         ///< QuantumYieldSpec::scale
  kBandStrength,       ///< OvertoneBandSpec::strength_cm
  kCrossSectionScale,  ///< CrossSectionSpec::scale
};

/// One reference to a named parameter in the photolysis data. The written quantity is
/// q = p (`{parameter: NAME, unit: U}`, set) or q = base p (`{value: Q, scale: NAME}`);
/// the internal value is q * factor, or 1e7 / (q * factor) when `reciprocal` (an energy
/// turned into a threshold wavelength in nm: factor converts it to cm^-1).
struct ParameterUse {
  std::string name;
  std::size_t parameter = 0;  ///< index into the mechanism's parameters (resolved at load)
  bool resolved = false;
  SourceLocation where;  ///< of the reference in the data file
  std::string key_path;
  ParameterTarget target = ParameterTarget::kThreshold;
  std::size_t absorber = 0, band = 0, channel = 0;
  bool scale = false;
  double base = 1.0;
  double factor = 1.0;
  bool reciprocal = false;

  /// The internal value for parameter value p.
  [[nodiscard]] double value(double p) const {
    const double q = (scale ? base * p : p) * factor;
    return reciprocal ? 1.0e7 / q : q;
  }
};

/// Rayleigh scattering of one bulk gas: sigma_R = sigma_0 (lambda_0 / lambda)^exponent.
struct RayleighSpec {
  std::string gas;
  double cross_section_cm2 = 0.0;
  double reference_nm = 550.0;
  double exponent = 4.0;
};

enum class SpectrumForm { kTable, kPlanck };

struct StellarSpectrumSpec {
  SpectrumForm form = SpectrumForm::kTable;
  /// kTable: photon flux (cm^-2 s^-1 nm^-1) at 1 au, or energy flux (erg cm^-2 s^-1 nm^-1)
  /// when `energy` is set; energy is turned into photons per bin with E = h c / lambda
  /// integrated exactly over the piecewise-linear table.
  TabulatedSpectrum table;
  bool energy = false;
  double temperature_K = 0.0;  ///< kPlanck
  double radius_cm = 0.0;      ///< kPlanck: stellar radius
};

enum class IlluminationForm { kFixed, kDiurnal };

struct IlluminationSpec {
  IlluminationForm form = IlluminationForm::kFixed;
  double zenith_angle_rad = 0.0;  ///< kFixed
  double day_fraction = 1.0;      ///< kFixed: J is multiplied by it
  double latitude_rad = 0.0;      ///< kDiurnal
  double declination_rad = 0.0;   ///< kDiurnal
  int hour_angle_points = 8;      ///< kDiurnal: Gauss-Legendre nodes from noon to sunset
};

enum class SlantPath { kPlaneParallel, kSpherical };

/// An optical property of the aerosol (single-scattering albedo or asymmetry parameter): a
/// constant, a column of the aerosol's altitude table (linear in altitude, end values held,
/// like the extinction), a function of wavelength (bin-averaged, end values held), or a
/// function of both: a spectrum at each of several altitudes, each bin-averaged, then
/// linear in altitude between them (end values held).
enum class OpticalPropertyForm { kConstant, kAltitude, kWavelength, kAltitudeWavelength };

struct OpticalPropertySpec {
  OpticalPropertyForm form = OpticalPropertyForm::kConstant;
  double value = 0.0;               ///< kConstant
  std::vector<double> by_altitude;  ///< kAltitude: at AerosolSpec::altitude_cm
  TabulatedSpectrum by_wavelength;  ///< kWavelength
  /// kAltitudeWavelength: increasing altitudes (cm) and the spectrum at each.
  std::vector<double> grid_altitude_cm{};
  std::vector<TabulatedSpectrum> spectra{};
};

/// Prescribed aerosol or cloud extinction: beta(z, lambda) = beta(z) (lambda_ref/lambda)^a.
/// The direct-beam scheme counts all of it as lost from the beam; the two-stream scheme
/// scatters the fraction omega (single-scattering albedo) with asymmetry parameter g.
struct AerosolSpec {
  bool present = false;
  std::vector<double> altitude_cm;
  std::vector<double> extinction_cm1;
  double wavelength_exponent = 0.0;
  double reference_nm = 550.0;
  std::string source;
  bool has_optical_properties = false;             ///< omega and g were given
  OpticalPropertySpec single_scattering_albedo{};  ///< constant 0 unless given
  OpticalPropertySpec asymmetry{};
};

enum class RadiativeTransferScheme { kDirectBeam, kTwoStream };

/// How the light field is computed: the attenuated direct beam only (the default), or the
/// direct beam plus a two-stream diffuse field over a Lambertian lower boundary
/// (photo/two_stream.hpp).
struct RadiativeTransferSpec {
  RadiativeTransferScheme scheme = RadiativeTransferScheme::kDirectBeam;
  TwoStreamClosure closure = TwoStreamClosure::kQuadrature;
  bool delta_scaling = true;
  /// Lambertian albedo of the lower boundary: `surface_albedo` unless the table has values
  /// (bin-averaged, end values held).
  double surface_albedo = 0.0;
  TabulatedSpectrum surface_albedo_table;
};

/// A channel whose J is prescribed instead of computed (`photolysis.prescribed`): a profile
/// J(z) from a table (e.g. from another radiative-transfer code), interpolated linearly in
/// altitude onto the cell centres (the table must cover them), or one value held at every
/// altitude. The value is the J the chemistry sees (s^-1, not multiplied by the illumination's
/// day fraction) and does not depend on the state.
struct PrescribedJSpec {
  std::string channel;
  std::size_t channel_index = 0;    ///< into PhotolysisSpec::channels (resolved at load)
  bool held = false;                ///< one value at every altitude
  double value_s1 = 0.0;            ///< held
  std::vector<double> altitude_cm;  ///< table: increasing
  std::vector<double> j_s1;         ///< table
  std::string source;               ///< the table file, for messages
};

struct PhotolysisSpec {
  std::vector<double> bin_edges_nm;  ///< strictly increasing; empty = default_bin_edges()
  StellarSpectrumSpec spectrum;
  std::vector<AbsorberSpec> absorbers;
  std::vector<ChannelSpec> channels;
  std::vector<RayleighSpec> rayleigh;
  IlluminationSpec illumination;
  SlantPath slant_path = SlantPath::kPlaneParallel;
  /// Aerosol and cloud populations (`aerosol:` one map or a list of maps); their extinction,
  /// scattering and g-weighted scattering optical depths add.
  std::vector<AerosolSpec> aerosols;
  RadiativeTransferSpec radiative_transfer;
  std::string data_source;  ///< the data file, for provenance
  /// Named parameters the data refer to (resolved against the mechanism at scenario load).
  std::vector<ParameterUse> parameter_uses;
  /// Channels with prescribed J (each channel at most once).
  std::vector<PrescribedJSpec> prescribed;
};

struct Mechanism;

/// What a value `v` of `target` must be ("a positive threshold wavelength or energy"), or
/// empty when it is one; `top` is the largest yield of the form a kYieldScale multiplies.
std::string parameter_value_problem(ParameterTarget target, double v, double top = 1.0);

/// Checks the resolved parameter uses of `spec` against `mech`: every value must make sense
/// over its parameter's whole [min, max], and every parameter of the mechanism must be used
/// by a reaction's scale or by the data. Violations are InputErrors (ExitCode::kInputData) at
/// the reference or at the parameter's declaration.
void check_parameter_uses(const PhotolysisSpec& spec, const Mechanism& mech);

/// Writes the values of the parameters the spec refers to into its fields (parameters:
/// indexed as the mechanism's; every use must be resolved). Returns the changed spec.
PhotolysisSpec with_parameters(const PhotolysisSpec& spec, std::span<const double> parameters);

/// The default spectral grid: 1 nm bins from 100 to 350 nm (resolves the SO2 and O3
/// band envelopes at the resolution of tabulated data), 5 nm bins from 350 to 1000 nm.
std::vector<double> default_bin_edges();

/// Edges from `from_nm` to `to_nm` in bins of `width_nm`; empty unless the width divides the
/// range into at most 200000 whole bins (a relative slack of 1e-6 of a width).
std::vector<double> uniform_bin_edges(double from_nm, double to_nm, double width_nm);

/// Why a list of bin edges (nm) cannot be a spectral grid, as {expected, found} (found empty:
/// the list itself), or two empty strings when it can: at least two edges, strictly
/// increasing, the first positive.
std::pair<std::string, std::string> bin_edges_problem(std::span<const double> edges_nm);

}  // namespace colchem
