// PetscSession and check(): see petsc_session.hpp.
#include "solve/petsc_session.hpp"

#include <string>

#include "core/error.hpp"

namespace colchem {

PetscSession::PetscSession() { start(nullptr, nullptr); }

PetscSession::PetscSession(int& argc, char**& argv) { start(&argc, &argv); }

void PetscSession::start(int* argc, char*** argv) {
  PetscBool already = PETSC_FALSE;
  check(PetscInitialized(&already), "PetscInitialized");
  if (already) return;
  // No help text of our own: "-help" lists PETSc's options, ours are in the scenario.
  check(PetscInitialize(argc, argv, nullptr, nullptr), "PetscInitialize");
  owns_ = true;
  check(PetscPushErrorHandler(PetscReturnErrorHandler, nullptr), "PetscPushErrorHandler");
}

PetscSession::~PetscSession() {
  if (!owns_) return;
  // Destructors must not throw; a failing finalisation has nothing left to report to.
  (void)PetscPopErrorHandler();
  (void)PetscFinalize();
}

void check(PetscErrorCode ierr, const char* what) {
  if (ierr == 0) return;
  const char* text = nullptr;
  char* specific = nullptr;
  (void)PetscErrorMessage(ierr, &text, &specific);
  std::string msg = std::string("PETSc call failed: ") + what + " (error " +
                    std::to_string(static_cast<int>(ierr));
  if (text != nullptr) msg += std::string(": ") + text;
  if (specific != nullptr && specific[0] != '\0') msg += std::string("; ") + specific;
  msg += ")";
  throw RunError(ExitCode::kInternal, msg);
}

}  // namespace colchem
