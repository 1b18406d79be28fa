// Small column operators for testing the solvers (not the model's transport or chemistry):
// each is simple enough that its steady state or its exact time step is known in closed
// form. State ordering x[j*S + s] as in core/block_tridiagonal.hpp.
#pragma once

#include <cmath>
#include <limits>
#include <span>
#include <vector>

#include "core/column_operator.hpp"

namespace colchem::testing {

/// Linear exchange between neighbouring cells with zero flux at both ends:
///   f_js = c_s (x_{j+1,s} - 2 x_js + x_{j-1,s}),  c_s = K_s/dz^2 (s^-1).
/// Species with held_bottom[s] keep their cell-0 density fixed (zero tendency and
/// Jacobian row). implicit_step: backward Euler (Thomas algorithm per species).
class Diffusion final : public ColumnOperator {
 public:
  Diffusion(std::size_t cells, std::vector<double> c, std::vector<bool> held_bottom = {})
      : n_(cells), c_(std::move(c)), held_(std::move(held_bottom)) {
    held_.resize(c_.size(), false);
  }
  [[nodiscard]] std::size_t species() const { return c_.size(); }

  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    const std::size_t S = species();
    for (std::size_t j = 0; j < n_; ++j) {
      for (std::size_t s = 0; s < S; ++s) {
        if (j == 0 && held_[s]) continue;
        const double xc = x[j * S + s];
        double v = 0.0;
        if (j > 0) v += x[(j - 1) * S + s] - xc;
        if (j + 1 < n_) v += x[(j + 1) * S + s] - xc;
        f[j * S + s] += c_[s] * v;
      }
    }
  }
  void add_jacobian(std::span<const double>, double, BlockTridiagonal& J) override {
    const std::size_t S = species();
    for (std::size_t j = 0; j < n_; ++j) {
      for (std::size_t s = 0; s < S; ++s) {
        if (j == 0 && held_[s]) continue;
        if (j > 0) { J.l(j, s) += c_[s]; J.d(j, s, s) -= c_[s]; }
        if (j + 1 < n_) { J.u(j, s) += c_[s]; J.d(j, s, s) -= c_[s]; }
      }
    }
  }
  bool implicit_step(std::span<double> x, double, double dt) override {
    const std::size_t S = species();
    std::vector<double> a(n_), b(n_), cc(n_), d(n_);
    for (std::size_t s = 0; s < S; ++s) {
      for (std::size_t j = 0; j < n_; ++j) {
        const bool held = j == 0 && held_[s];
        a[j] = (j > 0 && !held) ? -dt * c_[s] : 0.0;
        cc[j] = (j + 1 < n_ && !held) ? -dt * c_[s] : 0.0;
        b[j] = 1.0 - a[j] - cc[j];
        d[j] = x[j * S + s];
      }
      for (std::size_t j = 1; j < n_; ++j) {
        const double m = a[j] / b[j - 1];
        b[j] -= m * cc[j - 1];
        d[j] -= m * d[j - 1];
      }
      x[(n_ - 1) * S + s] = d[n_ - 1] / b[n_ - 1];
      for (std::size_t j = n_ - 1; j-- > 0;) {
        x[j * S + s] = (d[j] - cc[j] * x[(j + 1) * S + s]) / b[j];
      }
    }
    return true;
  }

 private:
  std::size_t n_;
  std::vector<double> c_;
  std::vector<bool> held_;
};

/// Three cells, uniform exchange rate c (s^-1), zero-flux ends, integrated EXACTLY:
/// the matrix c [[-1,1,0],[1,-2,1],[0,1,-1]] has eigenvalues 0, -c, -3c with eigenvectors
/// (1,1,1)/sqrt3, (1,0,-1)/sqrt2, (1,-2,1)/sqrt6 (analytic).
class ExactThreeCellExchange final : public ColumnOperator {
 public:
  ExactThreeCellExchange(std::size_t species, double c) : S_(species), c_(c) {}
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    for (std::size_t s = 0; s < S_; ++s) {
      const double a = x[s], b = x[S_ + s], d = x[2 * S_ + s];
      f[s] += c_ * (b - a);
      f[S_ + s] += c_ * (a - 2 * b + d);
      f[2 * S_ + s] += c_ * (b - d);
    }
  }
  void add_jacobian(std::span<const double>, double, BlockTridiagonal& J) override {
    for (std::size_t s = 0; s < S_; ++s) {
      J.d(0, s, s) -= c_; J.u(0, s) += c_;
      J.l(1, s) += c_; J.d(1, s, s) -= 2 * c_; J.u(1, s) += c_;
      J.l(2, s) += c_; J.d(2, s, s) -= c_;
    }
  }
  bool implicit_step(std::span<double> x, double, double dt) override {
    for (std::size_t s = 0; s < S_; ++s) {
      const double a = x[s], b = x[S_ + s], d = x[2 * S_ + s];
      const double m0 = (a + b + d) / 3.0;           // projection on (1,1,1)/3
      const double m1 = (a - d) / 2.0 * std::exp(-c_ * dt);
      const double m2 = (a - 2 * b + d) / 6.0 * std::exp(-3 * c_ * dt);
      x[s] = m0 + m1 + m2;
      x[S_ + s] = m0 - 2 * m2;
      x[2 * S_ + s] = m0 - m1 + m2;
    }
    return true;
  }

 private:
  std::size_t S_;
  double c_;
};

/// Per cell and species: f = P_js - k_js x_js; implicit_step is the exact exponential.
class LinearSourceLoss final : public ColumnOperator {
 public:
  LinearSourceLoss(std::vector<double> production, std::vector<double> loss)
      : p_(std::move(production)), k_(std::move(loss)) {}
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    for (std::size_t i = 0; i < x.size(); ++i) f[i] += p_[i] - k_[i] * x[i];
  }
  void add_jacobian(std::span<const double>, double, BlockTridiagonal& J) override {
    const std::size_t S = J.species;
    for (std::size_t i = 0; i < p_.size(); ++i) J.d(i / S, i % S, i % S) -= k_[i];
  }
  bool implicit_step(std::span<double> x, double, double dt) override {
    for (std::size_t i = 0; i < x.size(); ++i) {
      if (k_[i] == 0.0) {
        x[i] += p_[i] * dt;
      } else {
        const double inf = p_[i] / k_[i];
        x[i] = inf + (x[i] - inf) * std::exp(-k_[i] * dt);
      }
    }
    return true;
  }

 private:
  std::vector<double> p_, k_;
};

/// Two species per cell, A (0) and B (1): source P_j of A, A + A -> B (rate k A^2), B lost
/// at kB. Steady state (analytic): A = sqrt(P/(2k)), B = P/(2 kB).
class Dimerisation final : public ColumnOperator {
 public:
  Dimerisation(std::vector<double> production, double k, double kB)
      : p_(std::move(production)), k_(k), kb_(kB) {}
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    for (std::size_t j = 0; j < p_.size(); ++j) {
      const double a = x[2 * j], b = x[2 * j + 1];
      f[2 * j] += p_[j] - 2 * k_ * a * a;
      f[2 * j + 1] += k_ * a * a - kb_ * b;
    }
  }
  void add_jacobian(std::span<const double> x, double, BlockTridiagonal& J) override {
    for (std::size_t j = 0; j < p_.size(); ++j) {
      const double a = x[2 * j];
      J.d(j, 0, 0) -= 4 * k_ * a;
      J.d(j, 1, 0) += 2 * k_ * a;
      J.d(j, 1, 1) -= kb_;
    }
  }
  bool implicit_step(std::span<double>, double, double) override { return false; }

 private:
  std::vector<double> p_;
  double k_, kb_;
};

/// An oxygen-like photochemical cycle, species O2 (0, held fixed), O (1), O3 (2):
///   O2 + hv -> 2 O (j1),  O + O2 (+M) -> O3 (k2, M folded in),  O3 + hv -> O + O2 (j3),
///   O + O3 -> 2 O2 (k4).
/// Steady state (analytic, from the two balance equations): k2 k4 O^2 - j1 k4 O - j1 j3 = 0,
/// O3 = j1 O2 / (k4 O).
class OxygenCycle final : public ColumnOperator {
 public:
  struct Cell {
    double j1, k2, j3, k4;
  };
  explicit OxygenCycle(std::vector<Cell> cells) : c_(std::move(cells)) {}
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    for (std::size_t j = 0; j < c_.size(); ++j) {
      const double o2 = x[3 * j], o = x[3 * j + 1], o3 = x[3 * j + 2];
      const Cell& r = c_[j];
      f[3 * j + 1] += 2 * r.j1 * o2 - r.k2 * o * o2 + r.j3 * o3 - r.k4 * o * o3;
      f[3 * j + 2] += r.k2 * o * o2 - r.j3 * o3 - r.k4 * o * o3;
    }
  }
  void add_jacobian(std::span<const double> x, double, BlockTridiagonal& J) override {
    for (std::size_t j = 0; j < c_.size(); ++j) {
      const double o2 = x[3 * j], o = x[3 * j + 1], o3 = x[3 * j + 2];
      const Cell& r = c_[j];
      J.d(j, 1, 0) += 2 * r.j1 - r.k2 * o;
      J.d(j, 1, 1) += -r.k2 * o2 - r.k4 * o3;
      J.d(j, 1, 2) += r.j3 - r.k4 * o;
      J.d(j, 2, 0) += r.k2 * o;
      J.d(j, 2, 1) += r.k2 * o2 - r.k4 * o3;
      J.d(j, 2, 2) += -r.j3 - r.k4 * o;
    }
  }
  bool implicit_step(std::span<double>, double, double) override { return false; }
  /// Rates per cell, for a photolysis refresh.
  std::vector<Cell>& cells() { return c_; }
  static double steady_o(const Cell& r) {
    return (r.j1 * r.k4 + std::sqrt(r.j1 * r.j1 * r.k4 * r.k4 + 4 * r.k2 * r.k4 * r.j1 * r.j3)) /
           (2 * r.k2 * r.k4);
  }

 private:
  std::vector<Cell> c_;
};

/// f = -x, but NaN once any density exceeds `limit` (or always, with limit < 0).
class NanAbove final : public ColumnOperator {
 public:
  explicit NanAbove(double limit, double source) : limit_(limit), q_(source) {}
  void add_tendency(std::span<const double> x, double, std::span<double> f) override {
    for (std::size_t i = 0; i < x.size(); ++i) {
      const bool bad = limit_ < 0.0 || x[i] > limit_;
      f[i] += bad ? std::numeric_limits<double>::quiet_NaN() : q_ - 1e-6 * x[i];
    }
  }
  void add_jacobian(std::span<const double>, double, BlockTridiagonal& J) override {
    for (std::size_t j = 0; j < J.cells; ++j)
      for (std::size_t s = 0; s < J.species; ++s) J.d(j, s, s) -= 1e-6;
  }
  bool implicit_step(std::span<double>, double, double) override { return false; }

 private:
  double limit_, q_;
};

/// Dense Gaussian elimination with partial pivoting (for reference solutions in tests).
inline std::vector<double> dense_solve(std::vector<double> a, std::vector<double> b) {
  const std::size_t n = b.size();
  for (std::size_t k = 0; k < n; ++k) {
    std::size_t p = k;
    for (std::size_t i = k + 1; i < n; ++i)
      if (std::abs(a[i * n + k]) > std::abs(a[p * n + k])) p = i;
    for (std::size_t c = 0; c < n; ++c) std::swap(a[k * n + c], a[p * n + c]);
    std::swap(b[k], b[p]);
    for (std::size_t i = k + 1; i < n; ++i) {
      const double m = a[i * n + k] / a[k * n + k];
      for (std::size_t c = k; c < n; ++c) a[i * n + c] -= m * a[k * n + c];
      b[i] -= m * b[k];
    }
  }
  std::vector<double> x(n);
  for (std::size_t i = n; i-- > 0;) {
    double s = b[i];
    for (std::size_t c = i + 1; c < n; ++c) s -= a[i * n + c] * x[c];
    x[i] = s / a[i * n + i];
  }
  return x;
}

/// The dense matrix of a BlockTridiagonal.
inline std::vector<double> to_dense(const BlockTridiagonal& J) {
  const std::size_t S = J.species, n = J.cells * S;
  std::vector<double> a(n * n, 0.0);
  for (std::size_t j = 0; j < J.cells; ++j)
    for (std::size_t r = 0; r < S; ++r) {
      const std::size_t i = j * S + r;
      for (std::size_t c = 0; c < S; ++c) a[i * n + j * S + c] = J.d(j, r, c);
      if (j > 0) a[i * n + i - S] = J.l(j, r);
      if (j + 1 < J.cells) a[i * n + i + S] = J.u(j, r);
    }
  return a;
}

}  // namespace colchem::testing
