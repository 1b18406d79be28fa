// Reading NetCDF files back through the NetCDF-C API (run files, checkpoints, sweep files,
// tests); they are written by io/dataset_writer.hpp. Every failure is an input error (exit 4)
// naming the file, the variable or attribute, what was expected and what was found.
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

namespace colchem {

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
  [[nodiscard]] std::size_t dimension(const std::string& name) const;
  [[nodiscard]] std::vector<std::size_t> shape(const std::string& var) const;
  /// Every value of a numeric variable, row-major.
  [[nodiscard]] std::vector<double> read(const std::string& var) const;
  /// The values of a numeric variable of the shape of `dims` (dimension names, at their
  /// lengths in this file), all finite unless `finite` is false; refused otherwise.
  [[nodiscard]] std::vector<double> read(const std::string& var,
                                         const std::vector<std::string>& dims,
                                         bool finite = true) const;
  /// A one-dimensional variable of strings; with `dim`, one string per entry of `dim`.
  [[nodiscard]] std::vector<std::string> read_strings(const std::string& var,
                                                      const std::string& dim = {}) const;
  /// A scalar string variable (Dataset::text), or nullopt if there is none.
  [[nodiscard]] std::optional<std::string> text_variable(const std::string& name) const;
  [[nodiscard]] std::optional<std::string> global_text(const std::string& name) const;
  /// A numeric global attribute (its first value), or nullopt if there is none.
  [[nodiscard]] std::optional<double> global_number(const std::string& name) const;
  [[nodiscard]] std::optional<std::string> var_text(const std::string& var,
                                                    const std::string& att) const;
  /// Throws the input error (exit 4) naming this file and `what`.
  [[noreturn]] void refuse(const std::string& what, const std::string& expected,
                           const std::string& found) const;
  [[nodiscard]] const std::filesystem::path& path() const { return path_; }

 private:
  int varid(const std::string& name) const;
  void check(int status, const std::string& what) const;
  std::vector<std::string> strings(int varid, std::size_t n, const std::string& what) const;
  std::optional<std::string> attribute_text(int varid, const std::string& att,
                                            const std::string& what) const;
  std::filesystem::path path_;
  int ncid_ = -1;
};

}  // namespace colchem
