// Photolysis output (no formula of its own beyond J / J_direct-beam): J_<channel> (s-1), the
// bins (nm), the stellar photon flux at the top and the actinic and diffuse fluxes
// (cm-2 s-1 nm-1); variables and units listed in photo/photolysis_output.hpp.
#include "photo/photolysis_output.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <stdexcept>
#include <vector>

#include "core/constants.hpp"

namespace colchem {

namespace {
/// CF standard names of photolysis rates (CF Standard Name Table, from memory), recognised by
/// a channel's products: mass balance fixes the absorber (O2 + O(1D) can only come from O3,
/// NO + O only from NO2). Empty when CF names none.
std::string cf_photolysis_name(const std::string& products) {
  std::vector<std::string> p;
  std::size_t at = 0;
  while (at <= products.size()) {
    const std::size_t plus = products.find(" + ", at);
    p.push_back(products.substr(at, plus == std::string::npos ? std::string::npos : plus - at));
    if (plus == std::string::npos) break;
    at = plus + 3;
  }
  std::sort(p.begin(), p.end());
  if (p == std::vector<std::string>{"O(1D)", "O2"})
    return "photolysis_rate_of_ozone_to_1D_oxygen_atom";
  if (p == std::vector<std::string>{"NO", "O"}) return "photolysis_rate_of_nitrogen_dioxide";
  return {};
}
}  // namespace

void define_photolysis_output(NcWriter& nc, const PhotolysisModel& model, bool with_spectrum,
                              bool with_enhancement) {
  nc.dimension("wavelength", model.bins());
  nc.variable("wavelength", {"wavelength"},
              {"nm",
               "centre of the wavelength bin",
               "radiation_wavelength",
               {{"bounds", "wavelength_bounds"}}});
  nc.variable("wavelength_bounds", {"wavelength", "nv"}, {"nm", "wavelength bin edges", "", {}});
  nc.variable(
      "stellar_photon_flux", {"wavelength"},
      {"cm-2 s-1 nm-1", "stellar photon flux at the top of the atmosphere (bin average)", "", {}});
  // All channels in one J(channel, altitude) for tools that plot a field by its dimensions;
  // the per-channel J_<channel> variables stay for readers that pick one channel by name.
  nc.dimension("channel", model.channels().size());
  nc.string_variable("channel_name", "channel", "photolysis channel");
  nc.variable("J", {"channel", "altitude"}, {"s-1", "photolysis rate coefficient", "", {}});
  for (std::size_t c = 0; c < model.channels().size(); ++c) {
    const std::string& name = model.channels()[c];
    std::string long_name = "photolysis rate coefficient of channel " + name;
    if (!model.channel_products()[c].empty())
      long_name += " (-> " + model.channel_products()[c] + ")";
    nc.variable("J_" + name, {"altitude"},
                {"s-1", long_name, cf_photolysis_name(model.channel_products()[c]), {}});
    if (with_enhancement) {
      nc.variable("J_enhancement_" + name, {"altitude"},
                  {"1", "J of channel " + name + " over its direct-beam value", "", {}});
    }
  }
  if (with_spectrum) {
    nc.variable("actinic_flux", {"altitude", "wavelength"},
                {"cm-2 s-1 nm-1",
                 model.two_stream()
                     ? "actinic flux: direct beam plus 2 (F_up + F_down) of the diffuse field "
                       "(illumination-averaged, bin average)"
                     : "direct-beam stellar photon flux (illumination-averaged, bin average)",
                 "",
                 {}});
    if (model.two_stream()) {
      nc.variable(
          "diffuse_up", {"altitude", "wavelength"},
          {"cm-2 s-1 nm-1", "upward diffuse photon flux at the cell centre (two-stream)", "", {}});
      nc.variable("diffuse_down", {"altitude", "wavelength"},
                  {"cm-2 s-1 nm-1",
                   "downward diffuse photon flux at the cell centre (two-stream)",
                   "",
                   {}});
    }
  }
}

std::vector<double> enhancement_factors(std::span<const double> J,
                                        std::span<const double> J_direct) {
  std::vector<double> r(J.size(), 1.0);  // 1 where the direct beam gives no J at all
  for (std::size_t i = 0; i < J.size() && i < J_direct.size(); ++i) {
    if (J_direct[i] > 0.0) r[i] = J[i] / J_direct[i];
  }
  return r;
}

void write_photolysis_output(NcWriter& nc, const PhotolysisModel& model, std::span<const double> J,
                             std::span<const double> actinic_flux,
                             std::span<const double> J_direct) {
  const std::size_t N = model.levels();
  const std::size_t B = model.bins();
  if (J.size() != model.channels().size() * N) {
    throw std::invalid_argument("write_photolysis_output: J has the wrong size");
  }
  const auto& e = model.bin_edges_nm();
  std::vector<double> centre(B), bounds(2 * B), flux(B);
  for (std::size_t b = 0; b < B; ++b) {
    centre[b] = 0.5 * (e[b] + e[b + 1]);
    bounds[2 * b] = e[b];
    bounds[2 * b + 1] = e[b + 1];
    flux[b] = model.top_photons_per_bin()[b] / (e[b + 1] - e[b]);
  }
  nc.put("wavelength", centre);
  nc.put("wavelength_bounds", bounds);
  nc.put("stellar_photon_flux", flux);
  nc.put_strings("channel_name", model.channels());
  nc.put("J", J);
  for (std::size_t c = 0; c < model.channels().size(); ++c) {
    nc.put("J_" + model.channels()[c], J.subspan(c * N, N));
  }
  if (!J_direct.empty()) {
    const auto ratio = enhancement_factors(J, J_direct);
    for (std::size_t c = 0; c < model.channels().size(); ++c) {
      nc.put("J_enhancement_" + model.channels()[c],
             std::span<const double>(ratio).subspan(c * N, N));
    }
  }
  if (!actinic_flux.empty()) {
    nc.put("actinic_flux", actinic_flux);
    if (model.two_stream()) {
      nc.put("diffuse_up", model.diffuse_up());
      nc.put("diffuse_down", model.diffuse_down());
    }
  }
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
