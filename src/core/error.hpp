// Errors that users can act on: every failure caused by an input names where it came from
// (file, line, column, key path), what was expected and what was found, and maps to one of
// the documented exit codes (README "Exit codes").
#pragma once

#include <stdexcept>
#include <string>

namespace colchem {

/// Process exit codes; documented in README.md. Keep the numbers stable.
enum class ExitCode : int {
  kOk = 0,
  kInternal = 1,      ///< a bug or an unexpected library failure
  kUsage = 2,         ///< bad command line
  kConfig = 3,        ///< invalid scenario or sweep configuration
  kInputData = 4,     ///< invalid table, mechanism, spectrum or observation file
  kNotConverged = 5,  ///< a solver did not reach its tolerance
  kOutput = 6,        ///< an output file could not be written
  kInterrupted = 7,   ///< stopped by SIGINT/SIGTERM after writing a checkpoint
};

/// Where an input value came from. line and column are 1-based; 0 means unknown.
struct SourceLocation {
  std::string file;
  int line = 0;
  int column = 0;

  [[nodiscard]] std::string str() const;
};

/// An error in something the user gave us. The message is complete and ready to print; each
/// part is clipped (clip_for_message).
class InputError : public std::runtime_error {
 public:
  InputError(ExitCode code, SourceLocation where, std::string key_path, std::string expected,
             std::string found, std::string hint = {});

  [[nodiscard]] ExitCode code() const { return code_; }
  [[nodiscard]] const SourceLocation& where() const { return where_; }
  [[nodiscard]] const std::string& key_path() const { return key_path_; }
  [[nodiscard]] const std::string& expected() const { return expected_; }
  [[nodiscard]] const std::string& found() const { return found_; }

 private:
  ExitCode code_;
  SourceLocation where_;
  std::string key_path_;
  std::string expected_;
  std::string found_;
};

/// A failure that is not the user's input: a solver that did not converge, an output file
/// that could not be written, a library call that failed.
class RunError : public std::runtime_error {
 public:
  RunError(ExitCode code, const std::string& message)
      : std::runtime_error(message), code_(code) {}
  [[nodiscard]] ExitCode code() const { return code_; }

 private:
  ExitCode code_;
};

/// A value as it appears in a message: longer than 240 characters, its first 200 and
/// "... (N characters in all)" (a 10 MB value is not echoed whole).
std::string clip_for_message(const std::string& text);

/// A number as it appears in a message: six significant digits ("1e-07", "262.5"), never
/// std::to_string's fixed six decimals ("0.000000") nor a 17-digit round trip.
std::string message_number(double v);

/// Levenshtein distance, for "did you mean" suggestions.
std::size_t edit_distance(const std::string& a, const std::string& b);

}  // namespace colchem
