// The batch runs of the commands over MPI ranks (app/batch.hpp).
#include "app/batch.hpp"

#include <mpi.h>

#include "solve/progress.hpp"

namespace colchem::app {

WorldRanks world_ranks() {
  WorldRanks w;
  MPI_Comm_rank(MPI_COMM_WORLD, &w.rank);
  MPI_Comm_size(MPI_COMM_WORLD, &w.size);
  return w;
}

std::vector<VariantOutcome> run_batch(const std::vector<Variant>& variants,
                                      const VariantRunner& runner, const BatchReport& report,
                                      const std::function<bool()>& stop_requested,
                                      const std::vector<std::size_t>* todo) {
  BatchProgress batch(report.log, report.label, report.progress_every);
  const VariantDone done = [&](const Variant& v, const VariantOutcome& r) {
    batch.finished(r.finished, r.to_run);
    if (report.line) report.line(v, r);
  };
  return run_variants(MPI_COMM_WORLD, variants, runner, done, stop_requested, todo);
}

int exit_code_of_rank0(int code) {
  MPI_Bcast(&code, 1, MPI_INT, 0, MPI_COMM_WORLD);
  return code;
}

}  // namespace colchem::app
