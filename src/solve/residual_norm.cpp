// Scaled residual norm: definition and reasoning in residual_norm.hpp.
#include "solve/residual_norm.hpp"

#include <cmath>
#include <limits>

namespace colchem {

void residual_weights(const BlockTridiagonal& jac, std::span<const double> x,
                      const ResidualScale& scale, std::span<double> w) {
  const std::size_t S = jac.species;
  const std::size_t N = jac.cells;
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t r = 0; r < S; ++r) {
      const std::size_t i = j * S + r;
      double gross = 0.0;
      for (std::size_t c = 0; c < S; ++c) gross += std::abs(jac.d(j, r, c) * x[j * S + c]);
      if (j > 0) gross += std::abs(jac.l(j, r) * x[i - S]);
      if (j + 1 < N) gross += std::abs(jac.u(j, r) * x[i + S]);
      w[i] = (std::abs(x[i]) + scale.absolute(r)) / scale.reference_time_s + gross;
    }
  }
}

ScaledNorm scaled_norm(std::span<const double> tendency, const BlockTridiagonal& jac,
                       std::span<const double> x, const ResidualScale& scale) {
  const std::size_t S = jac.species;
  std::vector<double> w(x.size());
  residual_weights(jac, x, scale, w);
  ScaledNorm out;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double ri = std::abs(tendency[i]) / w[i];
    if (!std::isfinite(ri) || !std::isfinite(x[i])) {
      const double nan = std::numeric_limits<double>::quiet_NaN();
      return ScaledNorm{nan, i / S, i % S};
    }
    if (ri > out.value) {
      out.value = ri;
      out.cell = i / S;
      out.species = i % S;
    }
  }
  return out;
}

ScaledNorm scaled_residual_norm(const ColumnSystem& sys, std::span<const double> x,
                                const ResidualScale& scale, double t) {
  if (sys.coupling != nullptr) sys.coupling->refresh(x);
  std::vector<double> f(sys.size());
  BlockTridiagonal jac(sys.cells, sys.species);
  evaluate_tendency(sys, x, t, f);
  evaluate_jacobian(sys, x, t, jac);
  return scaled_norm(f, jac, x, scale);
}

std::size_t max_relative_change_index(std::span<const double> dx, std::span<const double> x,
                                      std::size_t species, const ResidualScale& scale) {
  double m = -1.0;
  std::size_t at = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double c = std::abs(dx[i]) / (std::abs(x[i]) + scale.absolute(i % species));
    if (!std::isfinite(c)) return i;
    if (c > m) {
      m = c;
      at = i;
    }
  }
  return at;
}

double max_relative_change(std::span<const double> dx, std::span<const double> x,
                           std::size_t species, const ResidualScale& scale) {
  if (x.empty()) return 0.0;
  const std::size_t i = max_relative_change_index(dx, x, species, scale);
  const double c = std::abs(dx[i]) / (std::abs(x[i]) + scale.absolute(i % species));
  return std::isfinite(c) ? c : std::numeric_limits<double>::quiet_NaN();
}

}  // namespace colchem
