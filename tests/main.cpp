// The test runner. Tests that need MPI (the sweep runner, PETSc) initialise it on first use
// (tests/test_support.hpp); it is finalised here, after every test has run.
#define CATCH_CONFIG_RUNNER
#include <mpi.h>

#include <catch2/catch.hpp>

int main(int argc, char** argv) {
  const int result = Catch::Session().run(argc, argv);
  int initialized = 0, finalized = 0;
  MPI_Initialized(&initialized);
  MPI_Finalized(&finalized);
  if (initialized && !finalized) MPI_Finalize();
  return result;
}
