// The start and the base solve that the commands share: the state a solve starts from (a
// restart file's, a grid sequence's or the scenario's own), the request the grid-family
// solvers take, and the steady state that fit, sensitivity and ensemble study, with its
// interrupt wiring, convergence check and exit codes (core/error.hpp: 7 interrupted,
// 5 not converged).
#pragma once

#include <spdlog/logger.h>

#include <filesystem>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "analysis/observations.hpp"
#include "solve/resolution_runner.hpp"
#include "app/commands.hpp"
#include "io/scenario.hpp"
#include "solve/column_run.hpp"
#include "solve/interrupt.hpp"

namespace colchem::app {

/// Where a command's solve starts.
struct BaseStart {
  BaseStart(std::string config_file, std::vector<std::string> overrides,
            std::string restart_file = {})
      : config(std::move(config_file)),
        sets(std::move(overrides)),
        restart(std::move(restart_file)) {}
  std::string config;             ///< the scenario file (solved again on coarser grids)
  std::vector<std::string> sets;  ///< its --set overrides
  std::string restart;            ///< a run file whose state starts the solve (empty: none)
  std::string restart_note;       ///< why that file starts afresh, for the log (may be empty)
  bool grid_sequencing = true;    ///< a steady cold start sequences when the scenario says so
  bool progress = true;           ///< the solver's progress lines go to the log
};

/// The state a solve starts from.
struct StartState {
  std::vector<double> x0;  ///< n[j*S + s]
  bool warm = false;       ///< x0 is a converged state (a whole restart or a grid sequence)
  std::vector<SequenceLevel> sequence;  ///< the coarser levels solved first (may be empty)
};

/// The request of a solve on other grids: the scenario with its overrides, stopped by
/// `interrupt`.
SolveRequest solve_request(const BaseStart& start, spdlog::logger* log,
                           const InterruptGuard& interrupt);

/// The restart file's state interpolated onto this grid; else, for a steady solve whose
/// scenario sets solver.grid_sequencing (and `start.grid_sequencing`), the same scenario
/// solved on coarser grids (solve/resolution_runner.hpp, sequenced_start); else the
/// scenario's initial state.
StartState start_state(const BaseStart& start, const Scenario& sc, const ColumnModel& model,
                       const UnitSystem& units, spdlog::logger* log,
                       const InterruptGuard& interrupt);

/// Refuses a scenario whose steady state cannot be studied: another solver.method, or no
/// chemistry. `purpose` says what needs the steady state ("fits of a steady state").
void require_steady_chemistry(const Scenario& sc, const ColumnModel& model,
                              std::string_view purpose);

/// The observation file of a command: its --observations `option`, else the scenario's
/// `observations`; refuses (ExitCode::kUsage) when there is neither.
std::filesystem::path observation_file(const std::string& option, const Scenario& sc);

/// The observations in `file` (none when it is empty), refused (exit 4) when they name a
/// species the model lacks: checked before any solve, not after.
ObservationSet read_model_observations(const std::filesystem::path& file, const ColumnModel& model,
                                       const UnitSystem& units);

/// The steady state of the scenario from start_state(...): `run.ok()` and `exit_code` 0, or
/// the reason logged and `exit_code` kInterrupted or kNotConverged. `what` names the state
/// in the log ("steady state at the starting values").
struct BaseSolve {
  RunOutcome run;
  int exit_code = 0;
};
BaseSolve solve_steady_base(const BaseStart& start, const Scenario& sc, ColumnModel& model,
                            const UnitSystem& units, Context& ctx, const InterruptGuard& interrupt,
                            std::string_view what);

/// The mole fractions of the state x (n[j*S + s]), species-major: f[s*N + j] = n / n_air.
std::vector<double> mole_fractions(const ColumnModel& model, std::span<const double> x);

}  // namespace colchem::app
