// The `sweep` and `merge` subcommands; see commands.h.

#include "harness/cli/commands.h"

#include "harness/run/sweep_runner.h"
#include "sim/quantity.h"

#include <unistd.h>

namespace harness::cli {

namespace {

int exit_code_of(const harness::run::sweep_totals& t) {
    if (t.partial) return exit_interrupted;
    if (t.internal != 0) return exit_internal;
    if (t.errors != 0) return exit_bad_input;
    if (t.failed_firmware != 0) return exit_firmware_failed;
    if (t.failed_checks != 0) return exit_check_failed;
    return exit_ok;
}

}  // namespace

int run_sweep_command(const sweep_command_options& options, std::ostream& out) {
    harness::run::sweep_options o;
    o.scenario = options.file;
    for (const std::string& v : options.vary) o.axes.push_back(harness::run::parse_axis(v));
    if (options.shard) o.part = harness::run::parse_shard(*options.shard);
    o.jobs = options.jobs;
    o.points_per_process = options.points_per_process;
    if (o.jobs == 0) {
        const long cores = ::sysconf(_SC_NPROCESSORS_ONLN);
        o.jobs = cores > 0 ? static_cast<unsigned>(cores) : 1;
    }
    if (options.waves == "failing")
        o.keep = harness::run::keep_folders::failing;
    else if (options.waves == "none")
        o.keep = harness::run::keep_folders::none;
    else
        o.keep = harness::run::keep_folders::all;
    o.out_dir = options.out_dir;
    o.progress = options.progress;
    o.base.firmware = options.firmware;
    if (options.duration) {
        o.base.duration = sim::parse_time(*options.duration);
        if (*o.base.duration == 0)
            throw sim::quantity_error("--duration: expected a time above 0 ps");
    }
    return exit_code_of(harness::run::run_sweep(o, out));
}

int run_merge_command(const merge_options& options, std::ostream& out) {
    std::string summary;
    const harness::run::sweep_totals t =
        harness::run::merge_sweeps(options.dirs, options.out_dir, summary);
    out << summary << "outputs in " << options.out_dir << ": sweep.jsonl, junit.xml, summary.txt\n";
    return exit_code_of(t);
}

}  // namespace harness::cli
