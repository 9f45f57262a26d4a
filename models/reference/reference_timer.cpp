#include "models/reference/reference_timer.h"

#include <algorithm>
#include <stdexcept>
#include <string>

namespace models::reference {

namespace {

std::uint32_t mask_bits(std::uint32_t v, unsigned bits) {
    return bits >= 32 ? v : v & ((1u << bits) - 1);
}

// The action codes docs/timer-model.md lists; every other code is reserved and ignored.
bool action_code_listed(std::uint32_t code) {
    static constexpr std::uint32_t listed[] = {0x0, 0x4, 0x5, 0x8, 0x9, 0xa, 0xc, 0xd};
    return std::find(std::begin(listed), std::end(listed), code) != std::end(listed);
}

}  // namespace

reference_timer::reference_timer(const timer_config& cfg, const sim::clock_domain& timer_clock,
                                 timer_observer* observer)
    : cfg_(cfg), clock_(timer_clock), observer_(observer), max_(cfg.counter_max()) {
    cfg_.validate();
    // Reset values: period = max, slope = both; everything else 0.
    period_written_ = period_ = max_;
    // With the reference level 0 the complementary output wants 1, and has wanted it since reset.
    for (channel_state& c : channels_) {
        c.comp_out.want = true;
        c.comp_out.active = true;
    }
}

reference_timer::channel_state& reference_timer::channel_at(unsigned c) {
    if (c >= cfg_.channels)
        throw std::out_of_range("reference_timer: channel " + std::to_string(c) + " of " +
                                std::to_string(cfg_.channels));
    return channels_[c];
}

const reference_timer::channel_state& reference_timer::channel_at(unsigned c) const {
    if (c >= cfg_.channels)
        throw std::out_of_range("reference_timer: channel " + std::to_string(c) + " of " +
                                std::to_string(cfg_.channels));
    return channels_[c];
}

std::uint32_t reference_timer::valid_flag_bits() const {
    std::uint32_t bits = flag_reload | flag_trigger;
    for (unsigned c = 0; c < cfg_.channels; ++c) bits |= flag_channel(c) | flag_overcapture(c);
    if (cfg_.complementary) bits |= flag_fault;
    return bits;
}

unsigned reference_timer::filter_length_of(unsigned input) const {
    const std::uint32_t index =
        input == trigger_pin_input ? trigger_filter_ : channels_[input].input_filter;
    return cfg_.filter_lengths[index];
}

void reference_timer::check_pin_input(unsigned input, const char* call) const {
    if ((input < cfg_.channels) || input == trigger_pin_input) return;
    std::string accepted = "the channel inputs 0";
    if (cfg_.channels > 1) accepted += " to " + std::to_string(cfg_.channels - 1);
    accepted += " and the trigger pin " + std::to_string(trigger_pin_input);
    if (input == fault_input) accepted += " (the fault input changes by set_fault_input)";
    throw std::invalid_argument(std::string("reference_timer: ") + call + " of input " +
                                std::to_string(input) +
                                ", which this timer lacks; accepted: " + accepted);
}

// ---- time ----

void reference_timer::advance_to(time_ps t) {
    for (;;) {
        const auto edge = started_ ? clock_.edge_after(last_tick_at_) : clock_.edge_at_or_after(0);
        if (!edge || edge->at > t) return;
        started_ = true;
        last_tick_at_ = edge->at;
        tick(*edge);
    }
}

bool reference_timer::next_event(time_ps& at) const {
    const auto edge = started_ ? clock_.edge_after(last_tick_at_) : clock_.edge_at_or_after(0);
    if (!edge) return false;
    at = edge->at;
    return true;
}

void reference_timer::clock_changed(time_ps) {}

// ---- one timer clock tick ----

void reference_timer::tick(const sim::clock_edge& edge) {
    const time_ps at = edge.at;
    ++ticks_;
    // 0. What register accesses since the last tick asked for: the flag and trigger pulse of a
    // forced reload.
    if (access_flags_ != 0) {
        set_flags(access_flags_, at);
        access_flags_ = 0;
    }
    if (access_trigger_) {
        access_trigger_ = false;
        send_trigger(at);
    }
    // 1. Compare latency: delayed compare values reaching their tick become active.
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        for (pending_compare& p : c.pending) --p.ticks_left;
        while (!c.pending.empty() && c.pending.front().ticks_left == 0) {
            c.compare = c.pending.front().value;
            c.pending.pop_front();
        }
    }
    // 2. Fault latency: the fault acts at the first tick after the input rose, or fault_latency
    // ticks later.
    if (fault_pending_) {
        if (fault_ticks_left_ == 0) {
            fault_pending_ = false;
            activate_fault(at);
        } else {
            --fault_ticks_left_;
        }
    }
    // 3. Inputs: every synchroniser samples; at a sampling tick (index a multiple of the divider)
    // every filter updates. This gives the tick's filtered edges.
    const bool sampling_tick = edge.tick % (std::uint64_t{1} << filter_divider_) == 0;
    for (unsigned i = 0; i < pin_inputs; ++i)
        update_input(inputs_[i], filter_length_of(i), sampling_tick);
    // 4. Trigger: the accepted trigger of this tick and whether the trigger is active. Chained
    // pulses travel whatever the trigger source; one that lands while another source is chosen is
    // lost.
    bool chained_lands = false;
    while (!chained_pending_.empty() && chained_pending_.front() == 0) {
        chained_pending_.pop_front();
        chained_lands = true;
    }
    for (std::uint32_t& left : chained_pending_) --left;
    bool accepted = false;
    bool active = false;
    if (trigger_source_ == models::trigger_source::chained) {
        accepted = chained_lands;  // the chained input has no level: never active
    } else {
        unsigned source = trigger_pin_input;
        if (trigger_source_ == models::trigger_source::channel_0_input)
            source = input_of_channel(0);
        if (trigger_source_ == models::trigger_source::channel_1_input)
            source = input_of_channel(1);
        const input_state& in = inputs_[source];
        accepted = trigger_falling_ ? in.fell : in.rose;
        active = in.filtered != trigger_falling_;
    }
    if (accepted) set_flags(flag_trigger, at);
    // 5. Prescaler, at a counting event; in the encoder sources each filtered encoder edge is a
    // step (A first), and steps 6 to 9 run once per step.
    switch (count_source_) {
        case models::count_source::timer_clock:
        case models::count_source::trigger_edges: {
            bool event = enable_;
            if (count_source_ == models::count_source::trigger_edges) event = event && accepted;
            if (trigger_action_ == models::trigger_action::gate &&
                count_source_ == models::count_source::timer_clock)
                event = event && active;
            if (!event) break;
            const std::uint64_t factor = std::uint64_t{prescaler_} + 1;
            if (pcount_ + 1 >= factor) {
                pcount_ = 0;
                run_step(at, false, false);  // 6. to 9.
            } else {
                pcount_ += 1;
            }
            break;
        }
        case models::count_source::encoder_x2:
        case models::count_source::encoder_x4: {
            if (!enable_) break;
            const input_state& a = inputs_[input_of_channel(0)];
            const input_state& b = inputs_[input_of_channel(1)];
            const bool b_edge = b.rose || b.fell;
            const bool b_before = b_edge ? !b.filtered : b.filtered;
            const bool a_edge = a.rose || a.fell;
            const bool b_steps = count_source_ == models::count_source::encoder_x4 && b_edge;
            // A's edge: up if A differs from B (before this tick's B edge) after it.
            if (a_edge) run_step(at, true, a.filtered != b_before);  // 6. to 9.
            // B's edge: up if A equals B after it.
            if (b_steps) run_step(at, true, a.filtered == b.filtered);  // 6. to 9.
            break;
        }
    }
    // 10. Captures: each capture channel counts its source's taken edges and captures at every
    // 2^capture_prescaler-th, the counter being the one after this tick's steps.
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        if (c.role == models::channel_role::compare) continue;
        const input_state& src =
            inputs_[c.role == models::channel_role::capture_own ? i : (i ^ 1u)];
        bool taken = false;
        switch (c.edge) {
            case models::capture_edge::rising:
                taken = src.rose;
                break;
            case models::capture_edge::falling:
                taken = src.fell;
                break;
            case models::capture_edge::both:
                taken = src.rose || src.fell;
                break;
        }
        if (!taken) continue;
        c.capture_count += 1;
        if (c.capture_count < (1u << c.capture_prescaler)) continue;
        c.capture_count = 0;
        capture(i, at);
    }
    // 11. Trigger action, after this tick's captures.
    if (accepted) {
        if (trigger_action_ == models::trigger_action::restart) {
            const reload_outputs sent = forced_reload();
            set_flags(sent.flags, at);
            if (sent.trigger) send_trigger(at);
        } else if (trigger_action_ == models::trigger_action::start) {
            enable_ = true;  // counting from the next tick
        }
    }
    // 12. Levels.
    evaluate_levels();
    // 13. Pins, and the interrupt line.
    update_outputs(at);
    update_irq(at);
}

void reference_timer::update_input(input_state& in, unsigned filter_length, bool sampling_tick) {
    in.rose = false;
    in.fell = false;
    // The synchroniser: the sample of this tick enters, the one taken S - 1 ticks ago leaves.
    for (unsigned s = cfg_.input_sync_ticks - 1; s > 0; --s) in.stages[s] = in.stages[s - 1];
    in.stages[0] = in.level;
    const bool synchronised = in.stages[cfg_.input_sync_ticks - 1];
    if (!sampling_tick) return;
    if (synchronised == in.filtered) {
        in.filter_count = 0;
        return;
    }
    in.filter_count += 1;
    if (in.filter_count < filter_length) return;
    in.filter_count = 0;
    in.filtered = synchronised;
    in.rose = synchronised;
    in.fell = !synchronised;
}

void reference_timer::run_step(time_ps at, bool encoder, bool up) {
    // 6. Counter step.
    bool stepped = true;
    bool wrapped = false;
    bool slope_down = !up;
    if (encoder)
        encoder_step(up, wrapped);
    else
        step_counter(stepped, wrapped, slope_down);
    if (!stepped) return;
    // 7. Wrap -> reload event (8. inside reload_event_from_wrap).
    if (wrapped) {
        ++wraps_;
        if (policy_ != reload_policy::held) {
            if (skip_count_ == 0) {
                reload_event_from_wrap(at);
                skip_count_ = wrap_skip_;
            } else {
                skip_count_ -= 1;
            }
        }
    }
    // 9. Matches, of compare channels only.
    bool slope_allowed = true;
    if (mode_ == count_mode::center) {
        slope_allowed = slope_ == match_slope::both || (slope_ == match_slope::up && !slope_down) ||
                        (slope_ == match_slope::down && slope_down);
    }
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        if (c.role != models::channel_role::compare) continue;
        if (!slope_allowed || counter_ != c.compare) continue;
        set_flags(flag_channel(i), at);
        switch (c.action) {
            case output_action::set_on_match:
                c.ref = true;
                break;
            case output_action::clear_on_match:
                c.ref = false;
                break;
            case output_action::toggle_on_match:
                c.ref = !c.ref;
                break;
            default:
                break;
        }
        if (trigger_select_ == trigger_on_match(i)) send_trigger(at);
    }
}

void reference_timer::encoder_step(bool up, bool& wrapped) {
    down_ = !up;  // direction reads the direction of the last encoder step
    if (up) {
        if (counter_ == period_ || counter_ == max_) {
            counter_ = 0;
            wrapped = true;
        } else {
            counter_ += 1;
        }
    } else {
        if (counter_ == 0) {
            counter_ = period_;
            wrapped = true;
        } else {
            counter_ -= 1;
        }
    }
}

void reference_timer::step_counter(bool& stepped, bool& wrapped, bool& slope_down) {
    switch (mode_) {
        case count_mode::up:
            slope_down = false;
            if (counter_ == period_ || counter_ == max_) {
                counter_ = 0;
                wrapped = true;
            } else {
                counter_ += 1;
            }
            break;
        case count_mode::down:
            slope_down = true;
            if (counter_ == 0) {
                counter_ = period_;
                wrapped = true;
            } else {
                counter_ -= 1;
            }
            break;
        case count_mode::center:
            slope_down = down_;
            if (period_ == 0) {
                stepped = false;  // nothing moves
                return;
            }
            if (!down_) {
                if (counter_ >= period_) {
                    // Only after a write: turn at once, the counter keeps its value.
                    down_ = true;
                    wrapped = true;
                } else {
                    counter_ += 1;
                    if (counter_ == period_) {
                        down_ = true;
                        wrapped = true;
                    }
                }
            } else {
                if (counter_ == 0) {
                    // Only after a write: turn at once, the counter stays 0.
                    down_ = false;
                    wrapped = true;
                } else {
                    counter_ -= 1;
                    if (counter_ == 0) {
                        down_ = false;
                        wrapped = true;
                    }
                }
            }
            break;
    }
}

void reference_timer::load_shadows() {
    // Values written while their preload was on wait here, even if preload was turned off since.
    if (period_waiting_) period_ = period_written_;
    period_waiting_ = false;
    if (cfg_.prescaler_shadowed) prescaler_ = prescaler_written_;
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        if (c.waiting) c.compare = c.compare_written;
        c.waiting = false;
    }
    wrap_skip_ = wrap_skip_written_;
}

void reference_timer::reload_event_from_wrap(time_ps at) {
    ++reload_events_;
    load_shadows();
    set_flags(flag_reload, at);
    if (trigger_select_ == trigger_on_reload) send_trigger(at);
    if (one_pulse_) enable_ = false;
}

reference_timer::reload_outputs reference_timer::forced_reload() {
    ++reload_events_;
    if (policy_ != reload_policy::held) load_shadows();
    counter_ = mode_ == count_mode::down ? period_ : 0;
    if (mode_ == count_mode::center) down_ = false;
    pcount_ = 0;
    skip_count_ = wrap_skip_;
    reload_outputs sent;
    if (policy_ == reload_policy::every) sent.flags = flag_reload;
    sent.trigger = trigger_select_ == trigger_on_reload;
    return sent;
}

void reference_timer::capture(unsigned i, time_ps at) {
    channel_state& c = channels_[i];
    // The captured value is the register: what a read gives and, should the channel become a
    // compare channel again, its active value. Nothing written earlier may still land on it.
    c.compare_written = c.compare = counter_;
    c.waiting = false;
    c.pending.clear();
    const bool already = (flags_ & flag_channel(i)) != 0;
    set_flags(flag_channel(i) | (already ? flag_overcapture(i) : 0u), at);
}

// ---- levels and pins ----

bool reference_timer::below(const channel_state& c) const {
    if (mode_ == count_mode::center && down_) return counter_ <= c.compare;
    return counter_ < c.compare;
}

void reference_timer::evaluate_levels() {
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        if (c.role != models::channel_role::compare) continue;  // a capture channel's level holds
        switch (c.action) {
            case output_action::pwm_below:
                c.ref = below(c);
                break;
            case output_action::pwm_at_or_above:
                c.ref = !below(c);
                break;
            case output_action::force_low:
                c.ref = false;
                break;
            case output_action::force_high:
                c.ref = true;
                break;
            default:
                break;  // none and the match actions keep the level last set
        }
    }
}

void reference_timer::update_output(output_state& o, bool want) {
    if (!want) {
        // A falling want takes effect at once and cancels a pending rise.
        o.active = false;
        o.rise_pending = false;
    } else if (!o.want) {
        // A rising want takes effect at the (dead_time x scale)-th tick after now.
        const std::uint64_t ticks = std::uint64_t{dead_time_} << dead_time_scale_;
        if (ticks == 0) {
            o.active = true;
        } else {
            o.rise_pending = true;
            o.rise_ticks_left = ticks;
        }
    } else if (o.rise_pending) {
        o.rise_ticks_left -= 1;
        if (o.rise_ticks_left == 0) {
            o.rise_pending = false;
            o.active = true;
        }
    }
    o.want = want;
}

void reference_timer::update_outputs(time_ps at) {
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        channel_state& c = channels_[i];
        bool main_level = false;
        bool comp_level = false;
        if (cfg_.complementary) {
            update_output(c.main_out, c.ref);
            update_output(c.comp_out, !c.ref);
            if (fault_active_) {
                main_level = c.main_safe_level;
                comp_level = c.comp_safe_level;
            } else {
                main_level =
                    c.main_enable ? (c.main_out.active != c.main_active_low) : c.main_active_low;
                comp_level =
                    c.comp_enable ? (c.comp_out.active != c.comp_active_low) : c.comp_active_low;
            }
        } else {
            main_level = c.main_enable ? (c.ref != c.main_active_low) : c.main_active_low;
            comp_level = c.comp_active_low;
        }
        const bool levels[2] = {main_level, comp_level};
        const unsigned pins[2] = {main_pin(i), comp_pin(i)};
        for (int k = 0; k < 2; ++k) {
            if (pins_[pins[k]] == levels[k]) continue;
            pins_[pins[k]] = levels[k];
            if (observer_) observer_->on_pin(pins[k], levels[k], at);
        }
    }
}

// ---- flags, interrupt line, trigger, fault ----

void reference_timer::set_flags(std::uint32_t bits, time_ps at) {
    const std::uint32_t rising = bits & ~flags_;
    if (rising == 0) return;
    flags_ |= rising;
    if (observer_) observer_->on_flags_set(rising, at);
}

void reference_timer::update_irq(time_ps at) {
    const bool line = (flags_ & irq_enable_) != 0;
    if (line == irq_) return;
    irq_ = line;
    if (observer_) observer_->on_irq(line, at);
}

void reference_timer::send_trigger(time_ps at) {
    if (observer_) observer_->on_trigger(at);
}

void reference_timer::activate_fault(time_ps at) {
    fault_active_ = true;
    set_flags(flag_fault, at);
}

// ---- register accesses ----

void reference_timer::write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) {
    advance_to(t);
    // A per-channel field of a channel the instance lacks: ignored.
    if (is_channel_field(f) && channel >= cfg_.channels) return;
    const bool bit = (value & 1u) != 0;
    switch (f) {
        case timer_field::enable:
            enable_ = bit;
            break;
        case timer_field::mode:
            if (value > 2) break;  // not a mode: ignored
            // Up and down modes set the direction at every write; center mode only on entering.
            if (static_cast<count_mode>(value) != count_mode::center || mode_ != count_mode::center)
                down_ = static_cast<count_mode>(value) == count_mode::down;
            mode_ = static_cast<count_mode>(value);
            break;
        case timer_field::slope:
            if (value <= 2) slope_ = static_cast<match_slope>(value);
            break;
        case timer_field::one_pulse:
            one_pulse_ = bit;
            break;
        case timer_field::period_preload:
            period_preload_ = bit;
            break;
        case timer_field::reload_policy:
            // 0 every, 1 quiet_forced, 2 held; 3 and above are reserved and ignored.
            if (value <= 2) policy_ = static_cast<reload_policy>(value);
            break;
        case timer_field::force_reload:
            if (bit) {
                // The flag and the trigger pulse show at the next tick, like every effect of an
                // access.
                const reload_outputs sent = forced_reload();
                access_flags_ |= sent.flags;
                access_trigger_ = access_trigger_ || sent.trigger;
            }
            break;
        case timer_field::prescaler:
            prescaler_written_ = mask_bits(value, cfg_.prescaler_bits);
            if (!cfg_.prescaler_shadowed) prescaler_ = prescaler_written_;
            break;
        case timer_field::period:
            period_written_ = value & max_;
            period_waiting_ = period_preload_;
            if (!period_preload_) period_ = period_written_;
            break;
        case timer_field::counter:
            counter_ = value & max_;
            break;
        case timer_field::wrap_skip:
            if (cfg_.wrap_skip_bits > 0) wrap_skip_written_ = mask_bits(value, cfg_.wrap_skip_bits);
            break;
        case timer_field::direction:
            break;  // read-only
        case timer_field::dead_time:
            dead_time_ = std::min(value, cfg_.dead_time_max);
            break;
        case timer_field::dead_time_scale:
            if (cfg_.dead_time_scaled) dead_time_scale_ = value & 3u;
            break;
        case timer_field::fault_enable:
            fault_enable_ = bit;
            break;
        case timer_field::fault_latency:
            fault_latency_ = value;
            break;
        case timer_field::rearm:
            if (bit && fault_active_ && !fault_input_) fault_active_ = false;
            break;
        case timer_field::flags:
            break;  // not data: a layout maps flag writes to clear_flags
        case timer_field::irq_enable:
            irq_enable_ = value & valid_flag_bits();
            break;
        case timer_field::trigger_select:
            // 0 none, 1 + c a channel the instance has, 7 the reload event; others ignored.
            if (value == 0 || value == 7 || (value >= 1 && value <= cfg_.channels))
                trigger_select_ = value;
            break;
        case timer_field::compare: {
            channel_state& c = channel_at(channel);
            if (c.role != models::channel_role::compare) break;  // a capture channel's: ignored
            c.compare_written = value & max_;
            c.waiting = c.compare_preload;
            if (!c.compare_preload) {
                if (cfg_.compare_latency == 0)
                    c.compare = c.compare_written;
                else  // the first compare_latency ticks after the write still use the old value
                    c.pending.push_back(
                        pending_compare{c.compare_written, cfg_.compare_latency + 1});
            }
            break;
        }
        case timer_field::compare_preload:
            channel_at(channel).compare_preload = bit;
            break;
        case timer_field::action:
            if (action_code_listed(value))
                channel_at(channel).action = static_cast<output_action>(value);
            break;
        case timer_field::main_enable:
            channel_at(channel).main_enable = bit;
            break;
        case timer_field::main_active_low:
            channel_at(channel).main_active_low = bit;
            break;
        case timer_field::comp_enable:
            channel_at(channel).comp_enable = bit;
            break;
        case timer_field::comp_active_low:
            channel_at(channel).comp_active_low = bit;
            break;
        case timer_field::main_safe_level:
            channel_at(channel).main_safe_level = bit;
            break;
        case timer_field::comp_safe_level:
            channel_at(channel).comp_safe_level = bit;
            break;
        case timer_field::filter_divider:
            if (value > 3) break;  // dividers 1, 2, 4, 8 only: ignored
            filter_divider_ = value;
            for (input_state& in : inputs_) in.filter_count = 0;
            break;
        case timer_field::count_source: {
            if (value > 3) break;  // not a counting source: ignored
            const auto source = static_cast<models::count_source>(value);
            const auto is_encoder = [](models::count_source s) {
                return s == models::count_source::encoder_x2 ||
                       s == models::count_source::encoder_x4;
            };
            // Leaving the encoder: the direction is the mode's again.
            if (is_encoder(count_source_) && !is_encoder(source)) down_ = mode_ == count_mode::down;
            count_source_ = source;
            break;
        }
        case timer_field::trigger_action:
            if (value <= 3) trigger_action_ = static_cast<models::trigger_action>(value);
            break;
        case timer_field::trigger_source:
            if (value <= 3) trigger_source_ = static_cast<models::trigger_source>(value);
            break;
        case timer_field::trigger_edge:
            if (value <= 1) trigger_falling_ = value == 1;
            break;
        case timer_field::trigger_filter:
            if (value >= cfg_.filter_lengths.size()) break;  // no such filter length: ignored
            trigger_filter_ = value;
            inputs_[trigger_pin_input].filter_count = 0;
            break;
        case timer_field::channel_role: {
            if (value > 2) break;  // not a role: ignored
            channel_state& c = channel_at(channel);
            c.role = static_cast<models::channel_role>(value);
            c.capture_count = 0;
            break;
        }
        case timer_field::capture_edge: {
            if (value > 2) break;  // not an edge kind: ignored
            channel_state& c = channel_at(channel);
            c.edge = static_cast<models::capture_edge>(value);
            c.capture_count = 0;
            break;
        }
        case timer_field::capture_prescaler: {
            if (value > 3) break;  // every 1st, 2nd, 4th or 8th edge only: ignored
            channel_state& c = channel_at(channel);
            c.capture_prescaler = value;
            c.capture_count = 0;
            break;
        }
        case timer_field::input_filter:
            if (value >= cfg_.filter_lengths.size()) break;  // no such filter length: ignored
            channel_at(channel).input_filter = value;
            inputs_[input_of_channel(channel)].filter_count = 0;
            break;
    }
}

std::uint32_t reference_timer::read(timer_field f, unsigned channel, time_ps t) {
    advance_to(t);
    // A per-channel field of a channel the instance lacks reads 0.
    if (is_channel_field(f) && channel >= cfg_.channels) return 0;
    switch (f) {
        case timer_field::enable:
            return enable_;
        case timer_field::mode:
            return static_cast<std::uint32_t>(mode_);
        case timer_field::slope:
            return static_cast<std::uint32_t>(slope_);
        case timer_field::one_pulse:
            return one_pulse_;
        case timer_field::period_preload:
            return period_preload_;
        case timer_field::reload_policy:
            return static_cast<std::uint32_t>(policy_);
        case timer_field::force_reload:
            return 0;
        case timer_field::prescaler:
            return prescaler_written_;
        case timer_field::period:
            return period_written_;
        case timer_field::counter:
            return counter_;
        case timer_field::wrap_skip:
            return wrap_skip_written_;
        case timer_field::direction:
            return down_ ? 1 : 0;
        case timer_field::dead_time:
            return dead_time_;
        case timer_field::dead_time_scale:
            return dead_time_scale_;
        case timer_field::fault_enable:
            return fault_enable_;
        case timer_field::fault_latency:
            return fault_latency_;
        case timer_field::rearm:
            return 0;
        case timer_field::flags:
            return flags_;
        case timer_field::irq_enable:
            return irq_enable_;
        case timer_field::trigger_select:
            return trigger_select_;
        case timer_field::compare: {
            const channel_state& c = channel_at(channel);
            // Reading a captured value clears the capture flag (the line follows at the next tick).
            if (c.role != models::channel_role::compare && cfg_.capture_read_clears_flag)
                flags_ &= ~flag_channel(channel);
            return c.compare_written;
        }
        case timer_field::compare_preload:
            return channel_at(channel).compare_preload;
        case timer_field::action:
            return static_cast<std::uint32_t>(channel_at(channel).action);
        case timer_field::main_enable:
            return channel_at(channel).main_enable;
        case timer_field::main_active_low:
            return channel_at(channel).main_active_low;
        case timer_field::comp_enable:
            return channel_at(channel).comp_enable;
        case timer_field::comp_active_low:
            return channel_at(channel).comp_active_low;
        case timer_field::main_safe_level:
            return channel_at(channel).main_safe_level;
        case timer_field::comp_safe_level:
            return channel_at(channel).comp_safe_level;
        case timer_field::filter_divider:
            return filter_divider_;
        case timer_field::count_source:
            return static_cast<std::uint32_t>(count_source_);
        case timer_field::trigger_action:
            return static_cast<std::uint32_t>(trigger_action_);
        case timer_field::trigger_source:
            return static_cast<std::uint32_t>(trigger_source_);
        case timer_field::trigger_edge:
            return trigger_falling_ ? 1 : 0;
        case timer_field::trigger_filter:
            return trigger_filter_;
        case timer_field::channel_role:
            return static_cast<std::uint32_t>(channel_at(channel).role);
        case timer_field::capture_edge:
            return static_cast<std::uint32_t>(channel_at(channel).edge);
        case timer_field::capture_prescaler:
            return channel_at(channel).capture_prescaler;
        case timer_field::input_filter:
            return channel_at(channel).input_filter;
    }
    return 0;
}

void reference_timer::clear_flags(std::uint32_t mask, time_ps t) {
    advance_to(t);
    flags_ &= ~mask;  // the interrupt line follows at the next tick
}

void reference_timer::set_fault_input(bool level, time_ps t) {
    advance_to(t);
    const bool rose = level && !fault_input_;
    fault_input_ = level;
    if (cfg_.complementary && rose && fault_enable_ && !fault_pending_ && !fault_active_) {
        fault_pending_ = true;
        fault_ticks_left_ = fault_latency_;
    }
}

void reference_timer::set_input(unsigned input, bool level, time_ps t) {
    check_pin_input(input, "set_input");
    advance_to(t);
    inputs_[input].level = level;  // sampled from the next tick on
}

void reference_timer::set_initial_input(unsigned input, bool level) {
    if (input != fault_input) check_pin_input(input, "set_initial_input");
    if (started_)
        throw std::logic_error("reference_timer: set_initial_input of input " +
                               std::to_string(input) +
                               " after the first timer clock tick; it gives the level held since "
                               "before time 0, so call it before anything else");
    if (input == fault_input) {
        fault_input_ = level;  // held since before time 0: no rise, so no fault
        return;
    }
    input_state& in = inputs_[input];
    in.level = in.filtered = level;
    in.stages.fill(level);
}

void reference_timer::chained_pulse(time_ps t) {
    advance_to(t);
    // An accepted trigger at tick n + chain latency, n being the first tick after t.
    chained_pending_.push_back(cfg_.chain_latency);
}

}  // namespace models::reference
