#include "models/watchdog/watchdog_core.h"

#include <gtest/gtest.h>

#include <vector>

namespace {

using models::watchdog_fault;
using models::watchdog_field;
constexpr sim::time_ps us = 1'000'000;

struct reset_log final : models::watchdog_observer {
    std::vector<std::pair<watchdog_fault, sim::time_ps>> resets;
    void on_reset(watchdog_fault why, sim::time_ps at) override { resets.emplace_back(why, at); }
};

// A 1 MHz oscillator: edge k at k us, edge 0 at time 0. With prescaler 0 the counter steps every
// 4 edges.
struct bench {
    explicit bench(std::uint64_t hz = 1'000'000)
        : clock(sim::frequency::hz(hz)), dog(models::watchdog_config{}, clock, &log) {}
    void refresh(sim::time_ps t) {
        dog.write(watchdog_field::key, models::watchdog_key_first, t);
        dog.write(watchdog_field::key, models::watchdog_key_second, t);
    }
    sim::clock_domain clock;
    reset_log log;
    models::watchdog_core dog;
};

TEST(watchdog_core_test, times_out_reload_steps_after_the_start) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    // Counting starts at edge 1; 10 steps of 4 edges end at edge 40.
    sim::time_ps at = 0;
    ASSERT_TRUE(b.dog.next_event(at));
    EXPECT_EQ(at, 40 * us);
    EXPECT_EQ(b.dog.read(watchdog_field::count, 4 * us), 9u);
    EXPECT_EQ(b.dog.read(watchdog_field::count, 39 * us), 1u);
    EXPECT_TRUE(b.log.resets.empty());
    b.dog.advance_to(40 * us);
    ASSERT_EQ(b.log.resets.size(), 1u);
    EXPECT_EQ(b.log.resets[0], std::make_pair(watchdog_fault::timeout, 40 * us));
    EXPECT_FALSE(b.dog.next_event(at));
}

TEST(watchdog_core_test, a_refresh_reloads_the_counter) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    b.refresh(30 * us);  // counting restarts at edge 31
    EXPECT_EQ(b.dog.read(watchdog_field::count, 30 * us), 10u);
    b.dog.advance_to(69 * us);
    EXPECT_TRUE(b.log.resets.empty());
    b.dog.advance_to(70 * us);
    ASSERT_EQ(b.log.resets.size(), 1u);
    EXPECT_EQ(b.log.resets[0].second, 70 * us);
    EXPECT_EQ(b.dog.last_refresh(), std::optional<sim::time_ps>(30 * us));
}

TEST(watchdog_core_test, the_key_sequence_must_be_the_two_values_in_order) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    // Reversed order, and a stray write between the two: neither refreshes.
    b.dog.write(watchdog_field::key, models::watchdog_key_second, 10 * us);
    b.dog.write(watchdog_field::key, models::watchdog_key_first, 11 * us);
    b.dog.write(watchdog_field::key, 0x1234, 12 * us);
    b.dog.write(watchdog_field::key, models::watchdog_key_second, 13 * us);
    EXPECT_EQ(b.dog.last_refresh(), std::optional<sim::time_ps>(0));
    b.dog.advance_to(40 * us);
    ASSERT_EQ(b.log.resets.size(), 1u);
    EXPECT_EQ(b.log.resets[0].first, watchdog_fault::timeout);
}

TEST(watchdog_core_test, a_refresh_above_the_window_is_a_fault) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::window, 4, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    b.refresh(20 * us);  // the counter is 5: too early
    ASSERT_EQ(b.log.resets.size(), 1u);
    EXPECT_EQ(b.log.resets[0], std::make_pair(watchdog_fault::early_refresh, 20 * us));
}

TEST(watchdog_core_test, a_refresh_inside_the_window_is_accepted) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::window, 4, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    EXPECT_EQ(b.dog.read(watchdog_field::count, 24 * us), 4u);
    b.refresh(24 * us);
    EXPECT_TRUE(b.log.resets.empty());
    EXPECT_EQ(b.dog.last_refresh(), std::optional<sim::time_ps>(24 * us));
}

TEST(watchdog_core_test, settings_are_locked_once_started) {
    bench b;
    b.dog.write(watchdog_field::reload, 10, 0);
    b.dog.write(watchdog_field::prescaler, 2, 0);
    b.dog.write(watchdog_field::start, 1, 0);
    b.dog.write(watchdog_field::reload, 1000, 1 * us);
    b.dog.write(watchdog_field::prescaler, 6, 1 * us);
    b.dog.write(watchdog_field::window, 1, 1 * us);
    EXPECT_EQ(b.dog.read(watchdog_field::reload, 1 * us), 10u);
    EXPECT_EQ(b.dog.read(watchdog_field::prescaler, 1 * us), 2u);
    EXPECT_EQ(b.dog.read(watchdog_field::window, 1 * us), 0xfffu);
    sim::time_ps at = 0;
    ASSERT_TRUE(b.dog.next_event(at));
    EXPECT_EQ(at, 160 * us);  // 10 steps of 16 edges from edge 1
}

TEST(watchdog_core_test, nothing_counts_before_the_start) {
    bench b;
    b.dog.write(watchdog_field::reload, 3, 0);
    b.refresh(5 * us);
    sim::time_ps at = 0;
    EXPECT_FALSE(b.dog.next_event(at));
    EXPECT_EQ(b.dog.read(watchdog_field::count, 1000 * us), 3u);
    EXPECT_EQ(b.dog.read(watchdog_field::start, 1000 * us), 0u);
}

TEST(watchdog_core_test, timeout_follows_the_oscillator_frequency) {
    // The same settings on a slow oscillator at the ends of a +-30 % band around 40 kHz: the
    // time to a timeout scales with the period (a 40 kHz-class slow oscillator with a band of tens
    // of percent: fact of the trade, no source).
    for (const std::uint64_t hz : {28'000ull, 52'000ull}) {
        bench b(hz);
        b.dog.write(watchdog_field::reload, 100, 0);
        b.dog.write(watchdog_field::start, 1, 0);
        sim::time_ps at = 0;
        ASSERT_TRUE(b.dog.next_event(at));
        EXPECT_EQ(at, b.clock.time_of(400));
    }
}

TEST(watchdog_core_test, out_of_range_instance_is_refused) {
    sim::clock_domain clock(sim::frequency::hz(1000));
    models::watchdog_config cfg;
    cfg.counter_bits = 17;
    EXPECT_THROW(models::watchdog_core(cfg, clock), std::invalid_argument);
}

}  // namespace
