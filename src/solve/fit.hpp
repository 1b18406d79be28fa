// Fitting parameters of a steady column to observations: bounded nonlinear least squares
//   min_u  chi2(u) = sum_i r_i(x(u))^2,   F(x(u), u) = 0,   lo <= u <= hi,
// r_i the residuals of the chi-square of analysis/score.hpp (solve/adjoint.hpp
// observation_residuals), by PETSc TAO's bounded regularised Gauss-Newton (TAOBRGN, a
// Gauss-Newton model J^T J on TAO's bounded Newton line search; runtime options with the
// prefix "colchem_fit_"). Each residual evaluation is a steady solve warm-started from the
// state of the previous one (RunControls::warm_start).
//
// The residual Jacobian dr/du by forward sensitivities: differentiating F(x(u), u) = 0,
//   J_F dx/du_k = -dF/du_k,     dr_i/du_k = (dr_i/dx) dx/du_k,
// one linear solve per parameter with the full Jacobian of the Newton step (the
// block-tridiagonal part as LU preconditioner, the photolysis coupling by its product,
// GMRES: PtcLinearSolver::solve_coupled). With p parameters and m observed points this
// costs p solves where the adjoint would cost m; a fit has few parameters and the
// observations of a profile are many.
//   dF/du of a named parameter: ColumnModel::parameter_tendency (exact);
//   of a held profile's multiplier: ChemistryOperator::add_held_profile_derivative (exact);
//   of a boundary value or a K scaling: the central difference of the transport tendency at
//   fixed x with ln p +- kTransportLogStep (as the adjoint does).
// A parameter with `log` is fitted as u = ln p (quantities spanning decades).
//
// Uncertainties: the Gauss-Newton covariance C = (J^T J)^-1 at the best fit, in u, not
// scaled by the reduced chi-square: the observations' sigmas are taken as their true
// one-sigma errors, and then C is the covariance of the estimate to first order (Press,
// Teukolsky, Vetterling and Flannery, Numerical Recipes, 3rd ed. 2007, sections 15.4-15.5;
// scaling by chi2/(N - p) is their remedy when the sigmas are unknown, and the scaled
// sigmas are reported beside). Correlations C_kl / sqrt(C_kk C_ll). A parameter at a bound
// is flagged; its sigma is that of the unconstrained quadratic model.
#pragma once

#include <cstddef>
#include <functional>
#include <span>
#include <string>
#include <vector>

#include "analysis/observations.hpp"
#include "solve/adjoint.hpp"
#include "solve/column_model.hpp"
#include "solve/column_run.hpp"
#include "solve/steady_state.hpp"

namespace colchem {

/// kHeld: a multiplier of a species' held profile (species.NAME.hold; start 1).
enum class FitKind { kNamed, kBoundary, kEddy, kHeld };

/// One fitted parameter, resolved against the model (app/cmd_fit.cpp parses the text).
struct FitParameter {
  std::string path;  ///< as given: "chemistry.parameters.kscale",
                     ///< "species.SO2.bottom.mixing_ratio", "atmosphere.eddy_diffusion[58-68]"
  FitKind kind = FitKind::kNamed;
  std::size_t index = 0;                 ///< named parameter q, or species s (boundary, held)
  bool top = false;                      ///< boundary: top edge
  std::size_t edge_lo = 0, edge_hi = 0;  ///< K: edges [lo, hi] scaled
  double initial = 0.0;                  ///< the scenario's value (1 for a K scaling)
  double min = 0.0, max = 0.0;           ///< bounds on the value
  bool log = false;                      ///< fitted as ln(value)
};

struct FitOptions {
  bool log_space = true;    ///< residuals of chi2_log (else chi2_linear)
  int max_iterations = 50;  ///< Gauss-Newton iterations
  /// Converged when ||g|| of chi2/2 in u is below gatol: the Gauss-Newton step left,
  /// C g, is then at most sigma_max^2 gatol, far below one sigma; iterating further chases
  /// the noise of the steady solves (at ~1e-6 on Pyrene) in a minimum that is itself only a
  /// statistical estimate (Numerical Recipes, 3rd ed., section 15.5.2, makes the same point).
  double gatol = 1e-3;
  double grtol = 0.0;  ///< on ||g|| / |chi2 / 2| (0: off)
  double krylov_rtol = 1e-12;
  /// Iterations of one warm steady solve inside the fit at most (warm solves of the shipped
  /// worlds take 10-25); a solve that fails is retried by continuation: first half-way from
  /// the last converged point, up to continuation_depth halvings.
  int max_solve_iterations = 60;
  int continuation_depth = 3;
  std::function<bool()> stop_requested;
  spdlog::logger* log = nullptr;
};

struct FitResult {
  bool converged = false;
  std::string reason;
  std::vector<double> value, sigma, sigma_scaled;  ///< physical values; one-sigma
  std::vector<double> u, sigma_u;                  ///< the fitted variables (ln p for log)
  std::vector<double> correlation;                 ///< [k*p + l]
  std::vector<int> at_bound;                       ///< -1 lower, +1 upper, 0 free
  double chi2 = 0.0, chi2_initial = 0.0, reduced_chi2 = 0.0;
  std::size_t points = 0;                      ///< residuals (observed points inside)
  std::vector<double> x;                       ///< fitted state
  std::vector<ObservationResidual> residuals;  ///< at the best fit
  int iterations = 0;
  int steady_solves = 0;       ///< residual evaluations (warm steady solves)
  long newton_iterations = 0;  ///< over every steady solve
  int jacobians = 0;           ///< Jacobian evaluations (p linear solves each)
  double wall_s = 0.0, steady_s = 0.0, jacobian_s = 0.0;
};

class FitProblem {
 public:
  /// x0: a converged state at the parameters' initial values.
  FitProblem(ColumnModel& model, const SolverSpec& solver, const ObservationSet& obs,
             std::vector<FitParameter> params, std::vector<double> x0, FitOptions opt);

  [[nodiscard]] std::size_t size() const { return params_.size(); }
  [[nodiscard]] std::size_t points() const { return m_; }
  /// The initial fit variables (ln of the initial value for log parameters).
  [[nodiscard]] std::vector<double> initial_u() const;
  /// The value of parameter k at fit variable u_k.
  [[nodiscard]] double value_of(std::size_t k, double u) const;

  /// Sets the parameters to u and solves the steady state warm from the last converged
  /// state; r gets the residuals. false when the steady solve fails (r then unchanged).
  bool residuals(std::span<const double> u, std::vector<double>& r);
  /// dr/du [i*p + k] at u (solving the steady state first when u is not the last point).
  bool jacobian(std::span<const double> u, std::vector<double>& jac);

  /// Runs TAOBRGN from the initial values, then the covariance at the best fit.
  FitResult solve();

  /// The state of the last converged solve and its parameters.
  [[nodiscard]] const std::vector<double>& state() const { return x_; }

  /// The solver settings of the solves inside the fit; tighten for finite-difference checks.
  SolverSpec& solver() { return solver_; }

 private:
  void apply(std::span<const double> u);
  bool solve_to(std::span<const double> u, int depth);
  void transport_apply(std::span<const double> u);
  /// dF/du_k at x_ for parameter k at the values `values` (held species not yet zeroed).
  void tendency_derivative(std::size_t k, std::span<const double> values, std::vector<double>& Fp);
  ColumnModel& model_;
  SolverSpec solver_;
  const ObservationSet& obs_;
  std::vector<FitParameter> params_;
  FitOptions opt_;
  Background base_bg_;
  std::vector<SpeciesBoundaries> base_bcs_;
  std::vector<double> x_, u_;        ///< last converged state and its u
  std::vector<double> u_jac_, jac_;  ///< the last Jacobian and its u
  std::size_t m_ = 0;
  FitResult stats_;
};

/// Covariance (J^T J)^-1 of a Gauss-Newton fit ([k*p + l]) from J [i*p + k]; false when
/// J^T J is singular (Cholesky fails).
bool gauss_newton_covariance(std::span<const double> jac, std::size_t p, std::vector<double>& cov);

}  // namespace colchem
