// The launcher: `colchem` itself runs the commands that solve nothing (check, compare,
// budget, photo, box) and hands every other command line to `colchem-full`, the program
// with every command, which it finds next to itself.
//
// Why: the solvers link PETSc, and PETSc links MPI and a hundred libraries more; the dynamic
// loader alone takes longer than a `check` of a scenario. The launcher links none of them, so
// the light commands start quickly; `colchem-full` is entered by exec (same process, same
// environment, so `mpirun colchem sweep` works as before).
#pragma once

namespace colchem::app {

/// True if the command line names a command the launcher runs itself (the first word that
/// is not a global option; `--log-level VALUE` is skipped). Help, version and unknown words
/// go to the full program, which lists every command.
bool launcher_runs(int argc, char** argv);

/// Replaces the process by colchem-full with the same arguments. Returns only on failure,
/// with the exit code to use after reporting why on standard error.
int exec_full_program(char** argv);

}  // namespace colchem::app
