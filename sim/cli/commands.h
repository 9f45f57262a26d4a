#pragma once
// The subcommands of the `tickbench` command and its exit codes (docs/cli.md). Each command is a
// plain function of its options and an output stream, so its behaviour does not depend on the
// argument parser; cli/app.cpp maps the command line onto them and errors onto exit codes.

#include <ostream>
#include <string>

namespace sim::cli {

// Exit codes of the command.
inline constexpr int exit_ok = 0;
// An unexpected failure inside tickbench (a bug): reported, never a verdict on the input.
inline constexpr int exit_internal = 1;
// Bad input: a usage error, an unreadable file, a scenario error or a clock rule violation.
inline constexpr int exit_bad_input = 2;

struct clocks_options {
    std::string file;
    bool json = false;
};

// `tickbench clocks`: prints the clock plan of FILE's [clocks] tables as text or JSON. Throws
// scenario_error (or clock_config_error) on bad input; returns the exit code otherwise.
int run_clocks(const clocks_options& options, std::ostream& out);

// `tickbench check`: validates FILE (the clock tree is built and its timelines started) and prints
// the clock plan and a verdict line. Throws like run_clocks.
int run_check(const std::string& file, std::ostream& out);

// The whole command line: parses argv, runs the command, reports errors on stderr prefixed
// "tickbench: error: " and returns the exit code.
int run(int argc, char** argv);

}  // namespace sim::cli
