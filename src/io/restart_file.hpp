// A file given to `run --restart` read back: a checkpoint of this column to continue from,
// or why it can only give an initial state.
#pragma once

#include <filesystem>
#include <optional>
#include <string>

#include "solve/column_model.hpp"
#include "solve/column_run.hpp"

namespace colchem {

/// Reading a file given to `run --restart`: `checkpoint` is set when the file is a
/// checkpoint of this column (the same cell edges to 1e-12 relative and the same species in
/// the same order) written by a run of `method`, and `why_not` says otherwise why the file
/// can only give an initial state (a run file, another grid, another method, ...).
struct RestartFile {
  std::optional<RunCheckpoint> checkpoint;
  std::string why_not;
};
RestartFile read_checkpoint(const std::filesystem::path& file, const ColumnModel& model,
                            SolverMethod method);

}  // namespace colchem
