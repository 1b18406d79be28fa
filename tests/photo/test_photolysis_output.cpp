// Photolysis NetCDF output and the printed J table.
#include <catch2/catch.hpp>

#include <vector>

#include "io/dataset_writer.hpp"
#include "io/netcdf_file.hpp"
#include "photo/photolysis_output.hpp"
#include "report/column_report.hpp"
#include "report/photolysis_report.hpp"
#include "photo_test_support.hpp"

using namespace colchem;

TEST_CASE("J-values and the actinic flux round-trip through NetCDF", "[photo][io]") {
  const Background bg = test::flat_isothermal(6, 60.0);
  PhotolysisSpec s;
  s.bin_edges_nm = {200.0, 205.0, 210.0};
  s.spectrum.table = test::flat_table(190.0, 220.0, 1e12);
  AbsorberSpec a;
  a.species = "A";
  a.cross_section.tables.push_back(test::flat_table(190.0, 220.0, 1e-19));
  s.absorbers.push_back(a);
  s.channels.push_back(test::make_channel("A_B_C", "A"));
  PhotolysisModel m(s, bg, {"A"});
  std::vector<double> n(6, 1e12), J(6), F(6 * 2);
  m.compute(n, J, F);

  const auto path = std::filesystem::path(COLCHEM_TEST_OUTPUT_DIR) / "photo" / "jvalues.nc";
  std::filesystem::create_directories(path.parent_path());
  {
    Dataset ds;
    add_background(ds, bg);
    add_photolysis(ds, m, {J, F, {}, true});
    write_dataset(ds, path);
  }
  NcReader r(path);
  const auto Jr = r.read("J_A_B_C");
  REQUIRE(Jr.size() == 6);
  for (std::size_t j = 0; j < 6; ++j) CHECK(Jr[j] == J[j]);  // written as computed
  CHECK(r.var_text("J_A_B_C", "units") == std::string("s-1"));
  CHECK(r.read("wavelength") == std::vector<double>{202.5, 207.5});  // bin centres (analytic)
  CHECK(r.shape("actinic_flux") == std::vector<std::size_t>{6, 2});
  CHECK(r.read("actinic_flux")[11] == F[11]);
  CHECK(r.var_text("actinic_flux", "units") == std::string("cm-2 s-1 nm-1"));
  CHECK(r.read("stellar_photon_flux")[0] == Approx(1e12));  // as given

  const std::string table = format_jvalue_table(m, J, bg.grid);
  CHECK(table.find("A_B_C") != std::string::npos);
  CHECK(table.find("55.00") != std::string::npos);  // top cell centre in km
}
