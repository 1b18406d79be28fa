// colchem: one-dimensional photochemistry and transport for planetary atmospheres.
//
//   colchem check configs/pyrene.yaml              validate a scenario and summarise it
//   colchem run configs/pyrene.yaml -o out.nc      run it and write CF NetCDF
//   colchem <command> --help                       options of a command
//
// Built twice: as colchem-full (every command) and, with COLCHEM_LAUNCHER, as the launcher
// colchem, which runs the commands that solve nothing and execs colchem-full for the others.
// main() 1. builds the command line, 2. parses it, 3. runs the chosen command, 4. turns
// every error into its documented exit code (README "Exit codes").
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>

#include <iostream>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "app/commands.hpp"
#include "app/launcher.hpp"
#include "colchem/version.hpp"
#include "core/error.hpp"
#include "solve/interrupt.hpp"

namespace {

using namespace colchem;
using Commands = std::vector<std::pair<CLI::App*, app::CommandAction>>;
using AddCommand = void (*)(CLI::App&, Commands&);

/// The commands, in the order `colchem --help` lists them; the launcher has only those
/// that solve nothing.
constexpr AddCommand kCommands[] = {
    app::add_check_command,
#ifndef COLCHEM_LAUNCHER
    app::add_run_command,
#endif
    app::add_compare_command,     app::add_budget_command,
#ifndef COLCHEM_LAUNCHER
    app::add_sweep_command,       app::add_resolve_command, app::add_ensemble_command,
    app::add_sensitivity_command, app::add_fit_command,
#endif
    app::add_photo_command,       app::add_box_command,     app::add_rates_command,
};

/// 1. The command line: the global options and every command.
void build_command_line(CLI::App& cli, std::string& log_level, Commands& commands) {
  cli.set_version_flag("--version",
                       std::string("colchem ") + kVersion + " (git " + kGitRevision + ")");
  cli.add_option("--log-level", log_level, "Log detail: trace, debug, info, warn, error, off")
      ->check(CLI::IsMember({"trace", "debug", "info", "warn", "error", "off"}))
      ->capture_default_str();
  cli.require_subcommand(1);
  for (const AddCommand add : kCommands) add(cli, commands);
}

/// The first word of the command line that is not a global option (empty: none).
std::string first_word(int argc, char** argv) {
  for (int i = 1; i < argc; ++i) {
    const std::string a = argv[i];
    if (a == "--log-level") {
      ++i;
      continue;
    }
    if (!a.empty() && a[0] == '-') continue;
    return a;
  }
  return {};
}

/// 2. Parses the command line: nothing to run on success, else the exit code (help and
/// version 0, a usage error 2). A first word that is no command is named with the list of
/// commands (CLI11 would only say that a subcommand is required).
std::optional<int> parse_command_line(CLI::App& cli, int argc, char** argv,
                                      const Commands& commands) {
  try {
    cli.parse(argc, argv);
    return std::nullopt;
  } catch (const CLI::CallForHelp& e) {
    return cli.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return cli.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return cli.exit(e);
  } catch (const CLI::ParseError& e) {
    const std::string word = first_word(argc, argv);
    std::string names;
    bool known = word.empty();
    for (const auto& [sub, action] : commands) {
      names += (names.empty() ? "" : ", ") + sub->get_name();
      known = known || sub->get_name() == word;
    }
    if (!known) {
      std::cerr << "colchem: unknown command '" << clip_for_message(word)
                << "'; expected one of: " << names << " (colchem --help)\n";
      return static_cast<int>(ExitCode::kUsage);
    }
    (void)cli.exit(e);
    return static_cast<int>(ExitCode::kUsage);
  }
}

/// What every command receives: the logger at the chosen level (also the default logger,
/// for library warnings such as io/output_claim.hpp's stale locks) and the command line.
app::Context make_context(const std::string& log_level, int argc, char** argv) {
  app::Context ctx;
  ctx.log = std::make_shared<spdlog::logger>(
      "colchem", std::make_shared<spdlog::sinks::stderr_color_sink_mt>());
  ctx.log->set_pattern("[%H:%M:%S.%e] %^%l%$ %v");
  ctx.log->set_level(spdlog::level::from_str(log_level));
  for (int i = 0; i < argc; ++i) ctx.command_line += (i ? " " : "") + std::string(argv[i]);
  spdlog::set_default_logger(ctx.log);
  return ctx;
}

/// 3. Runs the chosen command; 4. maps its errors to exit codes. A command that finished
/// although a signal came exits 7.
int run_command(Commands& commands, app::Context& ctx, const InterruptGuard& interrupt) {
  try {
    for (auto& [sub, action] : commands) {
      if (!sub->parsed()) continue;
      const int code = action(ctx);
      if (code == 0 && interrupt.requested()) {
        ctx.log->warn(
            "interrupted (signal {}) after the command had finished; its files are "
            "complete",
            interrupt.signal_number());
        return static_cast<int>(ExitCode::kInterrupted);
      }
      return code;
    }
    return static_cast<int>(ExitCode::kUsage);
  } catch (const InputError& e) {
    ctx.log->error("{}", e.what());
    return static_cast<int>(e.code());
  } catch (const RunError& e) {
    ctx.log->error("{}", e.what());
    return static_cast<int>(e.code());
  } catch (const std::exception& e) {
    ctx.log->critical("internal error: {}", e.what());
    return static_cast<int>(ExitCode::kInternal);
  }
}

}  // namespace

int main(int argc, char** argv) {
#ifdef COLCHEM_LAUNCHER
  // 0. The launcher runs the light commands itself and hands the others to colchem-full
  //    (app/launcher.hpp).
  if (!app::launcher_runs(argc, argv)) return app::exec_full_program(argv);
#endif
  // 1. Build the command line; 2. parse it.
  CLI::App cli{
      "colchem: one-dimensional photochemistry and transport model for planetary "
      "atmospheres (research tool)."};
  std::string log_level = "info";
  Commands commands;
  build_command_line(cli, log_level, commands);
  if (const auto code = parse_command_line(cli, argc, argv, commands)) return *code;

  // 3. Run the chosen command. SIGINT/SIGTERM only set a flag for the whole command
  //    (solve/interrupt.hpp), so every exit path runs the destructors that remove temporary
  //    files and output locks; commands that solve poll the flag and stop early, the others
  //    finish and exit 7. 4. Every error becomes its documented exit code.
  app::Context ctx = make_context(log_level, argc, argv);
  const InterruptGuard interrupt;
  return run_command(commands, ctx, interrupt);
}
