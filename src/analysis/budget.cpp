#include "analysis/budget.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <stdexcept>

#include "chem/condensation.hpp"
#include "core/constants.hpp"

namespace colchem {

namespace {
std::size_t find_species(const BudgetInputs& in, const std::string& name) {
  for (std::size_t s = 0; s < in.species.size(); ++s) {
    if (in.species[s] == name) return s;
  }
  throw std::invalid_argument("no species '" + name + "' in the run");
}

/// Integral over [lo, hi] of a cell-centred density x (piecewise constant in cells).
double band_integral(const std::vector<double>& edge, std::span<const double> x, double lo,
                     double hi) {
  double sum = 0.0;
  for (std::size_t j = 0; j + 1 < edge.size(); ++j) {
    const double a = std::max(lo, edge[j]);
    const double b = std::min(hi, edge[j + 1]);
    if (b > a) sum += x[j] * (b - a);
  }
  return sum;
}
}  // namespace

SpeciesBudget species_budget(const BudgetInputs& in, const std::string& species,
                             const std::vector<double>& band_edges_cm) {
  const std::size_t S = in.species.size();
  const std::size_t N = in.edge_cm.size() - 1;
  const std::size_t R = in.equations.size();
  const std::size_t s = find_species(in, species);
  SpeciesBudget b;
  b.species = species;
  b.band_edges_cm = band_edges_cm;
  const std::size_t nb = band_edges_cm.empty() ? 0 : band_edges_cm.size() - 1;
  b.band_production.assign(nb, 0.0);
  b.band_loss.assign(nb, 0.0);
  b.band_transport.assign(nb, 0.0);
  const double lo = in.edge_cm.front(), hi = in.edge_cm.back();

  std::vector<double> contrib(N);
  for (std::size_t r = 0; r < R; ++r) {
    const double nu = in.net_stoichiometry[r * S + s];
    if (nu == 0.0) continue;
    for (std::size_t j = 0; j < N; ++j) contrib[j] = nu * in.reaction_rate[r * N + j];
    BudgetTerm t;
    t.reaction = r;
    t.equation = in.equations[r];
    if (r < in.reaction_ids.size()) t.id = in.reaction_ids[r];
    t.column = band_integral(in.edge_cm, contrib, lo, hi);
    for (std::size_t k = 0; k < nb; ++k) {
      t.bands.push_back(band_integral(in.edge_cm, contrib, band_edges_cm[k], band_edges_cm[k + 1]));
      (nu > 0 ? b.band_production[k] : b.band_loss[k]) += std::abs(t.bands.back());
    }
    if (nu > 0) {
      b.column_production += t.column;
      b.production.push_back(std::move(t));
    } else {
      b.column_loss -= t.column;
      b.loss.push_back(std::move(t));
    }
  }
  for (auto& t : b.production) t.share = b.column_production > 0 ? t.column / b.column_production : 0.0;
  for (auto& t : b.loss) t.share = b.column_loss > 0 ? -t.column / b.column_loss : 0.0;
  auto by_size = [](const BudgetTerm& x, const BudgetTerm& y) {
    return std::abs(x.column) > std::abs(y.column);
  };
  std::stable_sort(b.production.begin(), b.production.end(), by_size);
  std::stable_sort(b.loss.begin(), b.loss.end(), by_size);

  const std::span<const double> tr(in.transport_tendency.data() + s * N, N);
  const std::span<const double> net(in.net_tendency.data() + s * N, N);
  b.column_transport = band_integral(in.edge_cm, tr, lo, hi);
  for (std::size_t k = 0; k < nb; ++k) {
    b.band_transport[k] = band_integral(in.edge_cm, tr, band_edges_cm[k], band_edges_cm[k + 1]);
  }
  b.column_net = b.column_production - b.column_loss + b.column_transport;
  b.column_net_model = band_integral(in.edge_cm, net, lo, hi);
  // Closure cell by cell (a column sum could hide cancelling errors).
  double worst = 0.0, gross_total = 0.0;
  for (std::size_t j = 0; j < N; ++j) {
    double listed = tr[j], gross = std::abs(tr[j]);
    for (std::size_t r = 0; r < R; ++r) {
      const double c = in.net_stoichiometry[r * S + s] * in.reaction_rate[r * N + j];
      listed += c;
      gross += std::abs(c);
    }
    worst = std::max(worst, std::abs(listed - net[j]));
    gross_total = std::max(gross_total, gross);
  }
  b.closure = gross_total > 0 ? worst / gross_total : 0.0;
  return b;
}

std::vector<ElementBudget> element_budgets(
    const BudgetInputs& in, const std::vector<std::vector<std::pair<std::string, int>>>& atoms,
    const std::vector<bool>& held, std::span<const double> bottom_flux,
    std::span<const double> top_flux) {
  const std::size_t S = in.species.size();
  const std::size_t N = in.edge_cm.size() - 1;
  const std::size_t R = in.equations.size();
  std::map<std::string, ElementBudget> by_element;
  std::vector<int> kind(R, 0);  // 1 condensed phase, 2 held profile
  for (std::size_t r = 0; r < R; ++r) {
    if (in.equations[r].find(kCondensedPhaseMarker) != std::string::npos) kind[r] = 1;
    if (in.equations[r].find(kHeldProfileMarker) != std::string::npos) kind[r] = 2;
  }
  for (std::size_t s = 0; s < S; ++s) {
    for (const auto& [el, count] : atoms[s]) {
      ElementBudget& e = by_element[el];
      e.element = el;
      double chem = 0.0, chem_gross = 0.0;
      for (std::size_t r = 0; r < R; ++r) {
        const double nu = in.net_stoichiometry[r * S + s];
        if (nu == 0.0) continue;
        double col = 0.0;
        for (std::size_t j = 0; j < N; ++j) {
          col += nu * in.reaction_rate[r * N + j] * (in.edge_cm[j + 1] - in.edge_cm[j]);
        }
        chem += col;
        chem_gross += std::abs(col);
        if (kind[r] == 1) e.condensed += count * col;
        if (kind[r] == 2) e.profile_supply += count * col;
      }
      const double a = count;
      e.gross += a * chem_gross;
      if (held[s]) {
        e.held_supply += a * chem;
      } else {
        e.chemistry += a * chem;
        e.boundary_in += a * (bottom_flux[s] - top_flux[s]);
        e.gross += a * (std::abs(bottom_flux[s]) + std::abs(top_flux[s]));
      }
    }
  }
  std::vector<ElementBudget> out;
  for (auto& [el, e] : by_element) {
    e.sinks = e.chemistry + e.held_supply;
    e.imbalance = e.boundary_in + e.chemistry;
    e.relative_imbalance = e.gross > 0 ? std::abs(e.imbalance) / e.gross : 0.0;
    out.push_back(e);
  }
  return out;
}

std::string format_species_budget(const SpeciesBudget& b, std::size_t top) {
  std::string out = fmt::format(
      "{}: column production {:.4e}, loss {:.4e}, transport {:+.4e} cm-2 s-1; net {:+.3e} "
      "(model {:+.3e}); closure {:.1e}\n",
      b.species, b.column_production, b.column_loss, b.column_transport, b.column_net,
      b.column_net_model, b.closure);
  const std::size_t nb = b.band_edges_cm.empty() ? 0 : b.band_edges_cm.size() - 1;
  auto header = [&](const char* what) {
    std::string h = fmt::format("  {:<5} {:>7} {:>12}", what, "share", "column");
    for (std::size_t k = 0; k < nb; ++k) {
      h += fmt::format(" {:>11}", fmt::format("{:.0f}-{:.0f}km", b.band_edges_cm[k] / constants::kCmPerKm,
                                               b.band_edges_cm[k + 1] / constants::kCmPerKm));
    }
    return h + "  reaction\n";
  };
  // Band values are signed in the list's own sense (production: made; loss: removed), so a
  // reversible term that runs the other way in a band (an exchange that condenses in one
  // band and evaporates in another) shows there with a minus sign.
  auto rows = [&](const std::vector<BudgetTerm>& terms, double sense) {
    std::string r;
    for (std::size_t i = 0; i < terms.size() && i < top; ++i) {
      const auto& t = terms[i];
      r += fmt::format("  {:<5} {:6.1f}% {:12.4e}", i + 1, 100.0 * t.share, std::abs(t.column));
      for (double v : t.bands) r += fmt::format(" {:11.3e}", sense * v);
      r += "  " + (t.id.empty() ? std::string() : t.id + "  ") + t.equation + "\n";
    }
    if (terms.size() > top) r += fmt::format("  ({} more)\n", terms.size() - top);
    return r;
  };
  out += "production\n" + header("rank") + rows(b.production, 1.0);
  out += "loss\n" + header("rank") + rows(b.loss, -1.0);
  if (nb > 0) {
    out += "  transport by band:";
    for (double v : b.band_transport) out += fmt::format(" {:+.3e}", v);
    out += "\n";
  }
  return out;
}

}  // namespace colchem
