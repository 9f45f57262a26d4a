// The command line of `tickbench`: options, subcommands, logging set-up and the mapping of errors
// onto exit codes (docs/cli.md). The only translation unit that includes CLI11.

#include "sim/cli/commands.h"

#include "sim/clock_tree.h"
#include "sim/scenario_error.h"

#include <CLI/CLI.hpp>
#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>

#include <iostream>
#include <sstream>

namespace sim::cli {

namespace {

// Writes `message` to stderr, each line prefixed so that a multi-finding error greps cleanly.
void report_error(const std::string& message) {
    std::istringstream lines(message);
    std::string line;
    while (std::getline(lines, line)) std::cerr << "tickbench: error: " << line << '\n';
}

// Logs go to stderr so that stdout carries only the command's output (JSON stays parseable).
void set_up_logging(const std::string& level) {
    auto logger = spdlog::stderr_color_mt("tickbench");
    logger->set_pattern("tickbench: %l: %v");
    spdlog::set_default_logger(logger);
    spdlog::set_level(spdlog::level::from_str(level));
}

}  // namespace

int run(int argc, char** argv) {
    CLI::App app{"Simulates microcontroller clock trees and counter/timer peripherals on the host.", "tickbench"};
    app.set_version_flag("--version", std::string("tickbench ") + TICKBENCH_VERSION, "Print the version and exit");
    std::string log_level = "warn";
    app.add_option("--log-level", log_level, "How much to log on stderr")
        ->check(CLI::IsMember({"trace", "debug", "info", "warn", "error", "critical", "off"}))
        ->capture_default_str();
    app.require_subcommand(1);
    app.fallthrough();  // --log-level may also follow the subcommand

    clocks_options clocks;
    CLI::App* clocks_cmd = app.add_subcommand("clocks", "Print the clock plan of the [clocks] tables in FILE");
    clocks_cmd->add_option("FILE", clocks.file, "Scenario or part description (TOML)")->required();
    clocks_cmd->add_flag("--json", clocks.json, "Print the plan as JSON instead of a table");

    std::string check_file;
    CLI::App* check_cmd = app.add_subcommand("check", "Validate FILE and print its clock plan");
    check_cmd->add_option("FILE", check_file, "Scenario or part description (TOML)")->required();

    try {
        app.parse(argc, argv);
    } catch (const CLI::ParseError& e) {
        if (e.get_exit_code() == 0) return app.exit(e);  // --help, --version
        report_error(e.what());
        std::cerr << "Run 'tickbench --help' for usage.\n";
        return exit_bad_input;
    }

    try {
        set_up_logging(log_level);
        if (*clocks_cmd) return run_clocks(clocks, std::cout);
        if (*check_cmd) return run_check(check_file, std::cout);
    } catch (const scenario_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const clock_config_error& e) {
        report_error(e.what());
        return exit_bad_input;
    } catch (const std::exception& e) {
        report_error(std::string("internal error: ") + e.what());
        return exit_internal;
    }
    return exit_internal;
}

}  // namespace sim::cli
