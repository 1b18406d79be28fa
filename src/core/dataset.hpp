// A file's contents as plain data: what a command writes, declared once per variable (name,
// dimensions, attributes and data together) and handed to the one NetCDF writer in io/
// (io/dataset_writer.hpp). No NetCDF here: report/ fills Datasets, io/ writes them.
//
// Order is kept as declared: dimensions, global attributes and variables appear in the file
// in the order they were added. Layout rules (index coordinates for dimensions without a
// numeric coordinate, `coordinates` attributes naming the string variables along a
// variable's dimensions) are the writer's, not the caller's.
#pragma once

#include <cstddef>
#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace colchem {

/// CF time units of model time (snapshots, box time series). Model time starts at zero; CF
/// time needs a date origin, and this one is a convention stated in the file (the worlds are
/// fictional): "0 s" is printed by xarray as 2000-01-01.
inline constexpr const char* kModelTimeUnits = "seconds since 2000-01-01 00:00:00";
inline constexpr const char* kModelTimeCalendar = "proleptic_gregorian";

/// The attributes every numeric variable may carry, written in this order: units,
/// long_name, standard_name, flag_values, then `extra` (by name).
struct VarAttrs {
  std::string units;  ///< UDUNITS-parsable; "1" for dimensionless
  std::string long_name;
  std::string standard_name;                 ///< CF standard name where one exists, else empty
  std::map<std::string, std::string> extra;  ///< further text attributes
  /// Stored as integers (counts, 0/1 flags); the data are given as doubles.
  bool integer = false;
  /// CF flag_values (with `flag_meanings` in `extra`); implies `integer`.
  std::vector<int> flag_values = {};
};

/// A global or variable attribute: text, or a number when `number` is set.
struct DatasetAttr {
  std::string name;
  std::string text;
  std::optional<double> number;
};

struct DatasetVariable {
  enum class Kind {
    kNumbers,  ///< doubles (or integers, VarAttrs::integer) along `dims`
    kStrings,  ///< one string per entry of its one dimension (e.g. species names)
    kText      ///< a scalar string (provenance texts)
  };
  Kind kind = Kind::kNumbers;
  std::string name;
  std::vector<std::string> dims;
  VarAttrs attrs;                  ///< kStrings and kText use long_name only
  std::vector<DatasetAttr> after;  ///< attributes written after `attrs`, in order
  std::vector<double> numbers;     ///< row-major over `dims`; empty = not written (fill)
  std::vector<std::string> strings;

  /// Adds a `_FillValue` of NaN (gaps in the data read as missing).
  DatasetVariable& nan_fill();
};

class Dataset {
 public:
  void global_text(const std::string& name, std::string value);
  void global_number(const std::string& name, double value);
  /// len 0 = unlimited.
  void dimension(const std::string& name, std::size_t len);

  /// A numeric variable, one statement: name, dimensions, attributes, data.
  DatasetVariable& variable(const std::string& name, std::vector<std::string> dims, VarAttrs attrs,
                            std::vector<double> data = {});
  /// An integer CF flag variable: values 0..k-1 (or `values`) named by `meanings`
  /// (space-separated, one word per value).
  DatasetVariable& flag(const std::string& name, std::vector<std::string> dims,
                        const std::string& long_name, const std::string& meanings,
                        std::vector<double> data = {}, std::vector<int> values = {});
  /// Strings along one dimension (names of its entries).
  DatasetVariable& strings(const std::string& name, const std::string& dim,
                           const std::string& long_name, std::vector<std::string> values = {});
  /// A scalar string variable (long texts kept out of the global attributes).
  DatasetVariable& text(const std::string& name, const std::string& long_name, std::string value);
  /// Appends a prepared variable.
  DatasetVariable& add(DatasetVariable v);

  /// The variable of that name (for filling its data after declaring it); throws if none.
  DatasetVariable& at(const std::string& name);

  [[nodiscard]] const std::vector<std::pair<std::string, std::size_t>>& dimensions() const {
    return dimensions_;
  }
  [[nodiscard]] const std::vector<DatasetAttr>& globals() const { return globals_; }
  [[nodiscard]] const std::vector<DatasetVariable>& variables() const { return variables_; }

 private:
  std::vector<std::pair<std::string, std::size_t>> dimensions_;
  std::vector<DatasetAttr> globals_;
  std::vector<DatasetVariable> variables_;
};

/// A numeric variable not yet placed in a Dataset (builders that fill several at once and
/// add them in file order).
DatasetVariable number_variable(const std::string& name, std::vector<std::string> dims,
                                VarAttrs attrs, std::vector<double> data = {});
/// A flag variable not yet placed (see Dataset::flag).
DatasetVariable flag_variable(const std::string& name, std::vector<std::string> dims,
                              const std::string& long_name, const std::string& meanings,
                              std::vector<double> data = {}, std::vector<int> values = {});
/// A string variable not yet placed (see Dataset::strings).
DatasetVariable string_variable(const std::string& name, const std::string& dim,
                                const std::string& long_name, std::vector<std::string> values = {});

}  // namespace colchem
