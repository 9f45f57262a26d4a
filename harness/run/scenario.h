#pragma once
// A scenario read from its TOML file (format in docs/scenario.md): the part (clock tree, timers
// with their layouts and addresses), the cpu and the firmware that runs on it, the run's length
// and seed, what goes to the waveform, and the checks. load_scenario() checks every key, resolves
// every name (clocks, signals, layout files) and reports each mistake as a sim::scenario_error
// finding at file:line:column with the key path and what would be accepted, all findings of a file
// at once. The TOML library stays in the .cpp: this header is cheap to include.

#include "harness/cpu.h"
#include "harness/platform.h"
#include "models/layout/unmapped_access.h"
#include "models/timer/timer_probe.h"
#include "sim/checks/check_spec.h"
#include "sim/clock_tree.h"

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace harness::run {

// The [firmware] table.
struct firmware_settings {
    std::string library;  // resolved: relative to the scenario file, or --firmware as given
    std::string entry = "tick_firmware_main";
    bool map_peripherals = false;
    std::map<std::string, std::string> parameters;
    // Where the library was named, for messages: "FILE:LINE:COLUMN: firmware.library" or
    // "--firmware".
    std::string origin;
};

// The [run] table.
struct run_settings {
    std::optional<time_ps> duration;
    std::uint64_t seed = 0;
    models::unmapped_policy unmapped = models::unmapped_policy::warn;
    double hang_wall_seconds = 10;  // from [cpu] hang-wall-time
};

// The [waves] table.
struct wave_settings {
    bool enabled = true;
    // Full signal names to dump, in declaration order (every signal when the key is absent).
    std::vector<std::string> signals;
    // Timescale unit in ps: given, or the coarsest unit keeping every clock edge exact (1 ps when
    // none coarser is known in advance).
    time_ps unit_ps = 1;
    bool unit_given = false;
};

struct scenario {
    std::string file;  // as given on the command line
    std::string name;  // the file's stem: the suite name of junit.xml
    std::vector<timer_spec> timers;
    // [peripherals.NAME]: the part's peripherals of other kinds (tick timers), in file order.
    std::vector<peripheral_spec> peripherals;
    std::optional<cpu_config> cpu;
    std::optional<firmware_settings> firmware;
    run_settings run;
    wave_settings waves;
    std::vector<sim::check_spec> checks;
    // [inputs]: what drives each timer input, sources resolved ([stimulus.NAME]).
    std::vector<input_wiring> inputs;

    // Every signal the timers' probes declare, in id order ("fan.channel1", ..., "fan.irq",
    // "fan.input1", ...).
    std::vector<std::string> signal_names() const;
    // The inputs timer `timer`'s probe shows: each input with a level that [inputs] wires (not the
    // chained input), in input order, with its level at time 0.
    std::vector<models::shown_input> shown_inputs(const std::string& timer) const;
};

// Command-line settings that replace the file's.
struct scenario_overrides {
    std::optional<std::string> firmware;  // --firmware, relative to the current directory
    std::optional<time_ps> duration;      // --duration
    std::optional<std::uint64_t> seed;    // --seed
    std::optional<std::uint64_t> start_offset_cycles;  // --start-offset
    std::map<std::string, std::string> parameters;     // --param NAME=VALUE (firmware parameters)
    // Scenario keys by dotted path and value text, applied to the TOML before it is read
    // (harness/run/scenario_key_overrides.h); `tickbench sweep --vary`.
    std::vector<std::pair<std::string, std::string>> keys;
};

// Reads the scenario at `path` and adds its clocks to `tree` (which should be empty). Throws
// sim::scenario_error listing every finding (those of a register layout file name that file).
scenario load_scenario(const std::string& path, sim::clock_tree& tree,
                       const scenario_overrides& overrides = {});

// The signals a timer named `timer` with instance `cfg` shows, in the order its probe declares
// them.
std::vector<std::string> timer_signal_names(const std::string& timer,
                                            const models::timer_config& cfg,
                                            const std::vector<models::shown_input>& inputs = {});

}  // namespace harness::run
