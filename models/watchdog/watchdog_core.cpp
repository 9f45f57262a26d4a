#include "models/watchdog/watchdog_core.h"

#include <algorithm>
#include <stdexcept>
#include <string>

namespace models {

const char* to_string(watchdog_field f) {
    switch (f) {
        case watchdog_field::key:
            return "key";
        case watchdog_field::start:
            return "start";
        case watchdog_field::prescaler:
            return "prescaler";
        case watchdog_field::reload:
            return "reload";
        case watchdog_field::window:
            return "window";
        case watchdog_field::count:
            return "count";
    }
    return "?";
}

const char* to_string(watchdog_fault f) {
    return f == watchdog_fault::timeout ? "timeout" : "early refresh";
}

void watchdog_config::validate() const {
    if (counter_bits < 4 || counter_bits > 16)
        throw std::invalid_argument("counter_bits " + std::to_string(counter_bits) +
                                    " is out of range; accepted: 4 to 16");
}

watchdog_core::watchdog_core(const watchdog_config& cfg, const sim::clock_domain& clock,
                             watchdog_observer* observer)
    : cfg_(cfg), clock_(clock), observer_(observer) {
    cfg_.validate();
    reload_ = window_ = cfg_.counter_max();
}

std::uint64_t watchdog_core::timeout_edge() const {
    const std::uint64_t steps = std::max<std::uint32_t>(reload_, 1);
    return origin_ + steps * step_edges() - 1;
}

namespace {

// Edges at or before t.
std::uint64_t edges_through(const sim::clock_domain& clock, time_ps t) {
    return t == sim::max_time_ps ? clock.tick_at(t) : clock.tick_at(t + 1);
}

}  // namespace

std::uint32_t watchdog_core::counter_at(time_ps t) const {
    const std::uint64_t seen = edges_through(clock_, t);
    const std::uint64_t steps = seen > origin_ ? (seen - origin_) / step_edges() : 0;
    return steps >= reload_ ? 0 : static_cast<std::uint32_t>(reload_ - steps);
}

void watchdog_core::load(time_ps t) {
    origin_ = edges_through(clock_, t);
    last_refresh_ = t;
}

void watchdog_core::raise(watchdog_fault why, time_ps at) {
    fault_ = why;
    fault_at_ = at;
    if (observer_) observer_->on_reset(why, at);
}

void watchdog_core::advance_to(time_ps t) {
    if (!running_ || fault_) return;
    const std::uint64_t k = timeout_edge();
    if (edges_through(clock_, t) > k) raise(watchdog_fault::timeout, clock_.time_of(k));
}

bool watchdog_core::next_event(time_ps& at) const {
    if (!running_ || fault_) return false;
    try {
        at = clock_.time_of(timeout_edge());
        return true;
    } catch (const std::out_of_range&) {
        return false;  // the oscillator stops for ever before then
    } catch (const sim::time_limit_error&) {
        return false;  // beyond the end of simulated time
    }
}

void watchdog_core::write(watchdog_field f, std::uint32_t value, time_ps t) {
    advance_to(t);
    if (fault_) return;  // the part is in reset: nothing more happens
    switch (f) {
        case watchdog_field::key:
            if (value == watchdog_key_first) {
                key_armed_ = true;
            } else if (value == watchdog_key_second && key_armed_) {
                key_armed_ = false;
                if (!running_) break;  // refreshing a watchdog that is not started does nothing
                if (counter_at(t) > window_) {
                    raise(watchdog_fault::early_refresh, t);
                    break;
                }
                load(t);
            } else {
                key_armed_ = false;  // any other key write breaks the sequence
            }
            break;
        case watchdog_field::start:
            if ((value & 1) != 0 && !running_) {
                running_ = true;
                load(t);
            }
            break;
        case watchdog_field::prescaler:
            if (!running_) prescaler_ = std::min(value, watchdog_prescaler_max);
            break;
        case watchdog_field::reload:
            if (!running_) reload_ = value & cfg_.counter_max();
            break;
        case watchdog_field::window:
            if (!running_) window_ = value & cfg_.counter_max();
            break;
        case watchdog_field::count:
            break;  // read-only
    }
}

std::uint32_t watchdog_core::read(watchdog_field f, time_ps t) {
    advance_to(t);
    switch (f) {
        case watchdog_field::key:
            return 0;
        case watchdog_field::start:
            return running_ ? 1 : 0;
        case watchdog_field::prescaler:
            return prescaler_;
        case watchdog_field::reload:
            return reload_;
        case watchdog_field::window:
            return window_;
        case watchdog_field::count:
            if (fault_) return 0;
            return running_ ? counter_at(t) : reload_;
    }
    return 0;
}

void watchdog_core::clock_changed(time_ps) {}

}  // namespace models
