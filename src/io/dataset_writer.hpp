// The one writer of the files colchem produces: a Dataset (core/dataset.hpp, filled by the
// builders in report/) written through NcWriter, which adds the layout every file gets
// (index coordinates and *_name string variables, `coordinates` attributes) and writes to a
// temporary renamed into place under the output claim (io/netcdf_file.hpp).
#pragma once

#include <filesystem>
#include <string>

#include "core/dataset.hpp"

namespace colchem {

/// Writes `ds` as a new file at `path`.
void write_dataset(const Dataset& ds, const std::filesystem::path& path);

/// Adds `ds` (attributes, dimensions and variables the file does not yet have) to a copy of
/// `source` and renames it onto `path` (which may be `source`).
void amend_dataset(const std::filesystem::path& source, const Dataset& ds,
                   const std::filesystem::path& path);

/// Writes text to a file through a temporary and a rename, under the output claim.
void write_text_file(const std::filesystem::path& file, const std::string& text);

}  // namespace colchem
