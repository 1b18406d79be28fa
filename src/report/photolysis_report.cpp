// Photolysis output as Dataset entries (report/photolysis_report.hpp).
#include "report/photolysis_report.hpp"

#include <algorithm>
#include <stdexcept>
#include <string>
#include <vector>

#include "photo/photolysis_output.hpp"

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

/// The wavelength bins and the stellar photon flux at the top.
void add_bins(Dataset& ds, const PhotolysisModel& model) {
  const std::size_t B = model.bins();
  const auto& e = model.bin_edges_nm();
  std::vector<double> centre(B), bounds(2 * B), flux(B);
  for (std::size_t b = 0; b < B; ++b) {
    centre[b] = 0.5 * (e[b] + e[b + 1]);
    bounds[2 * b] = e[b];
    bounds[2 * b + 1] = e[b + 1];
    flux[b] = model.top_photons_per_bin()[b] / (e[b + 1] - e[b]);
  }
  ds.dimension("wavelength", B);
  ds.variable("wavelength", {"wavelength"},
              {"nm",
               "centre of the wavelength bin",
               "radiation_wavelength",
               {{"bounds", "wavelength_bounds"}}},
              centre);
  ds.variable("wavelength_bounds", {"wavelength", "nv"}, {"nm", "wavelength bin edges", "", {}},
              bounds);
  ds.variable(
      "stellar_photon_flux", {"wavelength"},
      {"cm-2 s-1 nm-1", "stellar photon flux at the top of the atmosphere (bin average)", "", {}},
      flux);
}

void add_spectrum(Dataset& ds, const PhotolysisModel& model, std::span<const double> F) {
  const bool have = !F.empty();
  ds.variable(
      "actinic_flux", {"altitude", "wavelength"},
      {"cm-2 s-1 nm-1",
       model.two_stream() ? "actinic flux: direct beam plus 2 (F_up + F_down) of the diffuse field "
                            "(illumination-averaged, bin average)"
                          : "direct-beam stellar photon flux (illumination-averaged, bin average)",
       "",
       {}},
      have ? std::vector<double>(F.begin(), F.end()) : std::vector<double>{});
  if (!model.two_stream()) return;
  ds.variable(
      "diffuse_up", {"altitude", "wavelength"},
      {"cm-2 s-1 nm-1", "upward diffuse photon flux at the cell centre (two-stream)", "", {}},
      have ? model.diffuse_up() : std::vector<double>{});
  ds.variable(
      "diffuse_down", {"altitude", "wavelength"},
      {"cm-2 s-1 nm-1", "downward diffuse photon flux at the cell centre (two-stream)", "", {}},
      have ? model.diffuse_down() : std::vector<double>{});
}
}  // namespace

void add_photolysis(Dataset& ds, const PhotolysisModel& model, const PhotolysisData& d) {
  const std::size_t N = model.levels();
  const auto& channels = model.channels();
  if (d.J.size() != channels.size() * N) {
    throw std::invalid_argument("add_photolysis: J has the wrong size");
  }
  add_bins(ds, model);
  // All channels in one J(channel, altitude) for tools that plot a field by its dimensions;
  // the per-channel J_<channel> variables stay for readers that pick one channel by name.
  ds.dimension("channel", channels.size());
  ds.strings("channel_name", "channel", "photolysis channel", channels);
  ds.variable("J", {"channel", "altitude"}, {"s-1", "photolysis rate coefficient", "", {}},
              std::vector<double>(d.J.begin(), d.J.end()));
  const std::vector<double> ratio =
      d.J_direct.empty() ? std::vector<double>{} : enhancement_factors(d.J, d.J_direct);
  const auto row = [N](std::span<const double> v, std::size_t c) {
    return std::vector<double>(v.begin() + static_cast<std::ptrdiff_t>(c * N),
                               v.begin() + static_cast<std::ptrdiff_t>((c + 1) * N));
  };
  for (std::size_t c = 0; c < channels.size(); ++c) {
    const std::string& name = channels[c];
    std::string long_name = "photolysis rate coefficient of channel " + name;
    if (!model.channel_products()[c].empty())
      long_name += " (-> " + model.channel_products()[c] + ")";
    ds.variable("J_" + name, {"altitude"},
                {"s-1", long_name, cf_photolysis_name(model.channel_products()[c]), {}},
                row(d.J, c));
    if (!ratio.empty()) {
      ds.variable("J_enhancement_" + name, {"altitude"},
                  {"1", "J of channel " + name + " over its direct-beam value", "", {}},
                  row(ratio, c));
    }
  }
  if (d.with_spectrum) add_spectrum(ds, model, d.actinic_flux);
}

}  // namespace colchem
