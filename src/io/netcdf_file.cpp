// Reading NetCDF files back (io/netcdf_file.hpp).
#include "io/netcdf_file.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>
#include <netcdf.h>

#include <cmath>
#include <utility>

#include "core/error.hpp"

namespace colchem {

namespace {

std::string shape_text(const std::vector<std::size_t>& shape) {
  if (shape.empty()) return "a single value";
  return fmt::format("({})", fmt::join(shape, ", "));
}

}  // namespace

NcReader::NcReader(const std::filesystem::path& path) : path_(path) {
  const int status = nc_open(path.c_str(), NC_NOWRITE, &ncid_);
  if (status != NC_NOERR) {
    refuse("", "a readable NetCDF file written by colchem", nc_strerror(status));
  }
}

NcReader::NcReader(int ncid, std::filesystem::path name) : path_(std::move(name)), ncid_(ncid) {}

NcReader::~NcReader() {
  if (ncid_ >= 0) nc_close(ncid_);
}

void NcReader::refuse(const std::string& what, const std::string& expected,
                      const std::string& found) const {
  throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, what, expected, found);
}

void NcReader::check(int status, const std::string& what) const {
  if (status != NC_NOERR) refuse(what, "a readable value", nc_strerror(status));
}

int NcReader::varid(const std::string& name) const {
  int id = -1;
  if (nc_inq_varid(ncid_, name.c_str(), &id) != NC_NOERR) {
    refuse(name, "a variable named '" + name + "'", "none");
  }
  return id;
}

bool NcReader::has_variable(const std::string& name) const {
  int id = -1;
  return nc_inq_varid(ncid_, name.c_str(), &id) == NC_NOERR;
}

std::size_t NcReader::dimension(const std::string& name) const {
  int id = -1;
  check(nc_inq_dimid(ncid_, name.c_str(), &id), name);
  std::size_t len = 0;
  check(nc_inq_dimlen(ncid_, id, &len), name);
  return len;
}

std::vector<std::size_t> NcReader::shape(const std::string& var) const {
  int ndims = 0;
  int dimids[NC_MAX_VAR_DIMS];
  check(nc_inq_var(ncid_, varid(var), nullptr, nullptr, &ndims, dimids, nullptr), var);
  std::vector<std::size_t> out(static_cast<std::size_t>(ndims));
  for (std::size_t d = 0; d < out.size(); ++d) check(nc_inq_dimlen(ncid_, dimids[d], &out[d]), var);
  return out;
}

std::vector<double> NcReader::read(const std::string& var) const {
  // Only numbers convert to double: netCDF-C hands a string variable to HDF5's conversion,
  // which fails and leaks the strings it read.
  nc_type type = NC_NAT;
  check(nc_inq_vartype(ncid_, varid(var), &type), var);
  if (type == NC_CHAR || type == NC_STRING || type > NC_STRING) {
    refuse(var, "a numeric variable",
           type == NC_CHAR     ? "a variable of characters (NC_CHAR)"
           : type == NC_STRING ? "a variable of strings (NC_STRING)"
                               : "a variable of a user-defined type");
  }
  std::size_t total = 1;
  for (auto n : shape(var)) total *= n;
  std::vector<double> out(total);
  if (total > 0) check(nc_get_var_double(ncid_, varid(var), out.data()), var);
  return out;
}

std::vector<double> NcReader::read(const std::string& var, const std::vector<std::string>& dims,
                                   bool finite) const {
  std::vector<std::size_t> want;
  for (const auto& d : dims) want.push_back(dimension(d));
  if (const auto got = shape(var); got != want) {
    refuse(var, fmt::format("a ({}) variable of shape {}", fmt::join(dims, ", "), shape_text(want)),
           "shape " + shape_text(got));
  }
  std::vector<double> v = read(var);
  for (std::size_t i = 0; finite && i < v.size(); ++i) {
    if (!std::isfinite(v[i])) refuse(var, "finite values", fmt::format("{} at index {}", v[i], i));
  }
  return v;
}

std::vector<std::string> NcReader::strings(int id, std::size_t n, const std::string& what) const {
  std::vector<char*> raw(n, nullptr);
  if (n > 0) check(nc_get_var_string(ncid_, id, raw.data()), what);
  std::vector<std::string> out;
  for (char* s : raw) out.emplace_back(s ? s : "");
  if (n > 0) nc_free_string(n, raw.data());
  return out;
}

std::vector<std::string> NcReader::read_strings(const std::string& var,
                                                const std::string& dim) const {
  const auto shp = shape(var);
  nc_type type = NC_NAT;
  check(nc_inq_vartype(ncid_, varid(var), &type), var);
  if (type != NC_STRING || shp.size() != 1) {
    refuse(var, "a one-dimensional variable of strings (NC_STRING)",
           type != NC_STRING ? "another type" : std::to_string(shp.size()) + " dimensions");
  }
  if (!dim.empty() && shp[0] != dimension(dim)) {
    refuse(var, fmt::format("one name per '{}' ({})", dim, dimension(dim)), std::to_string(shp[0]));
  }
  return strings(varid(var), shp[0], var);
}

std::optional<std::string> NcReader::text_variable(const std::string& name) const {
  if (!has_variable(name)) return std::nullopt;
  nc_type type = NC_NAT;
  int nd = 0;
  check(nc_inq_var(ncid_, varid(name), nullptr, &type, &nd, nullptr, nullptr), name);
  if (type != NC_STRING || nd != 0) {
    refuse(name, "a scalar variable of text (NC_STRING)", "another type or shape");
  }
  return strings(varid(name), 1, name).front();
}

std::optional<std::string> NcReader::attribute_text(int id, const std::string& att,
                                                    const std::string& what) const {
  std::size_t len = 0;
  nc_type type = NC_NAT;
  if (nc_inq_att(ncid_, id, att.c_str(), &type, &len) != NC_NOERR) return std::nullopt;
  if (type == NC_STRING && len >= 1) {
    std::vector<char*> raw(len, nullptr);
    check(nc_get_att_string(ncid_, id, att.c_str(), raw.data()), what);
    std::string out = raw[0] ? raw[0] : "";
    nc_free_string(len, raw.data());
    return out;
  }
  if (type != NC_CHAR) {
    refuse(what, id == NC_GLOBAL ? "a text global attribute" : "a text attribute",
           "an attribute of another type");
  }
  std::string s(len, '\0');
  check(nc_get_att_text(ncid_, id, att.c_str(), s.data()), what);
  return s;
}

std::optional<std::string> NcReader::global_text(const std::string& name) const {
  return attribute_text(NC_GLOBAL, name, name);
}

std::optional<std::string> NcReader::var_text(const std::string& var,
                                              const std::string& att) const {
  return attribute_text(varid(var), att, var + ":" + att);
}

std::optional<double> NcReader::global_number(const std::string& name) const {
  std::size_t len = 0;
  nc_type type = NC_NAT;
  if (nc_inq_att(ncid_, NC_GLOBAL, name.c_str(), &type, &len) != NC_NOERR) return std::nullopt;
  if (type == NC_CHAR || type == NC_STRING || len == 0) return std::nullopt;
  std::vector<double> v(len);
  check(nc_get_att_double(ncid_, NC_GLOBAL, name.c_str(), v.data()), name);
  return v.front();
}

}  // namespace colchem
