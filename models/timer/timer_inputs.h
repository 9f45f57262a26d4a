#pragma once
// A timer's inputs fed from their sources, in time order, before the timer moves past them
// (docs/architecture.md, "Input stimulus").
//
// timer_inputs wraps a timer (any timer_core_if) and is itself one: every call at time t first
// delivers each input edge at or before t to the wrapped timer, in time order across inputs, then
// passes the call on; next_event() is the earliest of the timer's own next event and the next
// input edge. So whoever drives the timer (the bus, the processor bringing peripherals up to its
// time, the kernel, the end of the run) delivers inputs without knowing they exist, and a source
// is asked for an edge only when the timer is about to need it.
//
// Three kinds of source drive inputs: a described stimulus (sim::stimulus::edge_source, computed
// lazily), another timer's output pin (a loopback), and another timer's trigger pulses (the chained
// input). The last two make this timer a consumer of a producer timer: before delivering up to t,
// the consumer brings its producers to t, one producer event at a time, so it never runs ahead of
// an edge a producer may still report, and the edges waiting between the two stay few. A producer's
// next event counts among the consumer's, since it may turn into an input edge. Producers must not
// depend on their consumers (harness::platform refuses wiring loops).

#include "models/timer/timer_types.h"
#include "sim/stimulus/edge_source.h"
#include "sim/stimulus/fan_tach.h"

#include <deque>
#include <memory>
#include <optional>
#include <vector>

namespace models {

// Told of every level an input takes, with its time (for waveforms and checks).
class input_observer {
public:
    virtual ~input_observer() = default;
    // Input `input` (input_of_channel(c), trigger_pin_input or fault_input) took `level` at `at`.
    virtual void on_input(unsigned input, bool level, time_ps at) = 0;
};

class timer_inputs final : public timer_core_if {
public:
    // Wraps `timer`, which must outlive this.
    explicit timer_inputs(timer_core_if& timer);
    ~timer_inputs() override;
    timer_inputs(const timer_inputs&) = delete;
    timer_inputs& operator=(const timer_inputs&) = delete;

    // Input `input` follows `source` from time 0; a high initial level is given to the timer now.
    // Call before any other call on the timer. Throws std::logic_error when the input is driven
    // already.
    void drive(unsigned input, std::unique_ptr<sim::stimulus::edge_source> source);
    // Input `input` follows output pin `pin` of `producer` (low at reset, as every pin). Returns
    // the observer to add to the producer's observers. Throws std::logic_error when the input is
    // driven already.
    timer_observer& follow_pin(unsigned input, timer_core_if& producer, unsigned pin);
    // Input `input` follows the tachometer of `fan`, which output pin `pin` of `producer` drives:
    // the fan hears the pin's levels, and its edges reach the input as the pin's levels determine
    // them. Returns the observer to add to the producer's observers. Throws std::logic_error when
    // the input is driven already.
    timer_observer& follow_fan(unsigned input, timer_core_if& producer, unsigned pin,
                               std::unique_ptr<sim::stimulus::fan_tach> fan);
    // The chained input takes `producer`'s trigger pulses. Returns the observer to add to the
    // producer's observers. Throws std::logic_error when the chained input is fed already.
    timer_observer& follow_triggers(timer_core_if& producer);
    // Whether `input` has a source (a stimulus or a loopback).
    bool driven(unsigned input) const;
    // Also told of every input level (must outlive this).
    void add_observer(input_observer* o) { observers_.push_back(o); }

    // timer_core_if: inputs up to t first, then the call.
    void advance_to(time_ps t) override;
    void write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) override;
    std::uint32_t read(timer_field f, unsigned channel, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    // An input with no source, set from outside (firmware); throws std::logic_error for an input
    // that a source drives.
    void set_fault_input(bool level, time_ps t) override;
    void set_input(unsigned input, bool level, time_ps t) override;
    void set_initial_input(unsigned input, bool level) override;
    // A pulse on the chained input from outside; throws std::logic_error when a producer feeds it.
    void chained_pulse(time_ps t) override;
    bool next_event(time_ps& at) const override;
    void clock_changed(time_ps t) override;

private:
    struct tap;
    struct feed_state {
        unsigned input = 0;
        std::unique_ptr<sim::stimulus::edge_source> source;  // a stimulus, or
        std::unique_ptr<sim::stimulus::fan_tach> fan;        // a fan on a producer's pin, or
        std::deque<sim::stimulus::edge> queue;               // a loopback's reported edges
        std::optional<sim::stimulus::edge> next;             // the source's or fan's next edge
        time_ps from = 0;                                    // a fan is asked from here on
    };
    // Delivers every input edge at or before t, bringing producers along.
    void bring_inputs_to(time_ps t);
    // Delivers the waiting edges at or before t, in time order.
    void flush(time_ps t);
    // Tells every fan that its pin is known up to t, and finds its next edge.
    void settle_fans(time_ps t);
    // The earliest waiting edge (or chained pulse) of all feeds; for a fan with no determined
    // edge, the instant from which its edges are not determined yet.
    std::optional<time_ps> earliest_waiting() const;
    void deliver(unsigned input, bool level, time_ps at);
    void add_producer(timer_core_if& p);
    void claim(unsigned input);

    timer_core_if& timer_;
    std::vector<feed_state> feeds_;
    std::deque<time_ps> pulses_;  // chained pulses reported by the chain's producer
    bool chained_ = false;
    std::vector<timer_core_if*> producers_;
    std::vector<std::unique_ptr<tap>> taps_;
    std::vector<input_observer*> observers_;
    std::uint32_t driven_ = 0;  // inputs with a source, by bit
    std::uint32_t levels_ = 0;  // each input's level now, by bit
};

}  // namespace models
