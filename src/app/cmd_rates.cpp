// colchem rates: every thermal reaction's rate constant with its units and form, at given
// temperatures and pressures (a mechanism file) or along a scenario's column, as a table or
// CSV, for comparison with laboratory measurements.
//
// The values are those the solvers use: Kinetics::set_conditions evaluates them (the
// rate-law kernel of chem/rate_law.cpp, third-body efficiencies, named-parameter scaling).
// A "+ M" reaction whose law does not fold [M] in is reported with its own termolecular k
// (cm6 s-1), i.e. the solvers' k divided by its [M]; fall-off forms give the
// bimolecular-equivalent k at that [M] (cm3 s-1), as the JPL evaluation tabulates them.
#include <fmt/format.h>

#include <algorithm>
#include <iostream>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "app/commands.hpp"
#include "chem/kinetics.hpp"
#include "core/background.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "core/ideal_gas.hpp"
#include "core/units.hpp"
#include "io/dataset_writer.hpp"
#include "io/mechanism_loader.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"

namespace colchem::app {

namespace {

struct RatesOptions {
  std::string config;
  std::string mechanism;
  std::vector<std::string> sets;
  std::vector<double> temperature_K;
  std::vector<std::string> pressure;
  std::vector<double> air_density_cm3;
  std::vector<double> altitude_km;
  bool all_cells = false;
  std::vector<std::string> bulk;
  std::vector<std::string> match;
  std::string csv;
};

/// One set of conditions: temperature, air density and (for the table) its label.
struct Condition {
  double T = 0.0;
  double air = 0.0;
  std::optional<double> altitude_km;
};

/// p = n k T of a condition, in Pa.
double pressure_pa(const Condition& c) {
  return ideal_gas_pressure(c.air, c.T) * constants::kPaPerBarye;
}

/// Where each condition's numbers are evaluated: the chemistry and the bulk gases.
struct RatesProblem {
  std::shared_ptr<const Mechanism> mech;
  std::vector<std::size_t> modules;
  std::vector<double> parameters;
  std::map<std::string, double> bulk;
  std::vector<Condition> conditions;
};

InputError usage_error(const std::string& option, const std::string& expected,
                       const std::string& found) {
  return InputError(ExitCode::kUsage, SourceLocation{"command line", 0, 0}, option, expected,
                    found);
}

/// "1 bar", "10 mbar", "101325 Pa", "1 atm" -> dyn cm-2 (UDUNITS-2).
double pressure_dyn_cm2(const std::string& text, const UnitSystem& units) {
  const auto q = split_quantity(text);
  if (!q || q->unit.empty()) {
    throw usage_error("--pressure", "a pressure with its unit, e.g. \"1 bar\" or \"133.3 Pa\"",
                      "\"" + text + "\"");
  }
  const auto pa = units.convert(q->value, q->unit, "Pa");
  if (!pa || !(*pa > 0.0)) {
    throw usage_error("--pressure",
                      "a positive pressure in a pressure unit (Pa, mbar, bar, atm, Torr)",
                      "\"" + text + "\"");
  }
  return *pa / constants::kPaPerBarye;
}

/// NAME=x pairs of bulk mole fractions ([M] efficiencies are weighted by them).
std::map<std::string, double> parse_bulk(const std::vector<std::string>& items) {
  std::map<std::string, double> bulk;
  for (const auto& it : items) {
    const auto eq = it.find('=');
    std::size_t used = 0;
    double x = -1.0;
    if (eq != std::string::npos && eq > 0) {
      try {
        x = std::stod(it.substr(eq + 1), &used);
      } catch (const std::exception&) {
        used = 0;
      }
    }
    if (eq == std::string::npos || eq == 0 || used == 0 || used != it.size() - eq - 1 ||
        !(x >= 0.0 && x <= 1.0)) {
      throw usage_error("--bulk", "NAME=mole_fraction with 0 <= mole_fraction <= 1, e.g. CO2=0.965",
                        "\"" + it + "\"");
    }
    bulk[it.substr(0, eq)] = x;
  }
  return bulk;
}

std::vector<Condition> product_conditions(const RatesOptions& o, const UnitSystem& units) {
  if (!o.pressure.empty() && !o.air_density_cm3.empty()) {
    throw usage_error("--pressure/--air-density", "one of the two", "both");
  }
  std::vector<Condition> out;
  for (double T : o.temperature_K) {
    if (!(T > 0.0 && T < 1e5)) {
      throw usage_error("--temperature", "a temperature in K between 0 and 1e5",
                        fmt::format("{}", T));
    }
    if (!o.air_density_cm3.empty()) {
      for (double n : o.air_density_cm3) {
        if (!(n > 0.0)) {
          throw usage_error("--air-density", "a positive air number density in cm-3",
                            fmt::format("{}", n));
        }
        out.push_back({T, n, std::nullopt});
      }
      continue;
    }
    const std::vector<std::string> ps =
        o.pressure.empty() ? std::vector<std::string>{"1 atm"} : o.pressure;
    for (const auto& p : ps) {
      out.push_back({T, ideal_gas_density(pressure_dyn_cm2(p, units), T), std::nullopt});
    }
  }
  return out;
}

/// The column's cells at the requested altitudes (nearest cell centre), every cell, or
/// five spread from the bottom to the top.
std::vector<Condition> column_conditions(const RatesOptions& o, const Background& bg) {
  const auto& zc = bg.grid.center_cm;
  const std::size_t n = zc.size();
  std::vector<std::size_t> cells;
  if (o.all_cells) {
    for (std::size_t j = 0; j < n; ++j) cells.push_back(j);
  } else if (!o.altitude_km.empty()) {
    const double lo = bg.grid.edge_cm.front() * 1e-5, hi = bg.grid.edge_cm.back() * 1e-5;
    for (double z : o.altitude_km) {
      if (!(z >= lo && z <= hi)) {
        throw usage_error("--altitude",
                          fmt::format("an altitude within the column, {:g}-{:g} km", lo, hi),
                          fmt::format("{:g} km", z));
      }
      std::size_t best = 0;
      for (std::size_t j = 1; j < n; ++j) {
        if (std::abs(zc[j] - z * 1e5) < std::abs(zc[best] - z * 1e5)) best = j;
      }
      cells.push_back(best);
    }
  } else {
    const std::size_t k = std::min<std::size_t>(5, n);
    for (std::size_t i = 0; i < k; ++i) cells.push_back(k == 1 ? 0 : i * (n - 1) / (k - 1));
  }
  std::vector<Condition> out;
  for (auto j : cells) out.push_back({bg.temperature_K[j], bg.air_density_cm3[j], zc[j] * 1e-5});
  return out;
}

RatesProblem build_problem(const RatesOptions& o) {
  const UnitSystem units;
  RatesProblem pb;
  if (o.config.empty() == o.mechanism.empty()) {
    throw usage_error("CONFIG/--mechanism", "either a scenario file or --mechanism FILE",
                      o.config.empty() ? "neither" : "both");
  }
  if (!o.mechanism.empty()) {
    if (!o.sets.empty() || !o.altitude_km.empty() || o.all_cells) {
      throw usage_error("--set/--altitude/--all-cells", "a scenario file (these select its column)",
                        "--mechanism");
    }
    if (o.temperature_K.empty()) {
      throw usage_error("--temperature", "at least one temperature (K) with --mechanism", "none");
    }
    auto mech = load_mechanism(o.mechanism, units);
    for (std::size_t m = 0; m < mech->modules.size(); ++m) pb.modules.push_back(m);
    pb.parameters = mech->default_parameters();
    pb.mech = mech;
    // Without a bulk composition every efficiency counts the whole air density ([M] = n_air
    // times the efficiency of a gas no reaction names: 1).
    pb.bulk = o.bulk.empty() ? std::map<std::string, double>{{"", 1.0}} : parse_bulk(o.bulk);
    pb.conditions = product_conditions(o, units);
    return pb;
  }
  const Scenario sc = load_scenario(o.config, o.sets, units);
  if (!sc.chemistry.mechanism) {
    throw InputError(ExitCode::kConfig, SourceLocation{o.config, 0, 0}, "chemistry",
                     "a scenario with a chemistry section (a mechanism)", "no chemistry");
  }
  pb.mech = sc.chemistry.mechanism;
  pb.modules = sc.chemistry.modules;
  pb.parameters = sc.chemistry.parameters;
  const Background bg = build_background(sc.background);
  pb.bulk = o.bulk.empty() ? bg.bulk_mole_fraction : parse_bulk(o.bulk);
  if (!o.temperature_K.empty()) {
    if (!o.altitude_km.empty() || o.all_cells) {
      throw usage_error("--temperature",
                        "either conditions (--temperature ...) or column cells "
                        "(--altitude, --all-cells)",
                        "both");
    }
    pb.conditions = product_conditions(o, units);
  } else {
    if (!o.pressure.empty() || !o.air_density_cm3.empty()) {
      throw usage_error("--pressure/--air-density",
                        "--temperature as well (else the column's "
                        "own conditions are used)",
                        "no --temperature");
    }
    pb.conditions = column_conditions(o, bg);
  }
  return pb;
}

/// One reported reaction: its identity and k (the law's own) at every condition.
struct RateRow {
  std::string id, equation, form, units;
  std::vector<double> k, k_effective, M;
};

std::vector<RateRow> evaluate(const RatesProblem& pb, const std::vector<std::string>& match,
                              std::size_t& photolysis_skipped) {
  Kinetics kin(pb.mech, pb.modules, pb.parameters);
  std::vector<double> T, air;
  for (const auto& c : pb.conditions) {
    T.push_back(c.T);
    air.push_back(c.air);
  }
  kin.set_conditions(T, air, pb.bulk);
  const std::size_t N = T.size();
  const auto k = kin.rate_constants();
  const auto M = kin.third_body_densities();
  std::vector<RateRow> rows;
  photolysis_skipped = 0;
  for (std::size_t r = 0; r < kin.reaction_count(); ++r) {
    const std::size_t mi = kin.mechanism_reaction(r);
    const Reaction& rx = pb.mech->reactions[mi];
    if (rx.photon) {
      ++photolysis_skipped;
      continue;
    }
    RateRow row;
    row.id = rx.id;
    row.equation = rx.equation;
    if (!match.empty() && std::none_of(match.begin(), match.end(), [&](const std::string& m) {
          return row.id == m || row.equation.find(m) != std::string::npos;
        })) {
      continue;
    }
    row.form = rate_form_name(rx.rate.form);
    row.units = rate_constant_units(rx.rate_order());
    for (std::size_t j = 0; j < N; ++j) {
      const double keff = k[r * N + j], m = M[r * N + j];
      row.k_effective.push_back(keff);
      row.M.push_back(m);
      row.k.push_back(rx.multiplies_third_body() ? (m > 0.0 ? keff / m : 0.0) : keff);
    }
    rows.push_back(std::move(row));
  }
  return rows;
}

std::string csv_text(const RatesProblem& pb, const std::vector<RateRow>& rows) {
  std::string out =
      "reaction_id,equation,form,units,temperature_K,pressure_Pa,air_density_cm3,altitude_km,"
      "third_body_cm3,k,k_effective\n";
  for (const auto& row : rows) {
    for (std::size_t j = 0; j < pb.conditions.size(); ++j) {
      const auto& c = pb.conditions[j];
      const double p_pa = pressure_pa(c);
      out += fmt::format("{},\"{}\",{},{},{:.6g},{:.6g},{:.6e},{},{:.6e},{:.6e},{:.6e}\n", row.id,
                         row.equation, row.form, row.units, c.T, p_pa, c.air,
                         c.altitude_km ? fmt::format("{:.6g}", *c.altitude_km) : std::string(),
                         row.M[j], row.k[j], row.k_effective[j]);
    }
  }
  return out;
}

std::string table_text(const RatesProblem& pb, const std::vector<RateRow>& rows) {
  std::size_t eq_w = 8, id_w = 2;
  for (const auto& r : rows) eq_w = std::max(eq_w, std::min<std::size_t>(r.equation.size(), 44));
  for (const auto& r : rows) id_w = std::max(id_w, r.id.size());
  std::string head1 =
      fmt::format("{:<{}} {:<{}} {:<19} {:<8}", "id", id_w, "equation", eq_w, "form", "units");
  std::string head2 = fmt::format("{:<{}}", "", id_w + 1 + eq_w + 1 + 19 + 1 + 8);
  std::string head3 = head2;
  for (const auto& c : pb.conditions) {
    const double p_pa = pressure_pa(c);
    head1 += fmt::format(" {:>12}", c.altitude_km ? fmt::format("{:.4g} km", *c.altitude_km)
                                                  : fmt::format("{:.5g} K", c.T));
    head2 += fmt::format(
        " {:>12}", c.altitude_km ? fmt::format("{:.5g} K", c.T) : fmt::format("{:.4g} Pa", p_pa));
    head3 += fmt::format(" {:>12}", fmt::format("{:.3e}", c.air));
  }
  std::string out = head1 + "\n" + head2 + "\n" + head3 + "  (air, cm-3)\n";
  for (const auto& r : rows) {
    std::string eq = r.equation.size() > eq_w ? r.equation.substr(0, eq_w - 1) + "~" : r.equation;
    out += fmt::format("{:<{}} {:<{}} {:<19} {:<8}", r.id, id_w, eq, eq_w, r.form, r.units);
    for (double v : r.k) out += fmt::format(" {:>12.4e}", v);
    out += "\n";
  }
  return out;
}

}  // namespace

void add_rates_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out) {
  auto* cmd = app.add_subcommand(
      "rates",
      "Print every thermal rate constant of a mechanism (with units and form) at given "
      "temperatures and pressures, or along a scenario's column; a table or CSV.");
  auto o = std::make_shared<RatesOptions>();
  cmd->add_option("CONFIG", o->config,
                  "Scenario file (YAML): its mechanism, active modules, "
                  "parameters and column")
      ->check(CLI::ExistingFile);
  cmd->add_option("--mechanism", o->mechanism,
                  "A mechanism file instead of a scenario (every "
                  "module, default parameter values)")
      ->check(CLI::ExistingFile);
  cmd->add_option("--set", o->sets,
                  "Override a scenario value by its dotted key path "
                  "(repeatable), e.g. --set chemistry.parameters.beta=0.02");
  cmd->add_option("-T,--temperature", o->temperature_K, "Temperatures in K (several allowed)");
  cmd->add_option("-p,--pressure", o->pressure,
                  "Pressures with units, e.g. \"1 bar\" \"10 mbar\" "
                  "(default 1 atm); every temperature at every pressure");
  cmd->add_option("--air-density", o->air_density_cm3,
                  "Air number densities in cm-3 instead of "
                  "pressures");
  cmd->add_option("--altitude", o->altitude_km,
                  "Scenario column: the cells nearest to these "
                  "altitudes (km); default five cells bottom to top");
  cmd->add_flag("--all-cells", o->all_cells, "Scenario column: every cell (best with --csv)");
  cmd->add_option("--bulk", o->bulk,
                  "Bulk mole fractions weighting the third-body weights, "
                  "NAME=x (default: the scenario's; with --mechanism every "
                  "weight counts the whole air)");
  cmd->add_option("--reaction", o->match,
                  "Only reactions whose id (as in the mechanism file) is this or whose "
                  "equation contains this text (repeatable)");
  cmd->add_option("--csv", o->csv,
                  "Write CSV (one row per reaction and condition) to this file; "
                  "\"-\" for standard output instead of the table");
  out.emplace_back(cmd, [o](Context& ctx) {
    const RatesProblem pb = build_problem(*o);
    if (!o->csv.empty() && o->csv != "-") {
      std::vector<std::pair<std::string, std::filesystem::path>> inputs;
      if (!o->config.empty()) inputs.emplace_back("the scenario file", o->config);
      if (!o->mechanism.empty()) inputs.emplace_back("the mechanism file", o->mechanism);
      refuse_output_onto_input(o->csv, inputs);
    }
    std::size_t skipped = 0;
    const auto rows = evaluate(pb, o->match, skipped);
    if (!o->match.empty() && rows.empty()) {
      throw usage_error(
          "--reaction",
          "the id of an active thermal reaction (as in the mechanism file) or part of its "
          "equation",
          fmt::format("no match for {}", fmt::join(o->match, ", ")));
    }
    if (o->csv == "-") {
      std::cout << csv_text(pb, rows);
    } else {
      std::cout << fmt::format(
          "{} ({} thermal reactions; k as its law gives it, \"+ M\" "
          "termolecular laws without [M]; fall-off forms at the [M] shown)\n",
          pb.mech->name, rows.size());
      std::cout << table_text(pb, rows);
      if (skipped > 0) {
        std::cout << fmt::format(
            "{} photolysis reactions not listed (their J comes from the "
            "radiation field: see `colchem photo`)\n",
            skipped);
      }
      if (!o->csv.empty()) {
        write_text_file(o->csv, csv_text(pb, rows));
        ctx.log->info("wrote {}", o->csv);
      }
    }
    return 0;
  });
}

}  // namespace colchem::app
