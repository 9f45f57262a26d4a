#pragma once
// A timer observer that records everything a timer model reports, as a flat list of events.
//
// Tests of either timer model assert on these events, and the differential test compares two
// models' lists. Flag reports are split into one event per bit so two models that group the bits
// of one instant differently still compare equal; canonical() orders events of one instant by
// kind and id (keeping the order of equal keys) so the order of reports within an instant does
// not matter either, while e.g. a pin rising and falling back at one instant stays visible.

#include "models/timer/timer_types.h"

#include <algorithm>
#include <cstdint>
#include <ostream>
#include <string>
#include <vector>

namespace tickbench::test_support {

enum class timer_event_kind : std::uint32_t { pin = 0, flag = 1, irq = 2, trigger = 3, read = 4 };

// One report: at `at`, pin `id` went to `value`; flag bit `id` set; irq went to `value`; a
// trigger; or a read of field `id` returned `value`.
struct timer_event {
    sim::time_ps at = 0;
    timer_event_kind kind = timer_event_kind::pin;
    std::uint32_t id = 0;
    std::uint32_t value = 0;
    friend bool operator==(const timer_event& a, const timer_event& b) {
        return a.at == b.at && a.kind == b.kind && a.id == b.id && a.value == b.value;
    }
    friend bool operator!=(const timer_event& a, const timer_event& b) { return !(a == b); }
};

inline const char* to_string(timer_event_kind k) {
    switch (k) {
        case timer_event_kind::pin:
            return "pin";
        case timer_event_kind::flag:
            return "flag";
        case timer_event_kind::irq:
            return "irq";
        case timer_event_kind::trigger:
            return "trigger";
        case timer_event_kind::read:
            return "read";
    }
    return "?";
}

inline std::ostream& operator<<(std::ostream& os, const timer_event& e) {
    return os << e.at << " ps " << to_string(e.kind) << " id=" << e.id << " value=" << e.value;
}

class timer_event_log final : public models::timer_observer {
public:
    void on_pin(unsigned pin, bool level, sim::time_ps at) override {
        events.push_back({at, timer_event_kind::pin, pin, level ? 1u : 0u});
    }
    void on_flags_set(std::uint32_t bits, sim::time_ps at) override {
        for (std::uint32_t b = 0; b < 32; ++b)
            if (bits & (1u << b)) events.push_back({at, timer_event_kind::flag, b, 1});
    }
    void on_irq(bool level, sim::time_ps at) override {
        events.push_back({at, timer_event_kind::irq, 0, level ? 1u : 0u});
    }
    void on_trigger(sim::time_ps at) override {
        events.push_back({at, timer_event_kind::trigger, 0, 1});
    }
    // Records the result of a read, so reads compare like reports.
    void add_read(models::timer_field f, unsigned channel, std::uint32_t value, sim::time_ps at) {
        events.push_back(
            {at, timer_event_kind::read, static_cast<std::uint32_t>(f) * 8 + channel, value});
    }

    // The events ordered by (time, kind, id), stable within equal keys.
    std::vector<timer_event> canonical() const {
        std::vector<timer_event> out = events;
        std::stable_sort(out.begin(), out.end(), [](const timer_event& a, const timer_event& b) {
            if (a.at != b.at) return a.at < b.at;
            if (a.kind != b.kind) return a.kind < b.kind;
            return a.id < b.id;
        });
        return out;
    }
    // Times at which pin p went to `level`.
    std::vector<sim::time_ps> pin_edges(unsigned p, bool level) const {
        std::vector<sim::time_ps> out;
        for (const timer_event& e : events)
            if (e.kind == timer_event_kind::pin && e.id == p && (e.value != 0) == level)
                out.push_back(e.at);
        return out;
    }
    // Times at which `flag` (one flag bit as a mask: models::flag_reload...) set.
    std::vector<sim::time_ps> flag_sets(std::uint32_t flag) const {
        std::vector<sim::time_ps> out;
        for (const timer_event& e : events)
            if (e.kind == timer_event_kind::flag && (std::uint32_t{1} << e.id) == flag)
                out.push_back(e.at);
        return out;
    }
    std::vector<sim::time_ps> of_kind(timer_event_kind k) const {
        std::vector<sim::time_ps> out;
        for (const timer_event& e : events)
            if (e.kind == k) out.push_back(e.at);
        return out;
    }
    void clear() { events.clear(); }

    std::vector<timer_event> events;
};

}  // namespace tickbench::test_support
