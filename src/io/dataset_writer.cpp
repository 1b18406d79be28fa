// Writes a Dataset through NcWriter (definitions in declared order, then the data), and
// text files through a temporary and a rename.
#include "io/dataset_writer.hpp"

#include <unistd.h>

#include <fstream>

#include "core/error.hpp"
#include "io/netcdf_file.hpp"
#include "io/output_claim.hpp"

namespace colchem {

namespace {

void define(NcWriter& nc, const DatasetVariable& v) {
  switch (v.kind) {
    case DatasetVariable::Kind::kNumbers:
      nc.variable(v.name, v.dims, v.attrs);
      break;
    case DatasetVariable::Kind::kStrings:
      nc.string_variable(v.name, v.dims.front(), v.attrs.long_name);
      break;
    case DatasetVariable::Kind::kText:
      nc.text_variable(v.name, v.attrs.long_name, v.strings.empty() ? "" : v.strings.front());
      break;
  }
  for (const auto& a : v.after) {
    if (a.number) {
      nc.var_number(v.name, a.name, *a.number);
    } else {
      nc.var_text(v.name, a.name, a.text);
    }
  }
}

void write(NcWriter& nc, const Dataset& ds) {
  for (const auto& a : ds.globals()) {
    if (a.number) {
      nc.global_number(a.name, *a.number);
    } else {
      nc.global_text(a.name, a.text);
    }
  }
  for (const auto& [name, len] : ds.dimensions()) nc.dimension(name, len);
  for (const auto& v : ds.variables()) define(nc, v);
  nc.end_definitions();
  for (const auto& v : ds.variables()) {
    if (v.kind == DatasetVariable::Kind::kStrings) nc.put_strings(v.name, v.strings);
    // No data: the variable keeps its fill value (or has no entries).
    if (v.kind == DatasetVariable::Kind::kNumbers && !v.numbers.empty()) nc.put(v.name, v.numbers);
  }
  nc.commit();
}

}  // namespace

void write_dataset(const Dataset& ds, const std::filesystem::path& path) {
  NcWriter nc(path);
  write(nc, ds);
}

void amend_dataset(const std::filesystem::path& source, const Dataset& ds,
                   const std::filesystem::path& path) {
  NcWriter nc = NcWriter::amend(source, path);
  write(nc, ds);
}

void write_text_file(const std::filesystem::path& file, const std::string& text) {
  const OutputClaim claim(file);
  std::filesystem::path tmp = file;
  tmp += ".tmp-" + std::to_string(::getpid());
  if (file.has_parent_path()) {
    std::error_code ec;
    std::filesystem::create_directories(file.parent_path(), ec);
  }
  {
    std::ofstream out(tmp);
    out << text;
    if (!out) throw RunError(ExitCode::kOutput, file.string() + ": could not write");
  }
  std::error_code ec;
  std::filesystem::rename(tmp, file, ec);
  if (ec) {
    std::filesystem::remove(tmp, ec);
    throw RunError(ExitCode::kOutput, file.string() + ": could not move into place");
  }
}

}  // namespace colchem
