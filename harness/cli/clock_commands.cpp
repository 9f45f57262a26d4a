// The `clocks` and `check` subcommands; see commands.h.

#include "harness/cli/commands.h"

#include "harness/run/scenario_runner.h"
#include "sim/clock_plan.h"
#include "sim/clock_tree.h"
#include "sim/clock_tree_loader.h"

#include <spdlog/spdlog.h>

namespace harness::cli {

int run_clocks(const clocks_options& options, std::ostream& out) {
    sim::clock_tree tree;
    sim::load_clock_tree_file(options.file, tree);
    const std::vector<sim::clock_plan_row> rows = tree.plan(0);
    spdlog::info("{}: {} clocks read", options.file, rows.size());
    out << (options.json ? sim::clock_plan_json(rows) : sim::clock_plan_text(rows));
    if (options.json) out << '\n';
    return exit_ok;
}

int run_check(const std::string& file, std::ostream& out) {
    harness::run::check_scenario(file, out);
    return exit_ok;
}

}  // namespace harness::cli
