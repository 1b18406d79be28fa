// Sensitivities of one objective G(x) of a converged steady state F(x, p) = 0 to every
// parameter p of the column, by the discrete adjoint of the steady problem (Cacuci 1981,
// J. Math. Phys. 22, 2794; the discrete form as in Giles and Pierce 2000, Flow Turbul.
// Combust. 65, 393):
//   J^T lambda = (dG/dx)^T,     dG/dp = dG/dp|_x - lambda^T dF/dp|_x,
// one linear solve with the transposed Jacobian for all parameters (dx/dp = -J^-1 dF/dp
// from differentiating F(x(p), p) = 0). J is the full Jacobian of the Newton step: the
// block-tridiagonal part (transport, chemistry) plus the photolysis coupling J_nl = B DJ
// (ColumnModel::photolysis_jacobian; B local). With the direct beam DJ^T is applied
// exactly in reverse mode (PhotolysisModel::add_transpose_product, the cost of one J
// evaluation per product); with the two-stream scheme DJ is assembled column by column
// over the free absorber unknowns by central differences of J. The transposed system is solved by
// right-preconditioned GMRES with the transposed LU of the block-tridiagonal part as preconditioner
// (PtcLinearSolver::solve_transposed); rows of held species are unit rows, their lambda 0.
//
// Parameters and their dF/dp|_x:
//   rate constant of every active reaction r, as ln k_r: nu_r R_r per cell (exact); the
//     profile dG/d ln k_r(z_j) is the contribution of cell j (k_r scaled in that cell alone);
//   named parameters (rate scales and photolysis data): ColumnModel::parameter_tendency;
//   boundary values (Dirichlet mixing ratio or density, flux, deposition or escape
//     velocity), as ln b: central difference of the transport tendency at fixed x with
//     ln b +- 1e-4 (exact for the values the tendency is affine in; O(1e-8) for velocities);
//   eddy diffusion K scaled as a whole and per altitude band (edges of the band), as ln K:
//     the same central difference (the whole is the sum of the bands);
//   the stellar flux, as ln S: J is proportional to S, so dF/d ln S is the sum of the
//     photolysis reactions' rows.
// Objectives: chi-square against observations (log or linear residuals, analysis/
// score.hpp), a mole fraction at an altitude (interpolated as the score interpolates), a
// column amount (cm^-2), a column-integrated reaction rate (cm^-2 s^-1).
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "solve/column_model.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

enum class ObjectiveKind { kChiSquare, kMoleFraction, kColumn, kRate };

struct Objective {
  ObjectiveKind kind = ObjectiveKind::kColumn;
  std::size_t species = 0;   ///< mole fraction, column
  double altitude_cm = 0.0;  ///< mole fraction
  std::size_t reaction = 0;  ///< rate: active reaction index
  bool log_space = true;     ///< chi-square: log10 residuals (chi2_log), else linear
  const ObservationSet* observations = nullptr;  ///< chi-square (not owned)
  std::string label;                             ///< for tables and files
  std::string units;                             ///< UDUNITS of G
};

/// One observed point inside the model's altitude range as a residual of the chi-square
/// (analysis/score.hpp: observation_residual, through the point's kernel and altitude
/// uncertainty when it has them), 0 for an upper limit the model does not exceed, and its
/// derivative with respect to the densities it depends on: dr/dx[i] for each (i, dr/dx[i])
/// in `d` (x[j*S + s]; an index may appear more than once, the terms add). chi2 = sum r^2.
/// Every observed species must be a model species (InputError otherwise).
struct ObservationResidual {
  PointScore point;
  std::size_t species = 0;
  double r = 0.0;
  std::vector<std::pair<std::size_t, double>> d;
};
std::vector<ObservationResidual> observation_residuals(const ColumnModel& model,
                                                       const ObservationSet& obs, bool log_space,
                                                       std::span<const double> x);

/// Step in ln b and ln K of the central differences of the transport tendency at fixed x
/// that give dF/dp of boundary values and eddy scalings (here and in solve/fit.hpp).
inline constexpr double kTransportLogStep = 1e-4;

/// G at x (J-values refreshed at x by the caller). For the chi-square every observed species
/// must be a model species (InputError otherwise, as in score_column).
double objective_value(ColumnModel& model, const Objective& obj, std::span<const double> x);

enum class ParameterKind { kReaction, kNamed, kBoundary, kEddy, kStellarFlux };

/// One parameter of the column. Reactions, boundaries, K and the stellar flux are taken in
/// logarithm (a multiplier m = exp(step) on the value); named parameters as they are.
struct ParameterRef {
  ParameterKind kind = ParameterKind::kReaction;
  std::size_t index = 0;                 ///< reaction (active), named parameter, species (boundary)
  bool top = false;                      ///< boundary: top edge
  std::size_t edge_lo = 0, edge_hi = 0;  ///< K: edges [lo, hi] scaled
  std::string name;    ///< "k(12)", "beta_h2so3", "SO2 bottom mixing_ratio", "K 58-68 km"
  double value = 0.0;  ///< the parameter's value (1 for multipliers)
};

struct SensitivityRow {
  ParameterRef parameter;
  std::string equation;          ///< reactions: the equation; others: a description
  double dG = 0.0;               ///< dG/d ln p (log parameters) or dG/dp (named parameters)
  double log_sensitivity = 0.0;  ///< d ln G / d ln p (0 when G = 0 or p = 0)
};

struct SensitivityOptions {
  std::size_t eddy_bands = 5;  ///< K bands of equal height (0: only the whole profile)
  /// Transposed GMRES, on the unscaled residual: 1e-10 left errors of 3e-4 in sensitivities
  /// of Tellin's SO2 at 25 km (measured against finite differences); 1e-14 reaches 1e-6.
  double krylov_rtol = 1e-14;
  double shift = 1e-16;  ///< 1 / the Newton limit of the pseudo-time step
};

struct SensitivityResult {
  double value = 0.0;                      ///< G
  std::vector<double> lambda;              ///< adjoint [j*S + s] (0 for held species)
  std::vector<SensitivityRow> reactions;   ///< one per active reaction, mechanism order
  std::vector<double> reaction_profile;    ///< [r*N + j]: dG/d ln k_r from cell j
  std::vector<SensitivityRow> parameters;  ///< named, boundary, eddy, stellar flux
  int krylov_iterations = 0;
  bool photolysis_coupled = false;   ///< J_nl is part of the adjoint
  bool photolysis_reverse = false;   ///< J_nl^T applied in reverse mode (direct beam)
  std::size_t absorber_columns = 0;  ///< columns of DJ assembled (two-stream)
  double jacobian_s = 0.0, photolysis_jacobian_s = 0.0, solve_s = 0.0, parameters_s = 0.0,
         total_s = 0.0;
};

/// All sensitivities of `obj` at the converged state x. Throws RunError(kNotConverged) if
/// the adjoint solve fails.
SensitivityResult compute_sensitivities(ColumnModel& model, const Objective& obj,
                                        std::span<const double> x,
                                        const SensitivityOptions& opt = {});

/// Sets the model's parameter to exp(step) times its value (log parameters) or to value +
/// step (named parameters); step 0 restores it.
void perturb_parameter(ColumnModel& model, const ParameterRef& p, double step);

/// Central finite difference of G through the full nonlinear steady solve: G at p +- step,
/// each from a warm start at x with `opt` (tight tolerances), parameter restored after.
struct FiniteDifference {
  double dG = 0.0;
  bool converged = false;
  std::string reason;
};
FiniteDifference finite_difference(ColumnModel& model, const Objective& obj,
                                   std::span<const double> x, const ParameterRef& p, double step,
                                   const SteadyStateOptions& opt);

}  // namespace colchem
