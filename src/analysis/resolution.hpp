// Resolution as a result: Richardson extrapolation over a family of grids and
// equidistributed (solution-adapted) cell edges. Pure functions on profiles; the solves that
// produce them are in solve/resolution_runner.
//
// Richardson extrapolation (Roache 1998, Verification and Validation in Computational
// Science and Engineering, ch. 5): solutions u_1, u_2, u_3 on grids refined by a constant
// ratio r (cells N, rN, r^2 N) give the observed order and the error of the finest,
//   p = ln(|u_1 - u_2| / |u_2 - u_3|) / ln r,        e_3 = (u_2 - u_3) / (r^p - 1),
// so that u_exact ~ u_3 - e_3. Profiles are compared as log10 of the mole fraction at the
// coarsest grid's cell centres (finer solutions interpolated there linearly in altitude and
// log f); the differences are summarised by their maximum and root-mean-square over
// altitude. A profile is "asymptotic" when the order lies near the scheme's formal order 2
// (within [1.5, 2.5] by default, common practice, no source) and the differences shrink.
//
// Equidistribution (de Boor 1973, "Good approximation by splines with variable knots II";
// Huang and Russell 2011, Adaptive Moving Mesh Methods, ch. 2): the new edges z_k satisfy
//   int_{z_0}^{z_k} M dz = (k/N) int_{z_0}^{z_N} M dz
// for the monitor M(z) = sqrt(1 + c(z)/alpha) with the indicator
//   c(z) = max_s (|u_s''| + u_s'^2),  u_s = ln max(f_s, floor * max_z f_s),
// a bound on |f_s''/f_s| = |u_s'' + u_s'^2|, i.e. 1/L^2 for the local e-folding length L of
// a species' mole fraction. The study compares log10 f, and a second-order scheme's error in
// ln f over a cell is ~(h/L)^2: with M ~ 1/L every e-fold of every species (down to the
// comparison's floor, 1e-10 of its peak) gets the same number of cells, where a monitor of
// the curvature of f itself sees only the species near their peaks. alpha = (mean over z of
// sqrt(c))^2 (s/(1 - s))^2 gives the uniform part the share s of the monitor's integral (s =
// 1/2: both parts the same weight, Huang and Russell's choice of the intensity parameter,
// from memory). The monitor is smoothed with
// (1/4, 1/2, 1/4) passes; then the cell widths it asks for, h(z) = (int M dz / N) / M(z),
// are gradient-limited before the edges are placed, h(z) <= h(z') + g |z - z'| with
// g = 2 (r - 1)/(r + 1) (a geometric sequence of ratio r has exactly this slope between
// neighbouring centres; gradient limiting of a mesh size function: Persson 2006, Engineering
// with Computers 22, 95, from memory), so that the ratio bound r of neighbouring widths holds
// without stretching the thin cells afterwards; a last pass enforces it exactly. Altitudes in
// cm; f dimensionless.
#pragma once

#include <cstddef>
#include <limits>
#include <span>
#include <string>
#include <vector>

#include "core/grid.hpp"

namespace colchem {

enum class ResolutionStatus {
  kAsymptotic,     ///< order within the accepted range, differences shrinking
  kNotAsymptotic,  ///< order far from the formal order, or differences not shrinking
  kResolved,       ///< differences below the resolved threshold: no order to measure
  kFailed,         ///< a level did not converge (or no point to compare)
};
std::string resolution_status_name(ResolutionStatus s);

struct AsymptoticRange {
  double formal_order = 2.0;
  double low = 1.5;
  double high = 2.5;
  /// Differences (in the compared quantity) at or below this count as resolved.
  double resolved_below = 1e-7;
};

struct RichardsonEstimate {
  double order = std::numeric_limits<double>::quiet_NaN();  ///< observed order p
  /// Error of the finest, (u_2 - u_3)/(r^q - 1) with q = p when asymptotic, else the formal
  /// order; signed for scalars, a magnitude for norms.
  double error = std::numeric_limits<double>::quiet_NaN();
  ResolutionStatus status = ResolutionStatus::kFailed;
};

/// Observed order from the differences coarse-medium and medium-fine at refinement ratio r.
double observed_order(double diff_coarse, double diff_fine, double ratio);

/// Richardson from two difference magnitudes (norms), d12 = |u_1 - u_2|, d23 = |u_2 - u_3|.
RichardsonEstimate richardson_from_differences(double d12, double d23, double ratio,
                                               const AsymptoticRange& range);

/// Richardson for a scalar computed on three grids (coarse, medium, fine).
RichardsonEstimate richardson_scalar(double coarse, double medium, double fine, double ratio,
                                     const AsymptoticRange& range);

/// Splits every cell into `factor` equal cells.
std::vector<double> refine_edges(std::span<const double> edges_cm, std::size_t factor);

/// Mole fractions of one species on another set of altitudes, interpolated linearly in
/// altitude and log f (the interpolation of the scores); NaN outside the profile.
std::vector<double> profile_at(std::span<const double> altitude_cm, std::span<const double> f,
                               std::span<const double> at_cm);

struct DifferenceNorms {
  double max = 0.0;
  double rms = 0.0;
  std::size_t points = 0;
};
/// max and RMS of |a - b| over the points where `use` is set and both are finite.
DifferenceNorms difference_norms(std::span<const double> a, std::span<const double> b,
                                 const std::vector<bool>& use);

/// One species over the grid family. Levels are coarsest first.
struct SpeciesResolution {
  std::string species;
  /// log10 f on the comparison altitudes, [level][k]; NaN where a level failed.
  std::vector<std::vector<double>> log10_f;
  std::vector<bool> compared;  ///< altitudes counted (f above the floor on every converged level)
  /// Differences between consecutive levels, [level pair], pair i = levels i and i+1.
  std::vector<DifferenceNorms> differences;
  /// Per consecutive triple (levels i, i+1, i+2): the observed order from the RMS and the
  /// max norms.
  std::vector<double> order_rms, order_max;
  /// The finest triple: the estimates from the RMS and max norms and the status.
  RichardsonEstimate by_rms, by_max;
  ResolutionStatus status = ResolutionStatus::kFailed;
  /// Error of the finest level's log10 f at each comparison altitude (NaN where not compared).
  std::vector<double> error_log10;
  double error_max = std::numeric_limits<double>::quiet_NaN();  ///< max |error_log10|
  double error_rms = std::numeric_limits<double>::quiet_NaN();
};

struct ResolutionOptions {
  AsymptoticRange range;
  /// Altitudes where f < relative_floor * max_z f (of that species, on any level) are not
  /// compared: there the profile is below any meaningful tolerance of the solve.
  double relative_floor = 1e-10;
  /// The share s of the monitor's integral (and so of the cells) in its uniform part.
  double uniform_share = 0.5;
};

/// Compares one species' profiles on a grid family refined by `ratio`.
/// altitude_cm[l] are the cell centres of level l, f[l] the mole fractions there (empty when
/// the level failed); the comparison altitudes are the centres of level 0.
SpeciesResolution compare_species(const std::string& name,
                                  const std::vector<std::vector<double>>& altitude_cm,
                                  const std::vector<std::vector<double>>& f, double ratio,
                                  const ResolutionOptions& options);

// ---- equidistribution ----

struct EquidistributionOptions {
  int smoothing_passes = 2;          ///< (1/4, 1/2, 1/4) passes over the monitor
  double max_neighbour_ratio = 1.2;  ///< bound on h_{j+1}/h_j and h_j/h_{j+1}
  /// Mole fractions below this fraction of the species' peak count as the floor (the
  /// comparison's ResolutionOptions::relative_floor).
  double relative_floor = 1e-10;
  /// The share s of the monitor's integral (and so of the cells) in its uniform part.
  double uniform_share = 0.5;
};

/// c_j = max_s (|u''| + u'^2) at the cell centres, u = ln max(f_s, floor * peak_s)
/// (three-point first and second derivatives on non-uniform centres, both exact for
/// quadratic u; the end cells take their neighbour's value): the inverse square of the
/// shortest e-folding length there (cm^-2). f is [s*N + j]; species with a zero maximum or
/// with mask false are skipped.
std::vector<double> curvature_indicator(const Grid& grid, std::span<const double> f,
                                        std::size_t species, const std::vector<bool>& use,
                                        double relative_floor = 1e-10);

/// M_j = sqrt(1 + c_j/alpha), alpha = (sum_j h_j sqrt(c_j) / sum_j h_j)^2 (s/(1 - s))^2
/// with s = uniform_share in (0, 1) (M = 1 where c vanishes everywhere), then smoothed.
std::vector<double> monitor_from_indicator(const Grid& grid, std::span<const double> c,
                                           int smoothing_passes, double uniform_share = 0.5);

/// The monitor of `grid` (one value per cell) resampled on `subcells` equal parts of every
/// cell, with the widths it asks for gradient-limited to the ratio r of neighbouring widths
/// for `cells` new cells (see the header comment): returns the sample edges and the limited
/// monitor on them, ready for equidistribute().
struct SampledMonitor {
  std::vector<double> edges_cm;
  std::vector<double> M;
};
SampledMonitor gradient_limited_monitor(const Grid& grid, std::span<const double> M,
                                        std::size_t cells, double r, std::size_t subcells = 16);

/// Edges of `cells` cells over [edges.front(), edges.back()] with equal integrals of the
/// piecewise-constant monitor M (one value per old cell).
std::vector<double> equidistribute(std::span<const double> edges_cm, std::span<const double> M,
                                   std::size_t cells);

/// Bounds the ratio of neighbouring widths by r (shrinking the widths that exceed it, then
/// stretching all to the same span); ends stay fixed.
std::vector<double> limit_neighbour_ratio(std::span<const double> edges_cm, double r);

/// The composition: indicator of the profiles f [s*N + j] on `grid`, monitor, gradient
/// limit, equidistributed edges with `cells` cells, ratio bound.
std::vector<double> equidistributed_edges(const Grid& grid, std::span<const double> f,
                                          std::size_t species, const std::vector<bool>& use,
                                          std::size_t cells,
                                          const EquidistributionOptions& options);

}  // namespace colchem
