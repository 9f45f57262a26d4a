#include "tests/differential/timer_program.h"

#include "models/reference/reference_timer.h"

#include <algorithm>
#include <array>
#include <deque>
#include <random>
#include <sstream>

namespace tickbench::differential {

namespace {

using models::timer_field;

// Small helpers over one seeded engine, so a seed always gives the same program.
class dice {
public:
    explicit dice(std::uint64_t seed) : rng_(seed) {}
    // Uniform in [lo, hi].
    std::uint64_t range(std::uint64_t lo, std::uint64_t hi) {
        return std::uniform_int_distribution<std::uint64_t>(lo, hi)(rng_);
    }
    bool chance(double p) { return std::bernoulli_distribution(p)(rng_); }
    template <class T>
    const T& pick(const std::vector<T>& v) {
        return v[static_cast<std::size_t>(range(0, v.size() - 1))];
    }

private:
    std::mt19937_64 rng_;
};

const std::vector<std::uint64_t> clock_choices = {48'000'000, 1'000'000, 1'000'000'000, 32'768,
                                                  16'000'000};

// What time_near_next found: a time near the next wrap, a wrap too close to place an operation
// before it as asked, or no wrap within the horizon.
enum class nearby { placed, too_close, none };

// Picks the time of an operation near the next wrap (or reload event) of the model, if one comes
// within `horizon` ticks: within +/-2 ticks of it, exactly at a tick, just before one, or between.
nearby time_near_next(const models::reference::reference_timer& model, bool reload,
                      std::uint64_t horizon, dice& d, sim::time_ps not_before, sim::time_ps& out) {
    models::reference::reference_timer probe = model;
    probe.set_observer(nullptr);
    std::deque<sim::time_ps> recent;  // times of the last ticks processed by the probe
    const std::uint64_t w0 = probe.wraps(), r0 = probe.reload_events();
    for (std::uint64_t i = 0; i < horizon; ++i) {
        sim::time_ps t = 0;
        if (!probe.next_event(t)) return nearby::none;
        probe.advance_to(t);
        recent.push_back(t);
        if (recent.size() > 4) recent.pop_front();
        const bool hit = reload ? probe.reload_events() != r0 : probe.wraps() != w0;
        if (!hit) continue;
        const int offset = static_cast<int>(d.range(0, 4)) - 2;
        sim::time_ps tick = t;
        if (offset < 0) {
            const std::size_t back = static_cast<std::size_t>(-offset);
            if (back >= recent.size()) return nearby::too_close;
            tick = recent[recent.size() - 1 - back];
        } else {
            for (int k = 0; k < offset; ++k) {
                sim::time_ps n = 0;
                if (!probe.next_event(n)) break;
                probe.advance_to(n);
                tick = n;
            }
        }
        // Exactly at the tick (after it), 1 ps before it (before it), or a little before.
        switch (d.range(0, 2)) {
            case 0:
                out = tick;
                break;
            case 1:
                out = tick - 1;
                break;
            default:
                out = tick - std::min<sim::time_ps>(tick, d.range(2, 400));
                break;
        }
        out = std::max(out, not_before);
        return nearby::placed;
    }
    return nearby::none;
}

// What kind of program a seed gives. Regular programs are short and dense with operations. Long
// ones run for tens of thousands of ticks: many wraps of a small period, a wide counter started a
// few steps before its wrap, or a large prescaler.
enum class program_shape { regular, many_wraps, near_wide_wrap, slow_prescaler };

// The share of long programs, and of programs with timer clock changes (stops and restarts among
// them). timer_program_test measures both, so they cannot silently drop.
constexpr double long_share = 0.125;
constexpr double clock_change_share = 0.55;  // a short program may draw no change
constexpr double input_share = 0.6;          // programs that use the input side

struct run_plan {
    program_shape shape = program_shape::regular;
    std::uint64_t tick_budget = 0;       // no new operation after this many ticks
    std::size_t op_budget = 0;           // ... nor after this many operations after the set-up
    std::uint64_t probe_horizon = 3000;  // ticks searched ahead for the next wrap
    std::uint64_t max_gap = 200;         // most ticks between two operations placed freely
    bool clock_changes = false;
    bool inputs = false;  // the program drives inputs and sets up the input side
    bool long_run() const { return shape != program_shape::regular; }
};

run_plan random_plan(dice& d) {
    run_plan r;
    if (d.chance(long_share)) {
        r.shape = d.pick(std::vector<program_shape>{program_shape::many_wraps,
                                                    program_shape::near_wide_wrap,
                                                    program_shape::slow_prescaler});
        r.tick_budget = d.range(10'000, 40'000);
        r.op_budget = static_cast<std::size_t>(d.range(10, 50));
        r.probe_horizon = 10'000;
        r.max_gap = 2 * r.tick_budget / r.op_budget;
    } else {
        r.tick_budget = d.range(300, 3000);
        r.op_budget = static_cast<std::size_t>(d.range(10, 120));
    }
    r.clock_changes = d.chance(clock_change_share);
    r.inputs = d.chance(input_share);
    return r;
}

models::timer_config random_config(const run_plan& plan, dice& d) {
    models::timer_config cfg;
    cfg.counter_bits = static_cast<unsigned>(
        d.chance(0.5) ? d.pick(std::vector<std::uint64_t>{8, 16, 32}) : d.range(8, 32));
    if (plan.shape == program_shape::near_wide_wrap)
        cfg.counter_bits = static_cast<unsigned>(d.chance(0.6) ? 32 : d.range(24, 31));
    cfg.channels = static_cast<unsigned>(d.range(1, 6));
    cfg.prescaler_bits = static_cast<unsigned>(d.chance(0.7) ? 16 : d.range(1, 32));
    if (plan.shape == program_shape::slow_prescaler)
        cfg.prescaler_bits = static_cast<unsigned>(d.range(7, 32));
    cfg.wrap_skip_bits = static_cast<unsigned>(d.pick(std::vector<std::uint64_t>{0, 1, 3, 8, 16}));
    cfg.prescaler_shadowed = d.chance(0.5);
    cfg.complementary = d.chance(0.5);
    cfg.dead_time_max = static_cast<unsigned>(d.pick(std::vector<std::uint64_t>{0, 3, 15, 1023}));
    cfg.dead_time_scaled = d.chance(0.5);
    cfg.compare_latency = static_cast<unsigned>(d.range(0, 2));
    cfg.input_sync_ticks = static_cast<unsigned>(d.range(1, 3));
    cfg.filter_lengths = d.pick(std::vector<std::vector<unsigned>>{
        {1, 2, 4, 8}, {1}, {3, 1, 5}, {1, 2, 3, 4, 5, 6, 7, 8, 12, 16}, {2, 7}});
    cfg.capture_read_clears_flag = d.chance(0.7);
    cfg.chain_latency = static_cast<unsigned>(d.range(0, 3));
    return cfg;
}

// An action code: mostly PWM, sometimes any listed code, now and then a reserved one.
std::uint32_t random_action(dice& d) {
    using models::output_action;
    static const std::vector<std::uint64_t> listed = {std::uint64_t(output_action::hold),
                                                      std::uint64_t(output_action::pwm_below),
                                                      std::uint64_t(output_action::pwm_at_or_above),
                                                      std::uint64_t(output_action::toggle_on_match),
                                                      std::uint64_t(output_action::set_on_match),
                                                      std::uint64_t(output_action::clear_on_match),
                                                      std::uint64_t(output_action::force_low),
                                                      std::uint64_t(output_action::force_high)};
    if (d.chance(0.6))
        return static_cast<std::uint32_t>(d.chance(0.5) ? output_action::pwm_below
                                                        : output_action::pwm_at_or_above);
    if (d.chance(0.9)) return static_cast<std::uint32_t>(d.pick(listed));
    return static_cast<std::uint32_t>(d.range(0, 15));
}

std::uint32_t valid_flags(const models::timer_config& cfg) {
    std::uint32_t bits = models::flag_reload | models::flag_trigger;
    for (unsigned c = 0; c < cfg.channels; ++c)
        bits |= models::flag_channel(c) | models::flag_overcapture(c);
    if (cfg.complementary) bits |= models::flag_fault;
    return bits;
}

// A random input of the instance: a channel's input pin or the trigger pin; mostly the inputs of
// channels 0 and 1, which also feed the trigger and the encoder.
unsigned random_input(const models::timer_config& cfg, dice& d) {
    if (d.chance(0.2)) return models::trigger_pin_input;
    const unsigned last = d.chance(0.7) ? std::min(cfg.channels, 2u) - 1 : cfg.channels - 1;
    return models::input_of_channel(static_cast<unsigned>(d.range(0, last)));
}

std::uint32_t low_bits(unsigned bits) { return bits >= 32 ? 0xffff'ffffu : (1u << bits) - 1; }

bool is_single_bit(timer_field f) {
    switch (f) {
        case timer_field::enable:
        case timer_field::one_pulse:
        case timer_field::period_preload:
        case timer_field::force_reload:
        case timer_field::fault_enable:
        case timer_field::rearm:
        case timer_field::compare_preload:
        case timer_field::main_enable:
        case timer_field::main_active_low:
        case timer_field::comp_enable:
        case timer_field::comp_active_low:
        case timer_field::main_safe_level:
        case timer_field::comp_safe_level:
            return true;
        default:
            return false;
    }
}

// The largest value field f takes as written in this instance; larger ones are masked or clipped
// (docs/timer-model.md, "Out-of-range writes"). Enumerated fields, irq_enable and the read-only
// fields have no such bound (0xffffffff).
std::uint32_t field_limit(const models::timer_config& cfg, timer_field f) {
    if (is_single_bit(f)) return 1;
    switch (f) {
        case timer_field::counter:
        case timer_field::period:
        case timer_field::compare:
            return cfg.counter_max();
        case timer_field::prescaler:
            return low_bits(cfg.prescaler_bits);
        case timer_field::wrap_skip:
            return low_bits(cfg.wrap_skip_bits);
        case timer_field::dead_time:
            return cfg.dead_time_max;
        case timer_field::dead_time_scale:
            return cfg.dead_time_scaled ? 3 : 0;
        default:
            return 0xffff'ffffu;
    }
}

// A prescaler value that makes steps rare: in [64, 1000] where the width allows.
std::uint32_t slow_prescaler(const models::timer_config& cfg, dice& d) {
    const std::uint32_t mask = low_bits(cfg.prescaler_bits);
    return static_cast<std::uint32_t>(
        d.range(std::min<std::uint32_t>(64, mask), std::min<std::uint32_t>(1000, mask)));
}

// Whether writing field f can change when the counter wraps or a reload event comes.
bool moves_the_counting(timer_field f) {
    switch (f) {
        case timer_field::enable:
        case timer_field::mode:
        case timer_field::one_pulse:
        case timer_field::reload_policy:
        case timer_field::force_reload:
        case timer_field::prescaler:
        case timer_field::period:
        case timer_field::counter:
        case timer_field::wrap_skip:
            return true;
        default:
            return false;
    }
}

// A value worth writing to field f, given the model's present state.
std::uint32_t random_value(timer_field f, const models::timer_config& cfg, const run_plan& plan,
                           models::reference::reference_timer& model, sim::time_ps t, dice& d) {
    const std::uint32_t max = cfg.counter_max();
    const std::uint32_t period = model.read(timer_field::period, 0, t);
    const std::uint32_t counter = model.read(timer_field::counter, 0, t);
    auto small_or_edge = [&](std::uint32_t around) -> std::uint32_t {
        switch (d.range(0, 9)) {
            case 0:
                return 0;
            case 1:
                return around;
            case 2:
                return around + 1;
            case 3:
                return around > 0 ? around - 1 : 0;
            case 4:
                return max;
            case 5:
                return static_cast<std::uint32_t>(d.range(0, max));
            default:
                return static_cast<std::uint32_t>(
                    d.range(0, std::min<std::uint64_t>(around + 2, 60)));
        }
    };
    switch (f) {
        case timer_field::enable:
            return d.chance(0.8) ? 1 : 0;
        case timer_field::mode:  // 3 is reserved: written now and then
            return static_cast<std::uint32_t>(d.chance(0.95) ? d.range(0, 2) : 3);
        case timer_field::slope:
            return static_cast<std::uint32_t>(d.chance(0.95) ? d.range(0, 2) : 3);
        case timer_field::one_pulse:
            return d.chance(0.3) ? 1 : 0;
        case timer_field::reload_policy:
            // Mostly every (0); sometimes quiet_forced, held, or the reserved value 3.
            return d.chance(0.6) ? 0 : static_cast<std::uint32_t>(d.range(0, 3));
        case timer_field::force_reload:
            return d.chance(0.9) ? 1 : 0;
        case timer_field::prescaler:
            if (plan.long_run() && d.chance(0.3)) return slow_prescaler(cfg, d);
            return static_cast<std::uint32_t>(d.chance(0.8) ? d.range(0, 3) : d.range(0, 12));
        case timer_field::period: {
            switch (d.range(0, 11)) {
                case 0:
                    return 0;
                case 1:
                    return counter;
                case 2:
                    return counter > 0 ? counter - 1 : 0;
                case 3:
                    return counter + 1;
                case 4:
                    return static_cast<std::uint32_t>(d.range(0, max));
                default:
                    return static_cast<std::uint32_t>(d.range(1, d.chance(0.2) ? 300 : 40));
            }
        }
        case timer_field::counter:
            // A few steps before the counter's own wrap: long programs run up to it.
            if (d.chance(plan.long_run() ? 0.3 : 0.05))
                return max - static_cast<std::uint32_t>(d.range(0, plan.long_run() ? 40 : 2));
            return small_or_edge(period);
        case timer_field::wrap_skip:
            if (plan.shape == program_shape::many_wraps && d.chance(0.3))
                return static_cast<std::uint32_t>(d.range(0, low_bits(cfg.wrap_skip_bits)));
            return static_cast<std::uint32_t>(d.range(0, 4));
        case timer_field::dead_time:
            return static_cast<std::uint32_t>(d.chance(0.9) ? d.range(0, 12) : d.range(0, 3000));
        case timer_field::dead_time_scale:
            return static_cast<std::uint32_t>(d.range(0, 3));
        case timer_field::fault_latency:
            return static_cast<std::uint32_t>(d.range(0, 4));
        case timer_field::rearm:
            return 1;
        case timer_field::irq_enable:
            return static_cast<std::uint32_t>(d.range(0, 0x3ff)) & valid_flags(cfg);
        case timer_field::trigger_select:  // all 3-bit values, channels the instance lacks too
            return static_cast<std::uint32_t>(d.range(0, 7));
        case timer_field::compare:
            if (plan.long_run() && d.chance(0.3))
                return max - static_cast<std::uint32_t>(d.range(0, 60));
            return small_or_edge(period);
        case timer_field::action:
            return random_action(d);
        case timer_field::channel_role:
            return static_cast<std::uint32_t>(d.chance(0.97) ? d.range(0, 2) : 3);
        case timer_field::capture_edge:
            return static_cast<std::uint32_t>(d.chance(0.97) ? d.range(0, 2) : 3);
        case timer_field::capture_prescaler:
        case timer_field::filter_divider:
        case timer_field::count_source:
        case timer_field::trigger_action:
        case timer_field::trigger_source:
            return static_cast<std::uint32_t>(d.range(0, 3));
        case timer_field::trigger_edge:
            return d.chance(0.5) ? 1 : 0;
        case timer_field::input_filter:
        case timer_field::trigger_filter:  // sometimes an index beyond the list: reserved
            return static_cast<std::uint32_t>(
                d.range(0, cfg.filter_lengths.size() - (d.chance(0.95) ? 1 : 0)));
        default:
            return d.chance(0.5) ? 1 : 0;  // single-bit fields
    }
}

const std::vector<timer_field> global_fields = {
    timer_field::enable,          timer_field::mode,           timer_field::slope,
    timer_field::one_pulse,       timer_field::period_preload, timer_field::reload_policy,
    timer_field::force_reload,    timer_field::prescaler,      timer_field::period,
    timer_field::counter,         timer_field::wrap_skip,      timer_field::dead_time,
    timer_field::dead_time_scale, timer_field::fault_enable,   timer_field::fault_latency,
    timer_field::rearm,           timer_field::irq_enable,     timer_field::trigger_select,
    timer_field::filter_divider,  timer_field::count_source,   timer_field::trigger_action,
    timer_field::trigger_source,  timer_field::trigger_edge,   timer_field::trigger_filter,
};
const std::vector<timer_field> channel_fields = {
    timer_field::compare,         timer_field::compare_preload, timer_field::action,
    timer_field::main_enable,     timer_field::main_active_low, timer_field::comp_enable,
    timer_field::comp_active_low, timer_field::main_safe_level, timer_field::comp_safe_level,
    timer_field::channel_role,    timer_field::capture_edge,    timer_field::capture_prescaler,
    timer_field::input_filter,
};
// Fields that make the counter and pins move; written more often.
const std::vector<timer_field> hot_fields = {
    timer_field::period,  timer_field::counter,      timer_field::prescaler, timer_field::compare,
    timer_field::compare, timer_field::force_reload, timer_field::mode,      timer_field::enable,
    timer_field::action,  timer_field::wrap_skip,
};
// Fields with a width or a maximum, the counter-sized ones listed twice (written more often).
const std::vector<timer_field> bounded_fields = {
    timer_field::counter,     timer_field::counter,         timer_field::period,
    timer_field::period,      timer_field::compare,         timer_field::compare,
    timer_field::prescaler,   timer_field::prescaler,       timer_field::wrap_skip,
    timer_field::dead_time,   timer_field::dead_time_scale, timer_field::irq_enable,
    timer_field::enable,      timer_field::one_pulse,       timer_field::force_reload,
    timer_field::main_enable, timer_field::comp_active_low,
};

// A value above `limit` (< 0xffffffff) that the field's masking or clipping brings back in
// range: bits above a mask over a small value below it, or a little above a maximum.
std::uint32_t wider_than(std::uint32_t limit, dice& d) {
    const std::uint64_t unit = std::uint64_t{limit} + 1;
    if ((limit & unit) == 0) {  // a mask 2^k - 1
        const std::uint64_t low = d.range(0, std::min<std::uint64_t>(limit, 40));
        const std::uint64_t high =
            d.chance(0.3) ? (0xffff'ffffu / unit) : d.range(1, 0xffff'ffffu / unit);
        return static_cast<std::uint32_t>(high * unit | low);
    }
    return d.chance(0.2) ? 0xffff'ffffu : static_cast<std::uint32_t>(d.range(unit, unit + 3000));
}

// A write the specification calls out of range (docs/timer-model.md, "Out-of-range writes"): a
// reserved value of an enumerated field, a per-channel field of a channel the instance lacks, a
// value wider than its field, or a write to a field that is not data.
program_op out_of_range_write(const models::timer_config& cfg, const run_plan& plan,
                              models::reference::reference_timer& model, sim::time_ps at, dice& d) {
    program_op op;
    op.at = at;
    op.kind = op_kind::write;
    const auto kind = d.range(0, 9);
    if (kind < 3) {  // a reserved value
        op.field = d.pick(std::vector<timer_field>{
            timer_field::mode, timer_field::slope, timer_field::reload_policy, timer_field::action,
            timer_field::action, timer_field::trigger_select});
        const std::vector<std::uint64_t> beyond = {3, d.range(4, 15), 0x10000 | d.range(0, 2),
                                                   0xffff'ffffu};
        switch (op.field) {
            case timer_field::action: {
                op.channel = static_cast<unsigned>(d.range(0, cfg.channels - 1));
                const std::vector<std::uint64_t> reserved = {0x1, 0x2, 0x3, 0x6,  0x7,
                                                             0xb, 0xe, 0xf, 0x14, 0xffff'ffffu};
                op.value = static_cast<std::uint32_t>(d.pick(reserved));
                break;
            }
            case timer_field::trigger_select:
                // A channel the instance lacks (when it lacks any), or beyond the listed sources.
                op.value = static_cast<std::uint32_t>(
                    cfg.channels < 6 && d.chance(0.5)
                        ? models::trigger_on_match(static_cast<unsigned>(d.range(cfg.channels, 5)))
                        : d.pick(std::vector<std::uint64_t>{8, 15, 0xffff'ffffu}));
                break;
            default:
                op.value = static_cast<std::uint32_t>(d.pick(beyond));
                break;
        }
    } else if (kind < 6) {  // a channel the instance lacks
        op.field = d.pick(channel_fields);
        op.channel = static_cast<unsigned>(d.chance(0.9) ? d.range(cfg.channels, 7) : 255);
        op.value = random_value(op.field, cfg, plan, model, at, d);
    } else if (kind < 9) {  // wider than the field
        op.field = d.pick(bounded_fields);
        if (field_limit(cfg, op.field) == 0xffff'ffffu) op.field = timer_field::enable;
        if (is_channel_field(op.field))
            op.channel = static_cast<unsigned>(d.range(0, cfg.channels - 1));
        if (op.field == timer_field::irq_enable) {
            const std::uint32_t lacking = ~valid_flags(cfg);
            std::uint32_t bit = 0;
            do {
                bit = 1u << d.range(0, 31);
            } while ((bit & lacking) == 0);
            op.value = (static_cast<std::uint32_t>(d.range(0, 0x3ff)) & valid_flags(cfg)) | bit;
        } else {
            op.value = wider_than(field_limit(cfg, op.field), d);
        }
    } else {  // not data: the read-only direction, or the flags (cleared, never written)
        op.field = d.chance(0.5) ? timer_field::direction : timer_field::flags;
        op.value = static_cast<std::uint32_t>(d.chance(0.5) ? 0xffff'ffffu : d.range(0, 0x3ff));
    }
    return op;
}

}  // namespace

write_range classify_write(const models::timer_config& cfg, const program_op& op) {
    if (op.kind != op_kind::write) return write_range::in_range;
    if (is_channel_field(op.field) && op.channel >= cfg.channels)
        return write_range::missing_channel;
    switch (op.field) {
        case timer_field::direction:
        case timer_field::flags:
            return write_range::not_data;
        case timer_field::mode:
        case timer_field::slope:
        case timer_field::reload_policy:
        case timer_field::trigger_select:
        case timer_field::action:
        case timer_field::channel_role:
        case timer_field::capture_edge:
        case timer_field::capture_prescaler:
        case timer_field::filter_divider:
        case timer_field::count_source:
        case timer_field::trigger_action:
        case timer_field::trigger_source:
        case timer_field::trigger_edge:
        case timer_field::input_filter:
        case timer_field::trigger_filter:
            return models::is_defined_value(cfg, op.field, op.value) ? write_range::in_range
                                                                     : write_range::reserved_value;
        case timer_field::irq_enable:
            return (op.value & ~valid_flags(cfg)) != 0 ? write_range::too_wide
                                                       : write_range::in_range;
        default:
            return op.value > field_limit(cfg, op.field) ? write_range::too_wide
                                                         : write_range::in_range;
    }
}

void apply_clock_change(sim::clock_domain& domain, const program_op& op) {
    if (op.value == 0)
        domain.stop(op.at);
    else
        domain.change_frequency(op.at, sim::frequency::hz(op.value));
}

std::uint64_t run_ticks(const timer_program& p) {
    sim::clock_domain domain(sim::frequency::hz(p.clock_hz));
    for (const program_op& op : p.ops)
        if (op.kind == op_kind::clock_change) apply_clock_change(domain, op);
    return domain.tick_at(p.end + 1);
}

std::uint32_t apply_op(models::timer_core_if& model, sim::clock_domain& domain,
                       const program_op& op) {
    switch (op.kind) {
        case op_kind::write:
            model.write(op.field, op.channel, op.value, op.at);
            break;
        case op_kind::read:
            return model.read(op.field, op.channel, op.at);
        case op_kind::clear_flags:
            model.clear_flags(op.value, op.at);
            break;
        case op_kind::fault_input:
            model.set_fault_input(op.value != 0, op.at);
            break;
        case op_kind::clock_change:
            apply_clock_change(domain, op);
            model.clock_changed(op.at);
            break;
        case op_kind::input_edge:
            model.set_input(op.channel, op.value != 0, op.at);
            break;
        case op_kind::initial_input:
            model.set_initial_input(op.channel, op.value != 0);
            break;
        case op_kind::chained_pulse:
            model.chained_pulse(op.at);
            break;
    }
    return 0;
}

timer_program generate_program(std::uint64_t seed) {
    dice d(seed * 0x9e3779b97f4a7c15ULL + 12345);
    timer_program p;
    p.seed = seed;
    const run_plan plan = random_plan(d);
    p.config = random_config(plan, d);
    p.clock_hz = d.pick(clock_choices);
    const models::timer_config& cfg = p.config;

    sim::clock_domain domain(sim::frequency::hz(p.clock_hz));
    models::reference::reference_timer model(cfg, domain, nullptr);
    std::uint64_t hz = p.clock_hz;
    auto tick_ps = [&] {
        return std::max<sim::time_ps>(1, sim::ps_per_second / std::max<std::uint64_t>(hz, 1));
    };
    sim::time_ps now = 0;
    auto emit = [&](program_op op) {
        op.at = std::max(op.at, now);
        now = op.at;
        apply_op(model, domain, op);
        p.ops.push_back(op);
    };
    auto write = [&](timer_field f, unsigned ch, std::uint32_t v, sim::time_ps at) {
        emit(program_op{at, op_kind::write, f, ch, v});
    };

    // Inputs that are high from before time 0.
    std::array<bool, models::input_count> level{};
    if (plan.inputs) {
        for (unsigned c = 0; c < cfg.channels; ++c)
            if (d.chance(0.3)) level[models::input_of_channel(c)] = true;
        if (d.chance(0.3)) level[models::trigger_pin_input] = true;
        for (unsigned i = 0; i < models::input_count; ++i)
            if (level[i]) emit(program_op{0, op_kind::initial_input, timer_field::enable, i, 1});
    }

    // Set-up at a random early instant: small period and prescaler so that many wraps happen.
    const sim::time_ps start = d.range(0, 3) * tick_ps();
    write(timer_field::period_preload, 0, d.chance(0.5), start);
    write(timer_field::period, 0, static_cast<std::uint32_t>(d.range(0, 30)), start);
    write(timer_field::prescaler, 0, static_cast<std::uint32_t>(d.chance(0.6) ? 0 : d.range(1, 3)),
          start);
    write(timer_field::mode, 0, static_cast<std::uint32_t>(d.range(0, 2)), start);
    write(timer_field::slope, 0, static_cast<std::uint32_t>(d.range(0, 2)), start);
    if (d.chance(0.5))
        write(timer_field::wrap_skip, 0, static_cast<std::uint32_t>(d.range(0, 3)), start);
    if (cfg.complementary) {
        write(timer_field::dead_time, 0, static_cast<std::uint32_t>(d.range(0, 5)), start);
        write(timer_field::fault_enable, 0, d.chance(0.6), start);
        write(timer_field::fault_latency, 0, static_cast<std::uint32_t>(d.range(0, 3)), start);
    }
    for (unsigned c = 0; c < cfg.channels; ++c) {
        write(timer_field::compare_preload, c, d.chance(0.5), start);
        write(timer_field::compare, c, static_cast<std::uint32_t>(d.range(0, 32)), start);
        write(timer_field::action, c, random_action(d), start);
        write(timer_field::main_enable, c, d.chance(0.85), start);
        write(timer_field::comp_enable, c, d.chance(0.7), start);
        if (d.chance(0.3)) write(timer_field::main_active_low, c, 1, start);
        if (d.chance(0.3)) write(timer_field::comp_active_low, c, 1, start);
        if (d.chance(0.5)) write(timer_field::main_safe_level, c, 1, start);
        if (d.chance(0.5)) write(timer_field::comp_safe_level, c, 1, start);
    }
    write(timer_field::irq_enable, 0,
          static_cast<std::uint32_t>(d.range(0, 0xff)) & valid_flags(cfg), start);
    write(timer_field::trigger_select, 0, static_cast<std::uint32_t>(d.range(0, 1 + cfg.channels)),
          start);
    if (d.chance(0.5)) write(timer_field::force_reload, 0, 1, start);
    // Long programs: their own period and prescaler, loaded by a forced reload, then the counter.
    const std::uint32_t max = cfg.counter_max();
    switch (plan.shape) {
        case program_shape::regular:
            break;
        case program_shape::many_wraps:
            write(timer_field::period, 0, static_cast<std::uint32_t>(d.range(0, 12)), start);
            write(timer_field::prescaler, 0, static_cast<std::uint32_t>(d.range(0, 1)), start);
            write(timer_field::wrap_skip, 0,
                  static_cast<std::uint32_t>(d.range(0, low_bits(cfg.wrap_skip_bits))), start);
            write(timer_field::force_reload, 0, 1, start);
            break;
        case program_shape::near_wide_wrap: {
            const std::uint32_t period =
                d.chance(0.6) ? max : max - static_cast<std::uint32_t>(d.range(0, 100));
            write(timer_field::period, 0, period, start);
            const std::uint32_t prescaler =
                d.chance(0.7) ? static_cast<std::uint32_t>(d.range(0, 3)) : slow_prescaler(cfg, d);
            write(timer_field::prescaler, 0, prescaler, start);
            write(timer_field::force_reload, 0, 1, start);
            // Steps before the wrap: it comes within the first half of the run.
            const std::uint32_t k = static_cast<std::uint32_t>(
                d.range(0, std::min<std::uint64_t>(
                               40, plan.tick_budget / 2 / (prescaler + std::uint64_t{1}))));
            const bool down = model.read(timer_field::mode, 0, start) ==
                              static_cast<std::uint32_t>(models::count_mode::down);
            write(timer_field::counter, 0, down ? k : (d.chance(0.5) ? period : max) - k, start);
            for (unsigned c = 0; c < cfg.channels; ++c)
                if (d.chance(0.5))
                    write(timer_field::compare, c, max - static_cast<std::uint32_t>(d.range(0, 60)),
                          start);
            break;
        }
        case program_shape::slow_prescaler:
            write(timer_field::period, 0, static_cast<std::uint32_t>(d.range(1, 8)), start);
            write(timer_field::prescaler, 0, slow_prescaler(cfg, d), start);
            write(timer_field::force_reload, 0, 1, start);
            break;
    }
    // The input side: captures on some channels, filters, a counting source and a trigger.
    bool encoder = false;
    if (plan.inputs) {
        write(timer_field::filter_divider, 0, static_cast<std::uint32_t>(d.range(0, 3)), start);
        for (unsigned c = 0; c < cfg.channels; ++c) {
            if (d.chance(0.5))
                write(timer_field::channel_role, c, static_cast<std::uint32_t>(d.range(1, 2)),
                      start);
            write(timer_field::capture_edge, c, static_cast<std::uint32_t>(d.range(0, 2)), start);
            write(timer_field::capture_prescaler, c,
                  static_cast<std::uint32_t>(d.chance(0.6) ? 0 : d.range(1, 3)), start);
            write(timer_field::input_filter, c,
                  static_cast<std::uint32_t>(d.range(0, cfg.filter_lengths.size() - 1)), start);
        }
        write(timer_field::trigger_filter, 0,
              static_cast<std::uint32_t>(d.range(0, cfg.filter_lengths.size() - 1)), start);
        write(timer_field::trigger_source, 0, static_cast<std::uint32_t>(d.range(0, 3)), start);
        write(timer_field::trigger_edge, 0, d.chance(0.3), start);
        write(timer_field::trigger_action, 0,
              static_cast<std::uint32_t>(d.chance(0.4) ? 0 : d.range(1, 3)), start);
        const auto source = d.range(0, 9);
        const std::uint32_t count = source < 6 ? 0 : source < 7 ? 1 : source < 9 ? 3 : 2;
        encoder = count >= 2;
        write(timer_field::count_source, 0, count, start);
    }
    write(timer_field::enable, 0, 1, start);

    // The filter length and sampling period of input i, in ticks, as the model stands.
    auto filter_ticks = [&](unsigned i, sim::time_ps t) -> std::uint64_t {
        const std::uint32_t index = i == models::trigger_pin_input
                                        ? model.read(timer_field::trigger_filter, 0, t)
                                        : model.read(timer_field::input_filter, i, t);
        return std::uint64_t{cfg.filter_lengths[index]}
               << model.read(timer_field::filter_divider, 0, t);
    };
    // Quadrature state of inputs 0 (A) and 1 (B), stepped forwards or backwards.
    bool encoder_forward = true;

    bool fault_level = false;
    bool stopped = false;
    // No wrap and no reload event comes before this many ticks unless a write changes the
    // counting (searching ahead for one is the generator's main cost).
    std::uint64_t quiet_until = 0;

    const std::size_t set_up = p.ops.size();
    while (model.ticks() < plan.tick_budget && p.ops.size() < set_up + plan.op_budget) {
        // When.
        sim::time_ps at = now;
        // Regular programs place six operations in ten near a wrap (or a reload event), long ones
        // three, and spread the rest over the run.
        const auto where = d.range(0, 9);
        const std::uint64_t near_share = plan.long_run() ? 3 : 6;
        nearby found = nearby::none;
        if (!stopped && where < near_share && model.ticks() >= quiet_until &&
            model.read(timer_field::enable, 0, now) == 0)
            quiet_until = ~std::uint64_t{0};  // stopped counting stays stopped until a write
        if (!stopped && where < near_share && model.ticks() >= quiet_until) {
            // A wrap after the program's last operation is of no use.
            const std::uint64_t horizon =
                std::min(plan.probe_horizon, plan.tick_budget - model.ticks() + 3);
            found = time_near_next(model, where == near_share - 1, horizon, d, now, at);
            if (found == nearby::none) quiet_until = model.ticks() + horizon;
        }
        if (found != nearby::placed) {
            const std::uint64_t gap =
                d.chance(0.2)
                    ? 0
                    : d.range(1, d.chance(plan.long_run() ? 0.8 : 0.2) ? plan.max_gap : 30);
            at = now + gap * tick_ps() + (d.chance(0.5) ? 0 : d.range(0, tick_ps() - 1));
            // Often land exactly on a tick.
            if (!stopped && d.chance(0.5))
                if (const auto edge = domain.edge_after(at)) at = edge->at;
        }
        // What.
        program_op op;
        op.at = at;
        const auto what = d.range(0, 99);
        if (stopped || (plan.clock_changes && what < 10)) {
            op.kind = op_kind::clock_change;
            if (stopped || d.chance(0.7)) {
                hz = d.pick(clock_choices);
                op.value = static_cast<std::uint32_t>(hz);
                stopped = false;
            } else {
                op.value = 0;
                stopped = true;
            }
        } else if (what < 18) {
            op.kind = op_kind::read;
            const bool per_channel = d.chance(0.3);
            op.field = per_channel
                           ? d.pick(channel_fields)
                           : (d.chance(0.5)
                                  ? timer_field::counter
                                  : (d.chance(0.3) ? timer_field::flags : d.pick(global_fields)));
            if (d.chance(0.1)) op.field = timer_field::direction;
            // Now and then a channel the instance lacks: it reads 0.
            const unsigned last = d.chance(0.05) ? 7 : cfg.channels - 1;
            op.channel = per_channel ? static_cast<unsigned>(d.range(0, last)) : 0;
        } else if (what < 25) {
            op.kind = op_kind::clear_flags;
            op.value = d.chance(0.5) ? 0xffffffffu : static_cast<std::uint32_t>(d.range(0, 0xff));
        } else if (what < 30) {
            op.kind = op_kind::fault_input;
            fault_level = !fault_level;
            op.value = fault_level;
        } else if (what < 36) {
            op = out_of_range_write(cfg, plan, model, std::max(at, now), d);
        } else if (plan.inputs && what < 62) {
            const auto kind = d.range(0, 9);
            if (encoder && cfg.channels >= 2 && kind < 4) {
                // One quadrature step: A, B = 00 -> 10 -> 11 -> 01 -> 00 forwards.
                if (d.chance(0.1)) encoder_forward = !encoder_forward;
                const bool a = level[0], b = level[1];
                const bool move_a = (a == b) == encoder_forward;
                op.kind = op_kind::input_edge;
                op.channel = move_a ? 0 : 1;
            } else if (kind < 8) {
                op.kind = op_kind::input_edge;
                op.channel = random_input(cfg, d);
                if (kind >= 6 && !stopped) {
                    // A glitch around the filter's length: there and back again within about
                    // N sampling periods.
                    const unsigned i = op.channel;
                    const std::uint64_t ticks = filter_ticks(i, std::max(at, now));
                    const auto delta = static_cast<std::int64_t>(d.range(0, 4)) - 2;
                    const std::uint64_t width = static_cast<std::uint64_t>(
                        std::max<std::int64_t>(0, static_cast<std::int64_t>(ticks) + delta));
                    level[i] = !level[i];
                    emit(program_op{at, op_kind::input_edge, timer_field::enable, i, level[i]});
                    op.at =
                        now + width * tick_ps() + (d.chance(0.5) ? 0 : d.range(0, tick_ps() - 1));
                }
            } else {
                op.kind = op_kind::chained_pulse;
            }
            if (op.kind == op_kind::input_edge) {
                level[op.channel] = !level[op.channel];
                op.value = level[op.channel];
            }
        } else {
            op.kind = op_kind::write;
            const auto r = d.range(0, 9);
            if (r < 5) {
                op.field = d.pick(hot_fields);
            } else if (r < 7) {
                op.field = d.pick(channel_fields);
            } else {
                op.field = d.pick(global_fields);
            }
            op.channel = is_channel_field(op.field)
                             ? static_cast<unsigned>(d.range(0, cfg.channels - 1))
                             : 0;
            op.value = random_value(op.field, cfg, plan, model, std::max(at, now), d);
        }
        if (op.kind == op_kind::write && moves_the_counting(op.field)) quiet_until = 0;
        emit(op);
    }
    if (stopped) {
        hz = d.pick(clock_choices);
        emit(program_op{now + tick_ps(), op_kind::clock_change, timer_field::enable, 0,
                        static_cast<std::uint32_t>(hz)});
    }
    // Run on a little past the last operation.
    p.end = now + d.range(1, 200) * tick_ps();
    return p;
}

std::string describe(const program_op& op) {
    std::ostringstream s;
    s << "at " << op.at << " ps: ";
    switch (op.kind) {
        case op_kind::write:
            s << "write " << models::to_string(op.field);
            if (models::is_channel_field(op.field)) s << "[" << op.channel << "]";
            s << " = " << op.value;
            break;
        case op_kind::read:
            s << "read " << models::to_string(op.field);
            if (models::is_channel_field(op.field)) s << "[" << op.channel << "]";
            break;
        case op_kind::clear_flags:
            s << "clear_flags 0x" << std::hex << op.value << std::dec;
            break;
        case op_kind::fault_input:
            s << "fault_input " << op.value;
            break;
        case op_kind::clock_change:
            if (op.value == 0)
                s << "timer clock stops";
            else
                s << "timer clock -> " << op.value << " Hz";
            break;
        case op_kind::input_edge:
        case op_kind::initial_input:
            s << (op.kind == op_kind::initial_input ? "initial " : "") << "input ";
            if (op.channel == models::trigger_pin_input)
                s << "trigger";
            else
                s << op.channel;
            s << " = " << op.value;
            break;
        case op_kind::chained_pulse:
            s << "chained pulse";
            break;
    }
    return s.str();
}

std::string describe(const timer_program& p) {
    std::ostringstream s;
    const models::timer_config& c = p.config;
    s << "program seed " << p.seed << ": counter_bits " << c.counter_bits << ", channels "
      << c.channels << ", prescaler_bits " << c.prescaler_bits << ", wrap_skip_bits "
      << c.wrap_skip_bits << ", prescaler_shadowed " << c.prescaler_shadowed << ", complementary "
      << c.complementary << ", dead_time_max " << c.dead_time_max << ", compare_latency "
      << c.compare_latency << ", input_sync_ticks " << c.input_sync_ticks << ", filter_lengths [";
    for (std::size_t i = 0; i < c.filter_lengths.size(); ++i)
        s << (i ? " " : "") << c.filter_lengths[i];
    s << "], capture_read_clears_flag " << c.capture_read_clears_flag << ", chain_latency "
      << c.chain_latency << "; timer clock " << p.clock_hz << " Hz from 0 ps; end " << p.end
      << " ps; " << p.ops.size() << " operations\n";
    sim::clock_domain domain(sim::frequency::hz(p.clock_hz));
    for (const program_op& op : p.ops) {
        s << "  " << describe(op);
        if (op.kind == op_kind::clock_change) {
            apply_clock_change(domain, op);
        } else {
            // Where the operation sits relative to the timer clock ticks.
            s << "  (after " << domain.tick_at(op.at + 1) << " ticks)";
        }
        s << "\n";
    }
    return s.str();
}

}  // namespace tickbench::differential
