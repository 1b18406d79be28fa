// CF-1.10 NetCDF output through the NetCDF-C API.
//
// NcWriter writes to "<final>.tmp-<pid>" and renames onto the final path only in commit(),
// so an interrupted or failed run never leaves a half-written file under the final name;
// the destructor of an uncommitted writer deletes the temporary.
// NcReader reads variables and attributes back (restart, compare, budget, tests).
//
// Layout every file gets from the writer (so CDO, NCO and xarray read it without help):
// every dimension has a numeric coordinate variable of the same name. Dimensions the caller
// gives no coordinate (species, reaction, channel, variant, ...) get an integer index
// 0..n-1 at commit(); their names live in string variables along the dimension (e.g.
// `species_name(species)`), which every numeric variable on that dimension lists in its CF
// `coordinates` attribute. CDO does not accept string coordinates ("Unsupported
// x-coordinate type"), which is why names are never the coordinate variable itself.
// Long texts (the scenario, the input files) are scalar string variables (text_variable),
// not global attributes, so `ncdump -h` stays short.
#pragma once

#include <filesystem>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "core/dataset.hpp"
#include "io/output_claim.hpp"

namespace colchem {

class NcWriter {
 public:
  explicit NcWriter(std::filesystem::path final_path);
  /// Adds to an existing file: copies `source` to a temporary next to `final_path`, opens it
  /// for definitions, and on commit() renames it onto `final_path` (which may be `source`).
  static NcWriter amend(const std::filesystem::path& source, std::filesystem::path final_path);
  ~NcWriter();
  NcWriter(const NcWriter&) = delete;
  NcWriter& operator=(const NcWriter&) = delete;

  void global_text(const std::string& name, const std::string& value);
  void global_number(const std::string& name, double value);
  /// len 0 = unlimited.
  void dimension(const std::string& name, std::size_t len);
  void variable(const std::string& name, const std::vector<std::string>& dims,
                const VarAttrs& attrs);
  /// A variable of strings (NC_STRING) along one dimension, e.g. species names.
  void string_variable(const std::string& name, const std::string& dim,
                       const std::string& long_name);
  /// A scalar string variable holding `value` (provenance texts); written at end_definitions().
  void text_variable(const std::string& name, const std::string& long_name, std::string value);
  void var_text(const std::string& var, const std::string& att, const std::string& value);
  void var_number(const std::string& var, const std::string& att, double value);
  [[nodiscard]] bool has_variable(const std::string& name) const;

  /// Leaves define mode (called automatically by the first put).
  void end_definitions();
  void put(const std::string& var, std::span<const double> data);
  void put_strings(const std::string& var, const std::vector<std::string>& values);
  /// Closes and renames onto the final path.
  void commit();

  [[nodiscard]] const std::filesystem::path& final_path() const { return final_; }

 private:
  struct AmendTag {};
  NcWriter(AmendTag, const std::filesystem::path& source, std::filesystem::path final_path);
  int varid(const std::string& name) const;
  void check(int status, const std::string& what) const;
  /// Index coordinates for dimensions without one, `coordinates` attributes naming the
  /// string variables along a variable's dimensions (see the layout note above).
  void define_coordinates();
  void write_index_coordinates();
  OutputClaim claim_;
  std::vector<std::pair<std::string, std::string>> pending_texts_;
  std::vector<std::string>
      index_coordinates_;  ///< OUTPUT.lock while this writer lives (io/output_claim.hpp)
  std::filesystem::path final_;
  std::filesystem::path temp_;
  int ncid_ = -1;
  bool defining_ = true;
  bool committed_ = false;
};

class NcReader {
 public:
  explicit NcReader(const std::filesystem::path& path);
  /// Takes over `ncid`, a dataset opened with the netCDF-C API (closed with the reader);
  /// `name` stands for the file in messages. (tests/fuzz/fuzz_netcdf.cpp reads datasets it
  /// made in memory.)
  NcReader(int ncid, std::filesystem::path name);
  ~NcReader();
  NcReader(const NcReader&) = delete;
  NcReader& operator=(const NcReader&) = delete;

  [[nodiscard]] bool has_variable(const std::string& name) const;
  [[nodiscard]] std::vector<double> read(const std::string& var) const;
  [[nodiscard]] std::vector<std::size_t> shape(const std::string& var) const;
  [[nodiscard]] std::vector<std::string> read_strings(const std::string& var) const;
  /// A scalar string variable (NcWriter::text_variable), or nullopt if there is none.
  [[nodiscard]] std::optional<std::string> text_variable(const std::string& name) const;
  [[nodiscard]] std::optional<std::string> global_text(const std::string& name) const;
  /// A numeric global attribute (its first value), or nullopt if there is none.
  [[nodiscard]] std::optional<double> global_number(const std::string& name) const;
  [[nodiscard]] std::optional<std::string> var_text(const std::string& var,
                                                    const std::string& att) const;
  [[nodiscard]] std::size_t dimension(const std::string& name) const;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }

 private:
  int varid(const std::string& name) const;
  void check(int status, const std::string& what) const;
  /// The first value of an NC_STRING attribute with `len` values.
  std::string att_string(int varid, const std::string& att, std::size_t len,
                         const std::string& what) const;
  std::filesystem::path path_;
  int ncid_ = -1;
};

}  // namespace colchem
