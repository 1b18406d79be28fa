// PETSc's lifetime for one process, and PETSc errors as colchem errors.
//
// PETSc (and MPI under it) may be initialised once per process. A PetscSession created in
// main (or in a test harness) owns that initialisation; a session created while PETSc is
// already initialised is a no-op that leaves finalisation to its owner. Every PETSc call in
// colchem goes through check(), which turns an error code into a RunError carrying PETSc's
// message instead of aborting the process: the session installs PetscReturnErrorHandler so
// that PETSc returns error codes rather than printing a trace and calling MPI_Abort.
// A process not started by mpirun gets Open MPI's light singleton settings (an isolated
// singleton, self transport) unless the user set OMPI_MCA_* values of their own; a command
// creates its session only when it solves with PETSc, so `check` and split runs never
// initialise MPI.
#pragma once

#include <petscsys.h>

#include <string>

namespace colchem {

class PetscSession {
 public:
  /// Initialises PETSc without command-line options.
  PetscSession();
  /// Initialises PETSc with the program's arguments, so that PETSc runtime options
  /// (-colchem_ksp_type ..., -colchem_pc_type ..., -log_view) apply.
  PetscSession(int& argc, char**& argv);
  ~PetscSession();
  PetscSession(const PetscSession&) = delete;
  PetscSession& operator=(const PetscSession&) = delete;

  /// True if this object initialised PETSc (and will finalise it).
  [[nodiscard]] bool owns() const { return owns_; }

 private:
  void start(int* argc, char*** argv);
  bool owns_ = false;
  std::string session_dir_;  ///< private Open MPI session-directory base, removed at the end
};

/// Throws RunError(ExitCode::kInternal) naming `what` and PETSc's message if ierr != 0.
void check(PetscErrorCode ierr, const char* what);

}  // namespace colchem
