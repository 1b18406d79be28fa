// PhotolysisModel::add_transpose_product, the reverse-mode (transposed) Jacobian of the
// direct-beam J-values that the adjoint uses, against central differences of compute():
// the dot-product test u . (dJ/dn v) = v . ((dJ/dn)^T u) for random u and v (the defining
// identity of the transpose; common practice for adjoint code, no source), plane-parallel
// (Pyrene) and spherical with an 8-point diurnal quadrature (Tellin).
#include <catch2/catch.hpp>

#include <cmath>
#include <random>

#include "core/units.hpp"
#include "io/scenario.hpp"
#include "photo/photolysis_model.hpp"
#include "solve/column_model.hpp"

using namespace colchem;

namespace {
void dot_product_test(const char* file) {
  const UnitSystem units;
  const Scenario sc = load_scenario(file, {}, units);
  const ColumnModel model(sc);
  PhotolysisModel pm(sc.photolysis, model.background(), model.species(), sc.chemistry.parameters);
  const std::size_t N = model.cells(), S = model.species_count(), C = pm.channels().size();
  std::vector<double> x = model.initial_state();
  // Absorbers at 1e-6 of the air (the initial 1e-20 would leave them optically thin).
  for (std::size_t j = 0; j < N; ++j) {
    for (std::size_t s = 0; s < S; ++s) {
      x[j * S + s] = std::max(x[j * S + s], 1e-6 * model.background().air_density_cm3[j]);
    }
  }
  std::mt19937 rng(14);
  std::uniform_real_distribution<double> U(-1.0, 1.0);
  std::vector<double> u(C * N), v(N * S), xp(x), xm(x), Jp(C * N), Jm(C * N), out(N * S, 0.0);
  for (double& a : u) a = U(rng);
  for (std::size_t i = 0; i < v.size(); ++i) v[i] = x[i] * U(rng);
  const double h = 1e-4;
  for (std::size_t i = 0; i < x.size(); ++i) {
    xp[i] = x[i] + h * v[i];
    xm[i] = x[i] - h * v[i];
  }
  pm.compute(xp, Jp);
  pm.compute(xm, Jm);
  double forward = 0.0;
  for (std::size_t i = 0; i < u.size(); ++i) forward += u[i] * (Jp[i] - Jm[i]) / (2.0 * h);
  pm.add_transpose_product(x, u, out);
  double reverse = 0.0;
  for (std::size_t i = 0; i < v.size(); ++i) reverse += v[i] * out[i];
  INFO(file << ": forward " << forward << ", reverse " << reverse);
  REQUIRE(forward != 0.0);
  // Central differences at h = 1e-4 of relative density: truncation ~h^2 tau^2 ~ 1e-7.
  CHECK(std::abs(reverse / forward - 1.0) < 1e-6);
}
}  // namespace

TEST_CASE("Photolysis: the transposed Jacobian passes the dot-product test", "[photo][adjoint]") {
  dot_product_test(COLCHEM_SOURCE_DIR "/configs/pyrene_full.yaml");
  dot_product_test(COLCHEM_SOURCE_DIR "/configs/tellin.yaml");
}
