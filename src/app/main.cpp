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

#include "app/commands.hpp"
#include "app/launcher.hpp"
#include "colchem/version.hpp"
#include "core/error.hpp"
#include "solve/interrupt.hpp"

int main(int argc, char** argv) {
  using namespace colchem;
#ifdef COLCHEM_LAUNCHER
  // 0. The launcher runs the light commands itself and hands the others to colchem-full
  //    (app/launcher.hpp).
  if (!app::launcher_runs(argc, argv)) return app::exec_full_program(argv);
#endif
  // 1. Build the command line.
  CLI::App cli{"colchem: one-dimensional photochemistry and transport model for planetary "
               "atmospheres (research tool)."};
  cli.set_version_flag("--version", std::string("colchem ") + kVersion + " (git " +
                                        kGitRevision + ")");
  std::string log_level = "info";
  cli.add_option("--log-level", log_level, "Log detail: trace, debug, info, warn, error, off")
      ->check(CLI::IsMember({"trace", "debug", "info", "warn", "error", "off"}))
      ->capture_default_str();
  cli.require_subcommand(1);
  std::vector<std::pair<CLI::App*, app::CommandAction>> commands;
  app::add_check_command(cli, commands);
#ifndef COLCHEM_LAUNCHER
  app::add_run_command(cli, commands);
#endif
  app::add_compare_command(cli, commands);
  app::add_budget_command(cli, commands);
#ifndef COLCHEM_LAUNCHER
  app::add_sweep_command(cli, commands);
  app::add_resolve_command(cli, commands);
  app::add_ensemble_command(cli, commands);
  app::add_sensitivity_command(cli, commands);
  app::add_fit_command(cli, commands);
#endif
  app::add_photo_command(cli, commands);
  app::add_box_command(cli, commands);
  app::add_rates_command(cli, commands);

  // 2. Parse it. Help and version exit 0; a usage error exits 2.
  try {
    cli.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return cli.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return cli.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return cli.exit(e);
  } catch (const CLI::ParseError& e) {
    // A first word that is no command: say so and list the commands (CLI11 would only say
    // that a subcommand is required).
    std::string word;
    for (int i = 1; i < argc; ++i) {
      const std::string a = argv[i];
      if (a == "--log-level") {
        ++i;
        continue;
      }
      if (!a.empty() && a[0] == '-') continue;
      word = a;
      break;
    }
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

  app::Context ctx;
  ctx.log = std::make_shared<spdlog::logger>(
      "colchem", std::make_shared<spdlog::sinks::stderr_color_sink_mt>());
  ctx.log->set_pattern("[%H:%M:%S.%e] %^%l%$ %v");
  ctx.log->set_level(spdlog::level::from_str(log_level));
  for (int i = 0; i < argc; ++i) ctx.command_line += (i ? " " : "") + std::string(argv[i]);
  // Library warnings (io/output_claim.hpp: stale locks and temporaries) use the default logger.
  spdlog::set_default_logger(ctx.log);
  // SIGINT/SIGTERM only set a flag for the whole command (solve/interrupt.hpp), so every
  // exit path runs the destructors that remove temporary files and output locks; commands
  // that solve poll the flag and stop early, the others finish and exit 7 here.
  const InterruptGuard interrupt;

  // 3. Run the chosen command; 4. map errors to exit codes.
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
