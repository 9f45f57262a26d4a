#pragma once
// Test helper: the fast timer driving a check engine directly, as the simulation will.
//
// A 48 MHz timer clock, a timer with complementary outputs, three edge-aligned PWM channels at
// 25 kHz (prescaler 0, period 1919) with compares 480, 960 and 1440, and a dead time in timer
// clock ticks, the first period starting at tick 1. Each pin change goes straight to the sink;
// signals are "pwm.channel<c + 1>" and "pwm.channel<c + 1>_complement".

#include "models/timer/timer_core.h"
#include "sim/signal_sink.h"

#include <cstdint>
#include <string>

namespace tickbench::test_support {

class pwm_bench final : public models::timer_observer {
public:
    pwm_bench(sim::signal_sink& sink, std::uint32_t dead_ticks)
        : sink_(sink), clock_(sim::frequency::hz(48'000'000)), timer_(config(), clock_, this) {
        using models::timer_field;
        for (unsigned p = 0; p < 6; ++p) {
            sim::signal_info info;
            info.scope = "pwm";
            info.name = "channel" + std::to_string(p / 2 + 1) + (p % 2 ? "_complement" : "");
            sink_.declare(p, info);
        }
        timer_.write(timer_field::period, 0, 1919, 0);
        timer_.write(timer_field::dead_time, 0, dead_ticks, 0);
        for (unsigned c = 0; c < 3; ++c) {
            timer_.write(timer_field::compare, c, 480 * (c + 1), 0);
            timer_.write(timer_field::action, c,
                         static_cast<std::uint32_t>(models::output_action::pwm_below), 0);
            timer_.write(timer_field::main_enable, c, 1, 0);
            timer_.write(timer_field::comp_enable, c, 1, 0);
        }
        // The counter starts at the period, so the first tick wraps it to 0 and every period,
        // the first too, is whole (the set-up written at 0 shows from that tick on).
        timer_.write(timer_field::counter, 0, 1919, 0);
        sink_.begin();
        timer_.write(timer_field::enable, 0, 1, 0);
    }
    // Runs the timer up to `t` without ending the run.
    void advance_to(sim::time_ps t) { timer_.advance_to(t); }
    // Runs the timer up to `end` and ends the sink's run there.
    void run_to(sim::time_ps end) {
        timer_.advance_to(end);
        sink_.end(end);
    }
    void on_pin(unsigned pin, bool level, sim::time_ps at) override {
        if (pin < 6) forward(pin, level, at);
    }
    void on_flags_set(std::uint32_t, sim::time_ps) override {}
    void on_irq(bool, sim::time_ps) override {}
    void on_trigger(sim::time_ps) override {}
    // Number of changes handed to the sink.
    std::uint64_t changes() const { return changes_; }

    // Called around each change handed to the sink (the memory test counts allocations there).
    static inline void (*before_change)() = nullptr;
    static inline void (*after_change)() = nullptr;

private:
    static models::timer_config config() {
        models::timer_config cfg;
        cfg.complementary = true;
        cfg.channels = 4;
        return cfg;
    }
    void forward(unsigned pin, bool level, sim::time_ps at) {
        ++changes_;
        if (before_change) before_change();
        sink_.change(pin, level, at);
        if (after_change) after_change();
    }

    sim::signal_sink& sink_;
    sim::clock_domain clock_;
    models::timer_core timer_;
    std::uint64_t changes_ = 0;
};

}  // namespace tickbench::test_support
