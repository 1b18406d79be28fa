// Writes a Dataset (definitions in declared order, the layout of io/dataset_writer.hpp, then
// the data), and text files, each through a StagedFile.
#include "io/dataset_writer.hpp"

#include <netcdf.h>

#include <fstream>
#include <map>
#include <utility>

#include "core/error.hpp"
#include "io/output_claim.hpp"

namespace colchem {

namespace {

using Kind = DatasetVariable::Kind;

// A NetCDF file open for writing at a staged temporary (copied from `source` when one is
// given); closed by write() or the destructor.
class NcWriter {
 public:
  NcWriter(const StagedFile& file, const std::filesystem::path* source)
      : file_(file.output().string()) {
    if (source == nullptr) {
      check(nc_create(file.temporary().c_str(), NC_NETCDF4 | NC_CLOBBER, &ncid_), "create");
      return;
    }
    std::error_code ec;
    std::filesystem::copy_file(*source, file.temporary(),
                               std::filesystem::copy_options::overwrite_existing, ec);
    if (ec) {
      throw RunError(ExitCode::kOutput,
                     file_ + ": could not copy " + source->string() + ": " + ec.message());
    }
    check(nc_open(file.temporary().c_str(), NC_WRITE, &ncid_), "open for amending");
    check(nc_redef(ncid_), "definitions");
  }
  ~NcWriter() {
    if (ncid_ >= 0) nc_close(ncid_);
  }
  NcWriter(const NcWriter&) = delete;
  NcWriter& operator=(const NcWriter&) = delete;

  void write(const Dataset& ds) {
    for (const auto& a : ds.globals()) attribute(NC_GLOBAL, "", a);
    for (const auto& [name, len] : ds.dimensions()) {
      int id = -1;
      check(nc_def_dim(ncid_, name.c_str(), len == 0 ? NC_UNLIMITED : len, &id),
            "dimension " + name);
    }
    // The names of each dimension's entries: the string variables along it.
    std::map<std::string, std::string> labels;
    for (const auto& v : ds.variables()) {
      if (v.kind != Kind::kStrings) continue;
      std::string& names = labels[v.dims.front()];
      names += (names.empty() ? "" : " ") + v.name;
    }
    for (const auto& v : ds.variables()) define(v, labels);
    std::vector<DatasetVariable> index;
    for (const auto& [name, len] : ds.dimensions()) {
      int id = -1;
      if (name == "nv" || nc_inq_varid(ncid_, name.c_str(), &id) == NC_NOERR) continue;
      auto& v = index.emplace_back(
          number_variable(name, {name}, {"", name + " index (0-based)", "", {}, true}));
      if (labels.count(name)) v.attrs.extra["comment"] = "entry names in " + labels.at(name);
      for (std::size_t i = 0; i < len; ++i) v.numbers.push_back(static_cast<double>(i));
      define(v, {});
    }
    check(nc_enddef(ncid_), "end of definitions");
    for (const auto& v : ds.variables()) put(v);
    for (const auto& v : index) put(v);
    check(nc_close(std::exchange(ncid_, -1)), "close");
  }

 private:
  void check(int status, const std::string& what) const {
    if (status != NC_NOERR) {
      throw RunError(ExitCode::kOutput,
                     file_ + ": NetCDF " + what + " failed: " + nc_strerror(status));
    }
  }

  void attribute(int varid, const std::string& var, const DatasetAttr& a) {
    const std::string what = "attribute " + (var.empty() ? "" : var + ":") + a.name;
    if (a.number) {
      check(nc_put_att_double(ncid_, varid, a.name.c_str(), NC_DOUBLE, 1, &*a.number), what);
    } else {
      check(nc_put_att_text(ncid_, varid, a.name.c_str(), a.text.size(), a.text.c_str()), what);
    }
  }

  // A variable and its attributes: units, long_name, standard_name, flag_values, the extra
  // ones, the `after` ones, then (numbers) `coordinates` naming the labels of its dimensions.
  void define(const DatasetVariable& v, const std::map<std::string, std::string>& labels) {
    std::vector<int> dimids;
    std::string coords;
    for (const auto& d : v.dims) {
      check(nc_inq_dimid(ncid_, d.c_str(), &dimids.emplace_back()),
            "lookup of dimension '" + d + "'");
      if (labels.count(d)) coords += (coords.empty() ? "" : " ") + labels.at(d);
    }
    const bool integer = v.attrs.integer || !v.attrs.flag_values.empty();
    const nc_type type = v.kind != Kind::kNumbers ? NC_STRING : integer ? NC_INT : NC_DOUBLE;
    int id = -1;
    check(nc_def_var(ncid_, v.name.c_str(), type, static_cast<int>(dimids.size()), dimids.data(),
                     &id),
          "variable " + v.name);
    const auto text = [&](const std::string& att, const std::string& value) {
      attribute(id, v.name, {att, value, std::nullopt});
    };
    if (!v.attrs.units.empty()) text("units", v.attrs.units);
    if (!v.attrs.long_name.empty()) text("long_name", v.attrs.long_name);
    if (!v.attrs.standard_name.empty()) text("standard_name", v.attrs.standard_name);
    if (!v.attrs.flag_values.empty()) {
      check(nc_put_att_int(ncid_, id, "flag_values", NC_INT, v.attrs.flag_values.size(),
                           v.attrs.flag_values.data()),
            "attribute " + v.name + ":flag_values");
    }
    for (const auto& [att, value] : v.attrs.extra) text(att, value);
    for (const auto& a : v.after) attribute(id, v.name, a);
    std::size_t len = 0;
    const bool own = nc_inq_attlen(ncid_, id, "coordinates", &len) == NC_NOERR;
    if (v.kind == Kind::kNumbers && !coords.empty() && !own) text("coordinates", coords);
  }

  void put(const DatasetVariable& v) {
    int id = -1, ndims = 0, dimids[NC_MAX_VAR_DIMS];
    check(nc_inq_varid(ncid_, v.name.c_str(), &id), "lookup of variable '" + v.name + "'");
    if (v.kind != Kind::kNumbers) {  // strings along one dimension, or one scalar text
      std::vector<const char*> text;
      for (const auto& s : v.strings) text.push_back(s.c_str());
      if (v.kind == Kind::kText && text.empty()) text.push_back("");
      const std::size_t start = 0, count = text.size();
      check(v.kind == Kind::kText ? nc_put_var_string(ncid_, id, text.data())
                                  : nc_put_vara_string(ncid_, id, &start, &count, text.data()),
            "write of " + v.name);
    } else if (!v.numbers.empty()) {  // no data: the variable keeps its fill value
      check(nc_inq_var(ncid_, id, nullptr, nullptr, &ndims, dimids, nullptr), "shape of " + v.name);
      std::size_t total = 1;
      for (int d = 0; d < ndims; ++d) {
        std::size_t n = 0;
        check(nc_inq_dimlen(ncid_, dimids[d], &n), "shape of " + v.name);
        total *= n;
      }
      if (total != v.numbers.size()) {
        throw RunError(ExitCode::kInternal, "variable " + v.name + " expects " +
                                                std::to_string(total) + " values, got " +
                                                std::to_string(v.numbers.size()));
      }
      check(nc_put_var_double(ncid_, id, v.numbers.data()), "write of " + v.name);
    }
  }

  std::string file_;
  int ncid_ = -1;
};

void write(const Dataset& ds, const std::filesystem::path& path,
           const std::filesystem::path* source) {
  StagedFile file(path);
  NcWriter(file, source).write(ds);
  file.commit();
}

}  // namespace

void write_dataset(const Dataset& ds, const std::filesystem::path& path) {
  write(ds, path, nullptr);
}

void amend_dataset(const std::filesystem::path& source, const Dataset& ds,
                   const std::filesystem::path& path) {
  write(ds, path, &source);
}

void write_text_file(const std::filesystem::path& file, const std::string& text) {
  StagedFile staged(file);
  {
    std::ofstream out(staged.temporary());
    out << text;
    if (!out) throw RunError(ExitCode::kOutput, file.string() + ": could not write");
  }
  staged.commit();
}

}  // namespace colchem
