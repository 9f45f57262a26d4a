#pragma once
// The functional vocabulary of the general-purpose timer, shared by the fast model, the tick-exact
// reference model and the register layouts.
//
// A timer's behaviour is independent of where its fields sit in memory (docs/architecture.md,
// "Registers are data"): a layout maps offsets and bits to the functional fields named here, and
// both models implement the same semantics on them, written down in docs/timer-model.md. Names are
// our own plain words.

#include "models/event_source.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <string>
#include <vector>

namespace models {

using sim::time_ps;

// How the counter moves: up from 0 to the period, down from the period to 0, or up and down
// (center-aligned, turning at the period and at 0).
enum class count_mode : std::uint32_t { up = 0, down = 1, center = 2 };
// In center mode, which slope raises channel matches: the rising slope, the falling one, or both.
enum class match_slope : std::uint32_t { up = 0, down = 1, both = 2 };

// What a compare channel does with its output level. The value is a 4-bit code of our own: a kind
// in bits 2..3 (0 hold, 1 PWM, 2 on match, 3 forced) and a variant in bits 0..1. Codes not listed
// are reserved (docs/timer-model.md, "Out-of-range writes").
enum class output_action : std::uint32_t {
    hold = 0x0,             // level frozen where it was last set
    pwm_below = 0x4,        // active while counter < compare
    pwm_at_or_above = 0x5,  // active while counter >= compare
    toggle_on_match = 0x8,  // flips on a match
    set_on_match = 0x9,     // goes active on a match
    clear_on_match = 0xa,   // goes inactive on a match
    force_low = 0xc,        // inactive now and stays
    force_high = 0xd,       // active now and stays
};
// What a wrap and a forced reload do.
enum class reload_policy : std::uint32_t {
    every = 0,         // every wrap (after the wrap skip) and every forced reload is a reload
                       // event that sets the reload flag
    quiet_forced = 1,  // as `every`, but a forced reload sets no reload flag
    held = 2,          // wraps cause no reload event; a forced reload moves the counter only
};
// What a channel does: compare (and drive its output), or capture the counter on edges of its own
// input or of its neighbour's (channel c ^ 1: 0 and 1, 2 and 3, 4 and 5 are neighbours).
enum class channel_role : std::uint32_t { compare = 0, capture_own = 1, capture_neighbour = 2 };
// Which edges of the filtered input a capture channel takes.
enum class capture_edge : std::uint32_t { rising = 0, falling = 1, both = 2 };
// What steps the counter: the timer clock, accepted edges of the trigger source, or a quadrature
// encoder on the inputs of channels 0 (A) and 1 (B), counting edges of A only or of A and B.
enum class count_source : std::uint32_t {
    timer_clock = 0,
    trigger_edges = 1,
    encoder_x2 = 2,
    encoder_x4 = 3,
};
// What an accepted trigger does: nothing, restart the counter (a forced reload), let the counter
// count only while the trigger is active, or start the counter.
enum class trigger_action : std::uint32_t { none = 0, restart = 1, gate = 2, start = 3 };
// Where the trigger comes from: the filtered input of channel 0 or 1, the trigger input pin
// (filtered), or another timer's trigger pulses (the chained input).
enum class trigger_source : std::uint32_t {
    channel_0_input = 0,
    channel_1_input = 1,
    trigger_pin = 2,
    chained = 3,
};

// The inputs of a timer: each channel's input pin, the trigger input pin and the fault input.
// Levels change by set_input(); the chained input carries pulses (chained_pulse()).
inline constexpr unsigned input_of_channel(unsigned c) { return c; }
inline constexpr unsigned trigger_pin_input = 6;
inline constexpr unsigned fault_input = 7;
inline constexpr unsigned input_count = 8;

// Values of `trigger_select`: what sends a trigger pulse.
inline constexpr std::uint32_t trigger_none = 0;
// Channel c's match sends the trigger pulse.
inline constexpr std::uint32_t trigger_on_match(unsigned c) { return 1 + c; }
inline constexpr std::uint32_t trigger_on_reload = 7;

// Functional fields. Per-channel fields take the channel index (0-based) as a second argument.
enum class timer_field : std::uint32_t {
    enable,           // 1: counting
    mode,             // count_mode
    slope,            // match_slope (center mode)
    one_pulse,        // 1: counting stops at the next reload event caused by a wrap
    period_preload,   // 1: period writes wait for the next reload event
    reload_policy,    // reload_policy
    force_reload,     // write 1: forced reload event now (reads 0)
    prescaler,        // counter steps every (prescaler + 1) timer clock ticks
    period,           // counter turning value
    counter,          // the counter; reads give the value now
    wrap_skip,        // wraps skipped between reload events: a reload event every (wrap_skip + 1)
    direction,        // read-only: 0 counting up, 1 counting down
    dead_time,        // dead-time counts between one output falling and the other rising
    dead_time_scale,  // the dead-time count runs every 1 << dead_time_scale ticks (0..3)
    fault_enable,     // 1: the fault input forces the safe levels
    fault_latency,    // timer clock ticks from a fault input rising to the outputs forced
    rearm,            // write 1: leave the fault state (if the fault input is low)
    flags,            // flag bits (flag_channel, flag_reload, flag_fault)
    irq_enable,       // same bits: which flags raise the interrupt request
    trigger_select,   // trigger_none, trigger_on_match(c) or trigger_on_reload
    filter_divider,   // input sampling clock = timer clock / (1 << filter_divider), 0..3
    count_source,     // count_source
    trigger_action,   // trigger_action
    trigger_source,   // trigger_source
    trigger_edge,     // 0: the trigger is a rising edge (gate: high level); 1: falling (low)
    trigger_filter,   // the trigger pin's filter: an index into the instance's filter_lengths
    // per channel
    compare,            // compare value
    compare_preload,    // 1: compare writes wait for the next reload event
    action,             // output_action
    main_enable,        // 1: the main output drives its level; 0: it sits inactive
    main_active_low,    // 1: the main output's active level is low
    comp_enable,        // complementary output enable
    comp_active_low,    // complementary output polarity
    main_safe_level,    // level of the main output while a fault holds
    comp_safe_level,    // level of the complementary output while a fault holds
    channel_role,       // channel_role
    capture_edge,       // capture_edge
    capture_prescaler,  // capture on every 1st, 2nd, 4th or 8th taken edge (0..3)
    input_filter,       // this channel's input filter: an index into the instance's filter_lengths
};
// Readable name of a field ("period", "compare"...), for layouts and messages.
const char* to_string(timer_field f);
// Whether the field is indexed by channel.
bool is_channel_field(timer_field f);

// Flag bits: channel c's match or capture at bit c, the reload event at bit 8, the fault at bit 9,
// an accepted trigger at bit 10, channel c's over-capture at bit 16 + c.
inline constexpr std::uint32_t flag_channel(unsigned c) { return 1u << c; }
inline constexpr std::uint32_t flag_reload = 1u << 8;
inline constexpr std::uint32_t flag_fault = 1u << 9;
inline constexpr std::uint32_t flag_trigger = 1u << 10;
inline constexpr std::uint32_t flag_overcapture(unsigned c) { return 1u << (16 + c); }

// What one timer instance has: fixed by the part, not by firmware.
struct timer_config {
    unsigned counter_bits = 16;      // 8..32
    unsigned channels = 4;           // 1..6
    unsigned prescaler_bits = 16;    // width of the prescaler register
    unsigned wrap_skip_bits = 8;     // width of the wrap skip count; 0: none
    bool prescaler_shadowed = true;  // prescaler writes wait for the next reload event
    bool complementary = false;      // complementary outputs, dead time and fault input
    unsigned dead_time_max = 1023;   // largest dead_time value; larger writes are clipped
    bool dead_time_scaled = false;   // the dead_time_scale field exists (else the scale is 1)
    unsigned compare_latency = 0;    // 0..2 timer clock ticks before a compare write acts
    unsigned input_sync_ticks = 2;   // 1..3: synchroniser depth of every input
    // The filter lengths a filter field chooses from (1 to 16 entries, each 1..255 samples).
    std::vector<unsigned> filter_lengths = {1, 2, 4, 8};
    bool capture_read_clears_flag = true;  // reading a captured value clears its capture flag
    unsigned chain_latency = 0;            // 0..3: extra ticks a chained trigger pulse takes
    // Throws std::invalid_argument naming the first out-of-range value.
    void validate() const;
    std::uint32_t counter_max() const {
        return counter_bits >= 32 ? 0xffff'ffffu : (1u << counter_bits) - 1;
    }
};

// Whether a write of `value` to field f means something in this instance. Enumerated fields (mode,
// slope, reload_policy, action, trigger_select, and on the input side channel_role, capture_edge,
// capture_prescaler, filter_divider, count_source, trigger_action, trigger_source, trigger_edge,
// trigger_filter, input_filter) have reserved values, which both models ignore
// (docs/timer-model.md, "Out-of-range writes"); every other field takes any value.
bool is_defined_value(const timer_config& cfg, timer_field f, std::uint32_t value);

// Output pins: 2c is channel c's main output, 2c + 1 its complementary output.
inline constexpr unsigned main_pin(unsigned c) { return 2 * c; }
inline constexpr unsigned comp_pin(unsigned c) { return 2 * c + 1; }

// What a timer model reports as it runs. All times are exact simulation times in picoseconds.
class timer_observer {
public:
    virtual ~timer_observer() = default;
    // An output pin changed level.
    virtual void on_pin(unsigned pin, bool level, time_ps at) = 0;
    // Flag bits went from clear to set.
    virtual void on_flags_set(std::uint32_t bits, time_ps at) = 0;
    // The interrupt request line changed level.
    virtual void on_irq(bool level, time_ps at) = 0;
    // A trigger pulse left the timer.
    virtual void on_trigger(time_ps at) = 0;
};

// The plain C++ interface both timer models implement; the SystemC shell and the tests drive it.
// Calls come in non-decreasing time. A write or read at time t sees every timer clock tick at or
// before t as already happened.
class timer_core_if : public event_source {
public:
    // Process everything that happens at or before t.
    void advance_to(time_ps t) override = 0;
    // Write a field (channel for per-channel fields) at time t.
    virtual void write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) = 0;
    // Read a field at time t (the counter's value now; preloaded fields read the written value).
    virtual std::uint32_t read(timer_field f, unsigned channel, time_ps t) = 0;
    // Clear the flag bits in mask at time t.
    virtual void clear_flags(std::uint32_t mask, time_ps t) = 0;
    // The fault input changed level at time t.
    virtual void set_fault_input(bool level, time_ps t) = 0;
    // Input `input` (input_of_channel(c) or trigger_pin_input) changed to `level` at time t.
    virtual void set_input(unsigned input, bool level, time_ps t) = 0;
    // The level input `input` (input_of_channel(c), trigger_pin_input or fault_input) has held
    // since before time 0 (its reset level; call before any other call). A fault input high since
    // then is a level, not a rise: it starts no fault.
    virtual void set_initial_input(unsigned input, bool level) = 0;
    // A trigger pulse from another timer reached the chained input at time t.
    virtual void chained_pulse(time_ps t) = 0;
    // The earliest time something may happen that was not yet processed, or none.
    bool next_event(time_ps& at) const override = 0;
    // The timer clock's timeline changed from time t on (the clock tree rebuilt it).
    virtual void clock_changed(time_ps t) = 0;
};

}  // namespace models
