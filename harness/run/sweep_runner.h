#pragma once
// Running a sweep (docs/cli.md, "sweep"): every point of a sweep_plan (or of one shard of it) as
// its own run of the scenario, `jobs` at a time, and the reports of sweep_report.h.
//
// The parent reads the scenario and loads the firmware library once (a bad --vary or scenario is
// reported before any point runs), then forks `jobs` worker processes. A worker runs the points the
// parent hands it one after another in its own process, each on a fresh kernel
// (harness::start_fresh_kernel) with the firmware's writable data put back as first loaded
// (firmware_library::restore_data), and sends each point's record through a pipe; after
// `points_per_process` points it exits and a new worker takes over, since every point leaves its
// kernel behind. A firmware failure on the firmware's thread ends the point and not the worker; a
// crash ends the worker after it sent the record. A point whose folder is not kept writes no file
// at all (no waveform, no log); with `waves = failing` a failing point is run once more with its
// outputs, into DIR/points/INDEX, which therefore holds what `tickbench run` writes for the same
// point.
//
// Ctrl-C (SIGINT) starts no new point, ends the running children, and the reports written then
// say they are partial.

#include "harness/run/scenario.h"
#include "harness/run/sweep_plan.h"
#include "harness/run/sweep_report.h"

#include <ostream>
#include <string>
#include <vector>

namespace harness::run {

enum class keep_folders { failing, none, all };

struct sweep_options {
    std::string scenario;
    std::vector<sweep_axis> axes;
    shard part;
    unsigned jobs = 1;
    keep_folders keep = keep_folders::failing;
    std::string out_dir = "tickbench-sweep";
    scenario_overrides base;  // --firmware, --duration: the same for every point
    bool progress = false;    // a progress line on stderr
    // Points a process runs before a fresh one takes over (1: a process per point).
    std::uint64_t points_per_process = 256;
};

// Runs the sweep, writes the reports into `out_dir` and prints the summary on `out`. Throws
// sweep_error, sim::scenario_error, harness::firmware_load_error and sim::output_error for bad
// input found before any point runs.
sweep_totals run_sweep(const sweep_options& options, std::ostream& out);

// Where point `index`'s run folder goes in `out_dir`.
std::string point_folder(const std::string& out_dir, std::uint64_t index);

}  // namespace harness::run
