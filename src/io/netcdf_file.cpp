#include "io/netcdf_file.hpp"

#include <netcdf.h>
#include <unistd.h>

#include <system_error>
#include <utility>

#include "core/error.hpp"

namespace colchem {

// ---------------------------------------------------------------------------------------
// NcWriter

NcWriter::NcWriter(std::filesystem::path final_path)
    : claim_(final_path), final_(std::move(final_path)) {
  temp_ = final_;
  temp_ += ".tmp-" + std::to_string(::getpid());
  if (final_.has_parent_path() && !final_.parent_path().empty()) {
    std::error_code ec;
    std::filesystem::create_directories(final_.parent_path(), ec);
  }
  check(nc_create(temp_.c_str(), NC_NETCDF4 | NC_CLOBBER, &ncid_), "create");
}

NcWriter NcWriter::amend(const std::filesystem::path& source, std::filesystem::path final_path) {
  return NcWriter(AmendTag{}, source, std::move(final_path));
}

NcWriter::NcWriter(AmendTag, const std::filesystem::path& source, std::filesystem::path final_path)
    : claim_(final_path), final_(std::move(final_path)) {
  temp_ = final_;
  temp_ += ".tmp-" + std::to_string(::getpid());
  std::error_code ec;
  std::filesystem::copy_file(source, temp_, std::filesystem::copy_options::overwrite_existing, ec);
  if (ec) {
    throw RunError(ExitCode::kOutput,
                   final_.string() + ": could not copy " + source.string() + ": " + ec.message());
  }
  check(nc_open(temp_.c_str(), NC_WRITE, &ncid_), "open for amending");
  check(nc_redef(ncid_), "definitions");
}

bool NcWriter::has_variable(const std::string& name) const {
  int id = -1;
  return nc_inq_varid(ncid_, name.c_str(), &id) == NC_NOERR;
}

NcWriter::~NcWriter() {
  if (!committed_) {
    if (ncid_ >= 0) nc_close(ncid_);
    std::error_code ec;
    std::filesystem::remove(temp_, ec);
  }
}

void NcWriter::check(int status, const std::string& what) const {
  if (status != NC_NOERR) {
    throw RunError(ExitCode::kOutput, final_.string() + ": NetCDF " + what + " failed: " +
                                          nc_strerror(status));
  }
}

int NcWriter::varid(const std::string& name) const {
  int id = -1;
  check(nc_inq_varid(ncid_, name.c_str(), &id), "lookup of variable '" + name + "'");
  return id;
}

void NcWriter::global_text(const std::string& name, const std::string& value) {
  check(nc_put_att_text(ncid_, NC_GLOBAL, name.c_str(), value.size(), value.c_str()),
        "attribute " + name);
}

void NcWriter::global_number(const std::string& name, double value) {
  check(nc_put_att_double(ncid_, NC_GLOBAL, name.c_str(), NC_DOUBLE, 1, &value),
        "attribute " + name);
}

void NcWriter::dimension(const std::string& name, std::size_t len) {
  int id = -1;
  check(nc_def_dim(ncid_, name.c_str(), len == 0 ? NC_UNLIMITED : len, &id),
        "dimension " + name);
}

void NcWriter::variable(const std::string& name, const std::vector<std::string>& dims,
                        const VarAttrs& attrs) {
  std::vector<int> dimids;
  for (const auto& d : dims) {
    int id = -1;
    check(nc_inq_dimid(ncid_, d.c_str(), &id), "lookup of dimension '" + d + "'");
    dimids.push_back(id);
  }
  int id = -1;
  const bool integer = attrs.integer || !attrs.flag_values.empty();
  check(nc_def_var(ncid_, name.c_str(), integer ? NC_INT : NC_DOUBLE,
                   static_cast<int>(dimids.size()), dimids.data(), &id),
        "variable " + name);
  if (!attrs.units.empty()) var_text(name, "units", attrs.units);
  if (!attrs.long_name.empty()) var_text(name, "long_name", attrs.long_name);
  if (!attrs.standard_name.empty()) var_text(name, "standard_name", attrs.standard_name);
  if (!attrs.flag_values.empty()) {
    check(nc_put_att_int(ncid_, id, "flag_values", NC_INT, attrs.flag_values.size(),
                         attrs.flag_values.data()),
          "attribute " + name + ":flag_values");
  }
  for (const auto& [k, v] : attrs.extra) var_text(name, k, v);
}

void NcWriter::text_variable(const std::string& name, const std::string& long_name,
                             std::string value) {
  int id = -1;
  check(nc_def_var(ncid_, name.c_str(), NC_STRING, 0, nullptr, &id), "variable " + name);
  var_text(name, "long_name", long_name);
  pending_texts_.emplace_back(name, std::move(value));
}

void NcWriter::define_coordinates() {
  int ndims = 0, nvars = 0;
  check(nc_inq_ndims(ncid_, &ndims), "dimensions");
  check(nc_inq_nvars(ncid_, &nvars), "variables");
  // String variables along one dimension: the names of that dimension's entries.
  std::map<int, std::vector<std::string>> labels;
  for (int v = 0; v < nvars; ++v) {
    nc_type type = NC_NAT;
    int nd = 0;
    check(nc_inq_vartype(ncid_, v, &type), "variable type");
    check(nc_inq_varndims(ncid_, v, &nd), "variable shape");
    if (type != NC_STRING || nd != 1) continue;
    int dim = -1;
    char name[NC_MAX_NAME + 1];
    check(nc_inq_vardimid(ncid_, v, &dim), "variable shape");
    check(nc_inq_varname(ncid_, v, name), "variable name");
    labels[dim].emplace_back(name);
  }
  for (int d = 0; d < ndims; ++d) {
    char name[NC_MAX_NAME + 1];
    check(nc_inq_dimname(ncid_, d, name), "dimension name");
    int id = -1;
    // "nv" is the CF bounds dimension (two edges), which takes no coordinate.
    if (nc_inq_varid(ncid_, name, &id) == NC_NOERR || std::string(name) == "nv") continue;
    check(nc_def_var(ncid_, name, NC_INT, 1, &d, &id), "variable " + std::string(name));
    var_text(name, "long_name", std::string(name) + " index (0-based)");
    if (labels.count(d)) {
      std::string names;
      for (const auto& l : labels[d]) names += (names.empty() ? "" : " ") + l;
      var_text(name, "comment", "entry names in " + names);
    }
    index_coordinates_.emplace_back(name);
  }
  for (int v = 0; v < nvars; ++v) {
    nc_type type = NC_NAT;
    int nd = 0;
    check(nc_inq_vartype(ncid_, v, &type), "variable type");
    check(nc_inq_varndims(ncid_, v, &nd), "variable shape");
    if (type == NC_STRING || nd == 0) continue;
    std::vector<int> dims(static_cast<std::size_t>(nd));
    check(nc_inq_vardimid(ncid_, v, dims.data()), "variable shape");
    std::string coords;
    for (int dim : dims) {
      for (const auto& l : labels[dim]) coords += (coords.empty() ? "" : " ") + l;
    }
    if (coords.empty()) continue;
    char name[NC_MAX_NAME + 1];
    check(nc_inq_varname(ncid_, v, name), "variable name");
    std::size_t len = 0;
    if (nc_inq_attlen(ncid_, v, "coordinates", &len) == NC_NOERR) continue;
    var_text(name, "coordinates", coords);
  }
}

void NcWriter::write_index_coordinates() {
  for (const auto& name : index_coordinates_) {
    int dim = -1;
    check(nc_inq_dimid(ncid_, name.c_str(), &dim), "dimension " + name);
    std::size_t n = 0;
    check(nc_inq_dimlen(ncid_, dim, &n), "dimension " + name);
    std::vector<int> index(n);
    for (std::size_t i = 0; i < n; ++i) index[i] = static_cast<int>(i);
    const std::size_t start = 0;
    if (n > 0)
      check(nc_put_vara_int(ncid_, varid(name), &start, &n, index.data()), "write of " + name);
  }
  index_coordinates_.clear();
}

void NcWriter::string_variable(const std::string& name, const std::string& dim,
                               const std::string& long_name) {
  int dimid = -1;
  check(nc_inq_dimid(ncid_, dim.c_str(), &dimid), "lookup of dimension '" + dim + "'");
  int id = -1;
  check(nc_def_var(ncid_, name.c_str(), NC_STRING, 1, &dimid, &id), "variable " + name);
  var_text(name, "long_name", long_name);
}

void NcWriter::var_text(const std::string& var, const std::string& att,
                        const std::string& value) {
  check(nc_put_att_text(ncid_, varid(var), att.c_str(), value.size(), value.c_str()),
        "attribute " + var + ":" + att);
}

void NcWriter::var_number(const std::string& var, const std::string& att, double value) {
  check(nc_put_att_double(ncid_, varid(var), att.c_str(), NC_DOUBLE, 1, &value),
        "attribute " + var + ":" + att);
}

void NcWriter::end_definitions() {
  if (defining_) {
    define_coordinates();
    check(nc_enddef(ncid_), "end of definitions");
    defining_ = false;
    for (const auto& [name, value] : pending_texts_) {
      const char* p = value.c_str();
      check(nc_put_var_string(ncid_, varid(name), &p), "write of " + name);
    }
    pending_texts_.clear();
  }
}

void NcWriter::put(const std::string& var, std::span<const double> data) {
  end_definitions();
  const int id = varid(var);
  int ndims = 0;
  check(nc_inq_varndims(ncid_, id, &ndims), "shape of " + var);
  std::vector<int> dimids(static_cast<std::size_t>(ndims));
  check(nc_inq_vardimid(ncid_, id, dimids.data()), "shape of " + var);
  std::size_t total = 1;
  std::vector<std::size_t> start(dimids.size(), 0), count(dimids.size(), 1);
  for (std::size_t d = 0; d < dimids.size(); ++d) {
    check(nc_inq_dimlen(ncid_, dimids[d], &count[d]), "shape of " + var);
    total *= count[d];
  }
  if (total != data.size()) {
    throw RunError(ExitCode::kInternal, "variable " + var + " expects " + std::to_string(total) +
                                            " values, got " + std::to_string(data.size()));
  }
  check(nc_put_vara_double(ncid_, id, start.data(), count.data(), data.data()), "write of " + var);
}

void NcWriter::put_strings(const std::string& var, const std::vector<std::string>& values) {
  end_definitions();
  std::vector<const char*> ptrs;
  ptrs.reserve(values.size());
  for (const auto& s : values) ptrs.push_back(s.c_str());
  const std::size_t start = 0;
  const std::size_t count = values.size();
  check(nc_put_vara_string(ncid_, varid(var), &start, &count, ptrs.data()), "write of " + var);
}

void NcWriter::commit() {
  end_definitions();
  write_index_coordinates();
  check(nc_close(ncid_), "close");
  ncid_ = -1;
  std::error_code ec;
  std::filesystem::rename(temp_, final_, ec);
  if (ec) {
    std::filesystem::remove(temp_, ec);
    throw RunError(ExitCode::kOutput, final_.string() + ": could not move the finished file into "
                                                        "place: " + ec.message());
  }
  committed_ = true;
}

// ---------------------------------------------------------------------------------------
// NcReader

NcReader::NcReader(const std::filesystem::path& path) : path_(path) {
  const int status = nc_open(path.c_str(), NC_NOWRITE, &ncid_);
  if (status != NC_NOERR) {
    throw InputError(ExitCode::kInputData, SourceLocation{path.string()}, "",
                     "a readable NetCDF file written by colchem", nc_strerror(status));
  }
}

NcReader::NcReader(int ncid, std::filesystem::path name) : path_(std::move(name)), ncid_(ncid) {}

NcReader::~NcReader() {
  if (ncid_ >= 0) nc_close(ncid_);
}

void NcReader::check(int status, const std::string& what) const {
  if (status != NC_NOERR) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, what,
                     "a readable value", nc_strerror(status));
  }
}

int NcReader::varid(const std::string& name) const {
  int id = -1;
  const int status = nc_inq_varid(ncid_, name.c_str(), &id);
  if (status != NC_NOERR) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, name,
                     "a variable named '" + name + "'", "none");
  }
  return id;
}

bool NcReader::has_variable(const std::string& name) const {
  int id = -1;
  return nc_inq_varid(ncid_, name.c_str(), &id) == NC_NOERR;
}

std::vector<std::size_t> NcReader::shape(const std::string& var) const {
  const int id = varid(var);
  int ndims = 0;
  check(nc_inq_varndims(ncid_, id, &ndims), var);
  std::vector<int> dimids(static_cast<std::size_t>(ndims));
  check(nc_inq_vardimid(ncid_, id, dimids.data()), var);
  std::vector<std::size_t> out(dimids.size());
  for (std::size_t d = 0; d < dimids.size(); ++d) check(nc_inq_dimlen(ncid_, dimids[d], &out[d]), var);
  return out;
}

std::vector<double> NcReader::read(const std::string& var) const {
  // Only numbers convert to double: netCDF-C hands a string variable to HDF5's conversion,
  // which fails and leaks the strings it read.
  nc_type type = NC_NAT;
  check(nc_inq_vartype(ncid_, varid(var), &type), var);
  if (type == NC_CHAR || type == NC_STRING || type > NC_STRING) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, var,
                     "a numeric variable",
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

std::vector<std::string> NcReader::read_strings(const std::string& var) const {
  const auto shp = shape(var);
  nc_type type = NC_NAT;
  check(nc_inq_vartype(ncid_, varid(var), &type), var);
  if (type != NC_STRING || shp.size() != 1) {
    throw InputError(
        ExitCode::kInputData, SourceLocation{path_.string()}, var,
        "a one-dimensional variable of strings (NC_STRING)",
        type != NC_STRING ? "another type" : std::to_string(shp.size()) + " dimensions");
  }
  const std::size_t n = shp[0];
  if (n == 0) return {};
  std::vector<char*> raw(n, nullptr);
  check(nc_get_var_string(ncid_, varid(var), raw.data()), var);
  std::vector<std::string> out;
  for (char* s : raw) out.emplace_back(s ? s : "");
  nc_free_string(n, raw.data());
  return out;
}

std::optional<std::string> NcReader::text_variable(const std::string& name) const {
  int id = -1;
  if (nc_inq_varid(ncid_, name.c_str(), &id) != NC_NOERR) return std::nullopt;
  nc_type type = NC_NAT;
  int nd = 0;
  check(nc_inq_vartype(ncid_, id, &type), name);
  check(nc_inq_varndims(ncid_, id, &nd), name);
  if (type != NC_STRING || nd != 0) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, name,
                     "a scalar variable of text (NC_STRING)", "another type or shape");
  }
  char* raw = nullptr;
  check(nc_get_var_string(ncid_, id, &raw), name);
  std::string out = raw ? raw : "";
  nc_free_string(1, &raw);
  return out;
}

std::optional<std::string> NcReader::global_text(const std::string& name) const {
  std::size_t len = 0;
  nc_type type = NC_NAT;
  if (nc_inq_att(ncid_, NC_GLOBAL, name.c_str(), &type, &len) != NC_NOERR) return std::nullopt;
  if (type == NC_STRING && len >= 1) return att_string(NC_GLOBAL, name, len, name);
  if (type != NC_CHAR) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, name,
                     "a text global attribute", "an attribute of another type");
  }
  std::string s(len, '\0');
  check(nc_get_att_text(ncid_, NC_GLOBAL, name.c_str(), s.data()), name);
  return s;
}

std::string NcReader::att_string(int varid, const std::string& att, std::size_t len,
                                 const std::string& what) const {
  std::vector<char*> raw(len, nullptr);
  check(nc_get_att_string(ncid_, varid, att.c_str(), raw.data()), what);
  std::string out = raw[0] ? raw[0] : "";
  nc_free_string(len, raw.data());
  return out;
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

std::optional<std::string> NcReader::var_text(const std::string& var,
                                              const std::string& att) const {
  const int id = varid(var);
  std::size_t len = 0;
  nc_type type = NC_NAT;
  if (nc_inq_att(ncid_, id, att.c_str(), &type, &len) != NC_NOERR) return std::nullopt;
  if (type == NC_STRING && len >= 1) return att_string(id, att, len, var + ":" + att);
  if (type != NC_CHAR) {
    throw InputError(ExitCode::kInputData, SourceLocation{path_.string()}, var + ":" + att,
                     "a text attribute", "an attribute of another type");
  }
  std::string s(len, '\0');
  check(nc_get_att_text(ncid_, id, att.c_str(), s.data()), var + ":" + att);
  return s;
}

std::size_t NcReader::dimension(const std::string& name) const {
  int id = -1;
  check(nc_inq_dimid(ncid_, name.c_str(), &id), name);
  std::size_t len = 0;
  check(nc_inq_dimlen(ncid_, id, &len), name);
  return len;
}

}  // namespace colchem
