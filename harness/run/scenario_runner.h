#pragma once
// Running a scenario: the part it describes is built as a harness::platform, the timers' outputs
// go through probes to a fan-out feeding the waveform writer and the check engine, the firmware
// library is loaded and run, and the outputs are written into one folder (docs/cli.md, "run"):
// waves.vcd (streamed), checks.jsonl, junit.xml, summary.txt, firmware.log (the firmware's log
// lines, streamed), when firmware fails failure.txt, and the failure report (report.json and
// report.html, drawn from what a sim::wave_recorder in the fan-out kept).
//
// A firmware failure ends the process with exit code 3 (harness::platform::fail); before it does,
// the outputs written so far are finished with the verdicts as they stand, so a crash still leaves
// a readable waveform, assertion log and firmware log behind. Bad input found after the outputs
// were opened closes them before the error is thrown.

#include "harness/run/scenario.h"
#include "sim/checks/check_result.h"

#include <functional>
#include <ostream>
#include <string>
#include <vector>

namespace harness::run {

struct run_options {
    std::string out_dir = "tickbench-out";
    scenario_overrides overrides;
    // Show the progress line on stderr (the command sets it when stderr is a terminal).
    bool progress = false;
    // Write the output files. Without them (a sweep's point whose folder is not kept) no folder is
    // made, no waveform is recorded and the firmware's log lines are counted but not kept.
    bool write_outputs = true;
    // Called once with the final results and the failure report, if the firmware failed (then just
    // before the process ends), after the outputs are written.
    std::function<void(const std::vector<sim::check_result>&, const failure_report*)> on_results;
    // A firmware failure on the firmware's thread ends the run, not the process
    // (platform::set_keep_process): run_scenario returns with run_summary::firmware_failed set. For
    // a process that runs one scenario after another, each after harness::start_fresh_kernel().
    bool keep_process = false;
};

struct run_summary {
    std::size_t checks = 0;
    std::size_t failed = 0;
    bool firmware_failed = false;  // only with run_options::keep_process
    bool all_passed() const { return failed == 0 && !firmware_failed; }
};

// Runs the scenario at `path` (once per kernel: call harness::start_fresh_kernel() before running
// another in the same process), writes the outputs and prints the summary on `out`. Throws
// sim::scenario_error (bad scenario or layout), harness::firmware_load_error, sim::output_error
// (the output folder or a file cannot be written). Does not return on a firmware failure.
run_summary run_scenario(const std::string& path, const run_options& options, std::ostream& out);

// Validates the scenario at `path` without running it: every table, layout and check, the clock
// tree's timelines, and the firmware library (loaded, entry found). Prints the clock plan and a
// verdict line on `out`. Throws like run_scenario.
void check_scenario(const std::string& path, std::ostream& out);

}  // namespace harness::run
