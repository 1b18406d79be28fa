// Progress display: log lines off a terminal, one rewritten line on a terminal.
#include <catch2/catch.hpp>

#include <spdlog/logger.h>
#include <spdlog/sinks/ostream_sink.h>

#include <cstdio>
#include <sstream>

#include "solve/progress.hpp"

using namespace colchem;

namespace {
std::string read_all(std::FILE* f) {
  std::rewind(f);
  std::string s;
  int c = 0;
  while ((c = std::fgetc(f)) != EOF) s.push_back(static_cast<char>(c));
  return s;
}
}  // namespace

TEST_CASE("Progress: plain log lines when not on a terminal", "[solve][progress]") {
  std::ostringstream out;
  auto sink = std::make_shared<spdlog::sinks::ostream_sink_mt>(out);
  spdlog::logger log("test", sink);
  log.set_pattern("%v");
  ProgressOptions o;
  o.min_interval_s = 0.0;
  o.terminal = 0;
  Progress p(log, "steady", o);
  SteadyIteration it;
  it.iteration = 12;
  it.pseudo_step_s = 3.2e4;
  it.residual_norm = 4.1e-6;
  it.max_relative_change = 2e-3;
  it.wall_s = 0.21;
  p.update(it);
  it.iteration = 13;
  p.update(it);
  p.finish("converged");
  const std::string text = out.str();
  // Expected text: the format documented in progress.hpp (common practice, no source).
  CHECK_THAT(text, Catch::Contains(
                       "steady it 12  dtau 3.2e+04 s  |F| 4.1e-06  change 2.0e-03  elapsed 0.21 s"));
  CHECK_THAT(text, Catch::Contains("it 13"));
  CHECK_THAT(text, Catch::Contains("converged"));
  CHECK(text.find('\r') == std::string::npos);
  CHECK(p.lines_shown() == 3);
}

TEST_CASE("Progress: a rate-limited single line on a terminal", "[solve][progress]") {
  std::ostringstream out;
  auto sink = std::make_shared<spdlog::sinks::ostream_sink_mt>(out);
  spdlog::logger log("test", sink);
  std::FILE* f = std::tmpfile();
  REQUIRE(f != nullptr);
  ProgressOptions o;
  o.min_interval_s = 1e9;  // nothing but the first update passes the rate limit
  o.stream = f;
  o.terminal = 1;
  {
    Progress p(log, "split", o);
    SplitStepRecord st;
    for (long k = 1; k <= 50; ++k) {
      st.step = k;
      st.time_s = 10.0 * double(k);
      st.step_s = 10.0;
      p.update(st);
    }
    p.finish("completed");
    CHECK(p.lines_shown() == 2);  // the first, and the final one
  }
  const std::string text = read_all(f);
  std::fclose(f);
  CHECK(text.rfind("\rsplit step 1 ", 0) == 0);
  CHECK_THAT(text, Catch::Contains("step 50"));  // the last state is shown at the end
  CHECK_THAT(text, Catch::Contains("completed"));
  CHECK(text.back() == '\n');
  CHECK(out.str().empty());  // nothing went to the log
}

TEST_CASE("Progress: iteration ceiling, share of model time and time left", "[solve][progress]") {
  // Expected text: the format documented in progress.hpp; the time left is the linear
  // extrapolation wall * (end - t) / (t - start) (common practice, no source).
  SteadyIteration it;
  it.iteration = 12;
  it.pseudo_step_s = 3.2e4;
  it.residual_norm = 4.1e-6;
  it.max_relative_change = 2e-3;
  it.wall_s = 0.21;
  CHECK_THAT(Progress::format(it, 400), Catch::StartsWith("it 12/400  dtau"));
  CHECK_THAT(Progress::format(it), Catch::StartsWith("it 12  dtau"));
  SplitStepRecord st;
  st.step = 40;
  st.time_s = 3.6e4;  // a restart at 1.2e4 s of a run that ends at 7.2e4 s: 40 % done
  st.step_s = 900.0;
  st.wall_s = 0.30;   // since the restart: 2.4e4 s of model time took 0.30 s, 3.6e4 s remain
  const std::string s = Progress::format(st, 1.2e4, 7.2e4);
  CHECK_THAT(s, Catch::Contains("t 3.600e+04 s (40.0 %)"));
  CHECK_THAT(s, Catch::Contains("left ~0.45 s"));
  // No end known (a split run to steady state): neither share nor time left.
  const std::string n = Progress::format(st);
  CHECK(n.find('%') == std::string::npos);
  CHECK(n.find("left") == std::string::npos);
}

TEST_CASE("BatchProgress: done/total, share and time left", "[solve][progress]") {
  // Time left extrapolates the mean time per finished run: 12 s for 3 runs, 5 to go ->
  // 12 * 5 / 3 = 20 s (analytic; the format is the one documented in progress.hpp).
  CHECK(BatchProgress::format(3, 8, 12.0) == "3/8 done (37.5 %)  elapsed 12 s  left ~20 s");
  CHECK(BatchProgress::format(8, 8, 30.5) == "8/8 done (100.0 %)  elapsed 30.5 s");
  std::ostringstream out;
  auto sink = std::make_shared<spdlog::sinks::ostream_sink_mt>(out);
  spdlog::logger log("test", sink);
  log.set_pattern("%v");
  {
    BatchProgress every(log, "sweep", 0.0);  // interval 0: one line per finished run
    for (std::size_t k = 1; k <= 4; ++k) every.finished(k, 4);
    CHECK(every.lines_shown() == 4);
  }
  std::istringstream lines(out.str());
  std::string line;
  std::size_t k = 0;
  while (std::getline(lines, line)) {
    ++k;
    INFO(line);
    CHECK_THAT(line, Catch::StartsWith("sweep " + std::to_string(k) + "/4 done ("));
    CHECK_THAT(line, Catch::Contains(" %)  elapsed "));
    CHECK((line.find("  left ~") != std::string::npos) == (k < 4));
  }
  CHECK(k == 4);
  // A long interval shows the first and the last line only.
  BatchProgress rare(log, "sweep", 1e9);
  for (std::size_t j = 1; j <= 5; ++j) rare.finished(j, 5);
  CHECK(rare.lines_shown() == 2);
}
