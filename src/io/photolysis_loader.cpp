// Photolysis loader: YAML and tables -> PhotolysisSpec (keys in README.md, section Configuration
// reference).
#include "io/photolysis_loader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <limits>
#include <optional>
#include <set>
#include <sstream>

#include "chem/mechanism.hpp"
#include "core/constants.hpp"
#include "io/key_table.hpp"
#include "io/table.hpp"
#include "photo/photon_energy.hpp"
#include "photo/spectral_binning.hpp"

namespace colchem {

namespace {

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

/// How a written quantity becomes an internal value: times `factor`, then 1e7 / x when
/// `reciprocal` (an energy in cm^-1 turned into a threshold wavelength in nm).
struct Conversion {
  double factor = 1.0;
  bool reciprocal = false;
};

/// An energy unit (kcal/mol, kJ/mol, J/mol, eV, cm-1) as cm^-1 per unit, or nullopt.
std::optional<double> energy_to_wavenumber(const UnitSystem& units, const std::string& unit) {
  if (unit == "kcal/mol" || unit == "kcal mol-1") return wavenumber_per_molar_energy(4184.0);
  if (same_dimension(units, unit, "J mol-1")) {
    return wavenumber_per_molar_energy(*units.convert(1.0, unit, "J mol-1"));
  }
  if (same_dimension(units, unit, "erg")) {
    return wavenumber_per_energy(*units.convert(1.0, unit, "erg"));
  }
  if (same_dimension(units, unit, "cm-1")) return *units.convert(1.0, unit, "cm-1");
  return std::nullopt;
}

/// A channel threshold: a wavelength ("816.9 nm") or a photon energy ("35 kcal/mol").
Conversion threshold_conversion(const ConfigNode& n, const UnitSystem& units,
                                const std::string& unit) {
  if (!unit.empty() && same_dimension(units, unit, "nm"))
    return {*units.convert(1.0, unit, "nm"), false};
  if (auto f = energy_to_wavenumber(units, unit)) return {*f, true};
  n.fail("a wavelength ('816.9 nm') or an energy ('35 kcal/mol', 'kJ/mol', 'eV', 'cm-1')",
         unit.empty() ? std::string("a number without a unit") : "unit '" + unit + "'");
}

/// An energy width (the near-threshold onset), as cm^-1.
Conversion energy_conversion(const ConfigNode& n, const UnitSystem& units,
                             const std::string& unit) {
  if (auto f = energy_to_wavenumber(units, unit)) return {*f, false};
  n.fail("an energy ('2 kcal/mol', 'kJ/mol', 'eV', 'cm-1')",
         unit.empty() ? std::string("a number without a unit") : "unit '" + unit + "'");
}

using ConversionOf = std::function<Conversion(const ConfigNode&, const std::string& unit)>;

/// A value that may refer to a named parameter of the mechanism:
///   Q                              the value as written
///   {parameter: NAME, unit: U}     set: the parameter's value, in U (no unit: a number)
///   {value: Q, scale: NAME}        scale: Q times the parameter
/// A reference is recorded in spec.parameter_uses (`use` gives its target); the value
/// returned is then the written value (scale) or 0 (set): the parameter's value is written
/// in when the model is built (with_parameters).
double read_parametric(const ConfigNode& n, const ConversionOf& conversion, ParameterUse use,
                       PhotolysisSpec& spec) {
  auto parse = [&](const ConfigNode& q) {
    const auto t = split_quantity(q.text());
    if (!t) q.fail("a number (with its unit where it has one)");
    return *t;
  };
  if (n.is_scalar()) {
    const auto t = parse(n);
    use.base = t.value;
    use.scale = true;  // the written value times 1
    const Conversion c = conversion(n, t.unit);
    use.factor = c.factor;
    use.reciprocal = c.reciprocal;
    return use.value(1.0);
  }
  const auto par = n.find("parameter");
  const auto val = n.find("value");
  const auto scale = n.find("scale");
  const auto unit = n.find("unit");
  n.done();
  if (par && !val && !scale) {
    use.name = par->text();
    use.scale = false;
    const Conversion c = conversion(unit ? *unit : n, unit ? unit->text() : std::string{});
    use.factor = c.factor;
    use.reciprocal = c.reciprocal;
  } else if (val && scale && !par && !unit) {
    use.name = scale->text();
    use.scale = true;
    const auto t = parse(*val);
    use.base = t.value;
    const Conversion c = conversion(*val, t.unit);
    use.factor = c.factor;
    use.reciprocal = c.reciprocal;
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

/// A wavelength table: {table: FILE, column: NAME, wavelength_column: NAME} or FILE.
/// `target_unit` is the unit of the value column; nonnegative values are required.
TabulatedSpectrum read_spectrum_table(const ConfigNode& n, Ctx& ctx, const std::string& role,
                                      const std::string& default_column,
                                      const std::string& target_unit, Table* keep = nullptr) {
  const TableRef ref = table_ref(n, TableRefForm::wavelength(default_column));
  if (!n.is_scalar()) n.done();
  const Table t = ref.read();
  const std::string& column = ref.column;
  const std::string& wl_column = ref.axis_column;
  auto p = ref.profile(t, ctx.units, "nm", target_unit);
  TabulatedSpectrum s{std::move(p.axis), std::move(p.value), {}};
  for (std::size_t r = 0; r < s.value.size(); ++r) {
    if (!(s.value[r] >= 0.0))
      t.fail_row(r, column, "a value >= 0", message_number(t.raw(column)[r]));
  }
  if (s.wavelength_nm.front() <= 0.0) t.fail_row(0, wl_column, "a positive wavelength", "<= 0");
  s.source = table_label(t);
  if (ctx.inputs) ctx.inputs->push_back(InputFile{role, ref.file, t.text()});
  if (keep) *keep = t;
  return s;
}

void load_bins(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec) {
  const auto edges = n.find("edges");
  const auto from = n.find("from");
  const auto to = n.find("to");
  const auto width = n.find("width");
  n.done();
  std::vector<double> e;
  if (edges) {
    if (from || to || width)
      edges->fail("either 'edges' or 'from', 'to' and 'width'", "both forms");
    e = edges->quantity_list(ctx.units, "nm", "100 nm");
    if (e.size() < 2) edges->fail("at least two bin edges");
    for (std::size_t i = 1; i < e.size(); ++i) {
      if (!(e[i] > e[i - 1]))
        edges->fail("edges increasing strictly", "a decrease at entry " + std::to_string(i));
    }
    if (e.front() <= 0.0) edges->fail("positive wavelengths");
  } else {
    if (!from || !to || !width)
      n.fail("'from', 'to' and 'width' (or a list of 'edges')", "an incomplete set");
    const double a = from->quantity(ctx.units, "nm", "100 nm");
    const double b = to->quantity(ctx.units, "nm", "1000 nm");
    const double w = width->quantity(ctx.units, "nm", "1 nm");
    if (!(a > 0.0)) from->fail("a positive wavelength");
    if (!(b > a)) to->fail("a wavelength above 'from'");
    if (!(w > 0.0)) width->fail("a positive bin width");
    const double count = std::round((b - a) / w);
    if (count > 200000) width->fail("at most 200000 bins", std::to_string(count) + " bins");
    if (std::abs(count * w - (b - a)) > 1e-6 * w) {
      width->fail("a width that divides 'to' - 'from' into whole bins", width->describe());
    }
    const auto nb = static_cast<std::size_t>(count);
    for (std::size_t i = 0; i <= nb; ++i)
      e.push_back(a + (b - a) * static_cast<double>(i) / static_cast<double>(nb));
  }
  spec.bin_edges_nm = std::move(e);
}

void load_spectrum(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec) {
  StellarSpectrumSpec& s = spec.spectrum;
  const auto table = n.find("table");
  const auto planck = n.find("planck");
  if ((table ? 1 : 0) + (planck ? 1 : 0) != 1) n.fail("exactly one of 'table' or 'planck'");
  if (planck) {
    n.done();
    s.form = SpectrumForm::kPlanck;
    const auto T = planck->child("temperature");
    s.temperature_K = T.quantity(ctx.units, "K", "5772 K");
    if (!(s.temperature_K > 0.0)) T.fail("a positive temperature");
    const auto r = planck->child("radius");
    const auto q = split_quantity(r.text());
    if (q && (q->unit == "R_sun" || q->unit == "Rsun")) {
      s.radius_cm = q->value * constants::kSolarRadiusCm;
    } else {
      s.radius_cm = r.quantity(ctx.units, "cm", "6.957e5 km' or '1 R_sun");
    }
    if (!(s.radius_cm > 0.0)) r.fail("a positive radius");
    planck->done();
    return;
  }
  s.form = SpectrumForm::kTable;
  // The flux column: named by `column`, else the first column after the wavelength.
  TableRef ref = table_ref(n, TableRefForm::wavelength(""));
  n.done();
  const Table t = Table::read(ref.file);
  std::string& column = ref.column;
  const std::string& wl_column = ref.axis_column;
  if (column.empty()) {
    for (const auto& name : t.names()) {
      if (name != wl_column) {
        column = name;
        break;
      }
    }
    if (column.empty()) table->fail("a table with a wavelength and a flux column", "one column");
  }
  const std::string& unit = t.unit(column);
  std::string target;
  if (same_dimension(ctx.units, unit, "cm-2 s-1 nm-1")) {
    target = "cm-2 s-1 nm-1";
    s.energy = false;
  } else if (same_dimension(ctx.units, unit, "erg cm-2 s-1 nm-1")) {
    target = "erg cm-2 s-1 nm-1";
    s.energy = true;
  } else {
    table->fail(
        "a spectrum column in a photon flux unit (e.g. 'cm-2 s-1 nm-1') or an energy "
        "flux unit (e.g. 'W m-2 nm-1')",
        "column '" + column + "' in " + t.file() + " with " +
            (unit.empty() ? std::string("no unit") : "unit '" + unit + "'"));
  }
  t.require_increasing(wl_column);
  s.table.wavelength_nm = t.column(wl_column, ctx.units, "nm");
  s.table.value = t.column(column, ctx.units, target);
  for (std::size_t r = 0; r < s.table.value.size(); ++r) {
    if (!(s.table.value[r] >= 0.0))
      t.fail_row(r, column, "a flux >= 0", message_number(t.raw(column)[r]));
  }
  s.table.source = table_label(t);
  if (ctx.inputs) ctx.inputs->push_back(InputFile{"stellar spectrum", ref.file, t.text()});
}

/// An angle in radians. UDUNITS-2 spells degrees "degree" (or "arc_degree"); the common
/// abbreviation "deg" is accepted as well.
double angle(const ConfigNode& n, const UnitSystem& units, const std::string& example) {
  const auto q = split_quantity(n.text());
  if (q && q->unit == "deg") return q->value * constants::kPi / 180.0;
  return n.quantity(units, "rad", example);
}

void load_illumination(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec) {
  IlluminationSpec& il = spec.illumination;
  const auto zen = n.find("zenith_angle");
  const auto lat = n.find("latitude");
  const auto frac = n.find("day_fraction");
  const auto dec = n.find("declination");
  const auto pts = n.find("hour_angle_points");
  n.done();
  if ((zen ? 1 : 0) + (lat ? 1 : 0) != 1) {
    n.fail("either 'zenith_angle' (with 'day_fraction') or 'latitude' and 'declination'");
  }
  const double deg90 = 0.5 * constants::kPi * (1.0 + 1e-12);
  if (zen) {
    if (dec || pts)
      n.fail("'zenith_angle' without 'declination' or 'hour_angle_points'", "both forms");
    il.form = IlluminationForm::kFixed;
    il.zenith_angle_rad = angle(*zen, ctx.units, "60 deg");
    if (!(il.zenith_angle_rad >= 0.0 && il.zenith_angle_rad <= deg90)) {
      zen->fail("a zenith angle from 0 to 90 deg");
    }
    if (frac) {
      il.day_fraction = frac->number();
      if (!(il.day_fraction >= 0.0 && il.day_fraction <= 1.0)) frac->fail("a fraction from 0 to 1");
    }
  } else {
    if (frac)
      frac->fail("no 'day_fraction' with 'latitude' (the quadrature gives the day length)",
                 frac->describe());
    il.form = IlluminationForm::kDiurnal;
    il.latitude_rad = angle(*lat, ctx.units, "30 deg");
    if (std::abs(il.latitude_rad) > deg90) lat->fail("a latitude from -90 to 90 deg");
    const auto d = n.child("declination");
    il.declination_rad = angle(d, ctx.units, "0 deg");
    if (std::abs(il.declination_rad) > deg90) d.fail("a declination from -90 to 90 deg");
    if (pts) {
      const long k = pts->integer();
      if (k < 1 || k > 64) pts->fail("a number of points from 1 to 64");
      il.hour_angle_points = static_cast<int>(k);
    }
  }
}

/// An aerosol optical property: a number, {column: NAME} of the aerosol table, or a function
/// of wavelength {table: FILE, column: NAME, wavelength_column: wavelength}. Values must lie
/// in [lo, hi].
OpticalPropertySpec load_optical_property(const ConfigNode& n, Ctx& ctx, const Table& aerosol,
                                          const std::string& what, double lo, double hi) {
  OpticalPropertySpec p;
  const std::string range = fmt::format("{} from {} to {}", what, lo, hi);
  auto check = [&](double v) { return v >= lo && v <= hi; };
  if (n.is_scalar()) {
    p.form = OpticalPropertyForm::kConstant;
    p.value = n.number();
    if (!check(p.value)) n.fail("a " + range);
    return p;
  }
  if (n.find("table") && n.find("altitude_column")) {
    // Rows (altitude, wavelength, value), in blocks of one altitude each: altitudes
    // increasing from block to block, wavelengths increasing within a block.
    p.form = OpticalPropertyForm::kAltitudeWavelength;
    const std::string alt = n.child("altitude_column").text();
    const TableRef ref = table_ref(n, TableRefForm::wavelength("value", false));
    n.done();
    const std::string &column = ref.column, &wl = ref.axis_column;
    const Table t = Table::read(ref.file);
    const auto z = t.column(alt, ctx.units, "cm");
    const auto x = t.column(wl, ctx.units, "nm");
    const auto v = t.column(column, ctx.units, "1");
    for (std::size_t r = 0; r < t.rows(); ++r) {
      if (!check(v[r])) t.fail_row(r, column, "a " + range, message_number(t.raw(column)[r]));
      if (!(x[r] > 0.0)) t.fail_row(r, wl, "a positive wavelength", message_number(t.raw(wl)[r]));
      const bool new_block = r == 0 || z[r] != z[r - 1];
      if (new_block) {
        if (r > 0 && !(z[r] > z[r - 1])) {
          t.fail_row(r, alt, "altitudes increasing from block to block",
                     std::to_string(t.raw(alt)[r]));
        }
        p.grid_altitude_cm.push_back(z[r]);
        p.spectra.push_back(TabulatedSpectrum{{}, {}, table_label(t)});
      } else if (!(x[r] > x[r - 1])) {
        t.fail_row(r, wl, "wavelengths increasing within an altitude",
                   message_number(t.raw(wl)[r]));
      }
      p.spectra.back().wavelength_nm.push_back(x[r]);
      p.spectra.back().value.push_back(v[r]);
    }
    if (p.spectra.size() < 2) {
      t.fail_row(0, alt, "at least two altitudes (one: give the wavelength table alone)",
                 "one altitude");
    }
    if (ctx.inputs) ctx.inputs->push_back(InputFile{"aerosol " + what, ref.file, t.text()});
    return p;
  }
  if (n.find("table")) {
    p.form = OpticalPropertyForm::kWavelength;
    Table t;
    p.by_wavelength = read_spectrum_table(n, ctx, "aerosol " + what, "value", "1", &t);
    for (std::size_t r = 0; r < p.by_wavelength.value.size(); ++r) {
      if (!check(p.by_wavelength.value[r])) {
        t.fail_row(r, "value", "a " + range, message_number(p.by_wavelength.value[r]));
      }
    }
    return p;
  }
  const auto c = n.child("column");
  n.done();
  p.form = OpticalPropertyForm::kAltitude;
  p.by_altitude = aerosol.column(c.text(), ctx.units, "1");
  for (std::size_t r = 0; r < p.by_altitude.size(); ++r) {
    if (!check(p.by_altitude[r])) {
      aerosol.fail_row(r, c.text(), "a " + range, message_number(p.by_altitude[r]));
    }
  }
  return p;
}

void load_aerosol(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec) {
  AerosolSpec& a = spec.aerosols.emplace_back();
  const TableRef ref = table_ref(n, TableRefForm::altitude("extinction"));
  if (auto e = n.find("wavelength_exponent")) a.wavelength_exponent = e->number();
  if (auto r = n.find("reference_wavelength")) {
    a.reference_nm = r->quantity(ctx.units, "nm", "550 nm");
    if (!(a.reference_nm > 0.0)) r->fail("a positive wavelength");
  }
  const auto ssa = n.find("single_scattering_albedo");
  const auto asym = n.find("asymmetry");
  n.done();
  const Table t = ref.read();
  const std::string& column = ref.column;
  auto prof = ref.profile(t, ctx.units, "cm", "cm-1");
  a.altitude_cm = std::move(prof.axis);
  a.extinction_cm1 = std::move(prof.value);
  for (std::size_t r = 0; r < a.extinction_cm1.size(); ++r) {
    if (!(a.extinction_cm1[r] >= 0.0))
      t.fail_row(r, column, "an extinction >= 0", message_number(t.raw(column)[r]));
  }
  if ((ssa ? 1 : 0) + (asym ? 1 : 0) == 1) {
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

// photolysis.prescribed: a list of {channel, table[, column, altitude_column]} or
// {channel, value}.
void load_prescribed(const ConfigNode& list, Ctx& ctx, PhotolysisSpec& spec) {
  std::vector<std::string> names;
  for (const auto& c : spec.channels) names.push_back(c.name);
  for (const auto& n : list.items()) {
    PrescribedJSpec p;
    const auto channel = n.child("channel");
    const bool table = n.has("table");
    const auto value = n.find("value");
    const bool columns = n.has("column") || n.has("altitude_column");
    const TableRef ref = table ? table_ref(n, TableRefForm::altitude("J")) : TableRef{};
    n.done();
    p.channel = channel.text();
    const auto it = std::find(names.begin(), names.end(), p.channel);
    if (it == names.end()) {
      std::string hint;
      if (auto near = nearest_word(p.channel, names)) hint = "did you mean '" + *near + "'?";
      channel.fail(fmt::format("a channel of the photolysis data ({})", fmt::join(names, ", ")),
                   "'" + p.channel + "'", hint);
    }
    p.channel_index = static_cast<std::size_t>(it - names.begin());
    for (const auto& q : spec.prescribed) {
      if (q.channel == p.channel)
        channel.fail("each channel prescribed once", "a repeat of '" + p.channel + "'");
    }
    if ((table ? 1 : 0) + (value ? 1 : 0) != 1) {
      n.fail("exactly one of 'table' (a J profile) and 'value' (a J held at every altitude)",
             table ? "both" : "neither");
    }
    if (value) {
      if (columns) n.fail("'column' and 'altitude_column' only with 'table'", "'value'");
      p.held = true;
      p.value_s1 = value->quantity(ctx.units, "s-1", "2e-6 s-1");
      if (!(p.value_s1 >= 0.0)) value->fail("a J >= 0", value->describe());
    } else {
      const Table t = ref.read();
      const std::string& col = ref.column;
      auto prof = ref.profile(t, ctx.units, "cm", "s-1");
      p.altitude_cm = std::move(prof.axis);
      p.j_s1 = std::move(prof.value);
      for (std::size_t r = 0; r < p.j_s1.size(); ++r) {
        if (!(p.j_s1[r] >= 0.0) || !std::isfinite(p.j_s1[r])) {
          t.fail_row(r, col, "a finite J >= 0", message_number(t.raw(col)[r]));
        }
      }
      p.source = ref.file.string();
      if (ctx.inputs) ctx.inputs->push_back(InputFile{"prescribed J table", ref.file, t.text()});
    }
    spec.prescribed.push_back(std::move(p));
  }
}

void load_radiative_transfer(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec) {
  RadiativeTransferSpec& rt = spec.radiative_transfer;
  const auto scheme = n.child("scheme");
  const auto closure = n.find("closure");
  const auto delta = n.find("delta_scaling");
  const auto albedo = n.find("surface_albedo");
  n.done();
  rt.scheme = scheme.choice({"direct_beam", "two_stream"}) == "two_stream"
                  ? RadiativeTransferScheme::kTwoStream
                  : RadiativeTransferScheme::kDirectBeam;
  if (rt.scheme == RadiativeTransferScheme::kDirectBeam) {
    for (const auto& k : {closure, delta, albedo}) {
      if (k)
        k->fail("no two-stream settings with 'scheme: direct_beam'", k->describe(),
                "use scheme: two_stream");
    }
    return;
  }
  if (closure) {
    const std::string c = closure->choice({"eddington", "quadrature", "hemispheric_mean"});
    rt.closure = c == "eddington"    ? TwoStreamClosure::kEddington
                 : c == "quadrature" ? TwoStreamClosure::kQuadrature
                                     : TwoStreamClosure::kHemisphericMean;
  }
  if (delta) rt.delta_scaling = delta->boolean();
  if (albedo) {
    if (albedo->is_scalar()) {
      rt.surface_albedo = albedo->number();
      if (!(rt.surface_albedo >= 0.0 && rt.surface_albedo <= 1.0))
        albedo->fail("an albedo from 0 to 1");
    } else {
      Table t;
      rt.surface_albedo_table =
          read_spectrum_table(*albedo, ctx, "surface albedo", "albedo", "1", &t);
      for (std::size_t r = 0; r < rt.surface_albedo_table.value.size(); ++r) {
        if (rt.surface_albedo_table.value[r] > 1.0) {
          t.fail_row(r, "albedo", "an albedo from 0 to 1",
                     std::to_string(rt.surface_albedo_table.value[r]));
        }
      }
    }
  }
}

// --- Data file ----------------------------------------------------------------------

void load_cross_section(const ConfigNode& n, Ctx& ctx, AbsorberSpec& ab, PhotolysisSpec& spec) {
  const std::string role = "cross section of " + ab.species;
  if (!n.is_scalar()) {
    ParameterUse use;
    use.target = ParameterTarget::kCrossSectionScale;
    use.absorber = spec.absorbers.size();
    read_scale_key(n, use, spec);
  }
  if (n.is_scalar()) {
    ab.cross_section.tables.push_back(read_spectrum_table(n, ctx, role, "cross_section", "cm2"));
    return;
  }
  const auto one = n.find("table");
  const auto many = n.find("tables");
  if ((one ? 1 : 0) + (many ? 1 : 0) != 1) n.fail("exactly one of 'table' or 'tables'");
  if (one) {
    ab.cross_section.tables.push_back(read_spectrum_table(n, ctx, role, "cross_section", "cm2"));
    return;
  }
  n.done();
  for (const auto& item : many->items()) {
    const auto T = item.child("temperature");
    const double TK = T.quantity(ctx.units, "K", "295 K");
    if (!(TK > 0.0)) T.fail("a positive temperature");
    if (!ab.cross_section.temperature_K.empty() && !(TK > ab.cross_section.temperature_K.back())) {
      T.fail("temperatures increasing down the list", T.describe());
    }
    ConfigNode tn = item;
    tn.allow({"temperature"});
    ab.cross_section.temperature_K.push_back(TK);
    ab.cross_section.tables.push_back(
        read_spectrum_table(tn, ctx, role + " at " + T.text(), "cross_section", "cm2"));
  }
  if (ab.cross_section.tables.empty()) many->fail("at least one {temperature, table}");
}

OvertoneBandSpec load_band(const ConfigNode& n, Ctx& ctx, PhotolysisSpec& spec, std::size_t band) {
  OvertoneBandSpec b;
  if (auto l = n.find("label")) b.label = l->text();
  const auto c = n.child("center");
  b.center_nm = c.quantity(ctx.units, "nm", "740 nm");
  if (!(b.center_nm > 0.0)) c.fail("a positive wavelength");
  const auto w = n.child("width");
  const auto wq = split_quantity(w.text());
  if (wq && same_dimension(ctx.units, wq->unit, "cm-1")) {
    b.fwhm_cm1 = w.quantity(ctx.units, "cm-1", "100 cm-1");
  } else {
    // A width in wavelength, as a width in wavenumber.
    const double wl_nm = w.quantity(ctx.units, "nm", "5 nm' or '100 cm-1");
    b.fwhm_cm1 = wavenumber_width(wl_nm, b.center_nm);
  }
  if (!(b.fwhm_cm1 > 0.0)) w.fail("a positive width");
  if (auto s = n.find("shape")) {
    b.shape = s->choice({"gaussian", "lorentzian"}) == "gaussian" ? BandShape::kGaussian
                                                                  : BandShape::kLorentzian;
  }
  const auto S = n.find("strength");
  const auto f = n.find("oscillator_strength");
  if ((S ? 1 : 0) + (f ? 1 : 0) != 1) {
    n.fail("exactly one of 'strength' (cm, integrated over wavenumber) or 'oscillator_strength'");
  }
  ParameterUse use;
  use.target = ParameterTarget::kBandStrength;
  use.absorber = spec.absorbers.size();
  use.band = band;
  if (S) {
    b.strength_cm = read_parametric(
        *S,
        [&](const ConfigNode& q, const std::string& unit) {
          if (!same_dimension(ctx.units, unit, "cm"))
            q.fail("a band strength in a length unit ('1e-20 cm')", "unit '" + unit + "'");
          return Conversion{*ctx.units.convert(1.0, unit, "cm"), false};
        },
        use, spec);
    if (!(b.strength_cm >= 0.0)) S->fail("a strength >= 0");
  } else {
    // S = (pi e^2 / (m_e c^2)) f.
    b.strength_cm = read_parametric(
        *f,
        [&](const ConfigNode& q, const std::string& unit) {
          if (!unit.empty())
            q.fail("an oscillator strength (a number without a unit)", "unit '" + unit + "'");
          return Conversion{band_strength_from_oscillator(1.0), false};
        },
        use, spec);
    if (!(b.strength_cm >= 0.0)) f->fail("an oscillator strength >= 0");
  }
  n.done();
  return b;
}

double unit_fraction(const ConfigNode& n) {
  const double v = n.number();
  if (!(v >= 0.0 && v <= 1.0)) n.fail("a quantum yield from 0 to 1");
  return v;
}

QuantumYieldSpec load_yield(const ConfigNode& n, Ctx& ctx, const std::string& channel,
                            PhotolysisSpec& spec) {
  QuantumYieldSpec q;
  ParameterUse use;
  use.channel = spec.channels.size();
  if (n.is_scalar() || n.has("parameter") || n.has("value")) {
    q.form = YieldForm::kConstant;
    use.target = ParameterTarget::kYieldValue;
    const auto before = spec.parameter_uses.size();
    q.value = read_parametric(
        n,
        [](const ConfigNode& v, const std::string& unit) {
          if (!unit.empty())
            v.fail("a quantum yield (a number without a unit)", "unit '" + unit + "'");
          return Conversion{};
        },
        use, spec);
    if (spec.parameter_uses.size() == before && !(q.value >= 0.0 && q.value <= 1.0)) {
      n.fail("a quantum yield from 0 to 1");
    }
    return q;
  }
  use.target = ParameterTarget::kYieldScale;
  read_scale_key(n, use, spec);
  const auto table = n.find("table");
  const auto step = n.find("step");
  if ((table ? 1 : 0) + (step ? 1 : 0) != 1) {
    n.fail(
        "a number, {table: FILE}, {step: {below: WAVELENGTH, value: PHI}}, {parameter: NAME} "
        "or {value: PHI, scale: NAME}");
  }
  if (table) {
    q.form = YieldForm::kTable;
    Table t;
    q.table = read_spectrum_table(n, ctx, "quantum yield of " + channel, "quantum_yield", "1", &t);
    for (std::size_t r = 0; r < q.table.value.size(); ++r) {
      if (q.table.value[r] > 1.0)
        t.fail_row(r, "quantum_yield", "a quantum yield from 0 to 1",
                   std::to_string(q.table.value[r]));
    }
    return q;
  }
  n.done();
  q.form = YieldForm::kStep;
  const auto below = step->child("below");
  q.step_nm = below.quantity(ctx.units, "nm", "219 nm");
  if (!(q.step_nm > 0.0)) below.fail("a positive wavelength");
  q.below_value = unit_fraction(step->child("value"));
  q.above_value = 0.0;
  if (auto a = step->find("above_value")) q.above_value = unit_fraction(*a);
  step->done();
  return q;
}

}  // namespace

/// One entry of `channels:`; its absorber must be declared, its name new.
ChannelSpec load_channel(const ConfigNode& item, Ctx& ctx, PhotolysisSpec& spec,
                         const std::set<std::string>& absorbers, std::set<std::string>& names) {
  ChannelSpec ch;
  const auto nm = item.child("name");
  ch.name = nm.text();
  if (ch.name.empty() || ch.name.find_first_of(" \t/") != std::string::npos) {
    nm.fail("a channel name without spaces or '/' (it names the output variable J_<name>)");
  }
  if (!names.insert(ch.name).second) nm.fail("distinct channel names", "'" + ch.name + "' again");
  const auto ab = item.child("absorber");
  ch.absorber = ab.text();
  if (absorbers.count(ch.absorber) == 0) {
    std::string hint;
    const std::vector<std::string> declared(absorbers.begin(), absorbers.end());
    if (auto near = nearest_word(ch.absorber, declared)) hint = "did you mean '" + *near + "'?";
    ab.fail("an absorber declared under 'absorbers'", "'" + ch.absorber + "'", hint);
  }
  if (auto p = item.find("products")) ch.products = p->text();
  if (auto q = item.find("quantum_yield")) ch.quantum_yield = load_yield(*q, ctx, ch.name, spec);
  if (auto b = item.find("branching")) {
    ch.branching = b->number();
    if (!(ch.branching >= 0.0 && ch.branching <= 1.0)) b->fail("a branching fraction from 0 to 1");
  }
  ParameterUse use;
  use.channel = spec.channels.size();
  const auto t = item.find("threshold");
  if (t) {
    use.target = ParameterTarget::kThreshold;
    const auto before = spec.parameter_uses.size();
    ch.threshold_nm = read_parametric(
        *t,
        [&](const ConfigNode& q, const std::string& unit) {
          return threshold_conversion(q, ctx.units, unit);
        },
        use, spec);
    if (spec.parameter_uses.size() == before &&
        !(ch.threshold_nm > 0.0 && std::isfinite(ch.threshold_nm))) {
      t->fail("a positive wavelength or energy");
    }
  }
  if (auto w = item.find("onset_width")) {
    if (!t) w->fail("an 'onset_width' only with a 'threshold'", w->describe());
    use.target = ParameterTarget::kOnsetWidth;
    const auto before = spec.parameter_uses.size();
    ch.onset_width_cm1 = read_parametric(
        *w,
        [&](const ConfigNode& q, const std::string& unit) {
          return energy_conversion(q, ctx.units, unit);
        },
        use, spec);
    if (spec.parameter_uses.size() == before && !(ch.onset_width_cm1 >= 0.0)) {
      w->fail("an energy width >= 0");
    }
  }
  item.done();
  return ch;
}

/// `rayleigh: {GAS: {cross_section, at, exponent}}`: a key table per gas.
void load_rayleigh(const ConfigNode& ray, const UnitSystem& units, PhotolysisSpec& spec) {
  const double inf = std::numeric_limits<double>::infinity();
  for (const auto& [gas, node] : ray.entries()) {
    RayleighSpec r;
    r.gas = gas;
    const Key keys[] = {
        quantity("cross_section", &r.cross_section_cm2, "cm2", "4.5e-27 cm2", 0.0, inf,
                 "a cross section >= 0")
            .needed(),
        quantity("at", &r.reference_nm, "nm", "550 nm", 0.0, inf, "a positive wavelength")
            .above_lo()
            .needed(),
        number("exponent", &r.exponent, -inf, inf, "a finite number"),
    };
    read_keys(node, units, keys);
    node.done();
    spec.rayleigh.push_back(r);
  }
}

void load_photolysis_data(const std::filesystem::path& file, const UnitSystem& units,
                          PhotolysisSpec& spec, std::vector<InputFile>* inputs) {
  const ConfigDocument doc = ConfigDocument::load(file, ExitCode::kInputData);
  Ctx ctx{units, inputs};
  if (inputs) {
    inputs->push_back(InputFile{"photolysis data", file, doc.resolved_text()});
  }
  spec.data_source = file.string();
  const ConfigNode root = doc.root();
  if (auto d = root.find("description")) (void)d->text();
  if (auto s = root.find("source")) (void)s->text();

  std::set<std::string> absorbers;
  for (const auto& item : root.child("absorbers").items()) {
    AbsorberSpec ab;
    const auto sp = item.child("species");
    ab.species = sp.text();
    if (!absorbers.insert(ab.species).second)
      sp.fail("each absorber declared once", "'" + ab.species + "' again");
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

  std::set<std::string> names;
  if (auto chans = root.find("channels")) {
    for (const auto& item : chans->items()) {
      spec.channels.push_back(load_channel(item, ctx, spec, absorbers, names));
    }
  }

  if (auto ray = root.find("rayleigh")) load_rayleigh(*ray, units, spec);
  root.done();
}

PhotolysisSpec load_photolysis(const ConfigNode& n, const UnitSystem& units,
                               std::vector<InputFile>* inputs) {
  PhotolysisSpec spec;
  Ctx ctx{units, inputs};
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
  if (prescribed) {
    if (!prescribed->is_sequence()) {
      prescribed->fail("a list of {channel, table} or {channel, value}", prescribed->describe());
    }
    load_prescribed(*prescribed, ctx, spec);
  }
  load_spectrum(spectrum, ctx, spec);
  if (bins) load_bins(*bins, ctx, spec);
  if (illum) {
    load_illumination(*illum, ctx, spec);
  } else {
    spec.illumination.zenith_angle_rad = constants::kPi / 3.0;  // 60 deg
    spec.illumination.day_fraction = 0.5;
  }
  if (slant) {
    spec.slant_path = slant->choice({"plane_parallel", "spherical"}) == "spherical"
                          ? SlantPath::kSpherical
                          : SlantPath::kPlaneParallel;
  }
  if (spec.slant_path == SlantPath::kPlaneParallel &&
      spec.illumination.form == IlluminationForm::kFixed &&
      std::cos(spec.illumination.zenith_angle_rad) < 1e-6) {
    illum->child("zenith_angle")
        .fail("a zenith angle below 90 deg for plane_parallel paths",
              illum->child("zenith_angle").describe(), "use slant_path: spherical at 90 deg");
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
    // The value must make sense over the whole declared range of the parameter.
    const Parameter& p = mech->parameters[*idx];
    const ChannelSpec* ch = u.channel < spec.channels.size() ? &spec.channels[u.channel] : nullptr;
    for (const double x : {p.min, p.max}) {
      const double v = u.value(x);
      std::string bad;
      switch (u.target) {
        case ParameterTarget::kThreshold:
          if (!(v > 0.0 && std::isfinite(v))) bad = "a positive threshold";
          break;
        case ParameterTarget::kOnsetWidth:
        case ParameterTarget::kBandStrength:
        case ParameterTarget::kCrossSectionScale:
          if (!(v >= 0.0 && std::isfinite(v))) bad = "a value >= 0";
          break;
        case ParameterTarget::kYieldValue:
          if (!(v >= 0.0 && v <= 1.0)) bad = "a quantum yield from 0 to 1";
          break;
        case ParameterTarget::kYieldScale: {
          double top = 0.0;  // the largest yield the form gives before the scale
          const auto& q = ch->quantum_yield;
          if (q.form == YieldForm::kTable) {
            for (double y : q.table.value) top = std::max(top, y);
          } else {
            top = std::max(q.below_value, q.above_value);
          }
          if (!(v >= 0.0 && v * top <= 1.0)) bad = "a scaled quantum yield from 0 to 1";
          break;
        }
      }
      if (!bad.empty()) {
        throw InputError(
            ExitCode::kInputData, u.where, u.key_path,
            fmt::format("{} for every value of '{}' in [{}, {}]", bad, u.name, p.min, p.max),
            fmt::format("{:g} at {} = {}", v, u.name, x));
      }
    }
  }
  if (!mech) return;
  // A declared parameter that neither a reaction nor the photolysis data use does nothing.
  for (std::size_t i = 0; i < mech->parameters.size(); ++i) {
    bool used = std::any_of(spec.parameter_uses.begin(), spec.parameter_uses.end(),
                            [&](const ParameterUse& u) { return u.parameter == i; });
    for (const auto& rx : mech->reactions) {
      for (const auto& f : rx.scale) used = used || f.parameter == i;
    }
    if (!used) {
      const Parameter& p = mech->parameters[i];
      throw InputError(ExitCode::kInputData, p.where, "parameters." + p.name,
                       "a parameter that a reaction's 'scale' or the photolysis data ('" +
                           spec.data_source + "') refer to",
                       "'" + p.name + "', used by nothing",
                       "refer to it ({parameter: " + p.name + "} or {value: ..., scale: " + p.name +
                           "} in the photolysis data) or remove it");
    }
  }
}

void load_photolysis_section(const ConfigNode& section, const UnitSystem& units, Scenario& sc) {
  sc.photolysis = load_photolysis(section, units, &sc.inputs);
  sc.has_photolysis = true;
}

}  // namespace colchem
