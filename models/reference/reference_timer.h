#pragma once
// The tick-exact reference timer: the test oracle for the fast timer model.
//
// This model implements docs/timer-model.md the slow and obvious way (docs/architecture.md, "The
// reference model as oracle"): it keeps every register and every piece of internal state, and
// advance_to() walks the timer clock one tick at a time, doing the numbered per-tick steps of the
// specification in their written order; on the input side every synchroniser stage, filter count
// and capture count is kept and moved at every tick. There is no cleverness here on purpose: when
// the fast model and this one disagree, this one should be the easier to believe. It is slow; it
// is never linked into the product.

#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"

#include <array>
#include <cstdint>
#include <deque>

namespace models::reference {

class reference_timer final : public models::timer_core_if {
public:
    // A timer of the given configuration counting the edges of `timer_clock`, reporting to
    // `observer`
    // (may be null). The domain must outlive the timer. Throws std::invalid_argument on a bad
    // config.
    reference_timer(const timer_config& cfg, const sim::clock_domain& timer_clock,
                    timer_observer* observer);

    void advance_to(time_ps t) override;
    void write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) override;
    std::uint32_t read(timer_field f, unsigned channel, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    void set_fault_input(bool level, time_ps t) override;
    void set_input(unsigned input, bool level, time_ps t) override;
    void set_initial_input(unsigned input, bool level) override;
    void chained_pulse(time_ps t) override;
    // The next timer clock tick (the reference has work at every tick), or false while the clock
    // stays stopped.
    bool next_event(time_ps& at) const override;
    // Nothing to do: the next tick is always asked of the domain.
    void clock_changed(time_ps t) override;

    // Report to another observer from now on (null: report nothing). Lets a test probe a copy.
    void set_observer(timer_observer* observer) { observer_ = observer; }
    const timer_config& config() const { return cfg_; }
    // Current level of output pin p (main_pin(c) / comp_pin(c)).
    bool pin(unsigned p) const { return pins_.at(p); }
    // Current level of the interrupt request line.
    bool irq() const { return irq_; }
    // Timer clock ticks processed so far.
    std::uint64_t ticks() const { return ticks_; }
    // Counter wraps so far (whether or not they caused a reload event).
    std::uint64_t wraps() const { return wraps_; }
    // Reload events so far, from wraps and forced.
    std::uint64_t reload_events() const { return reload_events_; }

private:
    static constexpr unsigned max_channels = 6;
    // Input pins with a synchroniser and a filter: the channels' inputs, then the trigger pin.
    static constexpr unsigned pin_inputs = trigger_pin_input + 1;
    static constexpr unsigned max_sync_ticks = 3;

    // A compare value written without preload, waiting out the compare latency.
    struct pending_compare {
        std::uint32_t value = 0;
        unsigned ticks_left = 0;
    };
    // One output (main or complementary) between the reference level and the pin: dead time.
    struct output_state {
        bool want = false;    // what the reference level asks for
        bool active = false;  // after dead time
        bool rise_pending = false;
        std::uint64_t rise_ticks_left = 0;
    };
    // One input pin from its level to its filtered level (docs/timer-model.md, "Inputs").
    struct input_state {
        bool level = false;                         // the pin now
        std::array<bool, max_sync_ticks> stages{};  // synchroniser: stages[0] the newest sample
        bool filtered = false;                      // the filter's output
        unsigned filter_count = 0;
        bool rose = false, fell = false;  // a filtered edge at the tick being processed
    };
    struct channel_state {
        std::uint32_t compare_written = 0;  // last written value (the shadow when preloaded)
        bool waiting = false;               // written with preload on, not yet loaded
        std::uint32_t compare = 0;          // active value
        std::deque<pending_compare> pending;
        bool compare_preload = false;
        output_action action = output_action::hold;
        bool main_enable = false, main_active_low = false;
        bool comp_enable = false, comp_active_low = false;
        bool main_safe_level = false, comp_safe_level = false;
        bool ref = false;  // reference level
        output_state main_out, comp_out;
        models::channel_role role = models::channel_role::compare;
        models::capture_edge edge = models::capture_edge::rising;
        std::uint32_t capture_prescaler = 0;  // capture every 2^capture_prescaler taken edges
        std::uint32_t capture_count = 0;
        std::uint32_t input_filter = 0;  // index into the instance's filter lengths
    };
    // What the forced reload of a write or of a restart sends: the reload flag and a trigger pulse.
    struct reload_outputs {
        std::uint32_t flags = 0;
        bool trigger = false;
    };

    // One timer clock tick: the numbered steps of the specification, in order.
    void tick(const sim::clock_edge& edge);
    // Step 3 for one input: the synchroniser's sample and, at a sampling tick, the filter.
    void update_input(input_state& in, unsigned filter_length, bool sampling_tick);
    // Steps 6 to 9 for one counter step: of the mode, or (encoder) up or down as `up` says.
    void run_step(time_ps at, bool encoder, bool up);
    // Step 6 by mode: move the counter by one step; clears `stepped` if nothing moved.
    void step_counter(bool& stepped, bool& wrapped, bool& slope_down);
    // Step 6 for an encoder step: up or down, wrapping at the period both ways.
    void encoder_step(bool up, bool& wrapped);
    // Step 8 for a reload event caused by a wrap.
    void reload_event_from_wrap(time_ps at);
    // Shadow registers to active ones.
    void load_shadows();
    // The forced reload event of a force_reload write or a restart; returns what it sends.
    reload_outputs forced_reload();
    // Step 10 for channel i: its compare takes the counter; its flag (and over-capture) sets.
    void capture(unsigned i, time_ps at);
    // The pwm_below comparison for channel c, in the current mode and direction.
    bool below(const channel_state& c) const;
    // Step 12: reference levels for the continuous actions.
    void evaluate_levels();
    // Step 13: wants, dead time, pins; pending rises count down one tick.
    void update_outputs(time_ps at);
    void update_output(output_state& o, bool want);
    void set_flags(std::uint32_t bits, time_ps at);
    void update_irq(time_ps at);
    void send_trigger(time_ps at);
    void activate_fault(time_ps at);
    channel_state& channel_at(unsigned c);
    const channel_state& channel_at(unsigned c) const;
    std::uint32_t valid_flag_bits() const;
    // The filter length an input's filter field chooses.
    unsigned filter_length_of(unsigned input) const;
    // Throws std::invalid_argument unless `input` is an input pin this instance has.
    void check_pin_input(unsigned input, const char* call) const;

    timer_config cfg_;
    const sim::clock_domain& clock_;
    timer_observer* observer_;
    std::uint32_t max_;

    // Registers (the written values; shadowed ones beside their active values).
    bool enable_ = false;
    count_mode mode_ = count_mode::up;
    match_slope slope_ = match_slope::both;
    bool one_pulse_ = false;
    bool period_preload_ = false;
    reload_policy policy_ = reload_policy::every;
    std::uint32_t prescaler_written_ = 0, prescaler_ = 0;
    std::uint32_t period_written_ = 0, period_ = 0;
    bool period_waiting_ = false;  // written with preload on, not yet loaded
    std::uint32_t wrap_skip_written_ = 0, wrap_skip_ = 0;
    std::uint32_t dead_time_ = 0;
    std::uint32_t dead_time_scale_ = 0;
    bool fault_enable_ = false;
    std::uint32_t fault_latency_ = 0;
    std::uint32_t flags_ = 0;
    std::uint32_t irq_enable_ = 0;
    std::uint32_t trigger_select_ = 0;
    std::array<channel_state, max_channels> channels_{};
    std::uint32_t filter_divider_ = 0;  // sampling ticks: every 2^filter_divider-th tick
    models::count_source count_source_ = models::count_source::timer_clock;
    models::trigger_action trigger_action_ = models::trigger_action::none;
    models::trigger_source trigger_source_ = models::trigger_source::channel_0_input;
    bool trigger_falling_ = false;      // trigger_edge 1: falling edges, active while low
    std::uint32_t trigger_filter_ = 0;  // the trigger pin's filter: index into the filter lengths

    // Counting state.
    std::uint64_t pcount_ = 0;
    std::uint32_t counter_ = 0;
    bool down_ = false;  // direction
    std::uint32_t skip_count_ = 0;

    // Fault state.
    bool fault_input_ = false;
    bool fault_pending_ = false;
    std::uint32_t fault_ticks_left_ = 0;
    bool fault_active_ = false;

    // Input state. An input of a channel the instance lacks stays low: it has no pin.
    std::array<input_state, pin_inputs> inputs_{};
    // Chained pulses on their way: ticks left before each is an accepted trigger, oldest first.
    std::deque<std::uint32_t> chained_pending_;

    // What has been reported.
    std::array<bool, 2 * max_channels> pins_{};
    bool irq_ = false;

    // Where the walk over the timer clock ticks stands.
    bool started_ = false;      // false until the first tick has been processed
    time_ps last_tick_at_ = 0;  // time of the last processed tick

    std::uint64_t ticks_ = 0, wraps_ = 0, reload_events_ = 0;

    // What register accesses since the last tick left to show at the next one.
    std::uint32_t access_flags_ = 0;
    bool access_trigger_ = false;
};

}  // namespace models::reference
