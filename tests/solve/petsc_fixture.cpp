// Test-harness fixture: one PetscSession for the whole test run (PETSc and MPI can be
// initialised only once per process). This Catch2 listener is the harness's global
// fixture; the library itself holds no PETSc state.
#define CATCH_CONFIG_EXTERNAL_INTERFACES  // TestEventListenerBase
#include <catch2/catch.hpp>

#include <memory>

#include "solve/petsc_session.hpp"

namespace {

class PetscListener : public Catch::TestEventListenerBase {
 public:
  using Catch::TestEventListenerBase::TestEventListenerBase;
  void testRunStarting(Catch::TestRunInfo const&) override {
    session_ = std::make_unique<colchem::PetscSession>();
  }
  void testRunEnded(Catch::TestRunStats const&) override { session_.reset(); }

 private:
  std::unique_ptr<colchem::PetscSession> session_;
};

}  // namespace

CATCH_REGISTER_LISTENER(PetscListener)
