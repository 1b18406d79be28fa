// Fuzzes the readers of colchem's NetCDF inputs: read_model_column (run --restart, photo
// --from and compare read the species profiles through it) followed by the scoring compare
// does, and read_budget_inputs followed by the budget of the file's first species (colchem
// budget).
//
// The input does not hold the file's bytes: it describes a netCDF-4 dataset that this harness
// writes with the netCDF-C API in memory, then the readers read (an NcReader on the open
// dataset; the commands' NcReader opens a file by path, the reading is the same). Each
// variable the readers use may be missing, of the wrong dimensions or type, or carry NaN, infinite,
// negative, zero, huge or arbitrary values; dimensions may be empty, inconsistent or
// unlimited; names may be arbitrary, empty or repeated. An empty input describes a consistent
// run file (6 cells, 3 species, 4 reactions). Mutating the HDF5 container's bytes instead
// exercises HDF5 itself, whose Debian 12 version (1.10.8) crashes inside nc_open on corrupt
// files within seconds, a fault of that library that colchem cannot avoid.
#include <H5public.h>
#include <fuzzer/FuzzedDataProvider.h>
#include <netcdf.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <limits>
#include <map>
#include <string>
#include <vector>

#include "analysis/budget.hpp"
#include "analysis/observations.hpp"
#include "analysis/score.hpp"
#include "fuzz_support.hpp"
#include "io/netcdf_file.hpp"
#include "io/output.hpp"

namespace {

/// Defines and writes the described dataset in `nc` (a dataset just created); false when the
/// netCDF-C API refused the description (then the input is skipped: no file of that form can
/// exist).
bool describe(FuzzedDataProvider& in, int nc) {
  // Dimensions (an exhausted input gives the consistent default).
  const std::size_t N = 6 - in.ConsumeIntegralInRange<std::size_t>(0, 6);
  const std::size_t E = N + 1 - in.ConsumeIntegralInRange<std::size_t>(0, 2) + 0;
  const std::size_t S = 3 - in.ConsumeIntegralInRange<std::size_t>(0, 3);
  const std::size_t R = 4 - in.ConsumeIntegralInRange<std::size_t>(0, 4);
  const bool unlimited = in.ConsumeIntegralInRange<int>(0, 7) == 1;
  std::map<std::string, int> dim;
  const std::pair<const char*, std::size_t> dims[] = {{"altitude", unlimited ? NC_UNLIMITED : N},
                                                      {"altitude_edge", E},
                                                      {"species", S},
                                                      {"reaction", R}};
  for (const auto& [name, len] : dims) {
    if (nc_def_dim(nc, name, len, &dim[name]) != NC_NOERR) return false;
  }
  const auto dims_len = [&](const std::string& name) {
    for (const auto& [n, len] : dims) {
      if (name == n) return len;
    }
    return std::size_t{0};
  };
  const std::string all_dims[] = {"altitude", "altitude_edge", "species", "reaction"};
  struct Var {
    const char* name;
    std::vector<std::string> dims;
    bool text;
    int id = -1;
    int kind = 0;
    nc_type type = NC_DOUBLE;
  };
  std::vector<Var> vars = {{"altitude", {"altitude"}, false},
                           {"altitude_edge", {"altitude_edge"}, false},
                           {"species_name", {"species"}, true},
                           {"number_density", {"species", "altitude"}, false},
                           {"mole_fraction", {"species", "altitude"}, false},
                           {"reaction_equation", {"reaction"}, true},
                           {"net_stoichiometry", {"reaction", "species"}, false},
                           {"reaction_rate", {"reaction", "altitude"}, false},
                           {"transport_tendency", {"species", "altitude"}, false},
                           {"net_tendency", {"species", "altitude"}, false}};
  for (auto& v : vars) {
    // 0 as written by colchem, 1 absent, 2 other dimensions, 3 another type, 4 an extra dimension
    v.kind = in.ConsumeIntegralInRange<int>(0, 4);
    if (v.kind == 1) continue;
    if (v.kind == 2) {
      v.dims.clear();
      const int n = in.ConsumeIntegralInRange<int>(0, 3);
      for (int k = 0; k < n; ++k) v.dims.push_back(all_dims[in.ConsumeIntegralInRange<int>(0, 3)]);
    }
    if (v.kind == 4) v.dims.push_back(all_dims[in.ConsumeIntegralInRange<int>(0, 3)]);
    v.type = v.text ? NC_STRING : NC_DOUBLE;
    if (v.kind == 3) {
      const nc_type other[] = {NC_INT, NC_FLOAT, NC_CHAR, v.text ? NC_DOUBLE : NC_STRING};
      v.type = other[in.ConsumeIntegralInRange<int>(0, 3)];
    }
    std::vector<int> ids;
    for (const auto& d : v.dims) ids.push_back(dim[d]);
    if (nc_def_var(nc, v.name, v.type, static_cast<int>(ids.size()), ids.data(), &v.id) !=
        NC_NOERR) {
      return false;
    }
    // A variable along the unlimited dimension is stored in chunks; netCDF-C's default chunk
    // along two unlimited dimensions is 16 MB, filled on the first write. One chunk of the
    // size written instead: the file reads the same.
    if (unlimited && std::find(v.dims.begin(), v.dims.end(), "altitude") != v.dims.end()) {
      std::vector<std::size_t> chunks;
      for (const auto& d : v.dims) {
        const std::size_t len = d == "altitude" ? N : dims_len(d);
        chunks.push_back(std::max<std::size_t>(len, 1));
      }
      if (nc_def_var_chunking(nc, v.id, NC_CHUNKED, chunks.data()) != NC_NOERR) return false;
    }
  }
  if (nc_enddef(nc) != NC_NOERR) return false;
  const char* names[] = {"SO2", "O", "O2", "SO", "SO3", "CO2"};
  for (auto& v : vars) {
    if (v.kind == 1) continue;
    std::vector<std::size_t> count;
    std::size_t total = 1;
    for (const auto& d : v.dims) {
      std::size_t len = 0;
      nc_inq_dimlen(nc, dim[d], &len);
      if (d == "altitude" && unlimited) len = N;  // records written below
      count.push_back(len);
      total *= len;
    }
    if (total == 0 || total > 4096) continue;
    const std::vector<std::size_t> start(count.size(), 0);
    if (v.type == NC_STRING) {
      std::vector<std::string> s(total);
      std::vector<const char*> p(total);
      for (std::size_t i = 0; i < total; ++i) {
        switch (in.ConsumeIntegralInRange<int>(0, 3)) {
          case 0:
            s[i] = v.name == std::string("species_name") ? names[i % 6]
                                                         : std::string(names[i % 6]) + " -> O";
            break;
          case 1:
            s[i] = in.ConsumeRandomLengthString(24);
            break;
          case 2:
            s[i] = names[0];
            break;
          default:
            s[i].clear();
        }
        p[i] = s[i].c_str();
      }
      if (nc_put_vara_string(nc, v.id, start.data(), count.data(), p.data()) != NC_NOERR) {
        return false;
      }
      continue;
    }
    if (v.type == NC_CHAR) {
      const std::string s = in.ConsumeBytesAsString(total);
      std::string padded = s + std::string(total - s.size(), 'x');
      if (nc_put_vara_text(nc, v.id, start.data(), count.data(), padded.data()) != NC_NOERR) {
        return false;
      }
      continue;
    }
    std::vector<double> x(total);
    const std::size_t inner = count.empty() ? 1 : count.back();
    for (std::size_t i = 0; i < total; ++i) {
      const double j = static_cast<double>(i % inner);
      double regular = 1.0;
      const std::string nm = v.name;
      if (nm == "altitude")
        regular = 50.0 + j;
      else if (nm == "altitude_edge")
        regular = 49.5 + j;
      else if (nm == "number_density")
        regular = 1e6 * (1.0 + static_cast<double>(i));
      else if (nm == "mole_fraction")
        regular = 1e-6;
      else if (nm == "net_stoichiometry")
        regular = static_cast<double>(i % 3) - 1.0;
      else if (nm == "reaction_rate")
        regular = 1e3;
      switch (in.ConsumeIntegralInRange<int>(0, 7)) {
        case 0:
          x[i] = regular;
          break;
        case 1:
          x[i] = std::numeric_limits<double>::quiet_NaN();
          break;
        case 2:
          x[i] = -regular;
          break;
        case 3:
          x[i] = std::numeric_limits<double>::infinity();
          break;
        case 4:
          x[i] = 0.0;
          break;
        case 5:
          x[i] = 1e300;
          break;
        case 6:
          x[i] = -1e-300;
          break;
        default:
          x[i] = in.ConsumeFloatingPoint<double>();
      }
    }
    if (nc_put_vara_double(nc, v.id, start.data(), count.data(), x.data()) != NC_NOERR) {
      // NC_ERANGE for values outside an integer or float type: the rest is written.
    }
  }
  return true;
}

/// Runs the readers on `nc`, the way the commands run them on a file they opened.
void read(const colchem::NcReader& nc) {
  colchem::fuzz::refusals_allowed([&] {
    const colchem::ModelColumn m = colchem::read_model_column(nc);
    // Two observed points of the first species, one inside and one far above the column.
    colchem::ObservationSet obs;
    obs.file = "fuzz-observations.csv";
    colchem::ObservationPoint o;
    o.altitude_cm = m.altitude_cm.front();
    o.species = m.species.front();
    o.value = 1e-6;
    o.uncertainty = 1e-7;
    o.line = 2;
    obs.points.push_back(o);
    o.altitude_cm = 1e9;
    o.uncertainty = 0.0;
    o.upper_limit = true;
    o.line = 3;
    obs.points.push_back(o);
    (void)colchem::score_column(m.altitude_cm, m.species, m.mole_fraction, obs, 0);
  });
  colchem::fuzz::refusals_allowed([&] {
    const colchem::BudgetInputs in_b = colchem::read_budget_inputs(nc);
    (void)colchem::species_budget(in_b, in_b.species.front(), {});
  });
}

}  // namespace

extern "C" int LLVMFuzzerInitialize(int*, char***) {
  colchem::fuzz::quiet_logs();
  // HDF5 allocates a type-conversion buffer (1 MB by default, from memory) for writes and
  // reads of strings and returns it to malloc at once when its free list of such blocks
  // would exceed its limit (1 MB by default, from memory); under AddressSanitizer each is a
  // fresh mapping, page faults and all (half the CPU time per input, measured with perf).
  // Larger free lists let HDF5 reuse them; the memory stays HDF5's, and colchem's code and
  // its allocations are checked as before.
  H5set_free_list_limits(-1, -1, -1, -1, 64 << 20, 16 << 20);
  return 0;
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  FuzzedDataProvider in(data, size);
  // The dataset lives in memory only (NC_DISKLESS without NC_PERSIST) and the readers read it
  // in the session that wrote it: closing, writing out and reopening a netCDF-4 file costs
  // ten times the rest and runs only netCDF-C and HDF5 code. After a failed input the name
  // is free again, since the dataset is closed on every path.
  const char* const name = "fuzz-run.nc";
  int nc = -1;
  if (const int status = nc_create(name, NC_NETCDF4 | NC_DISKLESS, &nc); status != NC_NOERR) {
    std::fprintf(stderr, "fuzz_netcdf: nc_create: %s\n", nc_strerror(status));
    std::abort();
  }
  if (!describe(in, nc)) {
    nc_abort(nc);  // closes; its error, that there is no file to delete, is no concern here
    return 0;
  }
  colchem::fuzz::refusals_allowed([&] { read(colchem::NcReader(nc, name)); });
  return 0;
}
