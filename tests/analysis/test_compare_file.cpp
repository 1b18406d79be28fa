// Scores written into a run file and read back (the `colchem compare` path).
#include <catch2/catch.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>

#include "analysis/score.hpp"
#include "core/background.hpp"
#include "core/constants.hpp"
#include "core/error.hpp"
#include "io/dataset_writer.hpp"
#include "io/netcdf_file.hpp"
#include "io/observation_loader.hpp"
#include "io/output.hpp"
#include "io/scenario.hpp"
#include "report/column_report.hpp"
#include "report/score_report.hpp"

using namespace colchem;
namespace fs = std::filesystem;

TEST_CASE("scores are written into a copy of a run file and read back", "[score][netcdf]") {
  const UnitSystem units;
  const Scenario sc = load_scenario(COLCHEM_SOURCE_DIR "/configs/pyrene.yaml", {}, units);
  const Background bg = build_background(sc.background);
  const std::vector<std::string> species{"SO2", "CO"};
  const std::size_t N = bg.grid.cells();
  // SO2 mole fraction 1e-7 * 10^(-(z - 58 km)/20 km): log-linear in altitude, so the
  // interpolation is exact and the expected model values follow by hand.
  std::vector<double> n(N * 2);
  for (std::size_t j = 0; j < N; ++j) {
    const double z_km = bg.grid.center_cm[j] / constants::kCmPerKm;
    n[j * 2 + 0] = 1e-7 * std::pow(10.0, -(z_km - 58.0) / 20.0) * bg.air_density_cm3[j];
    n[j * 2 + 1] = 3e-5 * bg.air_density_cm3[j];
  }
  const fs::path run = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "score_run.nc";
  const fs::path scored = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "score_run_scored.nc";
  {
    Dataset ds;
    add_provenance(ds, sc, "test");
    add_background(ds, bg);
    add_species(ds, bg, species, n);
    write_dataset(ds, run);
  }
  const fs::path obs_file = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "score_obs.csv";
  // At 78 km the model is 1e-7 * 10^-1 = 1e-8 (by hand); observed 2e-8 +- 5e-9.
  std::ofstream(obs_file) << "altitude [km], species, value [1], uncertainty [1], upper_limit\n"
                             "78, SO2, 2e-8, 5e-9, 0\n98, SO2, 1e-9, 0, 1\n70, CO, 3e-5, 1e-5, 0\n";
  const ObservationSet obs = read_observations(obs_file, units);
  const NcReader reader(run);
  const ModelColumn model = read_model_column(reader);
  const auto scores = score_column(model.altitude_cm, model.species, model.mole_fraction, obs, 0);
  REQUIRE(scores.size() == 2);
  CHECK(scores[0].points[0].model == Approx(1e-8).epsilon(1e-9));
  // r_lin = (1e-8 - 2e-8)/5e-9 = -2; at 98 km the model is 1e-9 (equal to the limit: not exceeded).
  CHECK(scores[0].points[0].residual_linear == Approx(-2.0).epsilon(1e-8));
  CHECK(scores[0].chi2_linear == Approx(4.0).epsilon(1e-7));
  CHECK(scores[1].chi2_log == Approx(0.0).margin(1e-20));
  {
    Dataset ds;
    add_scores(ds, scores);
    amend_dataset(run, ds, scored);
  }
  const NcReader back(scored);
  CHECK(back.read("chi2_linear")[0] == Approx(4.0).epsilon(1e-7));
  CHECK(back.read_strings("score_species") == std::vector<std::string>{"SO2", "CO"});
  CHECK(back.read("observation_upper_limit")[1] == 1.0);
  CHECK(back.read("mole_fraction").size() == 2 * N);  // the run's own data are kept
  CHECK(format_scores(scores).find("SO2: N = 2") != std::string::npos);
}

TEST_CASE("an observed species the model lacks is an input error naming the line", "[score]") {
  const fs::path obs_file = fs::path(COLCHEM_TEST_OUTPUT_DIR) / "score_obs_missing.csv";
  std::ofstream(obs_file) << "altitude [km], species, value [1], uncertainty [1], upper_limit\n"
                             "78, SO2, 2e-8, 5e-9, 0\n80, OCS, 1e-9, 1e-10, 0\n";
  const UnitSystem units;
  const ObservationSet obs = read_observations(obs_file, units);
  const std::vector<double> z{0.0, 1e5};
  const std::vector<double> f{1e-8, 1e-8};
  try {
    (void)score_column(z, {"SO2"}, f, obs, 0);
    FAIL("no error");
  } catch (const InputError& e) {
    CHECK_THAT(e.what(), Catch::EndsWith("score_obs_missing.csv:3: 'species': expected a species "
                                         "of the model (SO2), found 'OCS'"));
  }
}
