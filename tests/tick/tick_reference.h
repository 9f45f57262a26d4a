#pragma once
// The tick-exact reference of the system tick timer: a loop over every clock edge applying the
// per-tick rules of docs/tick-timer.md one by one. It is the oracle the fast core
// (models::tick_timer_core) is compared with; cost per tick is what makes it obviously right.

#include "models/tick/tick_timer_core.h"

#include <cstdint>

namespace tests {

class tick_reference final : public models::tick_timer_if {
public:
    tick_reference(const models::tick_config& cfg, const sim::clock_domain& clock,
                   models::tick_observer* observer = nullptr)
        : cfg_(cfg), clock_(clock), observer_(observer) {}

    void advance_to(sim::time_ps t) override {
        const std::uint64_t n = clock_.tick_at(t + 1);
        for (; done_ < n; ++done_) step(done_);
    }
    void write(models::tick_field f, std::uint32_t value, sim::time_ps t) override {
        advance_to(t);
        switch (f) {
            case models::tick_field::enable:
                enable_ = (value & 1) != 0;
                break;
            case models::tick_field::irq_enable:
                irq_enable_ = (value & 1) != 0;
                irq(t);
                break;
            case models::tick_field::clock_choice:
                divided_ = (value & 1) != 0;
                break;
            case models::tick_field::flags:
                break;
            case models::tick_field::reload:
                reload_ = value & cfg_.counter_max();
                break;
            case models::tick_field::current:
                counter_ = 0;
                break;
        }
    }
    std::uint32_t read(models::tick_field f, sim::time_ps t) override {
        advance_to(t);
        switch (f) {
            case models::tick_field::enable:
                return enable_;
            case models::tick_field::irq_enable:
                return irq_enable_;
            case models::tick_field::clock_choice:
                return divided_;
            case models::tick_field::flags:
                return flags_;
            case models::tick_field::reload:
                return reload_;
            case models::tick_field::current:
                return counter_;
        }
        return 0;
    }
    void clear_flags(std::uint32_t mask, sim::time_ps t) override {
        advance_to(t);
        flags_ &= ~mask;
        irq(t);
    }
    // Found by stepping a copy edge by edge: the reference knows no shortcut.
    bool next_event(sim::time_ps& at) const override {
        if (!enable_ || (flags_ & models::tick_flag_zero) != 0) return false;
        tick_reference probe = *this;
        probe.observer_ = nullptr;
        const std::uint64_t limit =
            done_ + (std::uint64_t(counter_) + reload_ + 2) * (divided_ ? cfg_.divider : 1);
        for (std::uint64_t k = done_; k < limit; ++k) {
            probe.step(k);
            if ((probe.flags_ & models::tick_flag_zero) != 0) {
                at = clock_.time_of(k);
                return true;
            }
        }
        return false;
    }

private:
    // One clock edge, k, by the rules.
    void step(std::uint64_t k) {
        if (!enable_) return;
        if (divided_ && k % cfg_.divider != cfg_.divider - 1) return;
        if (counter_ == 0) {
            counter_ = reload_;
            return;
        }
        --counter_;
        if (counter_ == 0 && (flags_ & models::tick_flag_zero) == 0) {
            flags_ |= models::tick_flag_zero;
            if (observer_) observer_->on_flags_set(models::tick_flag_zero, clock_.time_of(k));
            irq(clock_.time_of(k));
        }
    }
    void irq(sim::time_ps at) {
        const bool level = irq_enable_ && (flags_ & models::tick_flag_zero) != 0;
        if (level == irq_) return;
        irq_ = level;
        if (observer_) observer_->on_irq(level, at);
    }

    models::tick_config cfg_;
    const sim::clock_domain& clock_;
    models::tick_observer* observer_;
    std::uint64_t done_ = 0;
    std::uint32_t counter_ = 0;
    std::uint32_t reload_ = 0;
    bool enable_ = false;
    bool irq_enable_ = false;
    bool divided_ = false;
    std::uint32_t flags_ = 0;
    bool irq_ = false;
};

}  // namespace tests
