#include "core/grid.hpp"

#include <stdexcept>

namespace colchem {

Grid Grid::uniform(double bottom_cm, double top_cm, std::size_t cells) {
  std::vector<double> edges(cells + 1);
  for (std::size_t j = 0; j <= cells; ++j) {
    edges[j] = bottom_cm + (top_cm - bottom_cm) * static_cast<double>(j) / static_cast<double>(cells);
  }
  return from_edges(std::move(edges));
}

Grid Grid::from_edges(std::vector<double> edges_cm) {
  if (edges_cm.size() < 2) throw std::invalid_argument("a grid needs at least two edges");
  for (std::size_t j = 1; j < edges_cm.size(); ++j) {
    if (!(edges_cm[j] > edges_cm[j - 1])) {
      throw std::invalid_argument("grid edges must increase strictly");
    }
  }
  Grid g;
  g.edge_cm = std::move(edges_cm);
  g.center_cm.resize(g.edge_cm.size() - 1);
  for (std::size_t j = 0; j + 1 < g.edge_cm.size(); ++j) {
    g.center_cm[j] = 0.5 * (g.edge_cm[j] + g.edge_cm[j + 1]);
  }
  return g;
}

}  // namespace colchem
