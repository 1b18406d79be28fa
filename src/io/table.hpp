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
#include <utility>
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
  void parse_header(const std::string& line, int line_no, bool comma);
  void parse_row(const std::vector<std::string>& fields, int line_no,
                 const std::vector<bool>& as_text);
  std::string file_;
  std::string text_;
  ExitCode code_ = ExitCode::kInputData;
  int header_line_ = 0;
  std::vector<std::string> names_;
  std::vector<std::string> units_;
  std::vector<std::vector<double>> data_;        // [column][row]; empty for text columns
  std::vector<std::vector<std::string>> cells_;  // [column][row]; empty for numeric columns
  std::vector<int> row_lines_;
  std::size_t rows_ = 0;
};

class ConfigNode;

/// An axis column (altitude, wavelength) and a value column of a table, converted.
struct TableProfile {
  std::vector<double> axis;
  std::vector<double> value;
  std::string source;  ///< the file
};

/// How a configuration refers to columns of a table file:
///   {table: FILE, column: NAME, <axis_key>: NAME}   (or FILE alone when file_alone)
struct TableRefForm {
  std::string column;                        ///< default value column (empty: none)
  bool column_required = false;              ///< `column` must be given (no default)
  std::string axis_key = "altitude_column";  ///< key naming the axis column; empty: fixed
  std::string axis_column = "altitude";      ///< default axis column
  bool file_alone = false;                   ///< a bare FILE is accepted
  std::string expected = "{table: FILE, column: NAME}";  ///< when the value is not a map

  /// {table: FILE, column: NAME (default `column`), altitude_column: NAME}, or FILE alone.
  static TableRefForm altitude(std::string column, bool file_alone = false) {
    return {.column = std::move(column), .file_alone = file_alone};
  }
  /// {table: FILE, column: NAME}, `column` required, the altitude column "altitude".
  static TableRefForm altitude_column_required() {
    return {.column = {}, .column_required = true, .axis_key = {}};
  }
  /// {table: FILE, column: NAME (default `column`), wavelength_column: NAME}, or FILE alone.
  static TableRefForm wavelength(std::string column, bool file_alone = true) {
    return {.column = std::move(column),
            .axis_key = "wavelength_column",
            .axis_column = "wavelength",
            .file_alone = file_alone};
  }
};

/// A reference to columns of a table file, as read from a configuration value.
struct TableRef {
  std::filesystem::path file;
  std::string column;
  std::string axis_column;
  /// Reads the file; the axis column must increase strictly down the table.
  [[nodiscard]] Table read() const;
  /// The axis column in `axis_unit` and the value column in `value_unit` (raw when empty).
  [[nodiscard]] TableProfile profile(const Table& t, const UnitSystem& units,
                                     const std::string& axis_unit,
                                     const std::string& value_unit) const;
};

/// The one reader of a table reference. It reads the reference's keys only: the caller reads
/// its own further keys, calls n.done(), then read().
TableRef table_ref(const ConfigNode& n, const TableRefForm& form);

}  // namespace colchem
