#include "models/timer/timer_core.h"

#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>

#include <algorithm>
#include <stdexcept>

namespace models {

namespace {

// Timer diagnostics (a clipped write...) go to the spdlog logger "timer".
std::shared_ptr<spdlog::logger> timer_logger() {
    if (auto l = spdlog::get("timer")) return l;
    try {
        return spdlog::stderr_color_mt("timer");
    } catch (const spdlog::spdlog_ex&) {
        return spdlog::get("timer");  // registered meanwhile by someone else
    }
}

}  // namespace

timer_core::timer_core(const timer_config& cfg, const sim::clock_domain& timer_clock,
                       timer_observer* observer, std::string name)
    : cfg_(cfg), clock_(timer_clock), observer_(observer), name_(std::move(name)) {
    cfg_.validate();
    max_ = cfg_.counter_max();
    all_channels_ = (1u << cfg_.channels) - 1;
    period_ = period_shadow_ = max_;
    // Reference levels start at 0, so complementary outputs have wanted to be active since reset.
    if (cfg_.complementary)
        for (unsigned i = 0; i < cfg_.channels; ++i) pins_[comp_pin(i)].active = true;
}

std::optional<time_ps> timer_core::time_of_tick(std::uint64_t n) const {
    if (n == never) return std::nullopt;
    try {
        return clock_.time_of(n);
    } catch (const std::out_of_range&) {
        return std::nullopt;  // the timer clock is stopped for ever before tick n
    } catch (const sim::time_limit_error&) {
        return std::nullopt;  // beyond the end of simulated time: nothing can be scheduled there
    }
}

std::uint64_t timer_core::tick_of_step(std::uint64_t k) const {
    const std::uint64_t p = std::uint64_t{prescaler_} + 1;
    const std::uint64_t first = next_tick_ + (pcount_ + 1 >= p ? 1 : p - pcount_) - 1;
    if (k - 1 > (never - first) / p) return never;
    return first + (k - 1) * p;
}

std::uint64_t timer_core::steps_to_next_interesting() const {
    if (!clock_counting()) return never;
    const std::uint64_t c = counter_, p = period_;
    std::uint64_t best = never;
    // Values the counter reaches before the wrap, at `steps` from now.
    auto consider_up = [&](std::uint64_t v, std::uint64_t limit) {
        if (v > c && v <= limit) best = std::min(best, v - c);
    };
    auto consider_down = [&](std::uint64_t v, std::uint64_t floor) {
        if (v < c && v >= floor) best = std::min(best, c - v);
    };
    // Capture channels never match: only compare channels make a step interesting.
    const std::uint32_t compares = all_channels_ & ~capture_channels_;
    auto each = [&](auto f) {
        for (std::uint32_t m = compares; m != 0; m &= m - 1)
            f(ch_[static_cast<unsigned>(__builtin_ctz(m))].compare);
    };
    switch (mode_) {
        case count_mode::up: {
            const std::uint64_t top = c <= p ? p : max_;
            best = top - c + 1;  // the wrap
            each([&](std::uint64_t v) { consider_up(v, top); });
            break;
        }
        case count_mode::down:
            best = c + 1;  // the wrap
            each([&](std::uint64_t v) {
                consider_down(v, 0);
                // counter < compare starts at the step reaching compare - 1
                if (v > 0) consider_down(v - 1, 0);
            });
            break;
        case count_mode::center:
            if (p == 0) return never;  // nothing moves
            if (!down_) {
                if (c >= p) return 1;
                best = p - c;
                each([&](std::uint64_t v) { consider_up(v, p - 1); });
            } else {
                if (c == 0) return 1;
                best = c;
                each([&](std::uint64_t v) { consider_down(v, 1); });
            }
            break;
    }
    return best;
}

std::uint64_t timer_core::next_interesting_tick() const {
    if (!cache_valid_) {
        cached_tick_ = compute_next_interesting_tick();
        cached_time_ = time_of_tick(cached_tick_);
        cache_valid_ = true;
    }
    return cached_tick_;
}

std::optional<time_ps> timer_core::next_interesting_time() const {
    next_interesting_tick();
    return cached_time_;
}

std::uint64_t timer_core::compute_next_interesting_tick() const {
    std::uint64_t n = std::min(fault_at_, effects_pending_ ? next_tick_ : never);
    if (pending_compares_ != 0)
        for (unsigned i = 0; i < cfg_.channels; ++i)
            if (!ch_[i].pending.empty()) n = std::min(n, ch_[i].pending.front().tick);
    for (std::uint32_t m = rise_channels_; m != 0; m &= m - 1) {
        const unsigned i = static_cast<unsigned>(__builtin_ctz(m));
        n = std::min({n, pins_[main_pin(i)].rise_at, pins_[comp_pin(i)].rise_at});
    }
    for (std::uint32_t m = pending_inputs_; m != 0; m &= m - 1)
        n = std::min(n, inputs_[static_cast<unsigned>(__builtin_ctz(m))].accept_at);
    if (!chained_ticks_.empty()) n = std::min(n, chained_ticks_.front());
    const std::uint64_t s = steps_to_next_interesting();
    if (s != never) n = std::min(n, tick_of_step(s));
    return n;
}

void timer_core::skip_to(std::uint64_t n) {
    if (n <= next_tick_) return;
    const std::uint64_t m = n - next_tick_;
    next_tick_ = n;
    if (!clock_counting()) return;
    const std::uint64_t p = std::uint64_t{prescaler_} + 1;
    const std::uint64_t d = pcount_ + 1 >= p ? 1 : p - pcount_;
    if (m < d) {
        pcount_ += m;
        return;
    }
    const std::uint64_t steps = 1 + (m - d) / p;
    pcount_ = (m - d) % p;
    // By construction none of these steps wraps: move the counter in its direction.
    if (mode_ == count_mode::center && period_ == 0) return;
    const bool down = mode_ == count_mode::down || (mode_ == count_mode::center && down_);
    counter_ = static_cast<std::uint32_t>(down ? counter_ - steps : counter_ + steps);
}

bool timer_core::step_counter(bool& wrapped, bool& slope_down) {
    wrapped = false;
    const std::uint32_t p = period_;
    switch (mode_) {
        case count_mode::up:
            slope_down = false;
            if (counter_ == p || counter_ == max_) {
                counter_ = 0;
                wrapped = true;
            } else {
                ++counter_;
            }
            return true;
        case count_mode::down:
            slope_down = true;
            if (counter_ == 0) {
                counter_ = p;
                wrapped = true;
            } else {
                --counter_;
            }
            return true;
        case count_mode::center:
            if (p == 0) return false;
            slope_down = down_;
            if (!down_) {
                if (counter_ < p) ++counter_;
                if (counter_ >= p) {
                    down_ = true;
                    wrapped = true;
                }
            } else {
                if (counter_ > 0) --counter_;
                if (counter_ == 0) {
                    down_ = false;
                    wrapped = true;
                }
            }
            return true;
    }
    return false;
}

void timer_core::load_shadows() {
    if (period_waiting_) period_ = period_shadow_;
    period_waiting_ = false;
    if (cfg_.prescaler_shadowed) prescaler_ = prescaler_shadow_;
    for (unsigned i = 0; i < cfg_.channels; ++i) {
        if (ch_[i].waiting) ch_[i].compare = ch_[i].compare_shadow;
        ch_[i].waiting = false;
    }
    wrap_skip_ = wrap_skip_shadow_;
}

void timer_core::reload_event(bool from_wrap, time_ps at) {
    load_shadows();
    if (from_wrap) skip_count_ = wrap_skip_;
    if (from_wrap || policy_ == reload_policy::every) set_flags(flag_reload, at);
    if (trigger_select_ == trigger_on_reload) trigger(at);
    if (from_wrap && one_pulse_) enable_ = false;
}

void timer_core::on_wrap(time_ps at) {
    if (policy_ == reload_policy::held) return;
    if (skip_count_ == 0)
        reload_event(true, at);
    else
        --skip_count_;
}

void timer_core::evaluate_levels() {
    // The PWM actions follow the counter, the forced ones set their level; the others hold, and so
    // does every capture channel.
    const bool center_down = mode_ == count_mode::center && down_;
    const std::uint32_t pwm = pwm_channels_ & ~capture_channels_;
    std::uint32_t refs = (refs_ & ~pwm & ~(forced_low_channels_ & ~capture_channels_)) |
                         (forced_high_channels_ & ~capture_channels_);
    for (std::uint32_t m = pwm; m != 0; m &= m - 1) {
        const unsigned i = static_cast<unsigned>(__builtin_ctz(m));
        const std::uint32_t compare = ch_[i].compare;
        const bool below = center_down ? counter_ <= compare : counter_ < compare;
        refs |= static_cast<std::uint32_t>(below) << i;
    }
    refs_ = refs ^ (pwm_above_channels_ & pwm);
}

void timer_core::update_pins(std::uint32_t channels, std::uint64_t first_tick_after, time_ps at) {
    for (std::uint32_t bits = channels; bits != 0; bits &= bits - 1) {
        const unsigned i = static_cast<unsigned>(__builtin_ctz(bits));
        const channel& c = ch_[i];
        const bool ref = (refs_ >> i) & 1u;
        pin_state& m = pins_[main_pin(i)];
        pin_state& k = pins_[comp_pin(i)];
        if (!cfg_.complementary) {
            m.active = ref;
        } else {
            for (auto [ps, want] : {std::pair<pin_state*, bool>{&m, ref}, {&k, !ref}}) {
                if (!want) {
                    ps->active = false;
                    ps->rise_at = never;
                } else if (!ps->active) {
                    if (ps->rise_at == never) {
                        const std::uint64_t d = dead_ticks();
                        if (d == 0)
                            ps->active = true;
                        else
                            ps->rise_at = first_tick_after + d - 1;
                    } else if (ps->rise_at < first_tick_after) {
                        ps->active = true;
                        ps->rise_at = never;
                    }
                }
            }
            if (m.rise_at != never || k.rise_at != never)
                rise_channels_ |= 1u << i;
            else
                rise_channels_ &= ~(1u << i);
        }
        const bool main_level =
            fault_active_ ? c.main_safe
                          : (c.main_enable ? m.active != c.main_active_low : c.main_active_low);
        bool comp_level = c.comp_active_low;
        if (cfg_.complementary)
            comp_level = fault_active_
                             ? c.comp_safe
                             : (c.comp_enable ? k.active != c.comp_active_low : c.comp_active_low);
        if (main_level != m.level) {
            m.level = main_level;
            if (observer_) observer_->on_pin(main_pin(i), main_level, at);
        }
        if (comp_level != k.level) {
            k.level = comp_level;
            if (observer_) observer_->on_pin(comp_pin(i), comp_level, at);
        }
    }
}

void timer_core::set_flags(std::uint32_t bits, time_ps at) {
    const std::uint32_t fresh = bits & ~flags_;
    flags_ |= bits;
    if (fresh && observer_) observer_->on_flags_set(fresh, at);
}

bool timer_core::clock_counting() const {
    return enable_ && count_source_ == count_source::timer_clock &&
           (trigger_action_ != trigger_action::gate || trigger_active());
}

std::uint64_t timer_core::filter_length(unsigned i) const {
    const std::uint32_t index =
        i == trigger_pin_input ? trigger_filter_ : ch_[i < max_channels ? i : 0].input_filter;
    return cfg_.filter_lengths[index];
}

std::uint64_t timer_core::first_sample(std::uint64_t from) const {
    const std::uint64_t d = std::uint64_t{1} << filter_divider_;
    return from + (d - from % d) % d;
}

void timer_core::settle(unsigned i) {
    // The filter as arithmetic over the pending changes: a run of the level away from the output
    // starts at a change and flips the output N sampling periods after its first sample, unless a
    // sample sees the level back first. A change back that no sample sees before the next change
    // away (both between two samples) is invisible. Runs that ended before the first tick not yet
    // processed are final and leave the list.
    input_state& in = inputs_[i];
    std::deque<std::uint64_t>& q = in.changes;
    const std::uint64_t span = (filter_length(i) - 1) * (std::uint64_t{1} << filter_divider_);
    std::size_t s = 0;  // the run's first change
    while (s < q.size()) {
        const std::uint64_t flip = first_sample(std::max(q[s], in.count_from)) + span;
        std::uint64_t ended = never;
        std::size_t j = s + 1;
        while (j < q.size()) {
            const std::uint64_t seen = first_sample(std::max(q[j], in.count_from));
            if (seen > flip) break;
            if (j + 1 < q.size() && q[j + 1] <= seen) {
                j += 2;  // away again before a sample saw the way back
                continue;
            }
            ended = seen;
            break;
        }
        if (ended == never) {
            in.accept_at = flip;
            pending_inputs_ |= 1u << i;
            return;
        }
        if (s == 0 && ended < next_tick_) {
            q.erase(q.begin(), q.begin() + static_cast<std::ptrdiff_t>(j + 1));
        } else {
            s = j + 1;
        }
    }
    in.accept_at = never;
    pending_inputs_ &= ~(1u << i);
}

void timer_core::restart_filter(unsigned i) {
    inputs_[i].count_from = next_tick_;
    settle(i);
}

int timer_core::capture_source(unsigned c) const {
    // A neighbour the instance lacks has no pin: its input stays low and never has an edge.
    return static_cast<int>(ch_[c].role == channel_role::capture_own ? c : (c ^ 1u));
}

int timer_core::trigger_input() const {
    switch (trigger_source_) {
        case trigger_source::channel_0_input:
            return 0;
        case trigger_source::channel_1_input:
            return 1;  // on a one-channel instance, an input with no pin: low for ever
        case trigger_source::trigger_pin:
            return static_cast<int>(trigger_pin_input);
        case trigger_source::chained:
            return -1;
    }
    return -1;
}

bool timer_core::trigger_active() const {
    const int i = trigger_input();
    return i >= 0 && inputs_[static_cast<unsigned>(i)].out != trigger_falling_;
}

void timer_core::raise_matches(bool slope_down, time_ps at) {
    for (std::uint32_t m = all_channels_ & ~capture_channels_; m != 0; m &= m - 1) {
        const unsigned i = static_cast<unsigned>(__builtin_ctz(m));
        channel& c = ch_[i];
        if (counter_ != c.compare) continue;
        if (mode_ == count_mode::center && slope_ != match_slope::both &&
            (slope_ == match_slope::down) != slope_down)
            continue;
        set_flags(flag_channel(i), at);
        if (c.action == output_action::set_on_match)
            refs_ |= 1u << i;
        else if (c.action == output_action::clear_on_match)
            refs_ &= ~(1u << i);
        else if (c.action == output_action::toggle_on_match)
            refs_ ^= 1u << i;
        if (trigger_select_ == trigger_on_match(i)) trigger(at);
    }
}

void timer_core::encoder_step(bool up, time_ps at) {
    // The step's direction is the counter's direction: `direction` reads it, a center-mode slope
    // filters the step's matches and the PWM levels use it.
    down_ = !up;
    bool wrapped = false;
    if (up) {
        if (counter_ == period_ || counter_ == max_) {
            counter_ = 0;
            wrapped = true;
        } else {
            ++counter_;
        }
    } else if (counter_ == 0) {
        counter_ = period_;
        wrapped = true;
    } else {
        --counter_;
    }
    if (wrapped) on_wrap(at);
    raise_matches(!up, at);
}

void timer_core::forced_reload(bool now, time_ps at) {
    if (policy_ != reload_policy::held) load_shadows();
    counter_ = mode_ == count_mode::down ? period_ : 0;
    if (mode_ == count_mode::center) down_ = false;
    pcount_ = 0;
    skip_count_ = wrap_skip_;
    const bool flag = policy_ == reload_policy::every;
    const bool pulse = trigger_select_ == trigger_on_reload;
    if (now) {
        if (flag) set_flags(flag_reload, at);
        if (pulse) trigger(at);
    } else {
        if (flag) pending_flags_ |= flag_reload;
        if (pulse) pending_trigger_ = true;
    }
}

void timer_core::take_capture_edge(unsigned c, time_ps at) {
    channel& ch = ch_[c];
    if (++ch.capture_count < (1u << ch.capture_prescaler)) return;
    ch.capture_count = 0;
    ch.compare = ch.compare_shadow = counter_;
    // A compare value still waiting (preloaded, or within the compare latency) is dropped.
    ch.waiting = false;
    pending_compares_ -= static_cast<unsigned>(ch.pending.size());
    ch.pending.clear();
    if (flags_ & flag_channel(c)) set_flags(flag_overcapture(c), at);
    set_flags(flag_channel(c), at);
}

void timer_core::update_capture_mask() {
    capture_channels_ = 0;
    for (unsigned c = 0; c < cfg_.channels; ++c)
        if (ch_[c].role != channel_role::compare) capture_channels_ |= 1u << c;
}

void timer_core::set_input(unsigned i, bool level, time_ps t) {
    check_input(i);
    catch_up(t);
    invalidate();
    input_state& in = inputs_[i];
    if (level == in.raw) return;
    in.raw = level;
    // Sampled first at the first tick after t, synchronised S - 1 ticks later; a change visible at
    // the same tick as the previous one undoes it.
    const std::uint64_t visible = next_tick_ + cfg_.input_sync_ticks - 1;
    if (!in.changes.empty() && in.changes.back() == visible)
        in.changes.pop_back();
    else
        in.changes.push_back(visible);
    settle(i);
}

void timer_core::set_initial_input(unsigned i, bool level) {
    if (i != fault_input) check_input(i);
    if (next_tick_ != 0 || ticks_processed_ != 0)
        throw std::logic_error(name_ + ": set_initial_input after the run began");
    if (i == fault_input) {
        fault_input_ = level;  // held since before time 0: no rise, so no fault
        return;
    }
    inputs_[i].raw = inputs_[i].out = level;
    inputs_[i].changes.clear();
}

void timer_core::check_input(unsigned i) const {
    if (i == fault_input)
        throw std::invalid_argument(name_ + ": the fault input changes by set_fault_input");
    if (i >= pin_inputs || (i < max_channels && i >= cfg_.channels))
        throw std::invalid_argument(name_ + ": no input " + std::to_string(i) +
                                    "; accepted: " + "the inputs of channels 0 to " +
                                    std::to_string(cfg_.channels - 1) + " and the trigger pin (" +
                                    std::to_string(trigger_pin_input) + ")");
}

void timer_core::chained_pulse(time_ps t) {
    catch_up(t);
    invalidate();
    chained_ticks_.push_back(next_tick_ + cfg_.chain_latency);
}

void timer_core::set_action(unsigned i, std::uint32_t code) {
    channel& c = ch_[i];
    c.action = static_cast<output_action>(code);
    const bool pwm =
        c.action == output_action::pwm_below || c.action == output_action::pwm_at_or_above;
    const std::uint32_t bit = 1u << i;
    pwm_channels_ = pwm ? pwm_channels_ | bit : pwm_channels_ & ~bit;
    pwm_above_channels_ = c.action == output_action::pwm_at_or_above ? pwm_above_channels_ | bit
                                                                     : pwm_above_channels_ & ~bit;
    forced_low_channels_ = c.action == output_action::force_low ? forced_low_channels_ | bit
                                                                : forced_low_channels_ & ~bit;
    forced_high_channels_ = c.action == output_action::force_high ? forced_high_channels_ | bit
                                                                  : forced_high_channels_ & ~bit;
}

void timer_core::update_irq(time_ps at) {
    const bool level = (flags_ & irq_enable_) != 0;
    if (level == irq_) return;
    irq_ = level;
    if (observer_) observer_->on_irq(level, at);
}

void timer_core::trigger(time_ps at) {
    if (observer_) observer_->on_trigger(at);
}

std::uint64_t timer_core::dead_ticks() const {
    return std::uint64_t{dead_time_} << dead_time_scale_;
}

void timer_core::warn_dead_time_clipped(std::uint32_t written, time_ps at) const {
    timer_logger()->warn(
        "{}: dead time {} written at {} ps is above the instance's maximum {}; clipped to {}",
        name_, written, at, cfg_.dead_time_max, cfg_.dead_time_max);
}

void timer_core::activate_fault(time_ps at) {
    if (fault_active_) return;
    fault_active_ = true;
    set_flags(flag_fault, at);
}

void timer_core::process_tick(std::uint64_t n, time_ps at) {
    ++ticks_processed_;
    invalidate();
    const std::uint32_t refs_before = refs_;
    const bool fault_before = fault_active_;
    // What register accesses since the last tick changed shows from this tick on.
    const bool after_access = effects_pending_;
    effects_pending_ = false;
    if (pending_flags_ != 0) {
        set_flags(pending_flags_, at);
        pending_flags_ = 0;
    }
    if (pending_trigger_) {
        pending_trigger_ = false;
        trigger(at);
    }
    if (pending_compares_ != 0)
        for (unsigned i = 0; i < cfg_.channels; ++i) {
            auto& q = ch_[i].pending;
            while (!q.empty() && q.front().tick <= n) {
                ch_[i].compare = q.front().value;
                q.pop_front();
                --pending_compares_;
            }
        }
    if (fault_at_ <= n) {
        fault_at_ = never;
        activate_fault(at);
    }
    // Inputs: the filter outputs that flip at this tick, and what they mean.
    std::uint32_t edges = 0, rising = 0;
    for (std::uint32_t m = pending_inputs_; m != 0; m &= m - 1) {
        const unsigned i = static_cast<unsigned>(__builtin_ctz(m));
        input_state& in = inputs_[i];
        if (in.accept_at != n) continue;
        in.out = !in.out;
        edges |= 1u << i;
        if (in.out) rising |= 1u << i;
        // The changes up to this tick are in the output now; the next one (if any) leads away.
        while (!in.changes.empty() && in.changes.front() <= n) in.changes.pop_front();
        settle(i);
    }
    // The trigger: an accepted trigger at this tick.
    bool triggered = false;
    if (trigger_source_ == trigger_source::chained) {
        while (!chained_ticks_.empty() && chained_ticks_.front() <= n) {
            chained_ticks_.pop_front();
            triggered = true;
        }
    } else if (const int ti = trigger_input(); ti >= 0 && (edges >> ti) & 1u) {
        triggered = ((rising >> ti) & 1u) != trigger_falling_;
    }
    if (!chained_ticks_.empty() && trigger_source_ != trigger_source::chained)
        while (!chained_ticks_.empty() && chained_ticks_.front() <= n) chained_ticks_.pop_front();
    if (triggered) set_flags(flag_trigger, at);
    // Counting events, steps, wraps and matches.
    if (count_source_ == count_source::encoder_x2 || count_source_ == count_source::encoder_x4) {
        if (enable_) {
            const bool a = inputs_[input_of_channel(0)].out;
            const bool b_before = (edges >> 1) & 1u ? !inputs_[input_of_channel(1)].out
                                                    : inputs_[input_of_channel(1)].out;
            if (edges & 1u) encoder_step(a != b_before, at);
            if (count_source_ == count_source::encoder_x4 && ((edges >> 1) & 1u))
                encoder_step(a == inputs_[input_of_channel(1)].out, at);
        }
    } else {
        const bool event =
            count_source_ == count_source::timer_clock ? clock_counting() : enable_ && triggered;
        bool stepped = false;
        if (event) {
            const std::uint64_t p = std::uint64_t{prescaler_} + 1;
            if (pcount_ + 1 >= p) {
                pcount_ = 0;
                stepped = true;
            } else {
                ++pcount_;
            }
        }
        bool wrapped = false, slope_down = false;
        if (stepped && step_counter(wrapped, slope_down)) {
            if (wrapped) on_wrap(at);
            raise_matches(slope_down, at);
        }
    }
    // Captures, then what the trigger does.
    for (std::uint32_t m = capture_channels_; edges != 0 && m != 0; m &= m - 1) {
        const unsigned c = static_cast<unsigned>(__builtin_ctz(m));
        const int src = capture_source(c);
        if (src < 0 || !((edges >> src) & 1u)) continue;
        const bool up = (rising >> src) & 1u;
        if (ch_[c].edge == capture_edge::both || (ch_[c].edge == capture_edge::rising) == up)
            take_capture_edge(c, at);
    }
    if (triggered) {
        if (trigger_action_ == trigger_action::restart) forced_reload(true, at);
        if (trigger_action_ == trigger_action::start) enable_ = true;
    }
    evaluate_levels();
    next_tick_ = n + 1;
    // Pins can only change where a level or a pending dead-time rise did; everywhere after an
    // access or a change of the fault state.
    const std::uint32_t channels = after_access || fault_active_ != fault_before
                                       ? all_channels_
                                       : (refs_ ^ refs_before) | rise_channels_;
    if (channels != 0) update_pins(channels, next_tick_, at);
    update_irq(at);
}

void timer_core::advance_to(time_ps t) {
    for (;;) {
        const std::uint64_t n = next_interesting_tick();
        const std::optional<time_ps> at = cached_time_;
        if (!at || *at > t) break;
        skip_to(n);
        process_tick(n, *at);
    }
}

void timer_core::catch_up(time_ps t) {
    advance_to(t);
    // Every tick at or before t has now happened; the ones left were boring: jump over them so
    // that an access at t sees the state at t. (advance_to alone leaves that to the next access.)
    skip_to(t == sim::max_time_ps ? clock_.tick_at(t) : clock_.tick_at(t + 1));
}

bool timer_core::next_event(time_ps& at) const {
    const std::optional<time_ps> t = next_interesting_time();
    if (!t) return false;
    at = *t;
    return true;
}

void timer_core::clock_changed(time_ps) {
    // State is kept in tick indices and ticks before the change (all that has been processed) keep
    // their times; only the cached time of the next event may have moved.
    invalidate();
}

void timer_core::write(timer_field f, unsigned channel_index, std::uint32_t v, time_ps t) {
    catch_up(t);
    invalidate();
    // Runs that samples already ended went by the old filter settings: settle them first.
    if (f == timer_field::filter_divider || f == timer_field::trigger_filter ||
        f == timer_field::input_filter)
        for (unsigned i = 0; i < pin_inputs; ++i) settle(i);
    const bool bit = (v & 1u) != 0;
    switch (f) {
        case timer_field::enable:
            enable_ = bit;
            break;
        case timer_field::mode:
            if (!is_defined_value(cfg_, f, v)) break;  // reserved: ignored
            if (static_cast<count_mode>(v) != count_mode::center)
                down_ = static_cast<count_mode>(v) == count_mode::down;
            else if (mode_ != count_mode::center)
                down_ = false;
            mode_ = static_cast<count_mode>(v);
            break;
        case timer_field::slope:
            if (is_defined_value(cfg_, f, v)) slope_ = static_cast<match_slope>(v);
            break;
        case timer_field::one_pulse:
            one_pulse_ = bit;
            break;
        case timer_field::period_preload:
            period_preload_ = bit;
            break;
        case timer_field::reload_policy:
            if (is_defined_value(cfg_, f, v)) policy_ = static_cast<reload_policy>(v);
            break;
        case timer_field::force_reload:
            if (bit) forced_reload(false, t);
            break;
        case timer_field::prescaler: {
            const std::uint32_t mask =
                cfg_.prescaler_bits >= 32 ? 0xffff'ffffu : (1u << cfg_.prescaler_bits) - 1;
            prescaler_shadow_ = v & mask;
            if (!cfg_.prescaler_shadowed) prescaler_ = prescaler_shadow_;
            break;
        }
        case timer_field::period:
            period_shadow_ = v & max_;
            period_waiting_ = period_preload_;
            if (!period_preload_) period_ = period_shadow_;
            break;
        case timer_field::counter:
            counter_ = v & max_;
            break;
        case timer_field::wrap_skip:
            if (cfg_.wrap_skip_bits > 0) wrap_skip_shadow_ = v & ((1u << cfg_.wrap_skip_bits) - 1);
            break;
        case timer_field::direction:
            break;  // read-only
        case timer_field::dead_time:
            dead_time_ = std::min<std::uint32_t>(v, cfg_.dead_time_max);
            if (v > cfg_.dead_time_max) warn_dead_time_clipped(v, t);
            break;
        case timer_field::dead_time_scale:
            if (cfg_.dead_time_scaled) dead_time_scale_ = v & 3u;
            break;
        case timer_field::fault_enable:
            fault_enable_ = bit;
            break;
        case timer_field::fault_latency:
            fault_latency_ = v;
            break;
        case timer_field::rearm:
            if (bit && fault_active_ && !fault_input_) fault_active_ = false;
            break;
        case timer_field::flags:
            break;  // layouts map flag writes to clear_flags()
        case timer_field::irq_enable: {
            // Only flags that exist can be enabled.
            std::uint32_t valid = flag_reload | (cfg_.complementary ? flag_fault : 0u);
            for (unsigned i = 0; i < cfg_.channels; ++i) valid |= flag_channel(i);
            irq_enable_ = v & valid;
            break;
        }
        case timer_field::trigger_select:
            if (is_defined_value(cfg_, f, v)) trigger_select_ = v;
            break;
        case timer_field::filter_divider:
            if (!is_defined_value(cfg_, f, v)) break;
            filter_divider_ = v;
            for (unsigned i = 0; i < pin_inputs; ++i) restart_filter(i);
            break;
        case timer_field::trigger_filter:
            if (!is_defined_value(cfg_, f, v)) break;
            trigger_filter_ = v;
            restart_filter(trigger_pin_input);
            break;
        case timer_field::count_source: {
            if (!is_defined_value(cfg_, f, v)) break;
            const auto was = count_source_;
            count_source_ = static_cast<count_source>(v);
            const auto encoder = [](count_source s) {
                return s == count_source::encoder_x2 || s == count_source::encoder_x4;
            };
            // Leaving the encoder, the direction becomes what the mode wants.
            if (encoder(was) && !encoder(count_source_)) down_ = mode_ == count_mode::down;
            break;
        }
        case timer_field::trigger_action:
            if (is_defined_value(cfg_, f, v)) trigger_action_ = static_cast<trigger_action>(v);
            break;
        case timer_field::trigger_source:
            if (is_defined_value(cfg_, f, v)) trigger_source_ = static_cast<trigger_source>(v);
            break;
        case timer_field::trigger_edge:
            if (is_defined_value(cfg_, f, v)) trigger_falling_ = v != 0;
            break;
        default: {
            if (channel_index >= cfg_.channels) break;
            channel& c = ch_[channel_index];
            switch (f) {
                case timer_field::compare:
                    if (c.role != channel_role::compare) break;  // holds the captured value
                    c.compare_shadow = v & max_;
                    c.waiting = c.preload;
                    if (c.preload) break;
                    if (cfg_.compare_latency == 0)
                        c.compare = c.compare_shadow;
                    else {
                        c.pending.push_back({next_tick_ + cfg_.compare_latency, c.compare_shadow});
                        ++pending_compares_;
                    }
                    break;
                case timer_field::compare_preload:
                    c.preload = bit;
                    break;
                case timer_field::action:
                    if (is_defined_value(cfg_, f, v)) set_action(channel_index, v);
                    break;
                case timer_field::main_enable:
                    c.main_enable = bit;
                    break;
                case timer_field::main_active_low:
                    c.main_active_low = bit;
                    break;
                case timer_field::comp_enable:
                    c.comp_enable = bit;
                    break;
                case timer_field::comp_active_low:
                    c.comp_active_low = bit;
                    break;
                case timer_field::main_safe_level:
                    c.main_safe = bit;
                    break;
                case timer_field::comp_safe_level:
                    c.comp_safe = bit;
                    break;
                case timer_field::channel_role:
                    if (!is_defined_value(cfg_, f, v)) break;
                    c.role = static_cast<channel_role>(v);
                    c.capture_count = 0;
                    update_capture_mask();
                    break;
                case timer_field::capture_edge:
                    if (!is_defined_value(cfg_, f, v)) break;
                    c.edge = static_cast<capture_edge>(v);
                    c.capture_count = 0;
                    break;
                case timer_field::capture_prescaler:
                    if (!is_defined_value(cfg_, f, v)) break;
                    c.capture_prescaler = v;
                    c.capture_count = 0;
                    break;
                case timer_field::input_filter:
                    if (!is_defined_value(cfg_, f, v)) break;
                    c.input_filter = v;
                    restart_filter(input_of_channel(channel_index));
                    break;
                default:
                    break;
            }
        }
    }
    // The registers hold the write now; outputs, flags and the interrupt line show it from the
    // first tick after t.
    effects_pending_ = true;
}

std::uint32_t timer_core::read(timer_field f, unsigned channel_index, time_ps t) {
    catch_up(t);
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
            return prescaler_shadow_;
        case timer_field::period:
            return period_shadow_;
        case timer_field::counter:
            return counter_;
        case timer_field::wrap_skip:
            return wrap_skip_shadow_;
        case timer_field::direction:
            if (count_source_ == count_source::encoder_x2 ||
                count_source_ == count_source::encoder_x4)
                return down_ ? 1 : 0;
            return mode_ == count_mode::down || (mode_ == count_mode::center && down_) ? 1 : 0;
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
        default:
            break;
    }
    if (channel_index >= cfg_.channels) return 0;
    const channel& c = ch_[channel_index];
    switch (f) {
        case timer_field::compare:
            if (c.role != channel_role::compare && cfg_.capture_read_clears_flag &&
                (flags_ & flag_channel(channel_index))) {
                // Reading the captured value takes its flag; the line follows at the next tick.
                flags_ &= ~flag_channel(channel_index);
                effects_pending_ = true;
                invalidate();
            }
            return c.compare_shadow;
        case timer_field::compare_preload:
            return c.preload;
        case timer_field::action:
            return static_cast<std::uint32_t>(c.action);
        case timer_field::main_enable:
            return c.main_enable;
        case timer_field::main_active_low:
            return c.main_active_low;
        case timer_field::comp_enable:
            return c.comp_enable;
        case timer_field::comp_active_low:
            return c.comp_active_low;
        case timer_field::main_safe_level:
            return c.main_safe;
        case timer_field::comp_safe_level:
            return c.comp_safe;
        case timer_field::channel_role:
            return static_cast<std::uint32_t>(c.role);
        case timer_field::capture_edge:
            return static_cast<std::uint32_t>(c.edge);
        case timer_field::capture_prescaler:
            return c.capture_prescaler;
        case timer_field::input_filter:
            return c.input_filter;
        default:
            return 0;
    }
}

void timer_core::clear_flags(std::uint32_t mask, time_ps t) {
    catch_up(t);
    invalidate();
    flags_ &= ~mask;
    effects_pending_ = true;  // the interrupt line follows at the next tick
}

void timer_core::set_fault_input(bool level, time_ps t) {
    catch_up(t);
    invalidate();
    const bool rising = level && !fault_input_;
    fault_input_ = level;
    // The fault acts at the first tick after the rise, or fault_latency ticks later.
    if (rising && fault_enable_ && cfg_.complementary && !fault_active_ && fault_at_ == never)
        fault_at_ = next_tick_ + fault_latency_;
}

}  // namespace models
