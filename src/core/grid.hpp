// The vertical grid: N cells with edges z_{j-1/2}, z_{j+1/2} and centres z_j (finite volume).
// Internal lengths are cm; `*_km` accessors exist for output.
#pragma once

#include <vector>

namespace colchem {

struct Grid {
  std::vector<double> edge_cm;    ///< N+1 edges, strictly increasing
  std::vector<double> center_cm;  ///< N centres, midway between edges

  [[nodiscard]] std::size_t cells() const { return center_cm.size(); }
  [[nodiscard]] double width_cm(std::size_t j) const { return edge_cm[j + 1] - edge_cm[j]; }

  /// Uniform cells between bottom and top.
  static Grid uniform(double bottom_cm, double top_cm, std::size_t cells);
  /// Cells from listed edges (strictly increasing, at least two).
  static Grid from_edges(std::vector<double> edges_cm);
};

}  // namespace colchem
