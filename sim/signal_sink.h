#pragma once
// Where observed signals go: the waveform writer, the checks, anything else that watches pins.
//
// Models report pin changes with their exact kernel time (often ahead of the SystemC kernel, see
// timer_module), so watchers take changes straight from the models instead of sampling
// sc_signals: that is exact and far cheaper than a kernel process per signal. A sink first learns
// every signal it will see (declare), then receives changes in non-decreasing time.

#include "sim/clock_domain.h"

#include <cstdint>
#include <string>

namespace sim {

// Index of a declared signal, dense from 0 in declaration order.
using signal_id = std::uint32_t;

// One declared signal: a hierarchical name split into scope ("fan_timer") and name ("channel1").
struct signal_info {
    std::string scope;
    std::string name;
    bool initial = false;  // level at time 0
};

class signal_sink {
public:
    virtual ~signal_sink() = default;
    // Called once per signal, in id order, before any change.
    virtual void declare(signal_id id, const signal_info& info) = 0;
    // All signals declared; the run begins.
    virtual void begin() = 0;
    // Signal `id` took `level` at time `at`; times never decrease across calls.
    virtual void change(signal_id id, bool level, time_ps at) = 0;
    // The run ended at `at` (no change will follow); flush and close what must be closed.
    virtual void end(time_ps at) = 0;
};

}  // namespace sim
