// A sweep's NetCDF (variant dimension) and ranked table, from synthetic results.
#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>

#include "io/dataset_writer.hpp"
#include "io/netcdf_file.hpp"
#include "io/scenario.hpp"
#include "report/column_report.hpp"
#include "report/sweep_report.hpp"

using namespace colchem;

TEST_CASE("sweep results are ranked, failed variants last, and written with a variant dimension",
          "[sweep][netcdf]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(COLCHEM_SOURCE_DIR "/configs/pyrene.yaml", {}, units);
  const Background bg = build_background(sc.background);
  const std::size_t N = bg.grid.cells();
  SweepSpec spec;
  spec.axes.push_back({"beta", {0.01, 0.02, 0.03}, false, {}, {}});
  SweepResults r;
  r.variants = expand_variants(spec);
  r.species = {"SO2"};
  r.parameter_names = {"beta"};
  const double chi[] = {5.0, 1.0, 0.0};
  for (std::size_t v = 0; v < 3; ++v) {
    VariantOutcome o;
    o.index = v;
    o.converged = v != 2;
    o.reason = v == 2 ? "did not converge in 2 iterations" : "converged";
    r.outcomes.push_back(o);
    r.mole_fraction.push_back(o.converged ? std::vector<double>(N, 1e-7 * static_cast<double>(v + 1)) : std::vector<double>{});
    SpeciesScore s;
    s.species = "SO2";
    s.chi2_log = chi[v];
    r.scores.push_back({s});
  }
  const auto ranking = rank_variants(r, "chi2_log");
  // Variant 1 has the smallest chi2 of the converged; the failed variant 2 is last although
  // its (meaningless) chi2 is 0.
  CHECK(ranking == std::vector<std::size_t>{1, 0, 2});
  const auto csv = sweep_table_csv(r, ranking, "chi2_log");
  CHECK(csv.find("1,1,\"scenario beta=0.02\",\"converged\",1,") != std::string::npos);
  CHECK(csv.find("\"did not converge in 2 iterations\"") != std::string::npos);

  const auto out = std::filesystem::path(COLCHEM_TEST_OUTPUT_DIR) / "sweep_out.nc";
  {
    Dataset ds;
    add_provenance(ds, sc, "test");
    add_sweep(ds, bg, r, ranking);
    write_dataset(ds, out);
  }
  const NcReader back(out);
  CHECK(back.shape("mole_fraction") == std::vector<std::size_t>{3, 1, N});
  const auto mf = back.read("mole_fraction");
  CHECK(mf[N] == Approx(2e-7));
  CHECK(std::isnan(mf[2 * N]));  // the failed variant
  CHECK(back.read("variant_ranking") == std::vector<double>{2, 1, 3});
  CHECK(back.read("parameter_value")[2] == Approx(0.03));
  CHECK(back.read_strings("variant_status")[2] == "did not converge in 2 iterations");
  CHECK(back.read("chi2_log")[1] == 1.0);
}
