// Progress display: see progress.hpp.
#include "solve/progress.hpp"

#include <unistd.h>

#include <algorithm>
#include <cmath>

namespace colchem {

namespace {
std::string fmt_num(const char* f, double v) {
  char buf[48];
  std::snprintf(buf, sizeof buf, f, v);
  return buf;
}
}  // namespace

Progress::Progress(spdlog::logger& log, std::string label, ProgressOptions options)
    : log_(log),
      label_(std::move(label)),
      options_(options),
      stream_(options.stream != nullptr ? options.stream : stderr),
      terminal_(options.terminal < 0 ? isatty(fileno(stream_)) != 0 : options.terminal != 0) {}

Progress::~Progress() {
  if (line_open_) {
    std::fputc('\n', stream_);
    std::fflush(stream_);
  }
}

std::string Progress::format(const SteadyIteration& it, int max_iterations) {
  std::string s = "it " + std::to_string(it.iteration);
  if (max_iterations > 0) s += "/" + std::to_string(max_iterations);
  s += "  dtau " + fmt_num("%.1e", it.pseudo_step_s) + " s";
  s += "  |F| " + fmt_num("%.1e", it.residual_norm);
  if (std::isfinite(it.max_relative_change)) {
    s += "  change " + fmt_num("%.1e", it.max_relative_change);
  }
  if (it.damping < 1.0) s += "  damped " + fmt_num("%.2f", it.damping);
  s += "  elapsed " + fmt_num("%.2f", it.wall_s) + " s";
  return s;
}

std::string Progress::format(const SplitStepRecord& st, double start_s, double end_s) {
  const bool known_end = end_s > start_s;
  std::string s = "step " + std::to_string(st.step);
  s += "  t " + fmt_num("%.3e", st.time_s) + " s";
  if (known_end) {
    s += " (" + fmt_num("%.1f", 100.0 * std::clamp((st.time_s - start_s) / (end_s - start_s), 0.0, 1.0)) + " %)";
  }
  s += "  dt " + fmt_num("%.1e", st.step_s) + " s";
  if (std::isfinite(st.residual_norm)) s += "  |F| " + fmt_num("%.1e", st.residual_norm);
  s += "  elapsed " + fmt_num("%.2f", st.wall_s) + " s";
  if (known_end && st.time_s > start_s && st.time_s < end_s) {
    const double left = st.wall_s * (end_s - st.time_s) / (st.time_s - start_s);
    s += "  left ~" + fmt_num("%.2g", std::max(0.0, left)) + " s";
  }
  return s;
}

void Progress::update(const SteadyIteration& it) {
  show(format(it, options_.max_iterations), false);
}

void Progress::update(const SplitStepRecord& step) {
  show(format(step, options_.start_s, options_.end_s), false);
}

void Progress::finish(const std::string& outcome) {
  std::string text = pending_.empty() ? outcome : pending_ + "  " + outcome;
  show(text, true);
  if (line_open_) {
    std::fputc('\n', stream_);
    std::fflush(stream_);
    line_open_ = false;
  }
}

void Progress::show(const std::string& text, bool force) {
  const auto now = std::chrono::steady_clock::now();
  const double dt = std::chrono::duration<double>(now - last_).count();
  if (!force && any_ && dt < options_.min_interval_s) {
    pending_ = text;  // shown by finish() if nothing newer comes through
    return;
  }
  pending_.clear();
  any_ = true;
  last_ = now;
  ++shown_;
  if (terminal_) {
    // "\r" + clear to end of line: the previous line may have been longer.
    std::fprintf(stream_, "\r%s %s\x1b[K", label_.c_str(), text.c_str());
    std::fflush(stream_);
    line_open_ = true;
  } else {
    log_.info("{} {}", label_, text);
  }
}

BatchProgress::BatchProgress(spdlog::logger& log, std::string label, double min_interval_s)
    : log_(log),
      label_(std::move(label)),
      min_interval_s_(min_interval_s),
      start_(std::chrono::steady_clock::now()) {}

std::string BatchProgress::format(std::size_t done, std::size_t total, double elapsed_s) {
  std::string s = std::to_string(done) + "/" + std::to_string(total) + " done";
  if (total > 0) {
    s += " (" + fmt_num("%.1f", 100.0 * static_cast<double>(done) / static_cast<double>(total)) +
         " %)";
  }
  s += "  elapsed " + fmt_num("%.3g", elapsed_s) + " s";
  if (done > 0 && done < total) {
    const double left = elapsed_s * static_cast<double>(total - done) / static_cast<double>(done);
    s += "  left ~" + fmt_num("%.2g", left) + " s";
  }
  return s;
}

void BatchProgress::finished(std::size_t done, std::size_t total) {
  const auto now = std::chrono::steady_clock::now();
  if (any_ && done < total &&
      std::chrono::duration<double>(now - last_).count() < min_interval_s_) {
    return;
  }
  any_ = true;
  last_ = now;
  ++shown_;
  log_.info("{} {}", label_,
            format(done, total, std::chrono::duration<double>(now - start_).count()));
}

}  // namespace colchem
