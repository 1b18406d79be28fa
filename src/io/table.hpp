// Column tables: profiles, spectra, cross sections, observations.
//
// Format (documented in README "Table files"):
//   # comment lines anywhere (sources, "invented" labels)
//   altitude [km], temperature [K], eddy_diffusion [cm2 s-1]
//   58, 262.0, 1.0e5
// The first non-comment line is the header: column names, each with its unit in square
// brackets (UDUNITS-2 syntax; "[1]" or no bracket for dimensionless). Fields are separated by
// commas when the header has a comma, by white space otherwise (then units hold no spaces).
#pragma once

#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include "core/error.hpp"
#include "core/units.hpp"

namespace colchem {

class Table {
 public:
  /// Reads and checks the file: every row has every column, every field is a number.
  /// `text_columns` are kept as text (e.g. a species name); all others must be numbers.
  /// With `numeric_columns` (not null), every column not named there is kept as text (the
  /// observation file's unknown columns, which are only warned about).
  static Table read(const std::filesystem::path& file, ExitCode code = ExitCode::kInputData,
                    const std::vector<std::string>& text_columns = {},
                    const std::vector<std::string>* numeric_columns = nullptr);
  static Table parse(const std::string& text, const std::string& name,
                     ExitCode code = ExitCode::kInputData,
                     const std::vector<std::string>& text_columns = {},
                     const std::vector<std::string>* numeric_columns = nullptr);

  [[nodiscard]] bool has(const std::string& column) const;
  /// The column converted to `target_unit`; errors name the file, the header line and the
  /// column.
  [[nodiscard]] std::vector<double> column(const std::string& name, const UnitSystem& units,
                                           const std::string& target_unit) const;
  /// Raw values and the unit as written.
  [[nodiscard]] const std::vector<double>& raw(const std::string& name) const;
  /// A text column (declared in `text_columns` when reading).
  [[nodiscard]] const std::vector<std::string>& texts(const std::string& name) const;
  [[nodiscard]] const std::string& unit(const std::string& name) const;
  [[nodiscard]] const std::vector<std::string>& names() const { return names_; }
  [[nodiscard]] std::size_t rows() const { return rows_; }
  /// File line of data row i (for error messages).
  [[nodiscard]] int line_of_row(std::size_t i) const { return row_lines_.at(i); }
  [[nodiscard]] const std::string& file() const { return file_; }
  [[nodiscard]] const std::string& text() const { return text_; }
  /// Fails unless the column increases strictly (altitude, wavelength).
  void require_increasing(const std::string& name) const;
  [[noreturn]] void fail_row(std::size_t row, const std::string& column,
                             const std::string& expected, const std::string& found) const;

 private:
  [[nodiscard]] std::size_t index(const std::string& name) const;
  std::string file_;
  std::string text_;
  ExitCode code_ = ExitCode::kInputData;
  int header_line_ = 0;
  std::vector<std::string> names_;
  std::vector<std::string> units_;
  std::vector<std::vector<double>> data_;       // [column][row]; empty for text columns
  std::vector<std::vector<std::string>> cells_;  // [column][row]; empty for numeric columns
  std::vector<int> row_lines_;
  std::size_t rows_ = 0;
};

}  // namespace colchem
