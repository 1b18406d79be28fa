// Bounded nonlinear least-squares fits of a steady column: see fit.hpp.
#include "solve/fit.hpp"

#include <petsctao.h>

#include <algorithm>
#include <chrono>
#include <cmath>

#include "core/error.hpp"
#include "core/stopwatch.hpp"
#include "solve/adjoint.hpp"
#include "solve/petsc_session.hpp"
#include "solve/ptc_linear_solver.hpp"
#include "solve/residual_norm.hpp"
#include "solve/solver_options.hpp"

namespace colchem {

namespace {

/// Residual of a point whose steady solve failed: large, finite, so that TAO's line search
/// backs off (common practice, no source).
constexpr double kFailedResidual = 1e8;

}  // namespace

FitProblem::FitProblem(ColumnModel& model, const SolverSpec& solver, const ObservationSet& obs,
                       std::vector<FitParameter> params, std::vector<double> x0, FitOptions opt)
    : model_(model),
      solver_(solver),
      obs_(obs),
      params_(std::move(params)),
      opt_(opt),
      base_bg_(model.background()),
      base_bcs_(model.boundaries()),
      x_(std::move(x0)) {
  u_ = initial_u();
  m_ = observation_residuals(model_, obs_, opt_.log_space, x_).size();
}

std::vector<double> FitProblem::initial_u() const {
  std::vector<double> u;
  for (const auto& p : params_) u.push_back(p.log ? std::log(p.initial) : p.initial);
  return u;
}

double FitProblem::value_of(std::size_t k, double u) const {
  return params_[k].log ? std::exp(u) : u;
}

void FitProblem::transport_apply(std::span<const double> values) {
  Background bg = base_bg_;
  std::vector<SpeciesBoundaries> bcs = base_bcs_;
  bool any = false;
  for (std::size_t k = 0; k < params_.size(); ++k) {
    const FitParameter& p = params_[k];
    if (p.kind == FitKind::kBoundary) {
      BoundaryCondition& bc = p.top ? bcs[p.index].top : bcs[p.index].bottom;
      for (double& v : bc.value.value) v = values[k];
      any = true;
    } else if (p.kind == FitKind::kEddy) {
      // The transport operator takes K at the edges only.
      for (std::size_t e = p.edge_lo; e <= p.edge_hi; ++e) bg.edge_eddy_cm2_s[e] *= values[k];
      any = true;
    }
  }
  if (any) model_.rebuild_transport(bg, std::move(bcs));
}

void FitProblem::apply(std::span<const double> u) {
  std::vector<double> values(u.size());
  for (std::size_t k = 0; k < u.size(); ++k) values[k] = value_of(k, u[k]);
  transport_apply(values);
  for (std::size_t k = 0; k < params_.size(); ++k) {
    if (params_[k].kind == FitKind::kNamed) model_.set_parameter(params_[k].index, values[k]);
    if (params_[k].kind == FitKind::kHeld) {
      model_.chemistry().scale_held_profile(params_[k].index, values[k]);
    }
  }
}

bool FitProblem::solve_to(std::span<const double> u, int depth) {
  apply(u);
  RunControls controls;
  controls.warm_start = true;
  controls.stop_requested = opt_.stop_requested;
  SolverSpec solver = solver_;
  solver.max_iterations = std::min(solver.max_iterations, opt_.max_solve_iterations);
  const RunOutcome run = run_column(model_, solver, x_, controls);
  ++stats_.steady_solves;
  stats_.newton_iterations += run.iterations;
  stats_.steady_s += run.wall_s;
  if (run.status == SolveStatus::kInterrupted) {
    throw RunError(ExitCode::kInterrupted, "fit: interrupted");
  }
  // The residual test alone also passes: round-off in the densities of trace species can
  // keep the step test of a tight solve (a finite-difference check) from passing once the
  // residual is at its floor (as solve/adjoint.cpp finite_difference).
  if (run.status == SolveStatus::kConverged ||
      (run.status == SolveStatus::kNotConverged && run.residual_norm <= solver.tolerance)) {
    x_ = run.x;
    u_.assign(u.begin(), u.end());
    return true;
  }
  if (depth == 0) return false;
  // Continuation: half-way first, from there to u.
  std::vector<double> mid(u.size());
  for (std::size_t k = 0; k < u.size(); ++k) mid[k] = 0.5 * (u_[k] + u[k]);
  const std::vector<double> target(u.begin(), u.end());
  return solve_to(mid, depth - 1) && solve_to(target, depth - 1);
}

bool FitProblem::residuals(std::span<const double> u, std::vector<double>& r) {
  if (!solve_to(u, opt_.continuation_depth)) {
    if (opt_.log) opt_.log->warn("fit: no steady state at this trial point; the step is shortened");
    apply(u_);
    return false;
  }
  model_.refresh(x_);
  const auto res = observation_residuals(model_, obs_, opt_.log_space, x_);
  r.resize(res.size());
  for (std::size_t i = 0; i < res.size(); ++i) r[i] = res[i].r;
  return true;
}

void FitProblem::tendency_derivative(std::size_t k, std::span<const double> values,
                                     std::vector<double>& Fp) {
  const FitParameter& p = params_[k];
  if (p.kind == FitKind::kNamed) {
    model_.parameter_tendency(p.index, x_, Fp);  // dF/dp
    if (p.log) {
      for (double& f : Fp) f *= values[k];
    }
  } else if (p.kind == FitKind::kHeld) {
    std::fill(Fp.begin(), Fp.end(), 0.0);
    model_.chemistry().add_held_profile_derivative(p.index, x_, Fp);  // dF/dp
    if (p.log) {
      for (double& f : Fp) f *= values[k];
    }
  } else {
    // dF/d ln p by the central difference of the transport tendency at fixed x.
    const std::size_t n = Fp.size();
    std::vector<double> v(values.begin(), values.end()), fplus(n, 0.0), fminus(n, 0.0);
    const double h = kTransportLogStep;
    v[k] = values[k] * std::exp(h);
    transport_apply(v);
    model_.transport().add_tendency(x_, 0.0, fplus);
    v[k] = values[k] * std::exp(-h);
    transport_apply(v);
    model_.transport().add_tendency(x_, 0.0, fminus);
    transport_apply(values);
    const double per_u = p.log ? 1.0 : 1.0 / values[k];
    for (std::size_t i = 0; i < n; ++i) Fp[i] = (fplus[i] - fminus[i]) / (2.0 * h) * per_u;
  }
}

bool FitProblem::jacobian(std::span<const double> u, std::vector<double>& jac) {
  if (!std::equal(u.begin(), u.end(), u_.begin(), u_.end())) {
    std::vector<double> r;
    if (!residuals(u, r)) return false;
  }
  if (u_jac_ == u_ && !jac_.empty()) {  // TAO asks again at the same point
    jac = jac_;
    return true;
  }
  const auto t0 = std::chrono::steady_clock::now();
  ++stats_.jacobians;
  const std::size_t S = model_.species_count(), N = model_.cells(), n = N * S;
  const std::size_t P = params_.size();
  apply(u_);
  model_.refresh(x_);
  const ColumnSystem sys = model_.system();
  BlockTridiagonal bt(N, S);
  evaluate_jacobian(sys, x_, 0.0, bt);
  std::vector<char> held(n);
  for (std::size_t i = 0; i < n; ++i) held[i] = model_.held(i % S) ? 1 : 0;
  const SteadyStateOptions so = steady_options(solver_);
  std::vector<double> weights(n);
  residual_weights(bt, x_, so.scale, weights);
  const PtcLinearSolver::Product product = [&](std::span<const double> v, std::span<double> out) {
    sys.coupling->add_jacobian_product(x_, v, out);
  };
  const double shift = 1.0 / so.max_pseudo_step_s;
  const auto res = observation_residuals(model_, obs_, opt_.log_space, x_);
  jac.assign(res.size() * P, 0.0);

  std::vector<double> values(P), Fp(n), dx(n);
  for (std::size_t k = 0; k < P; ++k) values[k] = value_of(k, u_[k]);
  PtcLinearSolver linear(N, S);
  for (std::size_t k = 0; k < P; ++k) {
    const FitParameter& p = params_[k];
    tendency_derivative(k, values, Fp);
    for (std::size_t i = 0; i < n; ++i) {
      if (held[i]) Fp[i] = 0.0;
    }
    // (shift I - J) dx = dF/du  =>  dx = dx/du in the Newton limit.
    std::string reason;
    const bool ok = sys.coupling != nullptr
                        ? linear.solve_coupled(bt, shift, held, Fp, weights, product,
                                               opt_.krylov_rtol, dx, reason)
                        : linear.solve(bt, shift, held, Fp, dx, reason);
    if (!ok) {
      throw RunError(ExitCode::kNotConverged,
                     "fit: forward sensitivity of " + p.path + " failed: " + reason);
    }
    for (std::size_t i = 0; i < res.size(); ++i) {
      double sum = 0.0;
      for (const auto& [idx, d] : res[i].d) sum += d * dx[idx];
      jac[i * P + k] = sum;
    }
  }
  stats_.jacobian_s += seconds_since(t0);
  u_jac_ = u_;
  jac_ = jac;
  return true;
}

bool gauss_newton_covariance(std::span<const double> jac, std::size_t p, std::vector<double>& cov) {
  const std::size_t m = p == 0 ? 0 : jac.size() / p;
  std::vector<double> A(p * p, 0.0);
  for (std::size_t i = 0; i < m; ++i) {
    for (std::size_t k = 0; k < p; ++k) {
      for (std::size_t l = 0; l < p; ++l) A[k * p + l] += jac[i * p + k] * jac[i * p + l];
    }
  }
  // Cholesky A = L L^T, then the columns of A^-1 from L y = e_k, L^T c = y.
  std::vector<double> L(p * p, 0.0);
  for (std::size_t k = 0; k < p; ++k) {
    for (std::size_t l = 0; l <= k; ++l) {
      double s = A[k * p + l];
      for (std::size_t q = 0; q < l; ++q) s -= L[k * p + q] * L[l * p + q];
      if (k == l) {
        if (!(s > 1e-14 * std::max(A[k * p + k], 1e-300))) return false;
        L[k * p + k] = std::sqrt(s);
      } else {
        L[k * p + l] = s / L[l * p + l];
      }
    }
  }
  cov.assign(p * p, 0.0);
  std::vector<double> y(p);
  for (std::size_t c = 0; c < p; ++c) {
    for (std::size_t k = 0; k < p; ++k) {
      double s = k == c ? 1.0 : 0.0;
      for (std::size_t q = 0; q < k; ++q) s -= L[k * p + q] * y[q];
      y[k] = s / L[k * p + k];
    }
    for (std::size_t k = p; k-- > 0;) {
      double s = y[k];
      for (std::size_t q = k + 1; q < p; ++q) s -= L[q * p + k] * cov[q * p + c];
      cov[k * p + c] = s / L[k * p + k];
    }
  }
  return true;
}

namespace {

struct TaoContext {
  FitProblem* problem = nullptr;
  std::vector<double> r, jac;
  std::string error;
};

PetscErrorCode tao_residual(Tao, Vec u, Vec r, void* ctx) {
  auto* c = static_cast<TaoContext*>(ctx);
  const PetscScalar* pu = nullptr;
  PetscCall(VecGetArrayRead(u, &pu));
  const std::vector<double> uu(pu, pu + c->problem->size());
  PetscCall(VecRestoreArrayRead(u, &pu));
  PetscScalar* pr = nullptr;
  PetscCall(VecGetArray(r, &pr));
  try {
    if (c->problem->residuals(uu, c->r)) {
      std::copy(c->r.begin(), c->r.end(), pr);
    } else {
      std::fill(pr, pr + c->problem->points(), kFailedResidual);
    }
  } catch (const std::exception& e) {
    c->error = e.what();
    std::fill(pr, pr + c->problem->points(), kFailedResidual);
  }
  PetscCall(VecRestoreArray(r, &pr));
  return 0;
}

PetscErrorCode tao_jacobian(Tao, Vec u, Mat J, Mat, void* ctx) {
  auto* c = static_cast<TaoContext*>(ctx);
  const std::size_t P = c->problem->size(), M = c->problem->points();
  const PetscScalar* pu = nullptr;
  PetscCall(VecGetArrayRead(u, &pu));
  const std::vector<double> uu(pu, pu + P);
  PetscCall(VecRestoreArrayRead(u, &pu));
  bool ok = false;
  try {
    ok = c->problem->jacobian(uu, c->jac);
  } catch (const std::exception& e) {
    c->error = e.what();
  }
  for (std::size_t i = 0; i < M; ++i) {
    for (std::size_t k = 0; k < P; ++k) {
      PetscCall(MatSetValue(J, static_cast<PetscInt>(i), static_cast<PetscInt>(k),
                            ok ? c->jac[i * P + k] : 0.0, INSERT_VALUES));
    }
  }
  PetscCall(MatAssemblyBegin(J, MAT_FINAL_ASSEMBLY));
  PetscCall(MatAssemblyEnd(J, MAT_FINAL_ASSEMBLY));
  return 0;
}

/// What TAOBRGN returned: the best u, why it stopped, its iterations.
struct TaoOutcome {
  bool converged = false;
  std::string reason;
  int iterations = 0;
  std::vector<double> u;
};

/// Runs TAOBRGN on the problem from u0 within the parameters' bounds (in u).
TaoOutcome run_tao(FitProblem& problem, const std::vector<FitParameter>& params,
                   const FitOptions& opt, std::span<const double> u0) {
  const std::size_t P = problem.size(), M = problem.points();
  TaoContext ctx;
  ctx.problem = &problem;
  Tao tao = nullptr;
  Vec u = nullptr, r = nullptr, lo = nullptr, hi = nullptr;
  Mat J = nullptr;
  check(TaoCreate(PETSC_COMM_SELF, &tao), "TaoCreate");
  check(TaoSetType(tao, TAOBRGN), "TaoSetType");
  check(VecCreateSeq(PETSC_COMM_SELF, static_cast<PetscInt>(P), &u), "VecCreateSeq");
  check(VecDuplicate(u, &lo), "VecDuplicate");
  check(VecDuplicate(u, &hi), "VecDuplicate");
  check(VecCreateSeq(PETSC_COMM_SELF, static_cast<PetscInt>(M), &r), "VecCreateSeq");
  check(MatCreateSeqDense(PETSC_COMM_SELF, static_cast<PetscInt>(M), static_cast<PetscInt>(P),
                          nullptr, &J),
        "MatCreateSeqDense");
  for (std::size_t k = 0; k < P; ++k) {
    const FitParameter& p = params[k];
    const auto i = static_cast<PetscInt>(k);
    check(VecSetValue(u, i, u0[k], INSERT_VALUES), "VecSetValue");
    check(VecSetValue(lo, i, p.log ? std::log(p.min) : p.min, INSERT_VALUES), "VecSetValue");
    check(VecSetValue(hi, i, p.log ? std::log(p.max) : p.max, INSERT_VALUES), "VecSetValue");
  }
  for (Vec v : {u, lo, hi}) {
    check(VecAssemblyBegin(v), "VecAssemblyBegin");
    check(VecAssemblyEnd(v), "VecAssemblyEnd");
  }
  check(TaoSetSolution(tao, u), "TaoSetSolution");
  check(TaoSetVariableBounds(tao, lo, hi), "TaoSetVariableBounds");
  check(TaoSetResidualRoutine(tao, r, tao_residual, &ctx), "TaoSetResidualRoutine");
  check(TaoSetJacobianResidualRoutine(tao, J, J, tao_jacobian, &ctx),
        "TaoSetJacobianResidualRoutine");
  check(TaoSetTolerances(tao, opt.gatol, opt.grtol, 0.0), "TaoSetTolerances");
  check(TaoSetMaximumIterations(tao, opt.max_iterations), "TaoSetMaximumIterations");
  check(TaoSetOptionsPrefix(tao, "colchem_fit_"), "TaoSetOptionsPrefix");
  check(TaoSetFromOptions(tao), "TaoSetFromOptions");
  check(TaoSolve(tao), "TaoSolve");
  TaoConvergedReason reason{};
  PetscInt its = 0;
  check(TaoGetConvergedReason(tao, &reason), "TaoGetConvergedReason");
  check(TaoGetIterationNumber(tao, &its), "TaoGetIterationNumber");
  TaoOutcome out;
  out.converged = reason > 0;
  out.reason = TaoConvergedReasons[reason];
  out.iterations = static_cast<int>(its);
  out.u.resize(P);
  {
    const PetscScalar* pu = nullptr;
    check(VecGetArrayRead(u, &pu), "VecGetArrayRead");
    std::copy(pu, pu + P, out.u.begin());
    check(VecRestoreArrayRead(u, &pu), "VecRestoreArrayRead");
  }
  MatDestroy(&J);
  VecDestroy(&r);
  VecDestroy(&lo);
  VecDestroy(&hi);
  VecDestroy(&u);
  TaoDestroy(&tao);
  if (!ctx.error.empty()) throw RunError(ExitCode::kNotConverged, "fit: " + ctx.error);
  return out;
}

/// The one-sigma uncertainties, bound flags and correlations at the best fit ubest from the
/// Gauss-Newton covariance of jac (res.reduced_chi2 set).
void add_uncertainties(FitResult& res, const FitProblem& problem,
                       const std::vector<FitParameter>& params, std::span<const double> ubest,
                       std::span<const double> jac) {
  const std::size_t P = params.size();
  std::vector<double> cov;
  const bool invertible = gauss_newton_covariance(jac, P, cov);
  for (std::size_t k = 0; k < P; ++k) {
    const FitParameter& p = params[k];
    const double v = problem.value_of(k, ubest[k]);
    res.value.push_back(v);
    const double su = invertible ? std::sqrt(cov[k * P + k]) : std::nan("");
    res.sigma_u.push_back(su);
    // One sigma in the value: v sigma_u for ln v (first order).
    res.sigma.push_back(p.log ? v * su : su);
    const double scale = std::isfinite(res.reduced_chi2) ? std::sqrt(res.reduced_chi2) : 1.0;
    res.sigma_scaled.push_back(res.sigma.back() * scale);
    const double lo_u = p.log ? std::log(p.min) : p.min, hi_u = p.log ? std::log(p.max) : p.max;
    const double tol = 1e-8 * std::max({1.0, std::abs(lo_u), std::abs(hi_u)});
    res.at_bound.push_back(ubest[k] <= lo_u + tol ? -1 : (ubest[k] >= hi_u - tol ? 1 : 0));
  }
  res.correlation.assign(P * P, std::nan(""));
  if (invertible) {
    for (std::size_t k = 0; k < P; ++k) {
      for (std::size_t l = 0; l < P; ++l) {
        res.correlation[k * P + l] = cov[k * P + l] / std::sqrt(cov[k * P + k] * cov[l * P + l]);
      }
    }
  }
}

}  // namespace

FitResult FitProblem::solve() {
  const auto t0 = std::chrono::steady_clock::now();
  const std::size_t P = params_.size(), M = m_;
  if (M == 0) {
    throw RunError(ExitCode::kConfig, "fit: no observed point lies inside the model column");
  }
  std::vector<double> r0;
  const std::vector<double> u0 = initial_u();
  if (!residuals(u0, r0)) {
    throw RunError(ExitCode::kNotConverged, "fit: the steady solve at the initial values failed");
  }
  double chi2_0 = 0.0;
  for (double v : r0) chi2_0 += v * v;

  const TaoOutcome tao = run_tao(*this, params_, opt_, u0);
  const std::vector<double>& ubest = tao.u;

  FitResult res = stats_;
  std::vector<double> rb, jac;
  if (!residuals(ubest, rb) || !jacobian(ubest, jac)) {
    throw RunError(ExitCode::kNotConverged, "fit: the steady solve at the best fit failed");
  }
  res = stats_;
  res.converged = tao.converged;
  res.reason = tao.reason;
  res.iterations = tao.iterations;
  res.u = ubest;
  res.points = M;
  res.chi2_initial = chi2_0;
  for (double v : rb) res.chi2 += v * v;
  const double dof = static_cast<double>(M) - static_cast<double>(P);
  res.reduced_chi2 = dof > 0 ? res.chi2 / dof : std::nan("");
  add_uncertainties(res, *this, params_, ubest, jac);
  res.x = x_;
  res.residuals = observation_residuals(model_, obs_, opt_.log_space, x_);
  res.wall_s = seconds_since(t0);
  return res;
}

}  // namespace colchem
