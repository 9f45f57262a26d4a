// The `run` subcommand; see commands.h.

#include "harness/cli/commands.h"

#include "harness/run/scenario_runner.h"
#include "sim/quantity.h"

namespace harness::cli {

int run_scenario_command(const run_command_options& options, std::ostream& out) {
    harness::run::run_options o;
    o.out_dir = options.out_dir;
    o.progress = options.progress;
    o.overrides.firmware = options.firmware;
    o.overrides.seed = options.seed;
    o.overrides.start_offset_cycles = options.start_offset;
    for (const std::string& p : options.params) {
        const auto eq = p.find('=');
        if (eq == std::string::npos || eq == 0)
            throw sim::quantity_error("--param '" + p +
                                      "': expected NAME=VALUE, e.g. --param variant=naive");
        o.overrides.parameters[p.substr(0, eq)] = p.substr(eq + 1);
    }
    if (options.duration) {
        o.overrides.duration = sim::parse_time(*options.duration);
        if (*o.overrides.duration == 0)
            throw sim::quantity_error("--duration: expected a time above 0 ps");
    }
    const harness::run::run_summary summary = harness::run::run_scenario(options.file, o, out);
    return summary.all_passed() ? exit_ok : exit_check_failed;
}

}  // namespace harness::cli
