// Shared helpers for the Catch2 tests.
#pragma once

#include <mpi.h>

namespace colchem_test {

/// Initialises MPI on first use (a singleton MPI process outside mpirun). Only tests that need
/// MPI call it, so the others start quickly; tests/main.cpp finalises it at exit.
inline void ensure_mpi() {
  int initialized = 0;
  MPI_Initialized(&initialized);
  if (!initialized) MPI_Init(nullptr, nullptr);
}

}  // namespace colchem_test
