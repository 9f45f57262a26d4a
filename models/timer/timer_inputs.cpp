#include "models/timer/timer_inputs.h"

#include <stdexcept>
#include <string>

namespace models {

// Hears a producer's reports and queues the ones a consumer takes: one pin's changes (a loopback)
// or the trigger pulses (the chained input).
struct timer_inputs::tap final : timer_observer {
    timer_inputs* owner = nullptr;
    std::size_t feed = 0;  // the loopback's feed
    unsigned pin = 0;
    bool triggers = false;
    void on_pin(unsigned p, bool level, time_ps at) override {
        if (triggers || p != pin) return;
        feed_state& f = owner->feeds_[feed];
        if (f.fan)
            f.fan->drive(level, at);
        else
            f.queue.push_back({at, level});
    }
    void on_flags_set(std::uint32_t, time_ps) override {}
    void on_irq(bool, time_ps) override {}
    void on_trigger(time_ps at) override {
        if (triggers) owner->pulses_.push_back(at);
    }
};

timer_inputs::timer_inputs(timer_core_if& timer) : timer_(timer) {}
timer_inputs::~timer_inputs() = default;

void timer_inputs::claim(unsigned input) {
    if (input >= input_count)
        throw std::logic_error("timer input " + std::to_string(input) + " does not exist");
    if (driven(input))
        throw std::logic_error("timer input " + std::to_string(input) + " has a source already");
    driven_ |= 1u << input;
}

bool timer_inputs::driven(unsigned input) const {
    return input < input_count && ((driven_ >> input) & 1u) != 0;
}

void timer_inputs::add_producer(timer_core_if& p) {
    for (timer_core_if* q : producers_)
        if (q == &p) return;
    producers_.push_back(&p);
}

void timer_inputs::drive(unsigned input, std::unique_ptr<sim::stimulus::edge_source> source) {
    claim(input);
    if (source->initial_level()) set_initial_input(input, true);
    feed_state f;
    f.input = input;
    f.next = source->next_edge(0);
    f.source = std::move(source);
    feeds_.push_back(std::move(f));
}

timer_observer& timer_inputs::follow_pin(unsigned input, timer_core_if& producer, unsigned pin) {
    claim(input);
    feed_state f;
    f.input = input;
    feeds_.push_back(std::move(f));
    auto t = std::make_unique<tap>();
    t->owner = this;
    t->feed = feeds_.size() - 1;
    t->pin = pin;
    taps_.push_back(std::move(t));
    add_producer(producer);
    return *taps_.back();
}

timer_observer& timer_inputs::follow_fan(unsigned input, timer_core_if& producer, unsigned pin,
                                         std::unique_ptr<sim::stimulus::fan_tach> fan) {
    timer_observer& o = follow_pin(input, producer, pin);
    if (fan->initial_level()) set_initial_input(input, true);
    feeds_.back().fan = std::move(fan);
    return o;
}

void timer_inputs::settle_fans(time_ps t) {
    for (feed_state& f : feeds_) {
        if (!f.fan) continue;
        f.fan->known_until(t);
        if (!f.next) f.next = f.fan->next_edge(f.from);
    }
}

timer_observer& timer_inputs::follow_triggers(timer_core_if& producer) {
    if (chained_) throw std::logic_error("the chained input has a source already");
    chained_ = true;
    auto t = std::make_unique<tap>();
    t->owner = this;
    t->triggers = true;
    taps_.push_back(std::move(t));
    add_producer(producer);
    return *taps_.back();
}

void timer_inputs::bring_inputs_to(time_ps t) {
    if (producers_.empty()) return flush(t);
    // One producer event at a time: what the producers report in a step is delivered before the
    // next step, so the queues between them hold one instant's edges, not a whole stretch's.
    bool first = true;
    time_ps step = 0;
    for (;;) {
        time_ps h = t;
        for (timer_core_if* p : producers_) {
            time_ps e;
            if (p->next_event(e) && e < h && (first || e > step)) h = e;
        }
        for (timer_core_if* p : producers_) p->advance_to(h);
        settle_fans(h);
        flush(h);
        if (h >= t) return;
        first = false;
        step = h;
    }
}

void timer_inputs::flush(time_ps t) {
    if (feeds_.empty() && pulses_.empty()) return;
    for (;;) {
        feed_state* best = nullptr;
        time_ps at = t;
        for (feed_state& f : feeds_) {
            const sim::stimulus::edge* head = f.source || f.fan
                                                  ? (f.next ? &*f.next : nullptr)
                                                  : (f.queue.empty() ? nullptr : &f.queue.front());
            if (head && head->at <= at && (!best || head->at < at)) {
                best = &f;
                at = head->at;
            }
        }
        if (!pulses_.empty() && pulses_.front() <= at && (!best || pulses_.front() < at)) {
            const time_ps p = pulses_.front();
            pulses_.pop_front();
            timer_.chained_pulse(p);
            continue;
        }
        if (!best) return;
        if (best->source) {
            const sim::stimulus::edge e = *best->next;
            best->next = e.at < sim::max_time_ps ? best->source->next_edge(e.at + 1) : std::nullopt;
            deliver(best->input, e.level, e.at);
        } else if (best->fan) {
            const sim::stimulus::edge e = *best->next;
            best->from = e.at + 1;
            best->next = best->fan->next_edge(best->from);
            deliver(best->input, e.level, e.at);
        } else {
            const sim::stimulus::edge e = best->queue.front();
            best->queue.pop_front();
            deliver(best->input, e.level, e.at);
        }
    }
}

std::optional<time_ps> timer_inputs::earliest_waiting() const {
    std::optional<time_ps> r;
    const auto take = [&r](time_ps t) {
        if (!r || t < *r) r = t;
    };
    for (const feed_state& f : feeds_) {
        if (f.source && f.next) take(f.next->at);
        if (f.fan) take(f.next ? f.next->at : f.fan->determined_until());
        if (!f.source && !f.fan && !f.queue.empty()) take(f.queue.front().at);
    }
    if (!pulses_.empty()) take(pulses_.front());
    return r;
}

void timer_inputs::deliver(unsigned input, bool level, time_ps at) {
    const std::uint32_t bit = 1u << input;
    if (((levels_ & bit) != 0) == level) return;  // firmware setting the level it has
    levels_ ^= bit;
    // The timer takes the fault input through its own call: it is no sampled pin input.
    if (input == fault_input)
        timer_.set_fault_input(level, at);
    else
        timer_.set_input(input, level, at);
    for (input_observer* o : observers_) o->on_input(input, level, at);
}

void timer_inputs::advance_to(time_ps t) {
    bring_inputs_to(t);
    timer_.advance_to(t);
}
void timer_inputs::write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) {
    bring_inputs_to(t);
    timer_.write(f, channel, value, t);
}
std::uint32_t timer_inputs::read(timer_field f, unsigned channel, time_ps t) {
    bring_inputs_to(t);
    return timer_.read(f, channel, t);
}
void timer_inputs::clear_flags(std::uint32_t mask, time_ps t) {
    bring_inputs_to(t);
    timer_.clear_flags(mask, t);
}
void timer_inputs::set_fault_input(bool level, time_ps t) { set_input(fault_input, level, t); }
void timer_inputs::set_input(unsigned input, bool level, time_ps t) {
    if (driven(input))
        throw std::logic_error("timer input " + std::to_string(input) +
                               " follows a source; it cannot be set from outside");
    bring_inputs_to(t);
    deliver(input, level, t);
}
void timer_inputs::set_initial_input(unsigned input, bool level) {
    if (input < input_count) levels_ = level ? levels_ | (1u << input) : levels_ & ~(1u << input);
    timer_.set_initial_input(input, level);
}
void timer_inputs::chained_pulse(time_ps t) {
    if (chained_)
        throw std::logic_error(
            "the chained input follows another timer; it cannot be pulsed from "
            "outside");
    bring_inputs_to(t);
    timer_.chained_pulse(t);
}
bool timer_inputs::next_event(time_ps& at) const {
    std::optional<time_ps> r = earliest_waiting();
    time_ps e;
    if (timer_.next_event(e) && (!r || e < *r)) r = e;
    for (const timer_core_if* p : producers_)
        if (p->next_event(e) && (!r || e < *r)) r = e;
    if (!r) return false;
    at = *r;
    return true;
}
void timer_inputs::clock_changed(time_ps t) { timer_.clock_changed(t); }

}  // namespace models
