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
