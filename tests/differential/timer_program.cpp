#include "tests/differential/timer_program.h"

#include "models/reference/reference_timer.h"

#include <algorithm>
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

// Picks the time of an operation near the next wrap (or reload event) of the model, if one comes
// within `horizon` ticks: within +/-2 ticks of it, exactly at a tick, just before one, or between.
bool time_near_next(const models::reference::reference_timer& model, bool reload, dice& d,
                    sim::time_ps not_before, sim::time_ps& out) {
    models::reference::reference_timer probe = model;
    probe.set_observer(nullptr);
    std::deque<sim::time_ps> recent;  // times of the last ticks processed by the probe
    const std::uint64_t w0 = probe.wraps(), r0 = probe.reload_events();
    const int horizon = 3000;
    for (int i = 0; i < horizon; ++i) {
        sim::time_ps t = 0;
        if (!probe.next_event(t)) return false;
        probe.advance_to(t);
        recent.push_back(t);
        if (recent.size() > 4) recent.pop_front();
        const bool hit = reload ? probe.reload_events() != r0 : probe.wraps() != w0;
        if (!hit) continue;
        const int offset = static_cast<int>(d.range(0, 4)) - 2;
        sim::time_ps tick = t;
        if (offset < 0) {
            const std::size_t back = static_cast<std::size_t>(-offset);
            if (back >= recent.size()) return false;
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
        return true;
    }
    return false;
}

models::timer_config random_config(dice& d) {
    models::timer_config cfg;
    cfg.counter_bits = static_cast<unsigned>(
        d.chance(0.5) ? d.pick(std::vector<std::uint64_t>{8, 16, 32}) : d.range(8, 32));
    cfg.channels = static_cast<unsigned>(d.range(1, 6));
    cfg.prescaler_bits = static_cast<unsigned>(d.chance(0.7) ? 16 : d.range(1, 32));
    cfg.wrap_skip_bits = static_cast<unsigned>(d.pick(std::vector<std::uint64_t>{0, 1, 3, 8, 16}));
    cfg.prescaler_shadowed = d.chance(0.5);
    cfg.complementary = d.chance(0.5);
    cfg.dead_time_max = static_cast<unsigned>(d.pick(std::vector<std::uint64_t>{0, 3, 15, 1023}));
    cfg.dead_time_scaled = d.chance(0.5);
    cfg.compare_latency = static_cast<unsigned>(d.range(0, 2));
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
    std::uint32_t bits = models::flag_reload;
    for (unsigned c = 0; c < cfg.channels; ++c) bits |= models::flag_channel(c);
    if (cfg.complementary) bits |= models::flag_fault;
    return bits;
}

// A value worth writing to field f, given the model's present state.
std::uint32_t random_value(timer_field f, const models::timer_config& cfg,
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
            if (d.chance(0.05)) return max - static_cast<std::uint32_t>(d.range(0, 2));
            return small_or_edge(period);
        case timer_field::wrap_skip:
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
            return small_or_edge(period);
        case timer_field::action:
            return random_action(d);
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
};
const std::vector<timer_field> channel_fields = {
    timer_field::compare,         timer_field::compare_preload, timer_field::action,
    timer_field::main_enable,     timer_field::main_active_low, timer_field::comp_enable,
    timer_field::comp_active_low, timer_field::main_safe_level, timer_field::comp_safe_level,
};
// Fields that make the counter and pins move; written more often.
const std::vector<timer_field> hot_fields = {
    timer_field::period,  timer_field::counter,      timer_field::prescaler, timer_field::compare,
    timer_field::compare, timer_field::force_reload, timer_field::mode,      timer_field::enable,
    timer_field::action,  timer_field::wrap_skip,
};

// Applies an operation to the generator's model and domain.
void apply(models::reference::reference_timer& model, sim::clock_domain& domain,
           const program_op& op) {
    switch (op.kind) {
        case op_kind::write:
            model.write(op.field, op.channel, op.value, op.at);
            break;
        case op_kind::read:
            model.read(op.field, op.channel, op.at);
            break;
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
    }
}

}  // namespace

void apply_clock_change(sim::clock_domain& domain, const program_op& op) {
    if (op.value == 0)
        domain.stop(op.at);
    else
        domain.change_frequency(op.at, sim::frequency::hz(op.value));
}

timer_program generate_program(std::uint64_t seed) {
    dice d(seed * 0x9e3779b97f4a7c15ULL + 12345);
    timer_program p;
    p.seed = seed;
    p.config = random_config(d);
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
        apply(model, domain, op);
        p.ops.push_back(op);
    };
    auto write = [&](timer_field f, unsigned ch, std::uint32_t v, sim::time_ps at) {
        emit(program_op{at, op_kind::write, f, ch, v});
    };

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
    write(timer_field::enable, 0, 1, start);

    const std::uint64_t tick_budget = d.range(300, 3000);
    const std::size_t op_budget = static_cast<std::size_t>(d.range(10, 120));
    const bool clock_changes = d.chance(0.15);
    bool fault_level = false;
    bool stopped = false;

    while (model.ticks() < tick_budget && p.ops.size() < op_budget + 40) {
        // When.
        sim::time_ps at = now;
        const auto where = d.range(0, 9);
        if (stopped || where >= 6 || !time_near_next(model, where == 5, d, now, at)) {
            const std::uint64_t gap = d.chance(0.2) ? 0 : d.range(1, d.chance(0.2) ? 200 : 30);
            at = now + gap * tick_ps() + (d.chance(0.5) ? 0 : d.range(0, tick_ps() - 1));
            if (!stopped) {
                // Often land exactly on a tick.
                sim::time_ps tk = 0;
                models::reference::reference_timer probe = model;
                probe.advance_to(at);
                if (d.chance(0.5) && probe.next_event(tk)) at = tk;
            }
        }
        // What.
        program_op op;
        op.at = at;
        const auto what = d.range(0, 99);
        if (stopped || (clock_changes && what < 4)) {
            op.kind = op_kind::clock_change;
            if (stopped || d.chance(0.7)) {
                hz = d.pick(clock_choices);
                op.value = static_cast<std::uint32_t>(hz);
                stopped = false;
            } else {
                op.value = 0;
                stopped = true;
            }
        } else if (what < 12) {
            op.kind = op_kind::read;
            const bool per_channel = d.chance(0.3);
            op.field = per_channel
                           ? d.pick(channel_fields)
                           : (d.chance(0.5)
                                  ? timer_field::counter
                                  : (d.chance(0.3) ? timer_field::flags : d.pick(global_fields)));
            if (d.chance(0.1)) op.field = timer_field::direction;
            op.channel = per_channel ? static_cast<unsigned>(d.range(0, cfg.channels - 1)) : 0;
        } else if (what < 20) {
            op.kind = op_kind::clear_flags;
            op.value = d.chance(0.5) ? 0xffffffffu : static_cast<std::uint32_t>(d.range(0, 0xff));
        } else if (what < 26) {
            op.kind = op_kind::fault_input;
            fault_level = !fault_level;
            op.value = fault_level;
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
            op.value = random_value(op.field, cfg, model, std::max(at, now), d);
        }
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
      << c.compare_latency << "; timer clock " << p.clock_hz << " Hz from 0 ps; end " << p.end
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
