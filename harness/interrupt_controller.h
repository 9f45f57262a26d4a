#pragma once
// The interrupt controller: request lines from peripherals, priorities, masking, pending state and
// nesting, as firmware sees them.
//
// Peripheral models report their request lines' changes with exact times, often ahead of the
// SystemC kernel (the firmware runs ahead in local time and the models compute what it sees). So
// the controller is plain C++ keyed by time: it remembers when each line rose, and the processor
// model asks "what may interrupt me at local time T, running at priority P?". Lines are
// level-sensitive: a line stays pending while the peripheral holds it high, so a handler that does
// not clear its flag runs again. An injected delivery delay per line reproduces late interrupts on
// purpose.

#include "sim/clock_domain.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace harness {

using sim::time_ps;

// Priority 0 is the most urgent. Code outside any handler runs at priority `idle_priority`.
inline constexpr unsigned idle_priority = 0xffff;

struct interrupt_line_config {
    std::string name;  // e.g. the peripheral's name
    unsigned priority = 8;
    time_ps extra_delay = 0;  // injected delivery delay (edge-case reproduction)
};

// An interrupt ready to enter: which line, and the earliest time it may.
struct interrupt_delivery {
    unsigned line = 0;
    time_ps ready_at = 0;
};

class interrupt_controller {
public:
    explicit interrupt_controller(std::vector<interrupt_line_config> lines);

    unsigned line_count() const { return static_cast<unsigned>(lines_.size()); }
    const interrupt_line_config& line(unsigned n) const { return lines_.at(n).cfg; }
    // Finds a line by name; throws std::out_of_range listing the known names.
    unsigned find(const std::string& name) const;

    // A peripheral's request line changed level at time `at`.
    void set_level(unsigned line, bool level, time_ps at);
    bool level(unsigned line) const { return lines_.at(line).level; }

    // Firmware controls (at local time `at`, which may be ahead of the kernel).
    void set_enabled(unsigned line, bool enabled, time_ps at);
    bool enabled(unsigned line) const { return lines_.at(line).enabled; }
    // Global interrupt mask; returns the previous state.
    bool set_global_enable(bool enabled);
    bool global_enable() const { return global_enable_; }
    void set_priority(unsigned line, unsigned priority) {
        lines_.at(line).cfg.priority = priority;
        ++changes_;
    }

    // The most urgent interrupt that may enter at local time `now` over code running at
    // `running_priority`: enabled, unmasked, pending (line high), more urgent than the running
    // code, and ready (rise + injected delay, and enable time, at or before `now`).
    std::optional<interrupt_delivery> deliverable(time_ps now, unsigned running_priority) const;
    // The earliest time after `now` at which some interrupt becomes deliverable over
    // `running_priority` if nothing else changes, or nothing.
    std::optional<time_ps> next_ready(time_ps now, unsigned running_priority) const;
    // Counts changes, so a waiting processor can tell that something happened.
    std::uint64_t changes() const { return changes_; }

private:
    struct line_state {
        interrupt_line_config cfg;
        bool level = false;
        bool enabled = false;
        time_ps rose_at = 0;
        time_ps enabled_at = 0;
    };
    time_ps ready_at(const line_state& l) const;
    std::vector<line_state> lines_;
    bool global_enable_ = true;
    std::uint64_t changes_ = 0;
};

}  // namespace harness
