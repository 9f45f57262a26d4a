#include "models/tick/tick_timer_core.h"

#include <stdexcept>

namespace models {

const char* to_string(tick_field f) {
    switch (f) {
        case tick_field::enable:
            return "enable";
        case tick_field::irq_enable:
            return "irq_enable";
        case tick_field::clock_choice:
            return "clock_choice";
        case tick_field::flags:
            return "flags";
        case tick_field::reload:
            return "reload";
        case tick_field::current:
            return "current";
    }
    return "?";
}

void tick_config::validate() const {
    if (counter_bits < 1 || counter_bits > 32)
        throw std::invalid_argument("counter_bits " + std::to_string(counter_bits) +
                                    " is out of range; accepted: 1 to 32");
    if (divider < 2 || divider > 65536)
        throw std::invalid_argument("divider " + std::to_string(divider) +
                                    " is out of range; accepted: 2 to 65536");
}

tick_timer_core::tick_timer_core(const tick_config& cfg, const sim::clock_domain& clock,
                                 tick_observer* observer)
    : cfg_(cfg), clock_(clock), observer_(observer) {
    cfg_.validate();
}

std::uint64_t tick_timer_core::counted(std::uint64_t a, std::uint64_t b) const {
    if (!divided_) return b - a;
    // The divided clock is a free-running divide of the instance clock: edge k counts when
    // k % divider == divider - 1, whatever the choice was before, so switching keeps its phase.
    return b / cfg_.divider - a / cfg_.divider;
}

std::uint64_t tick_timer_core::counted_edge(std::uint64_t a, std::uint64_t m) const {
    if (!divided_) return a + m - 1;
    const std::uint64_t d = cfg_.divider;
    return (a / d) * d + d - 1 + (m - 1) * d;
}

std::uint32_t tick_timer_core::value_after(std::uint64_t m) const {
    if (m <= counter_) return static_cast<std::uint32_t>(counter_ - m);
    // The tick after reaching 0 loads the reload value; from there the cycle is reload + 1 long.
    const std::uint64_t j = m - counter_ - 1;
    if (reload_ == 0) return 0;
    return static_cast<std::uint32_t>(reload_ - j % (std::uint64_t(reload_) + 1));
}

std::optional<std::uint64_t> tick_timer_core::ticks_to_zero() const {
    if (!enable_) return std::nullopt;
    if (counter_ > 0) return counter_;
    if (reload_ > 0) return std::uint64_t(reload_) + 1;
    return std::nullopt;  // counting from 0 with a reload value of 0: it stays at 0
}

void tick_timer_core::update_irq(time_ps at) {
    const bool level = irq_enable_ && (flags_ & tick_flag_zero) != 0;
    if (level == irq_) return;
    irq_ = level;
    if (observer_) observer_->on_irq(level, at);
}

void tick_timer_core::skip_to(std::uint64_t n) {
    if (n <= done_) return;
    if (enable_) {
        const std::uint64_t m = counted(done_, n);
        std::optional<time_ps> flag_at;
        if ((flags_ & tick_flag_zero) == 0)
            if (const auto z = ticks_to_zero(); z && *z <= m)
                flag_at = clock_.time_of(counted_edge(done_, *z));
        counter_ = value_after(m);
        done_ = n;
        if (flag_at) {
            ++events_;
            flags_ |= tick_flag_zero;
            if (observer_) observer_->on_flags_set(tick_flag_zero, *flag_at);
            update_irq(*flag_at);
        }
        cache_valid_ = false;
        return;
    }
    done_ = n;
}

void tick_timer_core::advance_to(time_ps t) {
    skip_to(t == sim::max_time_ps ? clock_.tick_at(t) : clock_.tick_at(t + 1));
}

void tick_timer_core::write(tick_field f, std::uint32_t value, time_ps t) {
    advance_to(t);
    switch (f) {
        case tick_field::enable:
            enable_ = (value & 1) != 0;
            break;
        case tick_field::irq_enable:
            irq_enable_ = (value & 1) != 0;
            update_irq(t);
            break;
        case tick_field::clock_choice:
            divided_ = (value & 1) != 0;
            break;
        case tick_field::flags:
            break;  // flags are set by counting and cleared through clear_flags() only
        case tick_field::reload:
            reload_ = value & cfg_.counter_max();
            break;
        case tick_field::current:
            counter_ = 0;  // whatever is written; the flag stays as it is
            break;
    }
    cache_valid_ = false;
}

std::uint32_t tick_timer_core::read(tick_field f, time_ps t) {
    advance_to(t);
    switch (f) {
        case tick_field::enable:
            return enable_ ? 1 : 0;
        case tick_field::irq_enable:
            return irq_enable_ ? 1 : 0;
        case tick_field::clock_choice:
            return divided_ ? 1 : 0;
        case tick_field::flags:
            return flags_;
        case tick_field::reload:
            return reload_;
        case tick_field::current:
            return counter_;
    }
    return 0;
}

void tick_timer_core::clear_flags(std::uint32_t mask, time_ps t) {
    advance_to(t);
    flags_ &= ~mask;
    update_irq(t);
    cache_valid_ = false;
}

bool tick_timer_core::next_event(time_ps& at) const {
    if (!cache_valid_) {
        cached_next_.reset();
        cache_valid_ = true;
        // With the flag set nothing observable happens until it is cleared: the counter is
        // computed when read.
        if ((flags_ & tick_flag_zero) == 0) {
            if (const auto z = ticks_to_zero()) {
                try {
                    cached_next_ = clock_.time_of(counted_edge(done_, *z));
                } catch (const std::out_of_range&) {
                    // the clock stops for ever before that edge
                } catch (const sim::time_limit_error&) {
                    // beyond the end of simulated time
                }
            }
        }
    }
    if (!cached_next_) return false;
    at = *cached_next_;
    return true;
}

void tick_timer_core::clock_changed(time_ps) { cache_valid_ = false; }

}  // namespace models
