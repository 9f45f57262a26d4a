// The generator of the differential test reaches what it must: operations around wraps in every
// counting mode, timer clock changes (stops too) around wraps in half the programs, long programs
// with many wraps, wide counters wrapping at their maximum and large prescalers, and writes the
// specification calls out of range (docs/timer-model.md, "Out-of-range writes"). Each share is
// measured on the reference, so a change of the generator cannot silently drop it.

#include "tests/differential/timer_program.h"

#include "models/reference/reference_timer.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <array>
#include <cstdint>
#include <map>
#include <optional>
#include <set>
#include <vector>

namespace tickbench::differential {
namespace {

using models::timer_field;

// What the reference does on a program.
struct program_trace {
    struct wrap {
        std::uint64_t tick;            // index of the tick the wrap came at
        std::uint32_t mode;            // count mode then
        std::uint32_t counter_before;  // the counter just before that tick
        std::uint32_t prescaler;       // the prescaler register then
    };
    std::vector<wrap> wraps;
    // Each input edge: its time, the input, its filter's length in ticks and the prescaler then.
    struct input_edge {
        sim::time_ps at;
        unsigned input;
        std::uint64_t filter_ticks;
        std::uint32_t prescaler;
    };
    std::vector<input_edge> input_edges;
    std::vector<std::uint64_t> steps;  // indices of the ticks at which the counter moved
    std::uint64_t ticks = 0;           // ticks of the whole run
    sim::clock_domain domain;          // the timer clock with every change of the program
};

program_trace trace(const timer_program& p) {
    program_trace t;
    t.domain = sim::clock_domain(sim::frequency::hz(p.clock_hz));
    models::reference::reference_timer model(p.config, t.domain, nullptr);
    sim::time_ps now = 0;
    auto step_to = [&](sim::time_ps end) {
        sim::time_ps next = 0;
        while (model.next_event(next) && next <= end) {
            const std::uint64_t w = model.wraps();
            const std::uint32_t before = model.read(timer_field::counter, 0, now);
            model.advance_to(next);
            now = next;
            if (model.read(timer_field::counter, 0, now) != before)
                t.steps.push_back(t.domain.tick_at(next));
            if (model.wraps() == w) continue;
            t.wraps.push_back({t.domain.tick_at(next), model.read(timer_field::mode, 0, now),
                               before, model.read(timer_field::prescaler, 0, now)});
        }
    };
    for (const program_op& op : p.ops) {
        // Initial levels hold from before time 0, so they go in before the tick at 0.
        if (op.kind != op_kind::initial_input) step_to(op.at);
        now = std::max(now, op.at);
        if (op.kind == op_kind::input_edge) {
            const std::uint32_t index =
                op.channel == models::trigger_pin_input
                    ? model.read(timer_field::trigger_filter, 0, now)
                    : model.read(timer_field::input_filter, op.channel, now);
            t.input_edges.push_back({op.at, op.channel,
                                     std::uint64_t{p.config.filter_lengths[index]}
                                         << model.read(timer_field::filter_divider, 0, now),
                                     model.read(timer_field::prescaler, 0, now)});
        }
        apply_op(model, t.domain, op);
    }
    step_to(p.end);
    t.ticks = model.ticks();
    return t;
}

// Whether the program counts something other than timer clock ticks (input edges, triggers, an
// encoder): such counters wrap only where the inputs take them, so searching for wraps rarely
// finds one and the ratios below leave them out.
bool counts_inputs(const timer_program& p) {
    return std::any_of(p.ops.begin(), p.ops.end(), [](const program_op& op) {
        return op.kind == op_kind::write && op.field == timer_field::count_source && op.value != 0;
    });
}

// The time of the program's set-up writes (its first write).
sim::time_ps set_up_time(const timer_program& p) {
    for (const program_op& op : p.ops)
        if (op.kind == op_kind::write) return op.at;
    return 0;
}

// The wrap within 2 ticks of an operation at time `at`, if any.
std::optional<program_trace::wrap> wrap_near(const program_trace& t, sim::time_ps at) {
    const std::uint64_t pos = t.domain.tick_at(at + 1);  // ticks at or before the operation
    // A wrap at tick index k has k + 1 ticks at or before it.
    auto it = std::lower_bound(
        t.wraps.begin(), t.wraps.end(), pos,
        [](const program_trace::wrap& w, std::uint64_t p) { return w.tick + 1 + 2 < p; });
    if (it == t.wraps.end() || it->tick + 1 > pos + 2) return std::nullopt;
    return *it;
}

TEST(timer_program_test, writes_around_wraps_in_every_mode) {
    std::size_t writes = 0, near_wrap = 0;
    std::set<std::uint32_t> modes_near_wrap;
    for (std::uint64_t seed = 1; seed <= 150; ++seed) {
        const timer_program p = generate_program(seed);
        if (counts_inputs(p)) continue;
        const program_trace t = trace(p);
        for (const program_op& op : p.ops) {
            if (op.kind != op_kind::write || op.at == set_up_time(p)) continue;
            ++writes;
            if (const auto w = wrap_near(t, op.at)) {
                ++near_wrap;
                modes_near_wrap.insert(w->mode);
            }
        }
    }
    EXPECT_GT(writes, 1000u);
    EXPECT_GT(near_wrap * 4, writes) << near_wrap << " of " << writes << " writes near a wrap";
    EXPECT_EQ(modes_near_wrap.size(), 3u);
}

TEST(timer_program_test, half_the_programs_change_the_clock_around_wraps_and_stop_it) {
    const std::uint64_t programs = 300;
    std::uint64_t changing = 0, stopping = 0, changes = 0, changes_near_wrap = 0,
                  stops_near_wrap = 0;
    for (std::uint64_t seed = 1; seed <= programs; ++seed) {
        const timer_program p = generate_program(seed);
        const program_trace t = trace(p);
        bool changed = false, stopped = false;
        const bool counts_ticks = !counts_inputs(p);
        for (const program_op& op : p.ops) {
            if (op.kind != op_kind::clock_change) continue;
            changed = true;
            changes += counts_ticks;
            const bool near = counts_ticks && wrap_near(t, op.at).has_value();
            changes_near_wrap += near;
            if (op.value != 0) continue;
            stopped = true;
            stops_near_wrap += near;
        }
        changing += changed;
        stopping += stopped;
    }
    EXPECT_GE(changing * 100, programs * 45) << changing << " of " << programs;
    EXPECT_GE(stopping * 100, programs * 25) << stopping << " of " << programs;
    EXPECT_GE(changes_near_wrap * 100, changes * 30) << changes_near_wrap << " of " << changes;
    EXPECT_GE(stops_near_wrap, 30u);
}

TEST(timer_program_test, long_programs_wrap_often_near_wide_maxima_and_slowly) {
    const std::uint64_t programs = 400;
    std::uint64_t long_runs = 0, many_wraps = 0, wide_max_wraps = 0, slow_wraps = 0;
    for (std::uint64_t seed = 1; seed <= programs; ++seed) {
        const timer_program p = generate_program(seed);
        const program_trace t = trace(p);
        long_runs += t.ticks >= 5000;
        many_wraps += t.wraps.size() >= 1000;
        const std::uint32_t max = p.config.counter_max();
        bool wide_max = false, slow = false;
        for (const program_trace::wrap& w : t.wraps) {
            // An up or center counter of 24 bits or more turning at its very top.
            wide_max |= p.config.counter_bits >= 24 && w.mode != 1 && w.counter_before >= max - 1;
            slow |= w.prescaler >= 64;
        }
        wide_max_wraps += wide_max;
        slow_wraps += slow;
    }
    EXPECT_GE(long_runs * 100, programs * 8) << long_runs << " of " << programs;
    EXPECT_GE(many_wraps, 6u);
    EXPECT_GE(wide_max_wraps, 10u);
    EXPECT_GE(slow_wraps, 15u);
}

TEST(timer_program_test, input_edges_land_near_wraps_filter_lengths_and_prescaler_steps) {
    const std::uint64_t programs = 300;
    std::uint64_t edges = 0, near_wrap = 0, around_filter = 0, near_step = 0;
    for (std::uint64_t seed = 1; seed <= programs; ++seed) {
        const timer_program p = generate_program(seed);
        const program_trace t = trace(p);
        std::map<unsigned, sim::time_ps> last_edge;
        for (const program_trace::input_edge& e : t.input_edges) {
            ++edges;
            near_wrap += !counts_inputs(p) && wrap_near(t, e.at).has_value();
            // A pulse whose width lies within two ticks of the filter's length: it passes or is
            // swallowed depending on where the sampling ticks fall.
            if (const auto it = last_edge.find(e.input); it != last_edge.end()) {
                const std::uint64_t width =
                    t.domain.tick_at(e.at + 1) - t.domain.tick_at(it->second + 1);
                around_filter += width + 2 >= e.filter_ticks && width <= e.filter_ticks + 2;
            }
            last_edge[e.input] = e.at;
            // With a prescaler, within a tick of a counter step: the edge meets the prescaler's
            // boundary.
            if (e.prescaler == 0) continue;
            const std::uint64_t k = t.domain.tick_at(e.at + 1);
            const auto s = std::lower_bound(t.steps.begin(), t.steps.end(), k > 1 ? k - 1 : 0);
            near_step += s != t.steps.end() && *s <= k + 1;
        }
    }
    EXPECT_GT(edges, 1500u);
    EXPECT_GE(near_wrap * 100, edges * 10) << near_wrap << " of " << edges;
    EXPECT_GE(around_filter * 100, edges * 12) << around_filter << " of " << edges;
    EXPECT_GE(near_step * 100, edges * 10) << near_step << " of " << edges;
}

TEST(timer_program_test, writes_out_of_range_values_of_every_kind) {
    std::array<std::uint64_t, 5> by_kind{};
    std::uint64_t writes = 0, programs_with_any = 0;
    const std::uint64_t programs = 300;
    for (std::uint64_t seed = 1; seed <= programs; ++seed) {
        const timer_program p = generate_program(seed);
        bool any = false;
        for (const program_op& op : p.ops) {
            if (op.kind != op_kind::write) continue;
            ++writes;
            const write_range r = classify_write(p.config, op);
            ++by_kind[static_cast<std::size_t>(r)];
            any |= r != write_range::in_range;
        }
        programs_with_any += any;
    }
    const auto share = [&](write_range r) { return by_kind[static_cast<std::size_t>(r)]; };
    EXPECT_GE(programs_with_any * 100, programs * 80) << programs_with_any << " of " << programs;
    // Per thousand writes.
    EXPECT_GE(share(write_range::reserved_value) * 1000, writes * 10)
        << share(write_range::reserved_value);
    EXPECT_GE(share(write_range::missing_channel) * 1000, writes * 6)
        << share(write_range::missing_channel);
    EXPECT_GE(share(write_range::too_wide) * 1000, writes * 15) << share(write_range::too_wide);
    EXPECT_GE(share(write_range::not_data) * 1000, writes * 2) << share(write_range::not_data);
}

TEST(timer_program_test, classifies_writes_by_the_specification) {
    models::timer_config cfg;
    cfg.counter_bits = 16;
    cfg.channels = 2;
    cfg.prescaler_bits = 8;
    cfg.wrap_skip_bits = 0;
    cfg.dead_time_max = 15;
    cfg.complementary = false;
    auto of = [&](timer_field f, std::uint32_t v, unsigned ch = 0) {
        return classify_write(cfg, program_op{0, op_kind::write, f, ch, v});
    };
    // docs/timer-model.md, "Out-of-range writes" and "Encodings".
    EXPECT_EQ(of(timer_field::mode, 2), write_range::in_range);
    EXPECT_EQ(of(timer_field::mode, 3), write_range::reserved_value);
    EXPECT_EQ(of(timer_field::action, 0x6), write_range::reserved_value);
    EXPECT_EQ(of(timer_field::trigger_select, models::trigger_on_match(2)),
              write_range::reserved_value);
    EXPECT_EQ(of(timer_field::trigger_select, models::trigger_on_reload), write_range::in_range);
    EXPECT_EQ(of(timer_field::compare, 5, 2), write_range::missing_channel);
    EXPECT_EQ(of(timer_field::compare, 0xffff, 1), write_range::in_range);
    EXPECT_EQ(of(timer_field::compare, 0x10000, 1), write_range::too_wide);
    EXPECT_EQ(of(timer_field::prescaler, 0x100), write_range::too_wide);
    EXPECT_EQ(of(timer_field::wrap_skip, 1), write_range::too_wide);
    EXPECT_EQ(of(timer_field::dead_time, 16), write_range::too_wide);
    EXPECT_EQ(of(timer_field::enable, 2), write_range::too_wide);
    EXPECT_EQ(of(timer_field::irq_enable, models::flag_fault), write_range::too_wide);
    EXPECT_EQ(of(timer_field::irq_enable, models::flag_reload | models::flag_channel(1)),
              write_range::in_range);
    EXPECT_EQ(of(timer_field::direction, 1), write_range::not_data);
    EXPECT_EQ(of(timer_field::fault_latency, 0xffff'ffffu), write_range::in_range);
}

}  // namespace
}  // namespace tickbench::differential
