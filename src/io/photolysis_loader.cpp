// Photolysis loader: YAML and tables -> PhotolysisSpec (keys in README.md, section Configuration
// reference).
#include "io/photolysis_loader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <optional>
#include <sstream>

#include "chem/mechanism.hpp"
#include "core/constants.hpp"
#include "io/key_table.hpp"
#include "io/table.hpp"
#include "photo/photon_energy.hpp"
#include "photo/spectral_binning.hpp"

namespace colchem {

namespace {

constexpr double kInf = std::numeric_limits<double>::infinity();

struct Ctx {
  const UnitSystem& units;
  std::vector<InputFile>* inputs;
};

/// The file name plus its '#' comment lines (the source label).
std::string table_label(const Table& t) {
  std::string label = t.file();
  std::stringstream ss(t.text());
  std::string line;
  while (std::getline(ss, line)) {
    const auto h = line.find('#');
    if (h == std::string::npos) continue;
    auto c = line.substr(h + 1);
    c.erase(0, c.find_first_not_of(" \t"));
    if (!c.empty()) label += (label == t.file() ? ": " : " ") + c;
  }
  return label;
}

/// Fails unless exactly one of two alternative forms is given.
void require_one(const ConfigNode& n, bool a, bool b, const std::string& expected) {
  if (a == b) n.fail(expected, a ? "both" : "neither");
}

/// One of the named options of a choice, as its enumerator.
template <class E>
E pick(const ConfigNode& n, const std::vector<std::pair<std::string, E>>& options) {
  std::vector<std::string> names;
  for (const auto& o : options) names.push_back(o.first);
  const std::string c = n.choice(names);
  return std::find_if(options.begin(), options.end(), [&](const auto& o) { return o.first == c; })
      ->second;
}

/// The position of the node's text among `names`; else an error with a "did you mean".
std::size_t index_among(const ConfigNode& n, const std::vector<std::string>& names,
                        const std::string& expected) {
  const std::string name = n.text();
  const auto it = std::find(names.begin(), names.end(), name);
  if (it == names.end()) {
    const auto near = nearest_word(name, names);
    n.fail(expected, "'" + name + "'", near ? "did you mean '" + *near + "'?" : "");
  }
  return static_cast<std::size_t>(it - names.begin());
}

/// Fails at the first row of `column` whose value `v` lies outside [lo, hi] (NaN included).
void check_rows(const Table& t, const std::string& column, const std::vector<double>& v, double lo,
                double hi, const std::string& expected) {
  for (std::size_t r = 0; r < v.size(); ++r) {
    if (!(v[r] >= lo && v[r] <= hi))
      t.fail_row(r, column, expected, message_number(t.raw(column)[r]));
  }
}

/// The written form of a value that may refer to a parameter: a quantity in `unit` (empty: a
/// bare number, times `factor`), or with `energy` also an energy, taken as cm^-1 (turned into
/// a threshold wavelength 1e7 / x nm when `unit` is "nm").
struct WrittenForm {
  const char* expected;
  const char* unit;
  bool energy = false;
  double factor = 1.0;
};

const WrittenForm kThresholdForm{
    "a wavelength ('816.9 nm') or an energy ('35 kcal/mol', 'kJ/mol', 'eV', 'cm-1')", "nm", true};
const WrittenForm kOnsetForm{"an energy ('2 kcal/mol', 'kJ/mol', 'eV', 'cm-1')", "", true};
const WrittenForm kYieldForm{"a quantum yield (a number without a unit)", ""};

/// Sets use.factor and use.reciprocal for a value written in `unit` (n: where it was written).
void convert(const ConfigNode& n, const UnitSystem& units, const std::string& unit,
             const WrittenForm& f, ParameterUse& use) {
  const std::string target = f.unit;
  use.reciprocal = false;
  if (!unit.empty() && !target.empty() && same_dimension(units, unit, target)) {
    use.factor = *units.convert(1.0, unit, target);
    return;
  }
  if (const auto w = f.energy ? wavenumber_per_energy_unit(units, unit) : std::nullopt) {
    use.factor = *w;
    use.reciprocal = target == "nm";
    return;
  }
  if (!f.energy && target.empty() && unit.empty()) {
    use.factor = f.factor;
    return;
  }
  n.fail(f.expected, unit.empty() ? std::string("a number without a unit") : "unit '" + unit + "'");
}

/// A value that may refer to a named parameter of the mechanism:
///   Q                              the value as written
///   {parameter: NAME, unit: U}     set: the parameter's value, in U (no unit: a number)
///   {value: Q, scale: NAME}        scale: Q times the parameter
/// A reference is recorded in spec.parameter_uses (`use` gives its target); the value
/// returned is then the written value (scale) or 0 (set): the parameter's value is written
/// in when the model is built (with_parameters). A value as written must make sense at once.
double read_parametric(const ConfigNode& n, const Ctx& ctx, const WrittenForm& form,
                       ParameterUse use, PhotolysisSpec& spec) {
  auto written = [&](const ConfigNode& q) {
    const auto t = split_quantity(q.text());
    if (!t) q.fail("a number (with its unit where it has one)");
    use.base = t->value;
    use.scale = true;  // the written value times the parameter (times 1 when none)
    convert(q, ctx.units, t->unit, form, use);
  };
  if (n.is_scalar()) {
    written(n);
    const std::string bad = parameter_value_problem(use.target, use.value(1.0));
    if (!bad.empty()) n.fail(bad);
    return use.value(1.0);
  }
  const auto par = n.find("parameter");
  const auto val = n.find("value");
  const auto scale = n.find("scale");
  const auto unit = n.find("unit");
  n.done();
  if (par && !val && !scale) {
    use.name = par->text();
    convert(unit ? *unit : n, ctx.units, unit ? unit->text() : std::string{}, form, use);
  } else if (val && scale && !par && !unit) {
    use.name = scale->text();
    written(*val);
  } else {
    n.fail("a value, {parameter: NAME, unit: UNIT} or {value: VALUE, scale: NAME}");
  }
  use.where = n.location();
  use.key_path = n.key_path();
  spec.parameter_uses.push_back(use);
  return use.scale ? use.value(1.0) : 0.0;
}

/// `scale: NAME` of a map (a cross-section or yield table): the parameter multiplies it.
void read_scale_key(const ConfigNode& n, ParameterUse use, PhotolysisSpec& spec) {
  const auto s = n.find("scale");
  if (!s) return;
  use.name = s->text();
  use.scale = true;
  use.base = 1.0;
  use.where = s->location();
  use.key_path = s->key_path();
  spec.parameter_uses.push_back(use);
}

ParameterUse use_of(ParameterTarget target, std::size_t absorber, std::size_t band,
                    std::size_t channel) {
  ParameterUse use;
  use.target = target;
  use.absorber = absorber;
  use.band = band;
  use.channel = channel;
  return use;
}

/// The value column of a wavelength table (in `unit`, within [lo, hi]), labelled and recorded.
TabulatedSpectrum spectrum_of(const TableRef& ref, const Table& t, const Ctx& ctx,
                              const std::string& role, const std::string& unit, double lo,
                              double hi, const std::string& expected) {
  auto p = ref.profile(t, ctx.units, "nm", unit);
  check_rows(t, ref.column, p.value, lo, hi, expected);
  if (p.axis.front() <= 0.0) t.fail_row(0, ref.axis_column, "a positive wavelength", "<= 0");
  if (ctx.inputs) ctx.inputs->push_back(InputFile{role, ref.file, t.text()});
  return TabulatedSpectrum{std::move(p.axis), std::move(p.value), table_label(t)};
}

/// A wavelength table: {table: FILE, column: NAME, wavelength_column: NAME} or FILE, with
/// values within [lo, hi].
TabulatedSpectrum read_spectrum_table(const ConfigNode& n, const Ctx& ctx, const std::string& role,
                                      const std::string& default_column, const std::string& unit,
                                      double lo = 0.0, double hi = kInf,
                                      const std::string& expected = "a value >= 0") {
  const TableRef ref = table_ref(n, TableRefForm::wavelength(default_column));
  if (!n.is_scalar()) n.done();
  return spectrum_of(ref, ref.read(), ctx, role, unit, lo, hi, expected);
}

void load_bins(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec) {
  const auto edges = n.find("edges");
  const auto from = n.find("from");
  const auto to = n.find("to");
  const auto width = n.find("width");
  n.done();
  if (edges) {
    if (from || to || width)
      edges->fail("either 'edges' or 'from', 'to' and 'width'", "both forms");
    spec.bin_edges_nm = edges->quantity_list(ctx.units, "nm", "100 nm");
    const auto [expected, found] = bin_edges_problem(spec.bin_edges_nm);
    if (!expected.empty()) edges->fail(expected, found.empty() ? edges->describe() : found);
    return;
  }
  if (!from || !to || !width)
    n.fail("'from', 'to' and 'width' (or a list of 'edges')", "an incomplete set");
  double a = 0.0, b = 0.0, w = 0.0;
  const Key keys[] = {
      quantity("from", &a, "nm", "100 nm", 0.0, kInf, "a positive wavelength").above_lo(),
      quantity("to", &b, "nm", "1000 nm", -kInf, kInf, ""),
      quantity("width", &w, "nm", "1 nm", 0.0, kInf, "a positive bin width").above_lo(),
  };
  read_keys(n, ctx.units, keys);
  if (!(b > a)) to->fail("a wavelength above 'from'");
  spec.bin_edges_nm = uniform_bin_edges(a, b, w);
  if (spec.bin_edges_nm.empty()) {
    width->fail("a width that divides 'to' - 'from' into at most 200000 whole bins",
                fmt::format("{} for {} nm", width->describe(), message_number(b - a)));
  }
}

void load_spectrum(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec) {
  StellarSpectrumSpec& s = spec.spectrum;
  const auto table = n.find("table");
  const auto planck = n.find("planck");
  require_one(n, table.has_value(), planck.has_value(), "exactly one of 'table' or 'planck'");
  if (planck) {
    n.done();
    s.form = SpectrumForm::kPlanck;
    const Key keys[] = {quantity("temperature", &s.temperature_K, "K", "5772 K", 0.0, kInf,
                                 "a positive temperature")
                            .above_lo()
                            .needed()};
    read_keys(*planck, ctx.units, keys);
    const auto r = planck->child("radius");
    const auto q = split_quantity(r.text());
    const bool solar = q && (q->unit == "R_sun" || q->unit == "Rsun");
    s.radius_cm = solar ? q->value * constants::kSolarRadiusCm
                        : r.quantity(ctx.units, "cm", "6.957e5 km' or '1 R_sun");
    if (!(s.radius_cm > 0.0)) r.fail("a positive radius");
    planck->done();
    return;
  }
  s.form = SpectrumForm::kTable;
  // The flux column: named by `column`, else the first column after the wavelength.
  TableRef ref = table_ref(n, TableRefForm::wavelength(""));
  n.done();
  const Table t = ref.read();
  if (ref.column.empty()) {
    const auto& names = t.names();
    const auto it = std::find_if(names.begin(), names.end(),
                                 [&](const std::string& c) { return c != ref.axis_column; });
    if (it == names.end()) table->fail("a table with a wavelength and a flux column", "one column");
    ref.column = *it;
  }
  const std::string& unit = t.unit(ref.column);
  s.energy = same_dimension(ctx.units, unit, "erg cm-2 s-1 nm-1");
  if (!s.energy && !same_dimension(ctx.units, unit, "cm-2 s-1 nm-1")) {
    table->fail(
        "a spectrum column in a photon flux unit (e.g. 'cm-2 s-1 nm-1') or an energy "
        "flux unit (e.g. 'W m-2 nm-1')",
        "column '" + ref.column + "' in " + t.file() + " with " +
            (unit.empty() ? std::string("no unit") : "unit '" + unit + "'"));
  }
  s.table = spectrum_of(ref, t, ctx, "stellar spectrum",
                        s.energy ? "erg cm-2 s-1 nm-1" : "cm-2 s-1 nm-1", 0.0, kInf, "a flux >= 0");
}

/// An angle in radians within [lo, hi]. UDUNITS-2 spells degrees "degree" (or
/// "arc_degree"); the common abbreviation "deg" is accepted as well.
double angle(const ConfigNode& n, const UnitSystem& units, const std::string& example, double lo,
             double hi, const std::string& expected) {
  const auto q = split_quantity(n.text());
  const double a =
      q && q->unit == "deg" ? q->value * constants::kPi / 180.0 : n.quantity(units, "rad", example);
  if (!(a >= lo && a <= hi)) n.fail(expected);
  return a;
}

void load_illumination(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec) {
  IlluminationSpec& il = spec.illumination;
  const auto zen = n.find("zenith_angle");
  const auto lat = n.find("latitude");
  const auto frac = n.find("day_fraction");
  const auto dec = n.find("declination");
  const auto pts = n.find("hour_angle_points");
  n.done();
  require_one(n, zen.has_value(), lat.has_value(),
              "either 'zenith_angle' (with 'day_fraction') or 'latitude' and 'declination'");
  const double deg90 = 0.5 * constants::kPi * (1.0 + 1e-12);  // 90 deg after rounding
  if (zen) {
    if (dec || pts)
      n.fail("'zenith_angle' without 'declination' or 'hour_angle_points'", "both forms");
    il.form = IlluminationForm::kFixed;
    il.zenith_angle_rad =
        angle(*zen, ctx.units, "60 deg", 0.0, deg90, "a zenith angle from 0 to 90 deg");
    const Key keys[] = {
        number("day_fraction", &il.day_fraction, 0.0, 1.0, "a fraction from 0 to 1")};
    read_keys(n, ctx.units, keys);
    return;
  }
  if (frac)
    frac->fail("no 'day_fraction' with 'latitude' (the quadrature gives the day length)",
               frac->describe());
  il.form = IlluminationForm::kDiurnal;
  il.latitude_rad =
      angle(*lat, ctx.units, "30 deg", -deg90, deg90, "a latitude from -90 to 90 deg");
  il.declination_rad = angle(n.child("declination"), ctx.units, "0 deg", -deg90, deg90,
                             "a declination from -90 to 90 deg");
  const Key keys[] = {
      count("hour_angle_points", &il.hour_angle_points, 1, 64, "a number of points from 1 to 64")};
  read_keys(n, ctx.units, keys);
}

/// Rows (altitude, wavelength, value) of an optical property, in blocks of one altitude each:
/// altitudes increasing from block to block, wavelengths increasing within a block.
void read_altitude_blocks(const ConfigNode& n, const Ctx& ctx, const std::string& role,
                          OpticalPropertySpec& p, double lo, double hi,
                          const std::string& expected) {
  const std::string alt = n.child("altitude_column").text();
  const TableRef ref = table_ref(n, TableRefForm::wavelength("value", false));
  n.done();
  const std::string &column = ref.column, &wl = ref.axis_column;
  const Table t = Table::read(ref.file);
  const auto z = t.column(alt, ctx.units, "cm");
  const auto x = t.column(wl, ctx.units, "nm");
  const auto v = t.column(column, ctx.units, "1");
  check_rows(t, column, v, lo, hi, expected);
  check_rows(t, wl, x, std::numeric_limits<double>::denorm_min(), kInf, "a positive wavelength");
  for (std::size_t r = 0; r < t.rows(); ++r) {
    if (r == 0 || z[r] != z[r - 1]) {
      if (r > 0 && !(z[r] > z[r - 1])) {
        t.fail_row(r, alt, "altitudes increasing from block to block",
                   message_number(t.raw(alt)[r]));
      }
      p.grid_altitude_cm.push_back(z[r]);
      p.spectra.push_back(TabulatedSpectrum{{}, {}, table_label(t)});
    } else if (!(x[r] > x[r - 1])) {
      t.fail_row(r, wl, "wavelengths increasing within an altitude", message_number(t.raw(wl)[r]));
    }
    p.spectra.back().wavelength_nm.push_back(x[r]);
    p.spectra.back().value.push_back(v[r]);
  }
  if (p.spectra.size() < 2) {
    t.fail_row(0, alt, "at least two altitudes (one: give the wavelength table alone)",
               "one altitude");
  }
  if (ctx.inputs) ctx.inputs->push_back(InputFile{role, ref.file, t.text()});
}

/// An aerosol optical property: a number, {column: NAME} of the aerosol table, a function
/// of wavelength {table: FILE, column: NAME, wavelength_column: wavelength}, or of altitude
/// and wavelength (with `altitude_column`). Values must lie in [lo, hi].
OpticalPropertySpec load_optical_property(const ConfigNode& n, const Ctx& ctx, const Table& aerosol,
                                          const std::string& what, double lo, double hi) {
  OpticalPropertySpec p;
  const std::string range = fmt::format("a {} from {} to {}", what, lo, hi);
  if (n.is_scalar()) {
    p.value = n.number();
    if (!(p.value >= lo && p.value <= hi)) n.fail(range);
  } else if (n.find("table") && n.find("altitude_column")) {
    p.form = OpticalPropertyForm::kAltitudeWavelength;
    read_altitude_blocks(n, ctx, "aerosol " + what, p, lo, hi, range);
  } else if (n.find("table")) {
    p.form = OpticalPropertyForm::kWavelength;
    p.by_wavelength = read_spectrum_table(n, ctx, "aerosol " + what, "value", "1", lo, hi, range);
  } else {
    const auto c = n.child("column");
    n.done();
    p.form = OpticalPropertyForm::kAltitude;
    p.by_altitude = aerosol.column(c.text(), ctx.units, "1");
    check_rows(aerosol, c.text(), p.by_altitude, lo, hi, range);
  }
  return p;
}

void load_aerosol(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec) {
  AerosolSpec& a = spec.aerosols.emplace_back();
  const TableRef ref = table_ref(n, TableRefForm::altitude("extinction"));
  const Key keys[] = {
      number("wavelength_exponent", &a.wavelength_exponent, -kInf, kInf, "a number"),
      quantity("reference_wavelength", &a.reference_nm, "nm", "550 nm", 0.0, kInf,
               "a positive wavelength")
          .above_lo(),
  };
  read_keys(n, ctx.units, keys);
  const auto ssa = n.find("single_scattering_albedo");
  const auto asym = n.find("asymmetry");
  n.done();
  const Table t = ref.read();
  auto prof = ref.profile(t, ctx.units, "cm", "cm-1");
  check_rows(t, ref.column, prof.value, 0.0, kInf, "an extinction >= 0");
  a.altitude_cm = std::move(prof.axis);
  a.extinction_cm1 = std::move(prof.value);
  if (ssa.has_value() != asym.has_value()) {
    n.fail("both 'single_scattering_albedo' and 'asymmetry' (or neither)", "only one of them");
  }
  if (ssa) {
    a.single_scattering_albedo =
        load_optical_property(*ssa, ctx, t, "single-scattering albedo", 0.0, 1.0);
    a.asymmetry = load_optical_property(*asym, ctx, t, "asymmetry parameter", -0.99, 0.99);
    a.has_optical_properties = true;
  }
  a.source = table_label(t);
  a.present = true;
  if (ctx.inputs) ctx.inputs->push_back(InputFile{"aerosol extinction table", ref.file, t.text()});
}

/// `photolysis.prescribed`: a list of {channel, table[, column, altitude_column]} or
/// {channel, value}; each channel of the data at most once.
void load_prescribed(const ConfigNode& list, const Ctx& ctx, PhotolysisSpec& spec) {
  if (!list.is_sequence()) list.fail("a list of {channel, table} or {channel, value}");
  std::vector<std::string> names;
  for (const auto& c : spec.channels) names.push_back(c.name);
  for (const auto& n : list.items()) {
    PrescribedJSpec& p = spec.prescribed.emplace_back();
    const auto channel = n.child("channel");
    const bool table = n.has("table");
    const auto value = n.find("value");
    const bool columns = n.has("column") || n.has("altitude_column");
    const TableRef ref = table ? table_ref(n, TableRefForm::altitude("J")) : TableRef{};
    n.done();
    p.channel_index =
        index_among(channel, names,
                    fmt::format("a channel of the photolysis data ({})", fmt::join(names, ", ")));
    p.channel = channel.text();
    for (std::size_t k = 0; k + 1 < spec.prescribed.size(); ++k) {
      if (spec.prescribed[k].channel == p.channel)
        channel.fail("each channel prescribed once", "a repeat of '" + p.channel + "'");
    }
    require_one(n, table, value.has_value(),
                "exactly one of 'table' (a J profile) and 'value' (a J held at every altitude)");
    if (value) {
      if (columns) n.fail("'column' and 'altitude_column' only with 'table'", "'value'");
      p.held = true;
      const Key keys[] = {quantity("value", &p.value_s1, "s-1", "2e-6 s-1", 0.0, kInf, "a J >= 0")};
      read_keys(n, ctx.units, keys);
      continue;
    }
    const Table t = ref.read();
    auto prof = ref.profile(t, ctx.units, "cm", "s-1");
    check_rows(t, ref.column, prof.value, 0.0, std::numeric_limits<double>::max(),
               "a finite J >= 0");
    p.altitude_cm = std::move(prof.axis);
    p.j_s1 = std::move(prof.value);
    p.source = ref.file.string();
    if (ctx.inputs) ctx.inputs->push_back(InputFile{"prescribed J table", ref.file, t.text()});
  }
}

void load_radiative_transfer(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec) {
  RadiativeTransferSpec& rt = spec.radiative_transfer;
  const auto closure = n.find("closure");
  const auto delta = n.find("delta_scaling");
  const auto albedo = n.find("surface_albedo");
  rt.scheme = pick<RadiativeTransferScheme>(n.child("scheme"),
                                            {{"direct_beam", RadiativeTransferScheme::kDirectBeam},
                                             {"two_stream", RadiativeTransferScheme::kTwoStream}});
  n.done();
  if (rt.scheme == RadiativeTransferScheme::kDirectBeam) {
    for (const auto& k : {closure, delta, albedo}) {
      if (k)
        k->fail("no two-stream settings with 'scheme: direct_beam'", k->describe(),
                "use scheme: two_stream");
    }
    return;
  }
  if (closure) {
    rt.closure = pick<TwoStreamClosure>(*closure,
                                        {{"eddington", TwoStreamClosure::kEddington},
                                         {"quadrature", TwoStreamClosure::kQuadrature},
                                         {"hemispheric_mean", TwoStreamClosure::kHemisphericMean}});
  }
  if (delta) rt.delta_scaling = delta->boolean();
  if (albedo && albedo->is_scalar()) {
    rt.surface_albedo = albedo->number();
    if (!(rt.surface_albedo >= 0.0 && rt.surface_albedo <= 1.0))
      albedo->fail("an albedo from 0 to 1");
  } else if (albedo) {
    rt.surface_albedo_table = read_spectrum_table(*albedo, ctx, "surface albedo", "albedo", "1",
                                                  0.0, 1.0, "an albedo from 0 to 1");
  }
}

// --- Data file ----------------------------------------------------------------------

void load_cross_section(const ConfigNode& n, const Ctx& ctx, AbsorberSpec& ab,
                        PhotolysisSpec& spec) {
  const std::string role = "cross section of " + ab.species;
  CrossSectionSpec& xs = ab.cross_section;
  if (!n.is_scalar()) {
    read_scale_key(n, use_of(ParameterTarget::kCrossSectionScale, spec.absorbers.size(), 0, 0),
                   spec);
    require_one(n, n.has("table"), n.has("tables"), "exactly one of 'table' or 'tables'");
  }
  if (n.is_scalar() || n.has("table")) {
    xs.tables.push_back(read_spectrum_table(n, ctx, role, "cross_section", "cm2"));
    return;
  }
  const auto many = n.child("tables");
  n.done();
  for (const auto& item : many.items()) {
    const auto T = item.child("temperature");
    const double TK = T.quantity(ctx.units, "K", "295 K");
    if (!(TK > 0.0)) T.fail("a positive temperature");
    if (!xs.temperature_K.empty() && !(TK > xs.temperature_K.back()))
      T.fail("temperatures increasing down the list", T.describe());
    xs.temperature_K.push_back(TK);
    xs.tables.push_back(
        read_spectrum_table(item, ctx, role + " at " + T.text(), "cross_section", "cm2"));
  }
  if (xs.tables.empty()) many.fail("at least one {temperature, table}");
}

OvertoneBandSpec load_band(const ConfigNode& n, const Ctx& ctx, PhotolysisSpec& spec,
                           std::size_t band) {
  OvertoneBandSpec b;
  if (auto l = n.find("label")) b.label = l->text();
  const Key keys[] = {
      quantity("center", &b.center_nm, "nm", "740 nm", 0.0, kInf, "a positive wavelength")
          .above_lo()
          .needed()};
  read_keys(n, ctx.units, keys);
  const auto w = n.child("width");
  const auto wq = split_quantity(w.text());
  if (wq && same_dimension(ctx.units, wq->unit, "cm-1")) {
    b.fwhm_cm1 = w.quantity(ctx.units, "cm-1", "100 cm-1");
  } else {  // a width in wavelength, as a width in wavenumber
    b.fwhm_cm1 = wavenumber_width(w.quantity(ctx.units, "nm", "5 nm' or '100 cm-1"), b.center_nm);
  }
  if (!(b.fwhm_cm1 > 0.0)) w.fail("a positive width");
  if (auto s = n.find("shape")) {
    b.shape = pick<BandShape>(
        *s, {{"gaussian", BandShape::kGaussian}, {"lorentzian", BandShape::kLorentzian}});
  }
  const auto S = n.find("strength");
  const auto f = n.find("oscillator_strength");
  require_one(n, S.has_value(), f.has_value(),
              "exactly one of 'strength' (cm, integrated over wavenumber) or "
              "'oscillator_strength'");
  const auto use = use_of(ParameterTarget::kBandStrength, spec.absorbers.size(), band, 0);
  const WrittenForm strength{"a band strength in a length unit ('1e-20 cm')", "cm"};
  const WrittenForm oscillator{"an oscillator strength (a number without a unit)", "", false,
                               band_strength_from_oscillator(1.0)};
  b.strength_cm = S ? read_parametric(*S, ctx, strength, use, spec)
                    : read_parametric(*f, ctx, oscillator, use, spec);
  n.done();
  return b;
}

QuantumYieldSpec load_yield(const ConfigNode& n, const Ctx& ctx, const std::string& channel,
                            PhotolysisSpec& spec) {
  QuantumYieldSpec q;
  if (n.is_scalar() || n.has("parameter") || n.has("value")) {
    const auto use = use_of(ParameterTarget::kYieldValue, 0, 0, spec.channels.size());
    q.value = read_parametric(n, ctx, kYieldForm, use, spec);
    return q;
  }
  read_scale_key(n, use_of(ParameterTarget::kYieldScale, 0, 0, spec.channels.size()), spec);
  const auto table = n.find("table");
  const auto step = n.find("step");
  require_one(n, table.has_value(), step.has_value(),
              "a number, {table: FILE}, {step: {below: WAVELENGTH, value: PHI}}, {parameter: "
              "NAME} or {value: PHI, scale: NAME}");
  const std::string yield = "a quantum yield from 0 to 1";
  if (table) {
    q.form = YieldForm::kTable;
    q.table = read_spectrum_table(n, ctx, "quantum yield of " + channel, "quantum_yield", "1", 0.0,
                                  1.0, yield);
    return q;
  }
  n.done();
  q.form = YieldForm::kStep;
  const Key keys[] = {
      quantity("below", &q.step_nm, "nm", "219 nm", 0.0, kInf, "a positive wavelength")
          .above_lo()
          .needed(),
      number("value", &q.below_value, 0.0, 1.0, yield).needed(),
      number("above_value", &q.above_value, 0.0, 1.0, yield),
  };
  read_keys(*step, ctx.units, keys);
  step->done();
  return q;
}

/// One entry of `channels:`; its absorber must be declared, its name new.
ChannelSpec load_channel(const ConfigNode& item, const Ctx& ctx, PhotolysisSpec& spec) {
  ChannelSpec ch;
  const auto nm = item.child("name");
  ch.name = nm.text();
  if (ch.name.empty() || ch.name.find_first_of(" \t/") != std::string::npos) {
    nm.fail("a channel name without spaces or '/' (it names the output variable J_<name>)");
  }
  for (const auto& c : spec.channels) {
    if (c.name == ch.name) nm.fail("distinct channel names", "'" + ch.name + "' again");
  }
  std::vector<std::string> absorbers;
  for (const auto& a : spec.absorbers) absorbers.push_back(a.species);
  const auto ab = item.child("absorber");
  ch.absorber = absorbers[index_among(ab, absorbers, "an absorber declared under 'absorbers'")];
  if (auto p = item.find("products")) ch.products = p->text();
  if (auto q = item.find("quantum_yield")) ch.quantum_yield = load_yield(*q, ctx, ch.name, spec);
  const Key keys[] = {
      number("branching", &ch.branching, 0.0, 1.0, "a branching fraction from 0 to 1")};
  read_keys(item, ctx.units, keys);
  const auto t = item.find("threshold");
  auto use = use_of(ParameterTarget::kThreshold, 0, 0, spec.channels.size());
  if (t) ch.threshold_nm = read_parametric(*t, ctx, kThresholdForm, use, spec);
  if (auto w = item.find("onset_width")) {
    if (!t) w->fail("an 'onset_width' only with a 'threshold'", w->describe());
    use.target = ParameterTarget::kOnsetWidth;
    ch.onset_width_cm1 = read_parametric(*w, ctx, kOnsetForm, use, spec);
  }
  item.done();
  return ch;
}

/// `rayleigh: {GAS: {cross_section, at, exponent}}`: a key table per gas.
void load_rayleigh(const ConfigNode& ray, const UnitSystem& units, PhotolysisSpec& spec) {
  for (const auto& [gas, node] : ray.entries()) {
    RayleighSpec& r = spec.rayleigh.emplace_back();
    r.gas = gas;
    const Key keys[] = {
        quantity("cross_section", &r.cross_section_cm2, "cm2", "4.5e-27 cm2", 0.0, kInf,
                 "a cross section >= 0")
            .needed(),
        quantity("at", &r.reference_nm, "nm", "550 nm", 0.0, kInf, "a positive wavelength")
            .above_lo()
            .needed(),
        number("exponent", &r.exponent, -kInf, kInf, "a finite number"),
    };
    read_keys(node, units, keys);
    node.done();
  }
}

}  // namespace

void load_photolysis_data(const std::filesystem::path& file, const UnitSystem& units,
                          PhotolysisSpec& spec, std::vector<InputFile>* inputs) {
  const ConfigDocument doc = ConfigDocument::load(file, ExitCode::kInputData);
  const Ctx ctx{units, inputs};
  if (inputs) inputs->push_back(InputFile{"photolysis data", file, doc.resolved_text()});
  spec.data_source = file.string();
  const ConfigNode root = doc.root();
  for (const char* key : {"description", "source"}) {
    if (auto d = root.find(key)) (void)d->text();
  }
  for (const auto& item : root.child("absorbers").items()) {
    AbsorberSpec ab;
    const auto sp = item.child("species");
    ab.species = sp.text();
    for (const auto& a : spec.absorbers) {
      if (a.species == ab.species)
        sp.fail("each absorber declared once", "'" + ab.species + "' again");
    }
    const auto cs = item.find("cross_section");
    if (cs) load_cross_section(*cs, ctx, ab, spec);
    if (auto bands = item.find("bands")) {
      for (const auto& b : bands->items())
        ab.bands.push_back(load_band(b, ctx, spec, ab.bands.size()));
    }
    if (!cs && ab.bands.empty()) item.fail("a 'cross_section' or 'bands' (or both)", "neither");
    item.done();
    spec.absorbers.push_back(std::move(ab));
  }
  if (auto chans = root.find("channels")) {
    for (const auto& item : chans->items()) spec.channels.push_back(load_channel(item, ctx, spec));
  }
  if (auto ray = root.find("rayleigh")) load_rayleigh(*ray, units, spec);
  root.done();
}

PhotolysisSpec load_photolysis(const ConfigNode& n, const UnitSystem& units,
                               std::vector<InputFile>* inputs) {
  PhotolysisSpec spec;
  const Ctx ctx{units, inputs};
  const auto data = n.child("data");
  const auto spectrum = n.child("spectrum");
  const auto bins = n.find("bins");
  const auto illum = n.find("illumination");
  const auto slant = n.find("slant_path");
  const auto aerosol = n.find("aerosol");
  const auto rt = n.find("radiative_transfer");
  const auto prescribed = n.find("prescribed");
  n.done();
  load_photolysis_data(data.path(), units, spec, inputs);
  if (prescribed) load_prescribed(*prescribed, ctx, spec);
  load_spectrum(spectrum, ctx, spec);
  if (bins) load_bins(*bins, ctx, spec);
  if (illum) {
    load_illumination(*illum, ctx, spec);
  } else {
    spec.illumination.zenith_angle_rad = constants::kPi / 3.0;  // 60 deg
    spec.illumination.day_fraction = 0.5;
  }
  if (slant) {
    spec.slant_path = pick<SlantPath>(*slant, {{"plane_parallel", SlantPath::kPlaneParallel},
                                               {"spherical", SlantPath::kSpherical}});
  }
  if (spec.slant_path == SlantPath::kPlaneParallel &&
      spec.illumination.form == IlluminationForm::kFixed &&
      std::cos(spec.illumination.zenith_angle_rad) < 1e-6) {
    const auto zen = illum->child("zenith_angle");
    zen.fail("a zenith angle below 90 deg for plane_parallel paths", zen.describe(),
             "use slant_path: spherical at 90 deg");
  }
  // One population (a map) or several (a list of maps, e.g. a haze and a cloud deck).
  std::vector<ConfigNode> populations;
  if (aerosol) populations = aerosol->is_sequence() ? aerosol->items() : std::vector{*aerosol};
  for (const auto& p : populations) load_aerosol(p, ctx, spec);
  if (rt) load_radiative_transfer(*rt, ctx, spec);
  for (std::size_t k = 0; k < populations.size(); ++k) {
    if (spec.radiative_transfer.scheme == RadiativeTransferScheme::kTwoStream &&
        !spec.aerosols[k].has_optical_properties) {
      populations[k].fail(
          "'single_scattering_albedo' and 'asymmetry' with 'radiative_transfer.scheme: "
          "two_stream'",
          "neither");
    }
  }
  return spec;
}

void resolve_photolysis_parameters(PhotolysisSpec& spec, const Mechanism* mech) {
  std::vector<std::string> names;
  if (mech) {
    for (const auto& p : mech->parameters) names.push_back(p.name);
  }
  for (auto& u : spec.parameter_uses) {
    const auto idx = mech ? mech->parameter_index(u.name) : std::nullopt;
    if (!idx) {
      std::string hint = mech ? std::string{} : "the scenario has no 'chemistry' section";
      if (auto near = nearest_word(u.name, names)) hint = "did you mean '" + *near + "'?";
      throw InputError(ExitCode::kInputData, u.where, u.key_path,
                       "a parameter declared under 'parameters' in the mechanism" +
                           (mech ? " '" + mech->file.string() + "'" : std::string{}),
                       "undeclared parameter '" + u.name + "'", hint);
    }
    u.parameter = *idx;
    u.resolved = true;
  }
  if (mech) check_parameter_uses(spec, *mech);
}

void load_photolysis_section(const ConfigNode& section, const UnitSystem& units, Scenario& sc) {
  sc.photolysis = load_photolysis(section, units, &sc.inputs);
  sc.has_photolysis = true;
}

}  // namespace colchem
