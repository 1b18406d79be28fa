// The enhancement factors J / J_direct-beam (dimensionless) and the printed J table (s-1);
// the NetCDF variables of a photolysis run are built in report/ (photolysis J_<channel> in s-1,
// bins in nm, photon fluxes in cm-2 s-1 nm-1).
#include "photo/photolysis_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <vector>

#include "core/constants.hpp"

namespace colchem {

std::vector<double> enhancement_factors(std::span<const double> J,
                                        std::span<const double> J_direct) {
  std::vector<double> r(J.size(), 1.0);  // 1 where the direct beam gives no J at all
  for (std::size_t i = 0; i < J.size() && i < J_direct.size(); ++i) {
    if (J_direct[i] > 0.0) r[i] = J[i] / J_direct[i];
  }
  return r;
}

std::string format_jvalue_table(const PhotolysisModel& model, std::span<const double> J,
                                const Grid& grid, const std::string& unit) {
  const std::size_t N = model.levels();
  std::size_t width = 11;
  for (const auto& name : model.channels()) width = std::max(width, name.size() + 2);
  std::string out = fmt::format("{:>10}", "z [km]");
  for (const auto& name : model.channels()) out += fmt::format("{:>{}}", name, width);
  out += "\n";
  out += fmt::format("{:>10}", "");
  for (std::size_t c = 0; c < model.channels().size(); ++c)
    out += fmt::format("{:>{}}", unit, width);
  out += "\n";
  for (std::size_t jj = N; jj-- > 0;) {  // top first, as the beam goes
    out += fmt::format("{:10.2f}", grid.center_cm[jj] / constants::kCmPerKm);
    for (std::size_t c = 0; c < model.channels().size(); ++c) {
      out += fmt::format("{:>{}.3e}", J[c * N + jj], width);
    }
    out += "\n";
  }
  return out;
}

}  // namespace colchem
