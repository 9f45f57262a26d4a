#pragma once
// Deliberately wrong timer models, to prove the differential test finds and shrinks disagreements.
//
// Each wraps the reference and bends one rule the way a real implementation bug would: the
// harness must notice, and a harness that never fails would be worthless.

#include "models/reference/reference_timer.h"

#include <algorithm>
#include <deque>

namespace tickbench::differential {

// Base: forwards everything to a reference timer.
class forwarding_timer : public models::timer_core_if {
public:
    forwarding_timer(const models::timer_config& cfg, const sim::clock_domain& timer_clock,
                     models::timer_observer* observer)
        : inner_(cfg, timer_clock, observer) {}
    void advance_to(sim::time_ps t) override { inner_.advance_to(t); }
    void write(models::timer_field f, unsigned ch, std::uint32_t v, sim::time_ps t) override {
        inner_.write(f, ch, v, t);
    }
    std::uint32_t read(models::timer_field f, unsigned ch, sim::time_ps t) override {
        return inner_.read(f, ch, t);
    }
    void clear_flags(std::uint32_t mask, sim::time_ps t) override { inner_.clear_flags(mask, t); }
    void set_fault_input(bool level, sim::time_ps t) override { inner_.set_fault_input(level, t); }
    void set_input(unsigned input, bool level, sim::time_ps t) override {
        inner_.set_input(input, level, t);
    }
    void set_initial_input(unsigned input, bool level) override {
        inner_.set_initial_input(input, level);
    }
    void chained_pulse(sim::time_ps t) override { inner_.chained_pulse(t); }
    bool next_event(sim::time_ps& at) const override { return inner_.next_event(at); }
    void clock_changed(sim::time_ps t) override { inner_.clock_changed(t); }

protected:
    models::reference::reference_timer inner_;
};

// Off by one tick: a compare write without preload takes effect one timer clock tick late.
class late_compare_timer final : public forwarding_timer {
public:
    using forwarding_timer::forwarding_timer;
    void advance_to(sim::time_ps t) override {
        flush(t);
        inner_.advance_to(t);
    }
    void write(models::timer_field f, unsigned ch, std::uint32_t v, sim::time_ps t) override {
        flush(t);
        sim::time_ps next = 0;
        if (f == models::timer_field::compare &&
            inner_.read(models::timer_field::compare_preload, ch, t) == 0 &&
            inner_.next_event(next)) {
            late_.push_back({next, ch, v});
            return;
        }
        inner_.write(f, ch, v, t);
    }
    std::uint32_t read(models::timer_field f, unsigned ch, sim::time_ps t) override {
        flush(t);
        return inner_.read(f, ch, t);
    }
    void clear_flags(std::uint32_t mask, sim::time_ps t) override {
        flush(t);
        inner_.clear_flags(mask, t);
    }
    void set_fault_input(bool level, sim::time_ps t) override {
        flush(t);
        inner_.set_fault_input(level, t);
    }

private:
    struct late_write {
        sim::time_ps at;
        unsigned channel;
        std::uint32_t value;
    };
    void flush(sim::time_ps t) {
        while (!late_.empty() && late_.front().at <= t) {
            const late_write w = late_.front();
            late_.pop_front();
            inner_.write(models::timer_field::compare, w.channel, w.value, w.at);
        }
    }
    std::deque<late_write> late_;
};

// Off by one tick: dead times one timer clock tick longer than written (reads still give the
// written value).
class long_dead_time_timer final : public forwarding_timer {
public:
    using forwarding_timer::forwarding_timer;
    void write(models::timer_field f, unsigned ch, std::uint32_t v, sim::time_ps t) override {
        if (f == models::timer_field::dead_time) {
            written_ = std::min(v, inner_.config().dead_time_max);
            if (v > 0 && v < 0xffff'ffffu) ++v;
        }
        inner_.write(f, ch, v, t);
    }
    std::uint32_t read(models::timer_field f, unsigned ch, sim::time_ps t) override {
        const std::uint32_t v = inner_.read(f, ch, t);
        return f == models::timer_field::dead_time ? written_ : v;
    }

private:
    std::uint32_t written_ = 0;
};

}  // namespace tickbench::differential
