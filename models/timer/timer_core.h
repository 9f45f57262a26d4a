#pragma once
// The fast general-purpose timer: counters computed, not ticked (docs/architecture.md, "Counters
// are computed, not ticked").
//
// The state is "after timer clock tick n the counter held c, prescaler count p, direction d".
// Between two instants that matter (a wrap, a step onto a compare value, a delayed compare or fault
// taking effect, the end of a dead time) nothing observable happens, so the model jumps over those
// ticks with arithmetic and processes only the instants that matter, each exactly as
// docs/timer-model.md says. Cost is proportional to the events that matter, not to the clock
// frequency. The tick-exact reference in models/reference/ implements the same page the slow way;
// the differential test holds the two together.

#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"

#include <array>
#include <cstdint>
#include <deque>
#include <optional>
#include <string>

namespace models {

class timer_core final : public timer_core_if {
public:
    // A timer of the given configuration counting edges of `timer_clock`, reporting to `observer`
    // (may be null), named `name` in its warnings (logger "timer"). The domain must outlive the
    // timer. Throws std::invalid_argument on a bad config.
    timer_core(const timer_config& cfg, const sim::clock_domain& timer_clock,
               timer_observer* observer, std::string name = "timer");

    void advance_to(time_ps t) override;
    void write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) override;
    std::uint32_t read(timer_field f, unsigned channel, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    void set_fault_input(bool level, time_ps t) override;
    void set_input(unsigned input, bool level, time_ps t) override;
    void set_initial_input(unsigned input, bool level) override;
    void chained_pulse(time_ps t) override;
    bool next_event(time_ps& at) const override;
    void clock_changed(time_ps t) override;

    const timer_config& config() const { return cfg_; }
    // Current pin level (after everything up to the last call's time).
    bool pin(unsigned p) const { return pins_[p].level; }
    bool irq() const { return irq_; }
    // Number of timer clock ticks processed one by one (instants that mattered); the rest were
    // skipped.
    std::uint64_t ticks_processed() const { return ticks_processed_; }

private:
    static constexpr unsigned max_channels = 6;
    static constexpr std::uint64_t never = ~std::uint64_t{0};

    struct pending_compare {
        std::uint64_t tick;
        std::uint32_t value;
    };
    struct channel {
        std::uint32_t compare_shadow = 0;
        std::uint32_t compare = 0;  // active
        std::deque<pending_compare> pending;
        bool preload = false;
        bool waiting = false;  // written with preload on, not loaded yet
        output_action action = output_action::hold;
        bool main_enable = false, main_active_low = false;
        bool comp_enable = false, comp_active_low = false;
        bool main_safe = false, comp_safe = false;
        // The input side.
        channel_role role = channel_role::compare;
        capture_edge edge = capture_edge::rising;
        std::uint32_t capture_prescaler = 0;  // capture every 1 << capture_prescaler taken edges
        std::uint32_t input_filter = 0;       // index into the instance's filter lengths
        std::uint32_t capture_count = 0;
    };
    // An input pin between its raw level and its filtered level (docs/timer-model.md, "Inputs").
    // Instead of sampling every tick, it keeps the tick at which the filter output will flip, if
    // the raw level stays: a run of synchronised levels unlike the output starts at the tick the
    // edge that began it becomes visible, and the output flips at the N-th sampling tick of the run
    // unless an edge back becomes visible first.
    struct input_state {
        bool raw = false;  // level after every edge given so far
        bool out = false;  // filtered level after the processed ticks
        // Synchronised ticks of the raw changes the output has not taken yet, in order; levels
        // alternate, the first one leading away from `out`.
        std::deque<std::uint64_t> changes;
        std::uint64_t count_from = 0;     // a filter setting changed: counting restarts here
        std::uint64_t accept_at = never;  // tick at which `out` flips, or never
    };
    struct pin_state {
        bool active = false;            // after dead time
        std::uint64_t rise_at = never;  // tick at which a pending rise takes effect
        bool level = false;             // last level reported
    };

    // Tick index of the k-th counter step from now (k >= 1), given the prescaler state.
    std::uint64_t tick_of_step(std::uint64_t k) const;
    // Steps (>= 1) until the next step that matters, or never.
    std::uint64_t steps_to_next_interesting() const;
    // The next tick index that must be processed one by one, or never (cached: only processing a
    // tick, a write, a fault input or a clock change can move it; skipping boring ticks cannot).
    std::uint64_t next_interesting_tick() const;
    std::uint64_t compute_next_interesting_tick() const;
    // Time of the next interesting tick, cached with it.
    std::optional<time_ps> next_interesting_time() const;
    void invalidate() { cache_valid_ = false; }
    // Jump over boring ticks [next_tick_, n) with arithmetic.
    void skip_to(std::uint64_t n);
    // Process tick n (== next_tick_) exactly, at time `at`.
    void process_tick(std::uint64_t n, time_ps at);
    // Bring the state up to time t: every tick at or before t processed or skipped (advance_to only
    // processes the ticks that matter).
    void catch_up(time_ps t);

    // Counter arithmetic shared by steps and skipping.
    // One counter step per the mode table; false when nothing moves (center mode, period 0).
    bool step_counter(bool& wrapped, bool& slope_down);
    void on_wrap(time_ps at);
    void reload_event(bool from_wrap, time_ps at);
    void load_shadows();
    // Reference levels of the channels whose action follows the counter.
    void evaluate_levels();
    // A new action for channel i (a code the model defines).
    void set_action(unsigned i, std::uint32_t code);
    // Pin wants -> dead time -> pin levels of the channels in the mask `channels`; dead time counts
    // from `first_tick_after`, the first tick not yet processed.
    void update_pins(std::uint32_t channels, std::uint64_t first_tick_after, time_ps at);
    void set_flags(std::uint32_t bits, time_ps at);
    void update_irq(time_ps at);
    void trigger(time_ps at);
    void activate_fault(time_ps at);
    // The dead time in timer clock ticks: the dead_time count times its scale.
    std::uint64_t dead_ticks() const;
    void warn_dead_time_clipped(std::uint32_t written, time_ps at) const;
    std::optional<time_ps> time_of_tick(std::uint64_t n) const;

    // The input side.
    // Whether the timer clock's ticks are counting events now: enabled, counting the timer clock,
    // and not held by a closed gate.
    bool clock_counting() const;
    // Filter length of input i (samples).
    std::uint64_t filter_length(unsigned i) const;
    // The first sampling tick at or after tick `from`.
    std::uint64_t first_sample(std::uint64_t from) const;
    // Input i's next output flip from its pending changes (and whether it has one).
    void settle(unsigned i);
    // A filter setting changed: input i's count restarts from the first tick not yet processed.
    void restart_filter(unsigned i);
    // The filtered input a capture channel c takes edges from, or -1.
    int capture_source(unsigned c) const;
    // The input the trigger comes from (-1: the chained input or none).
    int trigger_input() const;
    // Whether the trigger is active now (a gate is open).
    bool trigger_active() const;
    // One encoder step, up or down, wrapping at the period both ways; false if nothing moved.
    void encoder_step(bool up, time_ps at);
    // Matches of a step that left the counter where it is, on the given slope.
    void raise_matches(bool slope_down, time_ps at);
    // The forced reload of a force_reload write or a restart trigger: flags and pulse at `at` when
    // `now`, else at the next tick.
    void forced_reload(bool now, time_ps at);
    // Counts a taken edge of channel c and captures when the prescaler says so.
    void take_capture_edge(unsigned c, time_ps at);
    void update_capture_mask();
    // Throws std::invalid_argument unless i is a pin input of this instance.
    void check_input(unsigned i) const;

    timer_config cfg_;
    const sim::clock_domain& clock_;
    timer_observer* observer_;
    std::uint32_t max_;

    // Registers.
    bool enable_ = false;
    count_mode mode_ = count_mode::up;
    match_slope slope_ = match_slope::both;
    bool one_pulse_ = false, period_preload_ = false;
    reload_policy policy_ = reload_policy::every;
    std::uint32_t prescaler_shadow_ = 0, prescaler_ = 0;
    std::uint32_t period_shadow_ = 0, period_ = 0;
    bool period_waiting_ = false;
    std::uint32_t wrap_skip_shadow_ = 0, wrap_skip_ = 0;
    std::uint32_t dead_time_ = 0;
    std::uint32_t dead_time_scale_ = 0;
    bool fault_enable_ = false;
    std::uint32_t fault_latency_ = 0;
    std::uint32_t flags_ = 0, irq_enable_ = 0, trigger_select_ = 0;
    std::array<channel, max_channels> ch_{};

    // Counting state after every tick before next_tick_.
    std::uint64_t next_tick_ = 0;
    std::uint32_t counter_ = 0;
    bool down_ = false;
    std::uint64_t pcount_ = 0;
    std::uint32_t skip_count_ = 0;

    // Fault.
    bool fault_input_ = false, fault_active_ = false;
    std::uint64_t fault_at_ = never;

    // Inputs: channel inputs 0..5, then the trigger pin.
    static constexpr unsigned pin_inputs = 7;
    std::array<input_state, pin_inputs> inputs_{};
    std::uint32_t pending_inputs_ = 0;  // bit i: input i has a flip scheduled
    std::uint32_t filter_divider_ = 0;
    std::uint32_t trigger_filter_ = 0;
    count_source count_source_ = count_source::timer_clock;
    trigger_action trigger_action_ = trigger_action::none;
    trigger_source trigger_source_ = trigger_source::channel_0_input;
    bool trigger_falling_ = false;
    std::deque<std::uint64_t> chained_ticks_;  // ticks at which chained pulses land, in order
    std::uint32_t capture_channels_ = 0;       // bit c: channel c captures

    std::array<pin_state, 2 * max_channels> pins_{};
    bool irq_ = false;
    std::uint32_t rise_channels_ = 0;  // bit c: a pin of channel c has a dead-time rise scheduled
    std::uint32_t all_channels_ = 0;   // bit c for every channel of the instance
    std::uint32_t pwm_channels_ = 0;   // bit c: channel c's action is a PWM action
    std::uint32_t pwm_above_channels_ = 0;    // bit c: ... and it is pwm_at_or_above
    std::uint32_t forced_low_channels_ = 0;   // bit c: channel c's action is force_low
    std::uint32_t forced_high_channels_ = 0;  // bit c: channel c's action is force_high
    std::uint32_t refs_ = 0;                  // reference levels: bit c is channel c's
    unsigned pending_compares_ = 0;           // compare writes waiting out the compare latency
    mutable bool cache_valid_ = false;
    mutable std::uint64_t cached_tick_ = never;
    mutable std::optional<time_ps> cached_time_;
    std::uint64_t ticks_processed_ = 0;
    std::string name_;

    // What register accesses since the last processed tick left to show at the next tick: outputs
    // and the interrupt line re-evaluated, flags to set, a trigger pulse to send.
    bool effects_pending_ = false;
    std::uint32_t pending_flags_ = 0;
    bool pending_trigger_ = false;
};

}  // namespace models
