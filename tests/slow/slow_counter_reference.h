#pragma once
// An edge-by-edge reference of the slow-clock counter for the differential test: it steps every
// slow-clock edge, keeps the counter after each one and looks up a synchronised read in that
// history, so it shares no arithmetic with models::slow_counter_core (docs/slow-counter.md gives
// the rules both follow).

#include "models/slow/slow_counter_core.h"

#include <array>
#include <optional>
#include <vector>

namespace tests {

class slow_counter_reference final : public models::slow_counter_if {
public:
    // A reference counter on `clock` (which must outlive it); `observer` may be null.
    slow_counter_reference(const models::slow_config& cfg, const sim::clock_domain& clock,
                           models::slow_observer* observer)
        : cfg_(cfg), clock_(clock), observer_(observer) {}

    void advance_to(sim::time_ps t) override {
        while (clock_.time_of(times_.size()) <= t) step();
    }
    void write(models::slow_field f, std::uint32_t v, sim::time_ps t) override {
        using models::slow_field;
        advance_to(t);
        if (f == slow_field::irq_enable) {
            irq_enable_ = v & 1;
            update_irq(t);
            return;
        }
        if (f == slow_field::flags || f == slow_field::busy) return;
        if (f == slow_field::enable) v &= 1;
        if (f == slow_field::prescale) v &= 15;
        if (f == slow_field::count || f == slow_field::alarm) v &= cfg_.counter_max();
        if (pending_ && pending_at_ != t) return;
        if (!pending_) {
            pending_ = true;
            pending_at_ = t;
            // edges 0..times_.size()-1 happened; the write waits for the write_latency-th next
            pending_edge_ = times_.size() + cfg_.write_latency - 1;
            values_ = {};
        }
        values_[std::size_t(f)] = v;
    }
    std::uint32_t read(models::slow_field f, sim::time_ps t) override {
        using models::slow_field;
        advance_to(t);
        switch (f) {
            case slow_field::enable:
                return enable_;
            case slow_field::prescale:
                return prescale_;
            case slow_field::alarm:
                return alarm_;
            case slow_field::irq_enable:
                return irq_enable_;
            case slow_field::flags:
                return flags_;
            case slow_field::busy:
                return pending_ ? 1 : 0;
            case slow_field::count: {
                std::size_t n = 0;
                if (t >= cfg_.read_window)
                    while (n < times_.size() && times_[n] <= t - cfg_.read_window) ++n;
                return history_[n];
            }
        }
        return 0;
    }
    void clear_flags(std::uint32_t mask, sim::time_ps t) override {
        advance_to(t);
        flags_ &= ~mask;
        update_irq(t);
    }
    bool next_event(sim::time_ps& at) const override {
        // Nothing can happen with no write pending and no counting towards a clear flag.
        if (!pending_ && (!enable_ || (flags_ & models::slow_flag_alarm) != 0)) return false;
        // Steps a copy edge by edge until a write applies or the flag sets. The bound covers a
        // whole wrap of the widest counter at the largest prescale the differential test uses.
        slow_counter_reference copy = *this;
        copy.observer_ = nullptr;
        for (int i = 0; i < 1 << 14; ++i) {
            const bool was_pending = copy.pending_;
            const std::uint32_t was_flags = copy.flags_;
            const sim::time_ps when = clock_.time_of(copy.times_.size());
            copy.step();
            if ((was_pending && !copy.pending_) || was_flags != copy.flags_) {
                at = when;
                return true;
            }
        }
        return false;
    }

private:
    void step() {
        const std::uint64_t e = times_.size();
        times_.push_back(clock_.time_of(e));
        const std::uint64_t every = std::uint64_t(1) << prescale_;
        if (enable_ && (e + 1) % every == 0) {
            counter_ = (counter_ + 1) & cfg_.counter_max();
            if (counter_ == alarm_ && (flags_ & models::slow_flag_alarm) == 0) {
                flags_ |= models::slow_flag_alarm;
                if (observer_) observer_->on_flags_set(models::slow_flag_alarm, times_.back());
                update_irq(times_.back());
            }
        }
        if (pending_ && pending_edge_ == e) {
            using models::slow_field;
            if (values_[std::size_t(slow_field::enable)])
                enable_ = *values_[std::size_t(slow_field::enable)];
            if (values_[std::size_t(slow_field::prescale)])
                prescale_ = *values_[std::size_t(slow_field::prescale)];
            if (values_[std::size_t(slow_field::count)])
                counter_ = *values_[std::size_t(slow_field::count)];
            if (values_[std::size_t(slow_field::alarm)])
                alarm_ = *values_[std::size_t(slow_field::alarm)];
            pending_ = false;
        }
        history_.push_back(counter_);
    }
    void update_irq(sim::time_ps at) {
        const bool level = irq_enable_ && (flags_ & models::slow_flag_alarm) != 0;
        if (level == irq_) return;
        irq_ = level;
        if (observer_) observer_->on_irq(level, at);
    }

    models::slow_config cfg_;
    const sim::clock_domain& clock_;
    models::slow_observer* observer_;
    std::vector<sim::time_ps> times_;        // time of each edge that happened
    std::vector<std::uint32_t> history_{0};  // counter after the first n edges
    std::uint32_t counter_ = 0, alarm_ = 0, flags_ = 0, prescale_ = 0;
    std::uint32_t enable_ = 0, irq_enable_ = 0;
    bool irq_ = false;
    bool pending_ = false;
    sim::time_ps pending_at_ = 0;
    std::uint64_t pending_edge_ = 0;
    std::array<std::optional<std::uint32_t>, models::slow_side_field_count> values_{};
};

}  // namespace tests
