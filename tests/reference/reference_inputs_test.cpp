// Unit tests of the reference timer's input side (docs/timer-model.md, "Inputs"): synchronisers,
// filters, captures, the trigger, counting sources and trigger actions, each worked out by hand
// from the page.
//
// Conventions of these tests: set-up writes come right after tick 0, so they act from tick 1 on;
// with `enable` written then, the counter steps at tick 1 and reads k at tick k (period max). An
// input change "before tick k" comes between ticks k - 1 and k, so the sample at tick k is the
// first to see it; with the default synchroniser (S = 2) and filter length 1 it makes a filtered
// edge at tick k + 1.

#include "tests/reference/reference_fixture.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <stdexcept>
#include <utility>
#include <vector>

namespace tickbench::test_reference {
namespace {

using models::capture_edge;
using models::channel_role;
using models::count_mode;
using models::count_source;
using models::flag_channel;
using models::flag_overcapture;
using models::flag_reload;
using models::flag_trigger;
using models::input_of_channel;
using models::timer_config;
using models::trigger_action;
using models::trigger_pin_input;
using models::trigger_source;
using test_support::timer_event_kind;

timer_config input_config() {
    timer_config cfg;
    cfg.counter_bits = 16;
    cfg.channels = 4;
    cfg.prescaler_shadowed = false;
    return cfg;  // synchroniser 2, filter lengths {1, 2, 4, 8}, reads clear capture flags
}

// The encoding of an enumerated value, for writes.
template <typename E>
std::uint32_t u(E e) {
    return static_cast<std::uint32_t>(e);
}

// Input `input` goes to `level` between ticks k - 1 and k (the sample at tick k sees it first).
void set_before(reference_fixture& fx, unsigned input, bool level, std::uint64_t k) {
    fx.timer.set_input(input, level, fx.at(k - 1) + 1000);
}

// A pulse on `input`: high from the sample at tick `first` through the sample at tick `last` (low
// again before tick last + 1). last = first - 1 makes a pulse that no tick samples.
void pulse(reference_fixture& fx, unsigned input, std::uint64_t first, std::uint64_t last) {
    fx.timer.set_input(input, true, fx.at(first - 1) + 1000);
    fx.timer.set_input(input, false, fx.at(last) + 2000);
}

std::vector<std::uint64_t> ticks_of(const reference_fixture& fx,
                                    const std::vector<sim::time_ps>& ts) {
    std::vector<std::uint64_t> out;
    for (auto t : ts) out.push_back(fx.tick_of(t));
    return out;
}

std::vector<std::uint64_t> trigger_ticks(const reference_fixture& fx) {
    return ticks_of(fx, fx.log.of_kind(timer_event_kind::trigger));
}

// Makes every accepted trigger visible as a trigger pulse at its tick: a restart sends one with
// trigger_select 7 (the counter is stopped, so no wrap sends any).
void trigger_pulse_per_accepted_trigger(reference_fixture& fx, trigger_source source) {
    fx.write(0, timer_field::trigger_source, u(source));
    fx.write(0, timer_field::trigger_action, u(trigger_action::restart));
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
}

// ---- synchroniser ----

class synchroniser_test : public ::testing::TestWithParam<unsigned> {};

TEST_P(synchroniser_test, an_edge_shows_s_minus_one_ticks_after_its_first_sample) {
    timer_config cfg = input_config();
    cfg.input_sync_ticks = GetParam();
    reference_fixture fx(cfg);
    trigger_pulse_per_accepted_trigger(fx, trigger_source::channel_0_input);
    // Rises between ticks 9 and 10: sampled first at 10, synchronised at 10 + S - 1, and the
    // filter of length 1 at divider 1 passes it at that tick.
    set_before(fx, input_of_channel(0), true, 10);
    set_before(fx, input_of_channel(0), false, 20);
    // Rises exactly at tick 30's instant: tick 30's sample does not see it (it comes after the
    // tick), so it is sampled first at 31 and shows at 31 + S - 1.
    fx.timer.set_input(input_of_channel(0), true, fx.at(30));
    fx.run_to(50);
    const std::uint64_t s = GetParam();
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{10 + s - 1, 31 + s - 1}));
}

INSTANTIATE_TEST_SUITE_P(depths, synchroniser_test, ::testing::Values(1u, 2u, 3u));

// ---- filters ----

// Watches channel 0's filtered input: its rising edges are accepted triggers (the trigger flag,
// set once), its falling edges captures of channel 1 (the neighbour's input; channel 1's flag).
void watch_channel_0_input(reference_fixture& fx, std::uint32_t filter_index,
                           std::uint32_t divider) {
    fx.write(0, timer_field::input_filter, filter_index, 0);
    fx.write(0, timer_field::filter_divider, divider);
    fx.write(0, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(0, timer_field::channel_role, u(channel_role::capture_neighbour), 1);
    fx.write(0, timer_field::capture_edge, u(capture_edge::falling), 1);
}

struct filter_case {
    std::uint32_t divider;      // filter_divider: D = 2^divider
    std::uint32_t index;        // into the default lengths {1, 2, 4, 8}
    std::uint64_t first;        // first high sample of both pulses
    std::uint64_t glitch_last;  // last high sample of a pulse one sampling tick too short
    std::uint64_t pass_last;    // last high sample of a pulse exactly long enough
    std::uint64_t rise, fall;   // the long enough pulse's filtered edges
};

class filter_test : public ::testing::TestWithParam<filter_case> {};

// Synchroniser depth 1, so the synchronised level at tick k is the sample at k. A pulse whose
// synchronised level is high at m sampling ticks counts 1..m there and falls back to 0 at the next
// one: it passes a filter of length N if m >= N, rising at its N-th high sampling tick; its fall
// then needs N low sampling ticks.
//   D = 1, N = 1: glitch with no sample (rise and fall between ticks 9 and 10); the pulse sampled
//     at 10 only rises at 10 and falls at 11.
//   D = 1, N = 2: glitch sampled at 10 (count 1); pulse sampled at 10, 11: rises at 11; low at
//     12, 13: falls at 13.
//   D = 1, N = 4: glitch 10..12 (counts 1..3); pulse 10..13: rises at 13; falls at 14 + 3 = 17.
//   D = 4, N = 1: sampling ticks 40, 44...; glitch with no sample; pulse high at 40..43 (sampling
//     tick 40): rises at 40, falls at 44.
//   D = 4, N = 2: glitch 40..43 (one sampling tick); pulse 40..47 (40, 44): rises at 44; low at
//     48, 52: falls at 52.
//   D = 4, N = 4: glitch 40..51 (40, 44, 48); pulse 40..55 (40..52): rises at 52; low at 56, 60,
//     64, 68: falls at 68.
TEST_P(filter_test, swallows_a_glitch_one_sample_short_and_passes_one_long_enough) {
    const filter_case c = GetParam();
    timer_config cfg = input_config();
    cfg.input_sync_ticks = 1;
    {
        reference_fixture fx(cfg);
        watch_channel_0_input(fx, c.index, c.divider);
        pulse(fx, input_of_channel(0), c.first, c.glitch_last);
        fx.run_to(200);
        EXPECT_TRUE(fx.log.flag_sets(flag_trigger).empty());
        EXPECT_TRUE(fx.log.flag_sets(flag_channel(1)).empty());
    }
    reference_fixture fx(cfg);
    watch_channel_0_input(fx, c.index, c.divider);
    pulse(fx, input_of_channel(0), c.first, c.pass_last);
    fx.run_to(200);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{c.rise}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(1))),
              (std::vector<std::uint64_t>{c.fall}));
}

INSTANTIATE_TEST_SUITE_P(lengths_and_dividers, filter_test,
                         ::testing::Values(filter_case{0, 0, 10, 9, 10, 10, 11},
                                           filter_case{0, 1, 10, 10, 11, 11, 13},
                                           filter_case{0, 2, 10, 12, 13, 13, 17},
                                           filter_case{2, 0, 40, 39, 43, 40, 44},
                                           filter_case{2, 1, 40, 43, 47, 44, 52},
                                           filter_case{2, 2, 40, 51, 55, 52, 68}));

TEST(reference_inputs_test, a_pulse_between_sampling_ticks_is_not_seen) {
    timer_config cfg = input_config();
    cfg.input_sync_ticks = 1;
    reference_fixture fx(cfg);
    watch_channel_0_input(fx, 0, 2);  // N = 1, D = 4: sampling ticks 40 and 44
    // High at the samples of ticks 41..43: the synchroniser sees it, no sampling tick does.
    pulse(fx, input_of_channel(0), 41, 43);
    fx.run_to(100);
    EXPECT_TRUE(fx.log.flag_sets(flag_trigger).empty());
}

TEST(reference_inputs_test, a_filter_write_restarts_the_filter_count) {
    timer_config cfg = input_config();
    cfg.input_sync_ticks = 1;
    for (const timer_field f : {timer_field::input_filter, timer_field::filter_divider}) {
        reference_fixture fx(cfg);
        watch_channel_0_input(fx, 2, 0);  // N = 4, D = 1
        set_before(fx, input_of_channel(0), true, 10);
        // Counts 1, 2, 3 at ticks 10, 11, 12; the write after tick 12 (of the same value) sets the
        // count to 0, so it reaches 4 at tick 16 instead of 13.
        fx.write(12, f, f == timer_field::input_filter ? 2 : 0, 0);
        fx.run_to(30);
        EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{16}))
            << models::to_string(f);
    }
}

TEST(reference_inputs_test, the_trigger_pin_has_its_own_filter) {
    reference_fixture fx(input_config());
    trigger_pulse_per_accepted_trigger(fx, trigger_source::trigger_pin);
    fx.write(0, timer_field::trigger_filter, 1);   // N = 2
    fx.write(0, timer_field::input_filter, 3, 0);  // channel 0's filter: not this input's
    // S = 2: the pulse sampled at 10 only is synchronised at 11 only: count 1, then 0.
    pulse(fx, trigger_pin_input, 10, 10);
    // Sampled at 20, 21: synchronised at 21, 22: counts 1, 2: the filtered level rises at 22.
    pulse(fx, trigger_pin_input, 20, 21);
    fx.run_to(40);
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{22}));
}

// ---- captures ----

// The counter counts every tick from tick 1, so a capture at tick k reads k.
void count_ticks(reference_fixture& fx) { fx.write(0, timer_field::enable, 1); }

TEST(reference_inputs_test, captures_rising_falling_and_both_edges_of_own_and_neighbour_input) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 2);
    fx.write(0, timer_field::capture_edge, u(capture_edge::rising), 2);
    fx.write(0, timer_field::channel_role, u(channel_role::capture_neighbour), 3);
    fx.write(0, timer_field::capture_edge, u(capture_edge::falling), 3);
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(0, timer_field::capture_edge, u(capture_edge::both), 0);
    fx.write(0, timer_field::channel_role, u(channel_role::capture_neighbour), 1);
    fx.write(0, timer_field::capture_edge, u(capture_edge::falling), 1);
    count_ticks(fx);
    // Input 2: filtered rise at 11, fall at 21. Input 0: rise at 31, fall at 41.
    set_before(fx, input_of_channel(2), true, 10);
    set_before(fx, input_of_channel(2), false, 20);
    set_before(fx, input_of_channel(0), true, 30);
    EXPECT_EQ(fx.read(35, timer_field::compare, 0), 31u);  // both edges: the rise at 31
    set_before(fx, input_of_channel(0), false, 40);
    fx.run_to(50);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(2))), (std::vector<std::uint64_t>{11}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(3))), (std::vector<std::uint64_t>{21}));
    // Channel 0's flag: set at 31, cleared by the read after tick 35, set again at 41.
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(0))),
              (std::vector<std::uint64_t>{31, 41}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(1))), (std::vector<std::uint64_t>{41}));
    EXPECT_EQ(fx.read(50, timer_field::compare, 2), 11u);
    EXPECT_EQ(fx.read(50, timer_field::compare, 3), 21u);
    EXPECT_EQ(fx.read(50, timer_field::compare, 0), 41u);
    EXPECT_EQ(fx.read(50, timer_field::compare, 1), 41u);
    EXPECT_EQ(fx.read(50, timer_field::flags) & 0xffff'00ffu, 0u);  // all read, no over-capture
}

class capture_prescaler_test : public ::testing::TestWithParam<std::uint32_t> {};

// Seventeen rising edges of input 0, filtered at ticks 11, 21, ..., 171. With capture_prescaler
// p the channel captures at the 2^p-th, 2 x 2^p-th... taken edge; the compare value read right
// after each edge (at 12, 22, ...) is the last capture:
//   p = 0: every edge: 11, 21, ..., 171
//   p = 1: edges 2, 4, ..., 16: 0, 21, 21, 41, 41, ..., 161, 161
//   p = 2: edges 4, 8, 12, 16: 0 x 3, 41 x 4, 81 x 4, 121 x 4, 161 x 2
//   p = 3: edges 8, 16: 0 x 7, 81 x 8, 161 x 2
TEST_P(capture_prescaler_test, captures_every_2_to_the_p_th_taken_edge) {
    static const std::vector<std::uint32_t> expected[4] = {
        {11, 21, 31, 41, 51, 61, 71, 81, 91, 101, 111, 121, 131, 141, 151, 161, 171},
        {0, 21, 21, 41, 41, 61, 61, 81, 81, 101, 101, 121, 121, 141, 141, 161, 161},
        {0, 0, 0, 41, 41, 41, 41, 81, 81, 81, 81, 121, 121, 121, 121, 161, 161},
        {0, 0, 0, 0, 0, 0, 0, 81, 81, 81, 81, 81, 81, 81, 81, 161, 161},
    };
    const std::uint32_t p = GetParam();
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(0, timer_field::capture_prescaler, p, 0);
    count_ticks(fx);
    std::vector<std::uint32_t> reads;
    for (std::uint64_t i = 0; i < 17; ++i) {
        set_before(fx, input_of_channel(0), true, 10 * i + 10);
        reads.push_back(fx.read(10 * i + 12, timer_field::compare, 0));
        set_before(fx, input_of_channel(0), false, 10 * i + 15);
    }
    EXPECT_EQ(reads, expected[p]);
}

INSTANTIATE_TEST_SUITE_P(prescalers, capture_prescaler_test, ::testing::Values(0u, 1u, 2u, 3u));

TEST(reference_inputs_test, a_capture_prescaler_write_restarts_the_capture_count) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(0, timer_field::capture_prescaler, 2, 0);  // every 4th rising edge
    count_ticks(fx);
    // Rising edges filtered at 11, 21, 31, ..., 91. After three (tick 35) the count is 3; the
    // write of the same value sets it to 0, so the capture comes at the 4th edge after it: 71.
    for (std::uint64_t i = 0; i < 9; ++i) {
        set_before(fx, input_of_channel(0), true, 10 * i + 10);
        set_before(fx, input_of_channel(0), false, 10 * i + 15);
        if (i == 2) fx.write(35, timer_field::capture_prescaler, 2, 0);
    }
    fx.run_to(100);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(0))), (std::vector<std::uint64_t>{71}));
    EXPECT_EQ(fx.read(100, timer_field::compare, 0), 71u);
}

TEST(reference_inputs_test, period_measured_across_a_counter_wrap) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::period, 99);
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    count_ticks(fx);  // counter k mod 100 at tick k: 0 again at tick 100
    // Rising edges filtered at 90 and 120: captures 90, then 20 after the wrap; the period is
    // (20 - 90 + 100) mod 100 = 30 ticks.
    set_before(fx, input_of_channel(0), true, 89);
    const std::uint32_t first = fx.read(95, timer_field::compare, 0);
    set_before(fx, input_of_channel(0), false, 100);
    set_before(fx, input_of_channel(0), true, 119);
    const std::uint32_t second = fx.read(125, timer_field::compare, 0);
    EXPECT_EQ(first, 90u);
    EXPECT_EQ(second, 20u);
    EXPECT_EQ((second + 100 - first) % 100, 30u);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_reload)), (std::vector<std::uint64_t>{100}));
}

TEST(reference_inputs_test, a_second_capture_before_the_read_sets_the_over_capture_flag) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 1);
    count_ticks(fx);
    for (std::uint64_t k : {10u, 20u}) {  // rising edges filtered at 11, 21
        set_before(fx, input_of_channel(1), true, k);
        set_before(fx, input_of_channel(1), false, k + 5);
    }
    fx.run_to(25);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_overcapture(1))),
              (std::vector<std::uint64_t>{21}));
    EXPECT_EQ(fx.read(25, timer_field::compare, 1), 21u);  // clears bit 1 only
    EXPECT_EQ(fx.read(25, timer_field::flags), flag_overcapture(1));
    // The capture at 31 finds bit 1 clear: no new over-capture (and bit 16 + 1 is still set).
    set_before(fx, input_of_channel(1), true, 30);
    fx.run_to(40);
    EXPECT_EQ(fx.log.flag_sets(flag_overcapture(1)).size(), 1u);
    EXPECT_EQ(fx.read(40, timer_field::flags), flag_channel(1) | flag_overcapture(1));
    fx.timer.clear_flags(flag_overcapture(1), fx.at(40));
    EXPECT_EQ(fx.read(40, timer_field::flags), flag_channel(1));
}

TEST(reference_inputs_test, reading_a_capture_clears_its_flag_when_the_instance_says_so) {
    for (const bool clears : {true, false}) {
        timer_config cfg = input_config();
        cfg.capture_read_clears_flag = clears;
        reference_fixture fx(cfg);
        fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
        fx.write(0, timer_field::irq_enable, flag_channel(0));
        count_ticks(fx);
        set_before(fx, input_of_channel(0), true, 10);  // captured at 11
        // Read halfway between ticks 15 and 16: the flag clears then, the line falls at 16.
        EXPECT_EQ(fx.timer.read(timer_field::compare, 0, fx.at(15) + 5000), 11u);
        fx.run_to(30);
        const std::vector<std::uint64_t> irq = ticks_of(fx, fx.log.of_kind(timer_event_kind::irq));
        if (clears) {
            EXPECT_EQ(irq, (std::vector<std::uint64_t>{11, 16}));
            EXPECT_EQ(fx.read(30, timer_field::flags) & flag_channel(0), 0u);
        } else {
            EXPECT_EQ(irq, (std::vector<std::uint64_t>{11}));
            EXPECT_EQ(fx.read(30, timer_field::flags) & flag_channel(0), flag_channel(0));
        }
    }
}

TEST(reference_inputs_test, a_capture_channel_ignores_compare_writes_and_keeps_its_level) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::action, u(models::output_action::force_high), 0);
    fx.write(0, timer_field::main_enable, 1, 0);
    fx.write(5, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(5, timer_field::action, u(models::output_action::force_low), 0);
    fx.write(5, timer_field::compare, 7, 0);
    EXPECT_EQ(fx.read(5, timer_field::compare, 0), 0u);
    fx.run_to(20);
    // force_high from tick 1; after the role write the level holds whatever the action says.
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(models::main_pin(0), true)),
              (std::vector<std::uint64_t>{1}));
    EXPECT_TRUE(fx.log.pin_edges(models::main_pin(0), false).empty());
}

TEST(reference_inputs_test, a_capture_drops_a_compare_value_still_waiting_out_the_latency) {
    timer_config cfg = input_config();
    cfg.compare_latency = 2;
    reference_fixture fx(cfg);
    fx.write(0, timer_field::period, 19);  // the counter reads k mod 20 at tick k
    fx.write(0, timer_field::trigger_select, models::trigger_on_match(0));
    count_ticks(fx);
    // Written after tick 10 under latency 2, 50 would become active at tick 13.
    fx.write(10, timer_field::compare, 50, 0);
    fx.write(10, timer_field::channel_role, u(channel_role::capture_own), 0);
    set_before(fx, input_of_channel(0), true, 11);  // captured at 12: 12
    fx.write(14, timer_field::channel_role, u(channel_role::compare), 0);
    EXPECT_EQ(fx.read(14, timer_field::compare, 0), 12u);
    // The dropped 50 never lands: compare 12 matches at 32 and 52 (50 would never match).
    fx.run_to(60);
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{32, 52}));
}

// ---- the classic measurement, trigger actions ----

TEST(reference_inputs_test, period_and_pulse_width_on_one_input_with_restart) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(0, timer_field::capture_edge, u(capture_edge::rising), 0);
    fx.write(0, timer_field::channel_role, u(channel_role::capture_neighbour), 1);
    fx.write(0, timer_field::capture_edge, u(capture_edge::falling), 1);
    fx.write(0, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(0, timer_field::trigger_action, u(trigger_action::restart));
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    count_ticks(fx);
    // Input 0: period 50 ticks, high 20: filtered rises at 11, 61, 111, 161, falls at 31, 81...
    // At 11: channel 0 captures 11 (counting since tick 1), then the restart sets the counter to
    // 0. At 31 the counter is 20: channel 1 captures the high time. At 61 it is 50: channel 0
    // captures the period before the restart.
    set_before(fx, input_of_channel(0), true, 10);
    EXPECT_EQ(fx.read(20, timer_field::compare, 0), 11u);
    EXPECT_EQ(fx.read(20, timer_field::counter), 9u);
    set_before(fx, input_of_channel(0), false, 30);
    set_before(fx, input_of_channel(0), true, 60);
    EXPECT_EQ(fx.read(70, timer_field::compare, 0), 50u);
    EXPECT_EQ(fx.read(70, timer_field::compare, 1), 20u);
    for (std::uint64_t k = 110; k < 200; k += 50) {
        set_before(fx, input_of_channel(0), false, k - 30);
        set_before(fx, input_of_channel(0), true, k);
    }
    set_before(fx, input_of_channel(0), false, 180);
    EXPECT_EQ(fx.read(190, timer_field::compare, 0), 50u);
    EXPECT_EQ(fx.read(190, timer_field::compare, 1), 20u);
    // The restart is a forced reload at the trigger's tick: its flag and pulse come at that tick.
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{11, 61, 111, 161}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_reload)), (std::vector<std::uint64_t>{11}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{11}));
}

TEST(reference_inputs_test, gate_counts_only_while_the_trigger_is_active) {
    for (const std::uint32_t edge : {0u, 1u}) {
        reference_fixture fx(input_config());
        fx.write(0, timer_field::trigger_source, u(trigger_source::trigger_pin));
        fx.write(0, timer_field::trigger_edge, edge);
        fx.write(0, timer_field::trigger_action, u(trigger_action::gate));
        count_ticks(fx);
        // The pin's filtered level is high at ticks 11..30. Open while high: counting events at
        // 11..30; open while low: at 1..10, then 31..40.
        set_before(fx, trigger_pin_input, true, 10);
        EXPECT_EQ(fx.read(10, timer_field::counter), edge == 0 ? 0u : 10u);
        EXPECT_EQ(fx.read(15, timer_field::counter), edge == 0 ? 5u : 10u);
        set_before(fx, trigger_pin_input, false, 30);
        EXPECT_EQ(fx.read(40, timer_field::counter), 20u);
    }
}

TEST(reference_inputs_test, start_enables_the_counter_from_the_next_tick) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::period, 4);
    fx.write(0, timer_field::one_pulse, 1);
    fx.write(0, timer_field::trigger_source, u(trigger_source::trigger_pin));
    fx.write(0, timer_field::trigger_action, u(trigger_action::start));
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    // Accepted triggers at 11 and 51.
    set_before(fx, trigger_pin_input, true, 10);
    EXPECT_EQ(fx.read(10, timer_field::enable), 0u);
    EXPECT_EQ(fx.read(11, timer_field::enable), 1u);
    EXPECT_EQ(fx.read(11, timer_field::counter), 0u);
    EXPECT_EQ(fx.read(12, timer_field::counter), 1u);
    // 1..4 at ticks 12..15, the wrap at 16 is a reload event and one_pulse stops the counter.
    EXPECT_EQ(fx.read(20, timer_field::enable), 0u);
    set_before(fx, trigger_pin_input, false, 30);
    set_before(fx, trigger_pin_input, true, 50);
    fx.run_to(70);
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{16, 56}));
}

TEST(reference_inputs_test, trigger_edges_count_through_the_prescaler) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::count_source, u(count_source::trigger_edges));
    fx.write(0, timer_field::trigger_source, u(trigger_source::trigger_pin));
    fx.write(0, timer_field::prescaler, 1);  // factor 2
    count_ticks(fx);
    // Accepted triggers at 11, 21, 31, 41, 51: pcount 1, step to 1, pcount 1, step to 2, pcount 1.
    // Read just before and at each: 0 0, 0 1, 1 1, 1 2, 2 2.
    std::vector<std::uint32_t> reads;
    for (std::uint64_t k = 10; k <= 50; k += 10) {
        set_before(fx, trigger_pin_input, true, k);
        reads.push_back(fx.read(k, timer_field::counter));
        reads.push_back(fx.read(k + 1, timer_field::counter));
        set_before(fx, trigger_pin_input, false, k + 5);
    }
    EXPECT_EQ(reads, (std::vector<std::uint32_t>{0, 0, 0, 1, 1, 1, 1, 2, 2, 2}));
    fx.write(60, timer_field::enable, 0);  // no counting while disabled
    set_before(fx, trigger_pin_input, true, 70);
    EXPECT_EQ(fx.read(80, timer_field::counter), 2u);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{11}));
}

TEST(reference_inputs_test, a_trigger_selection_write_makes_no_edge) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(0, timer_field::trigger_action, u(trigger_action::start));
    set_before(fx, trigger_pin_input, true, 5);  // filtered high from 6
    // Channel 0's input is low, the pin high: switching to the pin, then to falling edges of
    // channel 0's (low) input, changes the level seen but is no filtered edge.
    fx.write(10, timer_field::trigger_source, u(trigger_source::trigger_pin));
    fx.write(20, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(20, timer_field::trigger_edge, 1);
    fx.run_to(40);
    EXPECT_TRUE(fx.log.flag_sets(flag_trigger).empty());
    EXPECT_EQ(fx.read(40, timer_field::enable), 0u);
}

// ---- the chained input ----

class chain_latency_test : public ::testing::TestWithParam<unsigned> {};

TEST_P(chain_latency_test, a_chained_pulse_is_a_trigger_latency_ticks_after_the_next_tick) {
    timer_config cfg = input_config();
    cfg.chain_latency = GetParam();
    reference_fixture fx(cfg);
    trigger_pulse_per_accepted_trigger(fx, trigger_source::chained);
    const std::uint64_t l = GetParam();
    // Between ticks 10 and 11: n = 11. Exactly at tick 20: it comes after that tick, n = 21.
    fx.timer.chained_pulse(fx.at(10) + 1000);
    fx.timer.chained_pulse(fx.at(20));
    // Lands at 41 + L while another source is chosen: lost.
    fx.write(30, timer_field::trigger_source, u(trigger_source::trigger_pin));
    fx.timer.chained_pulse(fx.at(40) + 1000);
    fx.run_to(60);
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{11 + l, 21 + l}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{11 + l}));
}

INSTANTIATE_TEST_SUITE_P(latencies, chain_latency_test, ::testing::Values(0u, 2u));

TEST(reference_inputs_test, a_gate_on_the_chained_input_never_opens) {
    for (const std::uint32_t edge : {0u, 1u}) {
        reference_fixture fx(input_config());
        fx.write(0, timer_field::trigger_source, u(trigger_source::chained));
        fx.write(0, timer_field::trigger_edge, edge);
        fx.write(0, timer_field::trigger_action, u(trigger_action::gate));
        count_ticks(fx);
        fx.timer.chained_pulse(fx.at(5) + 1000);
        EXPECT_EQ(fx.read(20, timer_field::counter), 0u);
    }
}

// ---- the encoder ----

// Drives the quadrature inputs A (channel 0's) and B (channel 1's) one edge every 5 ticks.
// Forward: 00 -> 10 -> 11 -> 01 -> 00 (A leads): toggle A where A == B, else B; backward the
// other way round. With synchroniser depth 1 and filter length 1 an edge "before tick k" is a
// filtered edge at k.
struct quadrature {
    reference_fixture& fx;
    bool a = false, b = false;
    std::uint64_t next = 10;  // the tick of the next edge

    void steps(unsigned n, bool forward) {
        for (unsigned i = 0; i < n; ++i, next += 5) {
            const bool toggle_a = (a == b) == forward;
            if (toggle_a) {
                a = !a;
                set_before(fx, input_of_channel(0), a, next);
            } else {
                b = !b;
                set_before(fx, input_of_channel(1), b, next);
            }
        }
    }
    // The tick of the last edge so far.
    std::uint64_t last() const { return next - 5; }
    // The counter and the direction read right after the last edge.
    std::pair<std::uint32_t, std::uint32_t> position() {
        return {fx.read(last(), timer_field::counter), fx.read(last(), timer_field::direction)};
    }
};

using position = std::pair<std::uint32_t, std::uint32_t>;  // counter, direction (1: down)

timer_config encoder_config() {
    timer_config cfg = input_config();
    cfg.input_sync_ticks = 1;
    return cfg;
}

void start_encoder(reference_fixture& fx, count_source source, std::uint32_t period) {
    fx.write(0, timer_field::count_source, u(source));
    fx.write(0, timer_field::period, period);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
}

TEST(reference_inputs_test, encoder_x4_counts_every_edge_both_ways_and_wraps_at_the_period) {
    reference_fixture fx(encoder_config());
    start_encoder(fx, count_source::encoder_x4, 9);
    quadrature q{fx};
    // 12 forward edges: 1..9, then 9 -> 0 (a wrap: reload event) at the 10th (tick 55), 1, 2.
    q.steps(12, true);
    EXPECT_EQ(q.position(), position(2, 0));
    // 5 backward edges: 1, 0, then 0 -> 9 (a wrap) at the 3rd (tick 80), 8, 7.
    q.steps(5, false);
    EXPECT_EQ(q.position(), position(7, 1));
    // Reversing again: up from 7 to 8.
    q.steps(1, true);
    EXPECT_EQ(q.position(), position(8, 0));
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{55, 80}));
}

TEST(reference_inputs_test, encoder_x2_counts_edges_of_a_only) {
    reference_fixture fx(encoder_config());
    start_encoder(fx, count_source::encoder_x2, 3);
    quadrature q{fx};
    // 12 forward edges, A's at the 1st, 3rd... (ticks 10, 20, ..., 60): 1, 2, 3, then 3 -> 0 (a
    // wrap) at tick 40, 1, 2.
    q.steps(12, true);
    EXPECT_EQ(q.position(), position(2, 0));
    // 6 backward edges from 00: B first, then A (up if A differs from B after it: no, down): A's
    // at ticks 75, 85, 95: 1, 0, then 0 -> 3 (a wrap) at 95.
    q.steps(6, false);
    EXPECT_EQ(q.position(), position(3, 1));
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{40, 95}));
}

TEST(reference_inputs_test, encoder_edges_of_a_and_b_at_one_tick_step_twice_a_first) {
    reference_fixture fx(encoder_config());
    start_encoder(fx, count_source::encoder_x4, 99);
    // From 00 both rise before tick 10. A's edge, judged against B before this tick's edge: A = 1,
    // B = 0 differ: up. B's: A = 1 equals B = 1: up. Counter 2.
    set_before(fx, input_of_channel(0), true, 10);
    set_before(fx, input_of_channel(1), true, 10);
    EXPECT_EQ(fx.read(10, timer_field::counter), 2u);
    // From 11 A falls and B stays: A = 0 differs from B = 1: up, 3.
    set_before(fx, input_of_channel(0), false, 20);
    EXPECT_EQ(fx.read(20, timer_field::counter), 3u);
}

TEST(reference_inputs_test, encoder_needs_enable_and_leaving_it_restores_the_direction) {
    reference_fixture fx(encoder_config());
    start_encoder(fx, count_source::encoder_x4, 99);
    fx.write(0, timer_field::enable, 0);
    quadrature q{fx};
    q.steps(4, true);
    EXPECT_EQ(fx.read(q.last(), timer_field::counter), 0u);
    fx.write(q.last(), timer_field::enable, 1);
    q.steps(1, false);  // 0 -> 99, down
    EXPECT_EQ(q.position(), position(99, 1));
    // Back to the timer clock in up mode: the direction is up again.
    fx.write(q.last(), timer_field::count_source, u(count_source::timer_clock));
    EXPECT_EQ(fx.read(q.last(), timer_field::direction), 0u);
}

TEST(reference_inputs_test, encoder_steps_in_center_mode_match_on_the_chosen_slope) {
    reference_fixture fx(encoder_config());
    start_encoder(fx, count_source::encoder_x4, 99);
    fx.write(0, timer_field::mode, u(count_mode::center));
    fx.write(0, timer_field::slope, u(models::match_slope::up));
    fx.write(0, timer_field::compare, 3, 0);
    fx.write(0, timer_field::trigger_select, models::trigger_on_match(0));
    quadrature q{fx};
    // Edges at 10, 15...: up to 4 (3 reached going up at tick 20), down to 2 (3 reached going
    // down at tick 30: not on the up slope), up to 3 again at tick 40.
    q.steps(4, true);
    q.steps(2, false);
    q.steps(1, true);
    fx.run_to(60);
    EXPECT_EQ(trigger_ticks(fx), (std::vector<std::uint64_t>{20, 40}));
}

// ---- reset values, reserved writes, bad calls ----

TEST(reference_inputs_test, input_fields_reset_to_zero) {
    reference_fixture fx(input_config());
    for (const timer_field f :
         {timer_field::filter_divider, timer_field::count_source, timer_field::trigger_action,
          timer_field::trigger_source, timer_field::trigger_edge, timer_field::trigger_filter})
        EXPECT_EQ(fx.read(0, f), 0u) << models::to_string(f);
    for (unsigned c = 0; c < 4; ++c)
        for (const timer_field f : {timer_field::channel_role, timer_field::capture_edge,
                                    timer_field::capture_prescaler, timer_field::input_filter})
            EXPECT_EQ(fx.read(0, f, c), 0u) << models::to_string(f) << " " << c;
}

TEST(reference_inputs_test, an_initial_level_makes_no_edge_and_a_later_change_does) {
    reference_fixture fx(input_config());
    fx.timer.set_initial_input(input_of_channel(0), true);
    // From reset the trigger is channel 0's input, rising edges, which set the trigger flag even
    // at tick 0 (before any write could act): a high initial level is no edge.
    fx.run_to(20);
    EXPECT_TRUE(fx.log.flag_sets(flag_trigger).empty());
    set_before(fx, input_of_channel(0), false, 20);
    set_before(fx, input_of_channel(0), true, 25);  // filtered rise at 26
    fx.run_to(30);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{26}));
}

TEST(reference_inputs_test, reserved_values_are_ignored_and_reset_no_count) {
    reference_fixture fx(input_config());
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 2);
    fx.write(0, timer_field::capture_edge, u(capture_edge::falling), 2);
    fx.write(0, timer_field::capture_prescaler, 1, 2);
    fx.write(0, timer_field::input_filter, 2, 2);
    fx.write(0, timer_field::filter_divider, 1);
    fx.write(0, timer_field::count_source, u(count_source::trigger_edges));
    fx.write(0, timer_field::trigger_action, u(trigger_action::gate));
    fx.write(0, timer_field::trigger_source, u(trigger_source::trigger_pin));
    fx.write(0, timer_field::trigger_edge, 1);
    fx.write(0, timer_field::trigger_filter, 3);
    struct reserved {
        timer_field f;
        std::uint32_t value, held;
    };
    // Four filter lengths (indices 0..3); roles and edge kinds 0..2; the rest 0..3, the edge 0..1.
    const reserved writes[] = {
        {timer_field::channel_role, 3, 1},      {timer_field::capture_edge, 3, 1},
        {timer_field::capture_prescaler, 4, 1}, {timer_field::input_filter, 4, 2},
        {timer_field::filter_divider, 4, 1},    {timer_field::count_source, 4, 1},
        {timer_field::trigger_action, 7, 2},    {timer_field::trigger_source, 4, 2},
        {timer_field::trigger_edge, 2, 1},      {timer_field::trigger_filter, 4, 3},
    };
    for (const reserved& r : writes) {
        fx.write(1, r.f, r.value, 2);
        EXPECT_EQ(fx.read(1, r.f, 2), r.held) << models::to_string(r.f);
    }
    fx.write(1, timer_field::input_filter, 0xffff'ffffu, 2);
    EXPECT_EQ(fx.read(1, timer_field::input_filter, 2), 2u);
    // Input 0's filter (length 4, divider 2): sampled high from tick 10, synchronised (S = 2)
    // from 11; the sampling ticks 12, 14, 16, 18 count 1..4. Reserved filter writes between them
    // reset no count, so the filtered rise comes at 18 (resets at 13 and 15 would make it 22).
    fx.write(1, timer_field::input_filter, 2, 0);
    fx.write(1, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(1, timer_field::trigger_edge, 0);
    set_before(fx, input_of_channel(0), true, 10);
    fx.write(13, timer_field::input_filter, 9, 0);
    fx.write(15, timer_field::filter_divider, 5);
    fx.run_to(30);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_trigger)), (std::vector<std::uint64_t>{18}));
}

TEST(reference_inputs_test, irq_enable_keeps_the_trigger_and_over_capture_bits) {
    timer_config cfg = input_config();
    cfg.channels = 3;
    reference_fixture fx(cfg);
    fx.write(0, timer_field::irq_enable, 0xffff'ffffu);
    // Bits 0..2, reload 8, trigger 10, over-capture 16..18 (no fault: not complementary).
    EXPECT_EQ(fx.read(0, timer_field::irq_enable), 0x0007'0507u);
}

TEST(reference_inputs_test, an_input_the_instance_lacks_is_refused_and_stays_low) {
    timer_config cfg = input_config();
    cfg.channels = 3;
    reference_fixture fx(cfg);
    EXPECT_THROW(fx.timer.set_input(input_of_channel(3), true, fx.at(1)), std::invalid_argument);
    EXPECT_THROW(fx.timer.set_input(models::fault_input, true, fx.at(1)), std::invalid_argument);
    EXPECT_THROW(fx.timer.set_initial_input(8, true), std::invalid_argument);
    // Channel 2's neighbour (3) has no pin: a capture from it never happens.
    fx.write(0, timer_field::channel_role, u(channel_role::capture_neighbour), 2);
    fx.write(0, timer_field::capture_edge, u(capture_edge::both), 2);
    set_before(fx, input_of_channel(2), true, 5);
    fx.run_to(20);
    EXPECT_TRUE(fx.log.flag_sets(flag_channel(2)).empty());
    EXPECT_THROW(fx.timer.set_initial_input(input_of_channel(0), true), std::logic_error);
}

// ---- against the outside world ----

TEST(reference_inputs_test, period_capture_reads_timer_clock_over_input_frequency) {
    const std::uint64_t f_t = 48'000'000;
    const std::uint64_t f_in = 37'000;
    reference_fixture fx(input_config(), sim::frequency::hz(f_t));
    fx.write(0, timer_field::channel_role, u(channel_role::capture_own), 0);
    fx.write(0, timer_field::trigger_source, u(trigger_source::channel_0_input));
    fx.write(0, timer_field::trigger_action, u(trigger_action::restart));
    count_ticks(fx);
    // A square wave at f_in: rising edges at i / f_in s from 0.5 ms on, exact to the picosecond.
    std::vector<std::uint32_t> periods;
    for (std::uint64_t i = 19; i < 40; ++i) {
        const sim::time_ps rise = i * sim::ps_per_second / f_in;
        const sim::time_ps fall = rise + sim::ps_per_second / f_in / 2;
        fx.timer.set_input(input_of_channel(0), true, rise);
        fx.timer.set_input(input_of_channel(0), false, fall);
        if (i > 20) periods.push_back(fx.timer.read(timer_field::compare, 0, fall));
    }
    ASSERT_EQ(periods.size(), 19u);
    for (const std::uint32_t p : periods) {
        // common practice, no source: a period capture reads f_t / f_in counts, +-1 quantisation
        EXPECT_LE(std::fabs(static_cast<double>(p) - static_cast<double>(f_t) / f_in), 1.0) << p;
    }
}

TEST(reference_inputs_test, x4_decoding_gives_four_counts_per_encoder_line) {
    for (const count_source source : {count_source::encoder_x4, count_source::encoder_x2}) {
        reference_fixture fx(encoder_config());
        start_encoder(fx, source, 0xffff);
        quadrature q{fx};
        q.steps(4 * 25, true);  // 25 lines: a full quadrature cycle each
        const std::uint32_t counts = fx.read(q.last(), timer_field::counter);
        // common practice, no source: x4 decoding counts 4 edges per line, x2 counts 2
        EXPECT_EQ(counts, source == count_source::encoder_x4 ? 4u * 25u : 2u * 25u);
    }
}

}  // namespace
}  // namespace tickbench::test_reference
