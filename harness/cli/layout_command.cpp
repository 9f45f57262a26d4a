// The `layout` subcommand; see commands.h.

#include "harness/cli/commands.h"

#include "models/layout/layout_table.h"
#include "models/layout/register_layout.h"
#include "models/layout/unmapped_access.h"

#include <spdlog/spdlog.h>

namespace harness::cli {

int run_layout(const layout_options& options, std::ostream& out) {
    const models::register_layout layout = models::load_register_layout_file(options.file);
    spdlog::info("{}: {} registers, {} value tables read", options.file, layout.registers.size(),
                 layout.codes.size());
    if (options.json) {
        out << models::layout_json(layout) << '\n';
        return exit_ok;
    }
    const models::timer_config& c = layout.instance;
    out << "layout " << layout.name << ": " << layout.kind << ", window "
        << models::hex_address(layout.size) << " bytes, ";
    if (layout.kind == "tick_timer")
        out << layout.tick.counter_bits << "-bit counter, clock divider " << layout.tick.divider;
    else if (layout.kind == "watchdog")
        out << layout.watchdog.counter_bits << "-bit counter";
    else if (layout.kind == "slow_counter")
        out << layout.slow.counter_bits << "-bit counter, write latency "
            << layout.slow.write_latency << " slow edges";
    else if (layout.kind == "clock_control")
        out << layout.clock_slots.size() << " clock nodes";
    else
        out << c.counter_bits << "-bit counter, " << c.channels << " channels";
    out << ", " << layout.registers.size() << " registers, " << layout.codes.size()
        << " value tables\n\n"
        << models::layout_table_markdown(layout);
    // What firmware cannot reach through this layout: usually a field the datasheet was read past.
    std::string missing;
    for (const std::string& name : layout.unmapped_field_names())
        missing += (missing.empty() ? "" : ", ") + name;
    out << '\n'
        << (missing.empty() ? "every functional field of the instance is mapped"
                            : "not mapped (firmware cannot reach them): " + missing)
        << '\n';
    return exit_ok;
}

}  // namespace harness::cli
