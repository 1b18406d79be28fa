// Regression cases of inputs the libFuzzer harnesses (tests/fuzz/) found mishandled, each
// with what colchem must do instead (README "Fuzzing"). Expected refusals follow the error
// rules of README "Exit codes" (common practice, no source).
#include <netcdf.h>
#include <catch2/catch.hpp>

#include <filesystem>
#include <string>

#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"

using namespace colchem;
namespace fs = std::filesystem;

namespace {
void ok(int status) {
  REQUIRE(status == NC_NOERR);
}
}  // namespace

// fuzz_netcdf: a run file whose `altitude` holds strings. netCDF-C passed the strings to
// HDF5's conversion to double, which failed and leaked them (LeakSanitizer); the reader now
// refuses any non-numeric variable before reading it.
TEST_CASE("a run file with a variable of strings where numbers belong is refused",
          "[netcdf][fuzz]") {
  const fs::path file = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "fuzz_altitude_strings.nc";
  int nc = -1, dim = -1, var = -1;
  ok(nc_create(file.c_str(), NC_NETCDF4 | NC_CLOBBER, &nc));
  ok(nc_def_dim(nc, "altitude", 2, &dim));
  ok(nc_def_var(nc, "altitude", NC_STRING, 1, &dim, &var));
  ok(nc_enddef(nc));
  const char* text[] = {"50", "51"};
  ok(nc_put_var_string(nc, var, text));
  ok(nc_close(nc));
  const NcReader r(file);
  try {
    (void)read_model_column(r);
    FAIL("read_model_column accepted an altitude of strings");
  } catch (const InputError& e) {
    CHECK(e.code() == ExitCode::kInputData);
    CHECK(e.where().file == file.string());
    CHECK(e.key_path() == "altitude");
    CHECK(e.expected() == "a numeric variable");
    CHECK(e.found() == "a variable of strings (NC_STRING)");
  }
  fs::remove(file);
}
