// Exact restarts: a run continued from its checkpoint (written to NetCDF and read back into a
// fresh column model, as a new process would) ends where the uninterrupted run ends.
// References: the uninterrupted run itself, within the solver's own tolerance (README
// "Solvers": step-doubling rtol for the split integrator, step_tolerance for the steady
// solver), and mass conservation of an injection (README "Boundary conditions": an
// injection adds its column amount once).
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <memory>

#include "chem/stiff_integrator.hpp"
#include "io/dataset_writer.hpp"
#include "io/restart_file.hpp"
#include "io/scenario.hpp"
#include "report/run_report.hpp"
#include "solve/column_model.hpp"
#include "solve/column_run.hpp"

using namespace colchem;

namespace {

const char* const kColumn = COLCHEM_SOURCE_DIR "/tests/solve/restart/restart_column.yaml";

std::filesystem::path output(const char* name) {
  return std::filesystem::path(COLCHEM_TEST_OUTPUT_DIR) / name;
}

/// Largest |a - b| / (|a| + a_s) over a state (a_s: the absolute density of the norm).
double max_relative_difference(const std::vector<double>& a, const std::vector<double>& b,
                               double a_s) {
  REQUIRE(a.size() == b.size());
  double d = 0.0;
  for (std::size_t i = 0; i < a.size(); ++i) {
    d = std::max(d, std::abs(a[i] - b[i]) / (std::abs(a[i]) + a_s));
  }
  return d;
}

double column(const ColumnModel& m, const std::vector<double>& x, std::size_t s) {
  double c = 0.0;
  for (std::size_t j = 0; j < m.cells(); ++j) {
    c += x[j * m.species_count() + s] * m.background().grid.width_cm(j);
  }
  return c;
}

std::size_t index_of(const ColumnModel& m, const std::string& name) {
  const auto& n = m.species();
  return static_cast<std::size_t>(std::find(n.begin(), n.end(), name) - n.begin());
}

}  // namespace

TEST_CASE(
    "Restart: a transient interrupted after its injection continues at its model time "
    "and ends as the uninterrupted run",
    "[solve][restart]") {
  const UnitSystem units;
  // checkpoint_every = 1 lets the test see the model time after every step; the stop is
  // requested from the model time, never from the clock.
  const Scenario sc = load_scenario(kColumn, {"solver.checkpoint_every=1"}, units);
  const double injection_s = 0.5 * 86400.0;
  const double end_s = sc.solver.transient.end_s;

  ColumnModel m0(sc);
  const RunOutcome whole = run_column(m0, sc.solver, m0.initial_state(), {});
  REQUIRE(whole.status == SolveStatus::kCompleted);

  ColumnModel m1(sc);
  double last_time = 0.0;
  RunControls stop;
  stop.checkpoint = [&](const RunCheckpoint& cp) { last_time = cp.time_s; };
  stop.stop_requested = [&] { return last_time > 0.6 * 86400.0; };
  const RunOutcome first = run_column(m1, sc.solver, m1.initial_state(), stop);
  REQUIRE(first.status == SolveStatus::kInterrupted);
  REQUIRE(first.time_s > injection_s);  // interrupted after the injection
  REQUIRE(first.time_s < end_s);
  const auto file = output("restart_transient.checkpoint.nc");
  write_dataset(checkpoint_dataset(sc, m1, checkpoint_of(first), "test"), file);

  ColumnModel m2(sc);  // a new process
  const RestartFile rf = read_checkpoint(file, m2, sc.solver.method);
  REQUIRE(rf.checkpoint.has_value());
  const RunCheckpoint& cp = *rf.checkpoint;
  CHECK(cp.time_s == first.time_s);  // NetCDF doubles round-trip exactly
  CHECK(cp.step_s == first.step_s);
  CHECK(cp.x == first.x);
  const RunOutcome rest = continue_column(m2, sc.solver, cp, {});
  REQUIRE(rest.status == SolveStatus::kCompleted);
  CHECK(rest.time_s == end_s);
  CHECK(rest.iterations > first.iterations);  // steps count on from the checkpoint's
  CHECK(rest.history.front().iteration == first.iterations + 1);
  CHECK(rest.history.front().time_s > first.time_s);
  // The first step is the one the uninterrupted run took next (the step is restored, not
  // restarted at transient.step).
  CHECK(rest.history.front().step_s ==
        whole.history[static_cast<std::size_t>(first.iterations)].step_s);

  // Same end state within the solver tolerance. The runs differ only in the chemistry's
  // first sub-step inside the cell integrator (not stored), so the window is that
  // integrator's rtol (1e-4, StiffOptions), tighter than the step-doubling rtol (1e-3).
  const double rtol = StiffOptions{}.rtol;
  CHECK(max_relative_difference(whole.x, rest.x, sc.solver.absolute_density_cm3) < rtol);
  // The injection (1e16 cm-2, most of the SO2 column) is in the result once: the SO2
  // columns agree to rtol, far below the injected amount.
  const std::size_t so2 = index_of(m0, "SO2");
  const double c_whole = column(m0, whole.x, so2), c_rest = column(m2, rest.x, so2);
  CHECK(std::abs(c_rest - c_whole) < rtol * c_whole);
  CHECK(c_whole > 1e16);
  // Snapshots: the one before the checkpoint is carried over unchanged, the later ones agree.
  REQUIRE(rest.snapshot_times_s == whole.snapshot_times_s);
  REQUIRE(rest.snapshots.size() == 3);
  CHECK(rest.snapshots[0] == whole.snapshots[0]);
  for (std::size_t k = 1; k < 3; ++k) {
    CHECK(max_relative_difference(whole.snapshots[k], rest.snapshots[k],
                                  sc.solver.absolute_density_cm3) < rtol);
  }
}

TEST_CASE("Restart: an injection at the start time is applied once", "[solve][restart]") {
  // Over one minute the SO2 column changes by chemistry by less than 1e-5 relative (OH
  // reaction ~3e-6 s-1 in the bottom cell only), so the difference with and without the
  // injection is its column amount (conservation).
  const UnitSystem units;
  const std::vector<std::string> common = {"solver.transient.end=60 s",
                                           "solver.transient.outputs=[60 s]"};
  auto with = common;
  with.push_back(
      "injections=[{species: SO2, column: 1.0e16 cm-2, time: 0 s, from: 13 km, "
      "to: 15 km}]");
  auto without = common;
  without.push_back("injections=[]");
  const Scenario a = load_scenario(kColumn, with, units);
  const Scenario b = load_scenario(kColumn, without, units);
  ColumnModel ma(a), mb(b);
  const RunOutcome ra = run_column(ma, a.solver, ma.initial_state(), {});
  const RunOutcome rb = run_column(mb, b.solver, mb.initial_state(), {});
  REQUIRE(ra.ok());
  REQUIRE(rb.ok());
  const std::size_t so2 = index_of(ma, "SO2");
  CHECK(column(ma, ra.x, so2) - column(mb, rb.x, so2) == Approx(1e16).epsilon(1e-4));
}

TEST_CASE(
    "Restart: a steady solve continues with its pseudo-time step and converges to the "
    "uninterrupted state",
    "[solve][restart][steady]") {
  const UnitSystem units;
  const Scenario sc =
      load_scenario(kColumn, {"solver.method=steady", "solver.checkpoint_every=10"}, units);
  ColumnModel m0(sc);
  std::vector<RunCheckpoint> taken;
  RunControls keep;
  keep.checkpoint = [&](const RunCheckpoint& cp) { taken.push_back(cp); };
  const RunOutcome whole = run_column(m0, sc.solver, m0.initial_state(), keep);
  REQUIRE(whole.status == SolveStatus::kConverged);
  REQUIRE(!taken.empty());
  const RunCheckpoint& at10 = taken.front();
  REQUIRE(at10.iteration == 10);
  // The pseudo-time step handed out is the one of the 10th step (history row 9).
  CHECK(at10.step_s == whole.history[9].step_s);
  const auto file = output("restart_steady.checkpoint.nc");
  write_dataset(checkpoint_dataset(sc, m0, at10, "test"), file);

  ColumnModel m1(sc);
  const RestartFile rf = read_checkpoint(file, m1, sc.solver.method);
  REQUIRE(rf.checkpoint.has_value());
  const RunOutcome rest = continue_column(m1, sc.solver, *rf.checkpoint, {});
  REQUIRE(rest.status == SolveStatus::kConverged);
  // Still in the pseudo-transient phase at the checkpoint (above the Newton switch), so the
  // first step of the restart is the checkpoint's pseudo-time step, not the initial 1e-6 s.
  REQUIRE(rest.history.front().residual_norm > 1e-6);
  CHECK(rest.history.front().step_s == at10.step_s);
  CHECK(at10.step_s > 100.0 * sc.solver.initial_pseudo_step_s);
  CHECK(rest.history.front().iteration == 10);
  // Both are converged states of the same problem: they agree within step_tolerance (the
  // relative change of the last Newton step, README "Solvers").
  CHECK(max_relative_difference(whole.x, rest.x, sc.solver.absolute_density_cm3) <
        sc.solver.step_tolerance);
}

TEST_CASE("Restart: only a checkpoint of the same column and method continues",
          "[solve][restart]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(kColumn, {"solver.method=steady"}, units);
  ColumnModel m(sc);
  RunCheckpoint cp{"steady", 3, 0.0, 1.0, m.initial_state(), {}, {}};
  const auto file = output("restart_other.checkpoint.nc");
  write_dataset(checkpoint_dataset(sc, m, cp, "test"), file);
  CHECK(read_checkpoint(file, m, SolverMethod::kSteady).checkpoint.has_value());
  const RestartFile other_method = read_checkpoint(file, m, SolverMethod::kTransient);
  CHECK(!other_method.checkpoint);
  CHECK_THAT(other_method.why_not, Catch::Contains("method steady"));
  const Scenario finer = load_scenario(kColumn, {"solver.method=steady", "grid.cells=7"}, units);
  const ColumnModel mf(finer);
  const RestartFile other_grid = read_checkpoint(file, mf, SolverMethod::kSteady);
  CHECK(!other_grid.checkpoint);
  CHECK_THAT(other_grid.why_not, Catch::Contains("another grid"));
  RunOutcome done;
  done.status = SolveStatus::kConverged;
  done.method = "steady";
  done.x = m.initial_state();
  const auto run_file = output("restart_other_run.nc");
  write_dataset(run_dataset(sc, m, done, "test", {}), run_file);
  const RestartFile plain = read_checkpoint(run_file, m, SolverMethod::kSteady);
  CHECK(!plain.checkpoint);
  CHECK_THAT(plain.why_not, Catch::Contains("not a checkpoint"));
}
