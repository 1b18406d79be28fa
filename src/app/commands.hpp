// Thin command drivers: each subcommand registers its options here and runs library code.
#pragma once

#include <CLI/CLI.hpp>
#include <spdlog/logger.h>

#include <functional>
#include <memory>
#include <string>
#include <vector>

namespace colchem::app {

/// What every command receives from main(): the logger and the full command line.
struct Context {
  std::shared_ptr<spdlog::logger> log;
  std::string command_line;
};

/// A registered subcommand: main() calls `run` for the one the user chose; it returns the
/// process exit code.
using CommandAction = std::function<int(Context&)>;

void add_check_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_box_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_run_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_photo_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_sweep_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_budget_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_compare_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_ensemble_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_resolve_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_sensitivity_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_rates_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);
void add_fit_command(CLI::App& app, std::vector<std::pair<CLI::App*, CommandAction>>& out);

}  // namespace colchem::app
