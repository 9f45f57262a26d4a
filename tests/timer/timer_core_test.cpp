#include "models/timer/timer_core.h"
#include "tests/support/timer_event_log.h"

#include <gtest/gtest.h>

namespace {

using models::timer_field;
using sim::frequency;
constexpr sim::time_ps ms = 1'000'000'000;

struct bench {
    explicit bench(models::timer_config cfg = {}, std::uint64_t hz = 48'000'000)
        : clock(frequency::hz(hz)), timer(cfg, clock, &log) {}
    void set(timer_field f, std::uint32_t v, sim::time_ps at = 0) { timer.write(f, 0, v, at); }
    void set_ch(unsigned c, timer_field f, std::uint32_t v, sim::time_ps at = 0) {
        timer.write(f, c, v, at);
    }
    sim::clock_domain clock;
    tickbench::test_support::timer_event_log log;
    std::vector<sim::time_ps> rises(unsigned p) const { return log.pin_edges(p, true); }
    std::vector<sim::time_ps> falls(unsigned p) const { return log.pin_edges(p, false); }
    // Times at which the reload flag set.
    std::vector<sim::time_ps> flags() const { return log.flag_sets(models::flag_reload); }
    std::size_t irq_changes() const {
        std::size_t n = 0;
        for (const auto& e : log.events)
            n += e.kind == tickbench::test_support::timer_event_kind::irq;
        return n;
    }
    models::timer_core timer;
};

TEST(timer_core_test, edge_aligned_pwm_frequency_and_duty) {
    // Edge-aligned PWM frequency = f_timer / ((prescaler + 1) x (period + 1)) and duty =
    // compare / (period + 1) (common practice, no single source).
    bench b;
    b.set(timer_field::prescaler, 1);  // factor 2: 24 MHz counter clock
    b.set(timer_field::period, 959);   // 960 values: 25 kHz
    b.set_ch(0, timer_field::compare, 240);
    b.set_ch(0, timer_field::action, static_cast<std::uint32_t>(models::output_action::pwm_below));
    b.set_ch(0, timer_field::main_enable, 1);
    b.set(timer_field::force_reload, 1);  // loads the shadowed prescaler
    b.set(timer_field::enable, 1);
    b.timer.advance_to(10 * ms);
    const auto rises = b.rises(models::main_pin(0));
    const auto falls = b.falls(models::main_pin(0));
    ASSERT_GT(rises.size(), 200u);
    for (std::size_t i = 2; i + 1 < rises.size(); ++i)
        EXPECT_EQ(rises[i + 1] - rises[i], 40'000'000u);  // 40 us
    // Pulse width = 240 / 960 of 40 us = 10 us.
    for (std::size_t i = 2; i + 2 < falls.size(); ++i) {
        auto r = std::lower_bound(rises.begin(), rises.end(), falls[i]) - 1;
        EXPECT_EQ(falls[i] - *r, 10'000'000u);
    }
    // Most ticks were skipped: a few events per period, not 1920 ticks.
    EXPECT_LT(b.timer.ticks_processed(), 4 * rises.size());
}

TEST(timer_core_test, a_fault_input_high_since_before_time_0_starts_no_fault) {
    models::timer_config cfg;
    cfg.complementary = true;
    bench b(cfg);
    b.timer.set_initial_input(models::fault_input, true);
    b.set(timer_field::fault_enable, 1);
    b.set(timer_field::period, 99);
    b.set(timer_field::enable, 1);
    b.timer.advance_to(ms);
    EXPECT_TRUE(b.log.flag_sets(models::flag_fault).empty());
    // Only a rise starts a fault, at the first tick after it (no latency).
    b.timer.set_fault_input(false, ms + 1000);
    b.timer.set_fault_input(true, ms + 2000);
    b.timer.advance_to(2 * ms);
    const auto faults = b.log.flag_sets(models::flag_fault);
    ASSERT_EQ(faults.size(), 1u);
    EXPECT_GT(faults[0], ms + 2000);
    EXPECT_LE(faults[0], ms + 2000 + 20834);  // within one 48 MHz tick
}

TEST(timer_core_test, center_aligned_pwm_frequency_and_duty) {
    // Center-aligned PWM frequency = f_timer / ((prescaler + 1) x 2 x period) and duty =
    // compare / period (common practice, no single source).
    bench b;
    b.set(timer_field::mode, static_cast<std::uint32_t>(models::count_mode::center));
    b.set(timer_field::period, 960);  // 48 MHz / 1920 = 25 kHz
    b.set_ch(0, timer_field::compare, 240);
    b.set_ch(0, timer_field::action, static_cast<std::uint32_t>(models::output_action::pwm_below));
    b.set_ch(0, timer_field::main_enable, 1);
    b.set(timer_field::enable, 1);
    b.timer.advance_to(5 * ms);
    const auto rises = b.rises(models::main_pin(0));
    const auto falls = b.falls(models::main_pin(0));
    ASSERT_GT(rises.size(), 100u);
    for (std::size_t i = 1; i + 1 < rises.size(); ++i)
        EXPECT_EQ(rises[i + 1] - rises[i], 40'000'000u);
    for (std::size_t i = 2; i + 2 < falls.size(); ++i) {
        auto r = std::lower_bound(rises.begin(), rises.end(), falls[i]) - 1;
        EXPECT_EQ(falls[i] - *r, 10'000'000u);
    }
}

TEST(timer_core_test, up_counter_counting_to_p_takes_p_plus_one_steps) {
    // An up-counter counting 0..P gives P + 1 ticks per period (common practice, no single source).
    bench b({}, 1'000'000);
    b.set(timer_field::period, 9);
    b.set(timer_field::irq_enable, models::flag_reload);
    b.set(timer_field::enable, 1);
    // Reload flag at the step to 0: tick 10 (at 10 us) since the counter starts at 0. (The
    // channels, with compare 0, match at the same step; only the reload flag raises the irq.)
    b.timer.advance_to(10'000'000 - 1);
    EXPECT_TRUE(b.flags().empty());
    EXPECT_EQ(b.timer.read(timer_field::counter, 0, 9'999'999), 9u);
    b.timer.advance_to(10'000'000);
    ASSERT_EQ(b.flags().size(), 1u);
    EXPECT_EQ(b.flags()[0], 10'000'000u);
    b.timer.clear_flags(models::flag_reload, 10'500'000);
    b.timer.advance_to(20'000'000);
    ASSERT_EQ(b.flags().size(), 2u);
    EXPECT_EQ(b.flags()[1], 20'000'000u);
    ASSERT_EQ(b.irq_changes(), 3u);  // up at 10 us, down at 10.5 us, up at 20 us
}

TEST(timer_core_test, preloaded_compare_waits_for_the_reload) {
    bench b({}, 1'000'000);
    b.set(timer_field::period, 99);
    b.set_ch(0, timer_field::compare_preload, 1);
    b.set_ch(0, timer_field::compare, 50);
    b.set_ch(0, timer_field::action, static_cast<std::uint32_t>(models::output_action::pwm_below));
    b.set_ch(0, timer_field::main_enable, 1);
    b.set(timer_field::force_reload, 1);
    b.set(timer_field::enable, 1);
    // Mid-period duty change at 120 us (counter 20): must show only from the reload at 200 us.
    b.set_ch(0, timer_field::compare, 10, 120'000'000);
    b.timer.advance_to(400'000'000);
    const auto falls = b.falls(models::main_pin(0));
    ASSERT_GE(falls.size(), 4u);
    EXPECT_EQ(falls[0], 50'000'000u);
    EXPECT_EQ(falls[1], 150'000'000u);
    EXPECT_EQ(falls[2], 210'000'000u);
    EXPECT_EQ(falls[3], 310'000'000u);
}

TEST(timer_core_test, dead_time_delays_rises_and_swallows_short_pulses) {
    models::timer_config cfg;
    cfg.complementary = true;
    bench b(cfg, 1'000'000);
    b.set(timer_field::period, 99);
    b.set(timer_field::dead_time, 3);
    b.set_ch(0, timer_field::compare, 50);
    b.set_ch(0, timer_field::action, static_cast<std::uint32_t>(models::output_action::pwm_below));
    b.set_ch(0, timer_field::main_enable, 1);
    b.set_ch(0, timer_field::comp_enable, 1);
    b.set(timer_field::enable, 1);
    b.timer.advance_to(250'000'000);
    // The reference level goes inactive at 50 us: main falls at once, complementary rises 3 ticks
    // on.
    const auto mf = b.falls(models::main_pin(0));
    const auto cr = b.rises(models::comp_pin(0));
    ASSERT_GE(mf.size(), 2u);
    ASSERT_GE(cr.size(), 2u);
    EXPECT_EQ(mf[0], 50'000'000u);
    EXPECT_EQ(cr[0], 53'000'000u);
    // Both never high together.
    bool main_high = false, comp_high = false;
    for (const auto& e : b.log.events) {
        if (e.kind != tickbench::test_support::timer_event_kind::pin) continue;
        (e.id == 0 ? main_high : comp_high) = e.value != 0;
        EXPECT_FALSE(main_high && comp_high) << "at " << e.at;
    }
}

TEST(timer_core_test, counter_read_is_computed_at_any_time) {
    bench b({}, 1'000'000);
    b.set(timer_field::prescaler, 9);
    b.set(timer_field::force_reload, 1);
    b.set(timer_field::enable, 1);
    // 10 ticks per step: after 12345 us, 1234 steps (the first step is at 10 us).
    EXPECT_EQ(b.timer.read(timer_field::counter, 0, 12'345'000'000), 1234u);
    // One tick was processed on its own: the first after the writes, where their effects show.
    // The 12344 ticks after it were skipped.
    EXPECT_EQ(b.timer.ticks_processed(), 1u);
}

}  // namespace

namespace {

// The input side of the fast model on its own; the differential test holds it to the reference.
TEST(timer_core_test, captures_the_period_of_a_square_wave_input) {
    bench b({}, 1'000'000);  // 1 MHz: a tick per microsecond
    b.set(timer_field::period, 0xffff);
    b.set_ch(0, timer_field::channel_role,
             static_cast<std::uint32_t>(models::channel_role::capture_own));
    b.set(timer_field::enable, 1);
    // A 10 kHz input (100 ticks a period), rising at 50.5 us, 150.5 us, 250.5 us...
    for (int k = 0; k < 5; ++k) {
        b.timer.set_input(models::input_of_channel(0), true, (50 + 100 * k) * 1'000'000 + 500'000);
        b.timer.set_input(models::input_of_channel(0), false,
                          (100 + 100 * k) * 1'000'000 + 500'000);
    }
    b.timer.advance_to(600'000'000);
    // Rising between ticks 50 and 51: sampled at 51, synchronised (depth 2) at 52, filter length 1
    // passes it there; the counter, counting from tick 1, holds 52. A period later: 152.
    const auto flags = b.log.flag_sets(models::flag_channel(0));
    ASSERT_EQ(flags.size(), 1u);  // never cleared: set once
    EXPECT_EQ(flags[0], 52'000'000u);
    EXPECT_EQ(b.timer.read(timer_field::compare, 0, 600'000'000), 452u);
    // The flag was still set at each later capture: over-capture.
    EXPECT_EQ(b.log.flag_sets(models::flag_overcapture(0)).size(), 1u);
}

}  // namespace
