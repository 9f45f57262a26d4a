#pragma once
// The subcommands of the `tickbench` command and its exit codes (docs/cli.md). Each command is a
// plain function of its options and an output stream, so its behaviour does not depend on the
// argument parser; harness/cli/app.cpp maps the command line onto them and errors onto exit codes.

#include <cstdint>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

namespace harness::cli {

// Exit codes of the command.
inline constexpr int exit_ok = 0;
// `run`: at least one check (or firmware check) failed.
inline constexpr int exit_check_failed = 1;
// Bad input: a usage error, an unreadable file, a scenario, layout or clock rule error, a firmware
// library that cannot be loaded, an output folder that cannot be written.
inline constexpr int exit_bad_input = 2;
// `run`: the firmware crashed, aborted, hung or failed one of its own checks (harness::platform).
inline constexpr int exit_firmware_failed = 3;
// An unexpected failure inside tickbench (a bug): reported, never a verdict on the input.
inline constexpr int exit_internal = 4;
// `run`: a watchdog reset the part and the scenario did not expect it (harness::exit_code_of).
inline constexpr int exit_watchdog_reset = 5;
// `sweep`, `merge`: stopped by Ctrl-C before every point ran; the reports written are partial.
inline constexpr int exit_interrupted = 130;

struct clocks_options {
    std::string file;
    bool json = false;
};

// `tickbench clocks`: prints the clock plan of FILE's [clocks] tables as text or JSON. Throws
// scenario_error (or clock_config_error) on bad input; returns the exit code otherwise.
int run_clocks(const clocks_options& options, std::ostream& out);

// `tickbench check`: validates the whole scenario (tables, layouts, checks, clock timelines, the
// firmware library) and prints the clock plan and a verdict line. Throws like run_clocks, and
// harness::firmware_load_error.
int run_check(const std::string& file, std::ostream& out);

struct layout_options {
    std::string file;
    bool json = false;
};

// `tickbench layout`: loads the register layout FILE and prints its table (registers, fields, value
// tables and the functional fields no register reaches), or its JSON form. Throws scenario_error on
// a bad layout.
int run_layout(const layout_options& options, std::ostream& out);

struct run_command_options {
    std::string file;
    std::string out_dir = "tickbench-out";
    std::optional<std::string> firmware;
    std::optional<std::string> duration;  // a time such as "10 ms"
    std::optional<std::uint64_t> seed;
    std::optional<std::uint64_t> start_offset;
    std::vector<std::string> params;  // NAME=VALUE
    bool progress = false;
};

// `tickbench run`: runs the scenario and writes its outputs; returns exit_ok or exit_check_failed.
// A firmware failure ends the process with exit_firmware_failed (exit_watchdog_reset for an
// unexpected watchdog reset). Throws on bad input.
int run_scenario_command(const run_command_options& options, std::ostream& out);

struct sweep_command_options {
    std::string file;
    std::vector<std::string> vary;  // AXIS=VALUES
    unsigned jobs = 0;              // 0: one per core
    std::uint64_t points_per_process = 256;
    std::optional<std::string> shard;
    std::string waves = "failing";  // failing, none or all
    std::string out_dir = "tickbench-sweep";
    std::optional<std::string> firmware;
    std::optional<std::string> duration;
    bool progress = false;
};

// `tickbench sweep`: runs every point of the axes (or of one shard) and writes the sweep's
// reports; returns exit_ok, exit_check_failed, exit_firmware_failed, exit_bad_input (a point
// could not run), exit_internal or exit_interrupted. Throws on bad input found before any point
// runs.
int run_sweep_command(const sweep_command_options& options, std::ostream& out);

struct merge_options {
    std::vector<std::string> dirs;
    std::string out_dir = "tickbench-sweep";
};

// `tickbench merge`: joins the shards' reports into the whole sweep's; returns the exit code the
// unsharded sweep gives. Throws harness::run::sweep_error for folders that are not all the shards
// of one sweep.
int run_merge_command(const merge_options& options, std::ostream& out);

struct plan_options {
    std::string clock;   // a frequency such as "48 MHz"
    std::string target;  // a frequency
    unsigned width = 16;
    bool center = false;
    unsigned max = 10;
};

// `tickbench plan`: prints the prescaler and period pairs that reach the target, best first.
// Throws sim::quantity_error for an unreadable frequency.
int run_plan(const plan_options& options, std::ostream& out);

struct report_options {
    std::string dir;
};

// `tickbench report`: renders DIR/report.html again from DIR/report.json, byte for byte the page
// the run wrote. Throws sim::report_format_error for a missing or unreadable report.json,
// sim::output_error when report.html cannot be written.
int run_report_command(const report_options& options, std::ostream& out);
struct compare_options {
    std::string run_a;  // an output folder (its waves.vcd) or a VCD file
    std::string run_b;
    std::vector<std::string> signals;  // full names; empty: every signal
    std::string tolerance = "0 ps";    // a time such as "5 ns"
    bool common_only = false;
};

// `tickbench compare`: compares the waveforms of two runs edge by edge and prints the
// differences; returns exit_ok when they match and exit_check_failed when not. Throws
// sim::vcd_error for a missing or malformed waveform or an unknown signal, sim::quantity_error for
// a bad tolerance.
int run_compare_command(const compare_options& options, std::ostream& out);

// The whole command line: parses argv, runs the command, reports errors on stderr prefixed
// "tickbench: error: " and returns the exit code.
int run(int argc, char** argv);

}  // namespace harness::cli
