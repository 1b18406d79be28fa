// PetscSession and check(): see petsc_session.hpp.
#include "solve/petsc_session.hpp"

#include <cstdlib>
#include <filesystem>
#include <string>
#include <system_error>

#include "core/error.hpp"

namespace colchem {

namespace {

/// True when a launcher (mpirun, srun with PMIx or PMI) started this process.
bool launched_by_mpirun() {
  for (const char* v : {"OMPI_COMM_WORLD_SIZE", "PMIX_RANK", "PMI_RANK", "PMI_SIZE"}) {
    if (std::getenv(v) != nullptr) return true;
  }
  return false;
}

/// A process started without mpirun is an MPI singleton. Open MPI would start a helper
/// daemon for it (in case it spawns processes) and open and probe every transport, which
/// takes most of a short run's start-up. colchem never spawns and a singleton talks only to
/// itself, so it asks for an isolated singleton with the self transport (shared-memory
/// one-sided windows for the sweep counter). Only where the user has not set these.
/// Isolated singletons all take job family 0, so their session directories would collide
/// (one process removing the directory another is creating: MPI_Init fails when several run
/// at once); each therefore gets a session-directory base of its own, returned so that the
/// session removes it after finalisation ("" when none was made).
std::string prefer_light_singleton() {
  if (launched_by_mpirun()) return "";
  int initialized = 0;
  MPI_Initialized(&initialized);
  if (initialized) return "";
  std::string base;
  if (std::getenv("OMPI_MCA_orte_tmpdir_base") == nullptr) {
    std::error_code ec;
    std::string pattern = (std::filesystem::temp_directory_path(ec) / "colchem-mpi-XXXXXX").string();
    if (!ec && mkdtemp(pattern.data()) != nullptr) {
      base = pattern;
      setenv("OMPI_MCA_orte_tmpdir_base", base.c_str(), 1);
    }
  }
  const char* const settings[][2] = {{"OMPI_MCA_ess_singleton_isolated", "1"},
                                     {"OMPI_MCA_pml", "ob1"},
                                     {"OMPI_MCA_btl", "self"},
                                     {"OMPI_MCA_osc", "sm"},
                                     {"OMPI_MCA_coll", "self,basic,libnbc"}};
  for (const auto& s : settings) {
    // Without a private session directory, an isolated singleton is not safe to run beside
    // another one: keep Open MPI's default singleton then.
    if (base.empty() && std::string(s[0]) == "OMPI_MCA_ess_singleton_isolated") continue;
    setenv(s[0], s[1], 0);
  }
  return base;
}

}  // namespace

PetscSession::PetscSession() { start(nullptr, nullptr); }

PetscSession::PetscSession(int& argc, char**& argv) { start(&argc, &argv); }

void PetscSession::start(int* argc, char*** argv) {
  PetscBool already = PETSC_FALSE;
  check(PetscInitialized(&already), "PetscInitialized");
  if (already) return;
  session_dir_ = prefer_light_singleton();
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
  if (!session_dir_.empty()) {
    std::error_code ec;
    std::filesystem::remove_all(session_dir_, ec);
  }
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
