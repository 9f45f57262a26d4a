#include "models/slow/slow_counter_core.h"

#include <stdexcept>
#include <string>

namespace models {

const char* to_string(slow_field f) {
    switch (f) {
        case slow_field::enable:
            return "enable";
        case slow_field::prescale:
            return "prescale";
        case slow_field::count:
            return "count";
        case slow_field::alarm:
            return "alarm";
        case slow_field::irq_enable:
            return "irq_enable";
        case slow_field::flags:
            return "flags";
        case slow_field::busy:
            return "busy";
    }
    return "?";
}

void slow_config::validate() const {
    if (counter_bits < 1 || counter_bits > 32)
        throw std::invalid_argument("counter_bits " + std::to_string(counter_bits) +
                                    " is out of range; accepted: 1 to 32");
    if (write_latency < 1 || write_latency > 16)
        throw std::invalid_argument("write_latency " + std::to_string(write_latency) +
                                    " is out of range; accepted: 1 to 16 slow-clock edges");
    if (read_window > 1'000'000'000)
        throw std::invalid_argument("read_window " + std::to_string(read_window) +
                                    " ps is out of range; accepted: 0 to 1 ms");
}

slow_counter_core::slow_counter_core(const slow_config& cfg, const sim::clock_domain& clock,
                                     slow_observer* observer)
    : cfg_(cfg), clock_(clock), observer_(observer) {
    cfg_.validate();
}

std::uint64_t slow_counter_core::counted(const span& s, std::uint64_t a, std::uint64_t b) {
    if (!s.enable) return 0;
    // The prescaler is a free-running divide of the slow clock: edge k counts when
    // (k + 1) % 2^prescale == 0, so changing the prescale keeps its phase.
    return (b >> s.prescale) - (a >> s.prescale);
}

std::uint32_t slow_counter_core::value_at(const span& s, std::uint64_t n) const {
    const std::uint64_t m = counted(s, s.first, n);
    return static_cast<std::uint32_t>((s.start + m) & cfg_.counter_max());
}

const slow_counter_core::span& slow_counter_core::span_for(std::uint64_t n) const {
    for (std::size_t i = spans_.size(); i-- > 0;)
        if (spans_[i].first <= n) return spans_[i];
    return spans_.front();
}

std::optional<time_ps> slow_counter_core::edge_time(std::uint64_t k) const {
    try {
        return clock_.time_of(k);
    } catch (const std::out_of_range&) {
        return std::nullopt;  // the clock stops for ever before that edge
    } catch (const sim::time_limit_error&) {
        return std::nullopt;  // beyond the end of simulated time
    }
}

std::uint64_t slow_counter_core::edges_through(time_ps t) const {
    return t == sim::max_time_ps ? clock_.tick_at(t) : clock_.tick_at(t + 1);
}

std::optional<std::uint64_t> slow_counter_core::alarm_edge() const {
    const span& s = spans_.back();
    if (!s.enable) return std::nullopt;
    const std::uint64_t cur = value_at(s, done_);
    const std::uint64_t wrap = std::uint64_t(cfg_.counter_max()) + 1;
    std::uint64_t steps = (alarm_ + wrap - cur) % wrap;
    if (steps == 0) steps = wrap;  // already there: the next match is a whole wrap away
    const std::uint64_t d = std::uint64_t(1) << s.prescale;
    return (done_ / d) * d + d - 1 + (steps - 1) * d;
}

std::uint64_t slow_counter_core::seen_edges(time_ps t) const {
    return t < cfg_.read_window ? 0 : edges_through(t - cfg_.read_window);
}

void slow_counter_core::forget_before(std::uint64_t n) {
    while (spans_.size() > 1 && spans_[1].first <= n) spans_.erase(spans_.begin());
}

void slow_counter_core::update_irq(time_ps at) {
    const bool level = irq_enable_ && (flags_ & slow_flag_alarm) != 0;
    if (level == irq_) return;
    irq_ = level;
    if (observer_) observer_->on_irq(level, at);
}

void slow_counter_core::run_to(std::uint64_t n) {
    if (n <= done_) return;
    std::optional<time_ps> flag_at;
    if ((flags_ & slow_flag_alarm) == 0)
        if (const auto e = alarm_edge(); e && *e < n) flag_at = edge_time(*e);
    done_ = n;
    if (flag_at) {
        ++events_;
        flags_ |= slow_flag_alarm;
        if (observer_) observer_->on_flags_set(slow_flag_alarm, *flag_at);
        update_irq(*flag_at);
    }
}

void slow_counter_core::apply_pending(std::uint64_t first) {
    const span& old = spans_.back();
    span s;
    s.first = first;
    const auto& p = pending_;
    s.start = p[std::size_t(slow_field::count)] ? *p[std::size_t(slow_field::count)]
                                                : value_at(old, first);
    s.enable =
        p[std::size_t(slow_field::enable)] ? *p[std::size_t(slow_field::enable)] != 0 : old.enable;
    s.prescale =
        p[std::size_t(slow_field::prescale)] ? *p[std::size_t(slow_field::prescale)] : old.prescale;
    if (p[std::size_t(slow_field::alarm)]) alarm_ = *p[std::size_t(slow_field::alarm)];
    if (old.first == first)
        spans_.back() = s;
    else
        spans_.push_back(s);
    pending_ = {};
    has_pending_ = false;
    ++events_;
}

void slow_counter_core::advance_to(time_ps t) {
    const std::uint64_t n = edges_through(t);
    if (has_pending_ && pending_edge_ < n) {
        // The edge the write waits for still counts under the old settings.
        run_to(pending_edge_ + 1);
        apply_pending(pending_edge_ + 1);
    }
    run_to(n);
}

void slow_counter_core::write(slow_field f, std::uint32_t value, time_ps t) {
    advance_to(t);
    switch (f) {
        case slow_field::irq_enable:
            irq_enable_ = (value & 1) != 0;
            update_irq(t);
            return;
        case slow_field::flags:
        case slow_field::busy:
            return;  // flags clear through clear_flags() only; busy is read-only
        case slow_field::enable:
            value &= 1;
            break;
        case slow_field::prescale:
            value &= 15;
            break;
        case slow_field::count:
        case slow_field::alarm:
            value &= cfg_.counter_max();
            break;
    }
    // No later read looks further back than this one could: the spans before it go, so a driver
    // that only writes keeps a bounded history.
    forget_before(seen_edges(t));
    // One bus transfer writes all the fields of a register at the same instant: they travel
    // together. A write at a later instant while one is pending is lost, as in the hardware.
    if (has_pending_ && pending_at_ != t) return;
    if (!has_pending_) {
        has_pending_ = true;
        pending_at_ = t;
        pending_edge_ = done_ + cfg_.write_latency - 1;
    }
    pending_[static_cast<std::size_t>(f)] = value;
}

std::uint32_t slow_counter_core::read(slow_field f, time_ps t) {
    advance_to(t);
    switch (f) {
        case slow_field::enable:
            return spans_.back().enable ? 1 : 0;
        case slow_field::prescale:
            return spans_.back().prescale;
        case slow_field::alarm:
            return alarm_;
        case slow_field::irq_enable:
            return irq_enable_ ? 1 : 0;
        case slow_field::flags:
            return flags_;
        case slow_field::busy:
            return has_pending_ ? 1 : 0;
        case slow_field::count: {
            // The synchroniser samples the counter read_window before the read: the value after
            // the last edge at or before t - read_window.
            const std::uint64_t m = seen_edges(t);
            forget_before(m);
            const span& s = span_for(m);
            return value_at(s, m < s.first ? s.first : m);
        }
    }
    return 0;
}

void slow_counter_core::clear_flags(std::uint32_t mask, time_ps t) {
    advance_to(t);
    flags_ &= ~mask;
    update_irq(t);
}

bool slow_counter_core::next_event(time_ps& at) const {
    std::optional<time_ps> best;
    if (has_pending_) best = edge_time(pending_edge_);
    if ((flags_ & slow_flag_alarm) == 0)
        if (const auto e = alarm_edge())
            if (const auto when = edge_time(*e); when && (!best || *when < *best)) best = when;
    if (!best) return false;
    at = *best;
    return true;
}

void slow_counter_core::settle(time_ps t) {
    advance_to(t);
    if (has_pending_) apply_pending(done_);
}

}  // namespace models
