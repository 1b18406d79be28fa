// Shared helpers for the Catch2 tests.
#pragma once

#include <catch2/catch.hpp>
#include <mpi.h>

#include <functional>
#include <string>

#include "core/error.hpp"

namespace colchem_test {

/// Initialises MPI on first use (a singleton MPI process outside mpirun). Only tests that need
/// MPI call it, so the others start quickly; tests/main.cpp finalises it at exit.
inline void ensure_mpi() {
  int initialized = 0;
  MPI_Initialized(&initialized);
  if (!initialized) MPI_Init(nullptr, nullptr);
}

/// The message of the InputError that f throws, or "no error".
inline std::string error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const colchem::InputError& e) {
    return e.what();
  }
  return "no error";
}

/// The message of the InputError that f throws, checking that it names a line; fails the
/// test when f throws none.
inline std::string located_error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const colchem::InputError& e) {
    CHECK(e.where().line > 0);
    return e.what();
  }
  FAIL("no InputError");
  return {};
}

}  // namespace colchem_test
