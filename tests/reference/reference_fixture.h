#pragma once
// A small fixture for driving the reference timer by timer clock tick index in unit tests.

#include "models/reference/reference_timer.h"
#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"
#include "tests/support/timer_event_log.h"

#include <cstdint>
#include <memory>

namespace tickbench::test_reference {

using models::timer_field;

class reference_fixture {
public:
    explicit reference_fixture(const models::timer_config& cfg,
                               sim::frequency timer_clock = sim::frequency::hz(48'000'000))
        : domain(timer_clock), timer(cfg, domain, &log) {}

    // Time of timer clock tick k: an access "at tick k" happens right after that tick.
    sim::time_ps at(std::uint64_t k) const { return domain.time_of(k); }
    // Timer clock tick index of an edge time.
    std::uint64_t tick_of(sim::time_ps t) const { return domain.tick_at(t); }
    void write(std::uint64_t k, timer_field f, std::uint32_t v, unsigned ch = 0) {
        timer.write(f, ch, v, at(k));
    }
    std::uint32_t read(std::uint64_t k, timer_field f, unsigned ch = 0) {
        return timer.read(f, ch, at(k));
    }
    void run_to(std::uint64_t k) { timer.advance_to(at(k)); }

    sim::clock_domain domain;
    test_support::timer_event_log log;
    models::reference::reference_timer timer;
};

}  // namespace tickbench::test_reference
