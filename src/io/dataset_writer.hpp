// The one writer of the files colchem produces: a Dataset (core/dataset.hpp, filled by the
// builders in report/) written through the NetCDF-C API as CF-1.10, each file staged under
// a temporary name and renamed into place under the output claim (io/output_claim.hpp).
//
// Layout every file gets (so CDO, NCO and xarray read it without help): every dimension has
// a numeric coordinate variable of its name; a dimension the Dataset gives none (species,
// reaction, variant, ...; not the CF bounds dimension "nv") gets an integer index 0..n-1.
// Entry names live in string variables along the dimension (`species_name(species)`), which
// every numeric variable on it lists in its CF `coordinates` attribute: CDO does not accept
// string coordinates ("Unsupported x-coordinate type").
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
