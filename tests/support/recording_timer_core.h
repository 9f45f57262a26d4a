#pragma once
// A recording stand-in for a timer model, for bus-side tests: it keeps each functional field's
// value in a table, answers reads from it, and records every call (field writes, field reads, flag
// clears) with its time, so a test can check exactly what a register access turned into. Flags are
// a plain value a test sets; clear_flags clears bits of it. force_reload and rearm read 0, as the
// model's do.

#include "models/timer/timer_types.h"

#include <cstdint>
#include <map>
#include <utility>
#include <vector>

namespace tickbench_test {

class recording_timer_core : public models::timer_core_if {
public:
    struct call {
        enum class kind { write, read, clear } what;
        models::timer_field field;
        unsigned channel;
        std::uint32_t value;  // written value, value read, or clear mask
        models::time_ps at;
        bool operator==(const call& o) const {
            return what == o.what && field == o.field && channel == o.channel && value == o.value &&
                   at == o.at;
        }
    };

    void advance_to(models::time_ps) override {}
    void write(models::timer_field f, unsigned channel, std::uint32_t value,
               models::time_ps t) override {
        calls.push_back({call::kind::write, f, channel, value, t});
        if (f == models::timer_field::force_reload || f == models::timer_field::rearm) return;
        values[{f, channel}] = value;
    }
    std::uint32_t read(models::timer_field f, unsigned channel, models::time_ps t) override {
        const std::uint32_t v = value(f, channel);
        calls.push_back({call::kind::read, f, channel, v, t});
        return v;
    }
    void clear_flags(std::uint32_t mask, models::time_ps t) override {
        calls.push_back({call::kind::clear, models::timer_field::flags, 0, mask, t});
        values[{models::timer_field::flags, 0}] &= ~mask;
    }
    void set_fault_input(bool, models::time_ps) override {}
    void set_input(unsigned, bool, models::time_ps) override {}
    void set_initial_input(unsigned, bool) override {}
    void chained_pulse(models::time_ps) override {}
    bool next_event(models::time_ps&) const override { return false; }
    void clock_changed(models::time_ps) override {}

    // The stored value of a field (0 if never written).
    std::uint32_t value(models::timer_field f, unsigned channel = 0) const {
        if (f == models::timer_field::force_reload || f == models::timer_field::rearm) return 0;
        auto it = values.find({f, channel});
        return it == values.end() ? 0 : it->second;
    }
    // Sets a field's value without recording a call (test set-up).
    void set(models::timer_field f, unsigned channel, std::uint32_t v) { values[{f, channel}] = v; }
    // Only the calls of one kind, in order.
    std::vector<call> of(call::kind k) const {
        std::vector<call> out;
        for (const auto& c : calls)
            if (c.what == k) out.push_back(c);
        return out;
    }

    std::map<std::pair<models::timer_field, unsigned>, std::uint32_t> values;
    std::vector<call> calls;
};

}  // namespace tickbench_test
