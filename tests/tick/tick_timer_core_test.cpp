#include "models/tick/tick_timer_core.h"

#include <gtest/gtest.h>

#include <vector>

namespace {

using models::tick_field;
constexpr sim::time_ps us = 1'000'000;

// Records what a tick timer reports.
struct tick_log final : models::tick_observer {
    std::vector<sim::time_ps> flag_sets;
    std::vector<std::pair<bool, sim::time_ps>> irqs;
    void on_flags_set(std::uint32_t, sim::time_ps at) override { flag_sets.push_back(at); }
    void on_irq(bool level, sim::time_ps at) override { irqs.emplace_back(level, at); }
};

// A 1 MHz clock: edge k lies at k us, edge 0 at time 0.
struct bench {
    explicit bench(models::tick_config cfg = {})
        : clock(sim::frequency::hz(1'000'000)), timer(cfg, clock, &log) {}
    // Reload N, counter cleared, counting on the undivided clock, all at time 0.
    void start(std::uint32_t reload) {
        timer.write(tick_field::reload, reload, 0);
        timer.write(tick_field::current, 0, 0);
        timer.write(tick_field::enable, 1, 0);
    }
    std::uint32_t at(sim::time_ps t) { return timer.read(tick_field::current, t); }
    bool flag(sim::time_ps t) {
        return (timer.read(tick_field::flags, t) & models::tick_flag_zero) != 0;
    }
    sim::clock_domain clock;
    tick_log log;
    models::tick_timer_core timer;
};

TEST(tick_timer_core_test, flag_sets_when_the_counter_steps_from_one_to_zero) {
    bench b;
    b.start(3);
    // Edge 1 loads 3 into the cleared counter; edges 2, 3, 4 count 2, 1, 0.
    EXPECT_EQ(b.at(1 * us), 3u);
    EXPECT_EQ(b.at(3 * us), 1u);
    EXPECT_FALSE(b.flag(3 * us + us / 2));
    EXPECT_EQ(b.at(4 * us), 0u);
    EXPECT_TRUE(b.flag(4 * us));
    EXPECT_EQ(b.log.flag_sets, std::vector<sim::time_ps>{4 * us});
}

TEST(tick_timer_core_test, zero_is_readable_with_the_flag_set_and_reloads_on_the_next_tick) {
    bench b;
    b.start(3);
    EXPECT_EQ(b.at(4 * us + us / 2), 0u);
    EXPECT_TRUE(b.flag(4 * us + us / 2));
    EXPECT_EQ(b.at(5 * us), 3u);
    // The reload itself sets no flag: it is still the one from edge 4, reported once.
    EXPECT_EQ(b.log.flag_sets.size(), 1u);
}

TEST(tick_timer_core_test, reload_value_n_gives_a_period_of_n_plus_one_ticks) {
    // A reload value of N gives N + 1 ticks between counted-to-zero events (common practice, no
    // source).
    bench b;
    b.start(9);
    std::vector<sim::time_ps> flags;
    for (int i = 0; i < 5; ++i) {
        sim::time_ps at = 0;
        ASSERT_TRUE(b.timer.next_event(at));
        b.timer.advance_to(at);
        flags.push_back(at);
        b.timer.clear_flags(models::tick_flag_zero, at);
    }
    // The first event is one load plus 9 counts after enabling at edge 0.
    EXPECT_EQ(flags, (std::vector<sim::time_ps>{10 * us, 20 * us, 30 * us, 40 * us, 50 * us}));
    EXPECT_EQ(b.log.flag_sets, flags);
}

TEST(tick_timer_core_test, writing_the_current_value_clears_it_without_setting_the_flag) {
    bench b;
    b.start(100);
    EXPECT_EQ(b.at(11 * us), 90u);
    b.timer.write(tick_field::current, 0x1234, 11 * us + 1);
    EXPECT_EQ(b.at(11 * us + 2), 0u);
    EXPECT_FALSE(b.flag(11 * us + 2));
    EXPECT_EQ(b.at(12 * us), 100u);  // the next tick reloads
    EXPECT_FALSE(b.flag(12 * us));
    EXPECT_TRUE(b.log.flag_sets.empty());
}

TEST(tick_timer_core_test, the_flag_stays_set_until_cleared_and_the_counter_keeps_going) {
    bench b;
    b.start(4);
    EXPECT_TRUE(b.flag(5 * us));
    EXPECT_EQ(b.at(12 * us), 3u);  // edges 6..10 are the next cycle, 11 reloads, 12 counts 3
    EXPECT_TRUE(b.flag(12 * us));
    b.timer.clear_flags(models::tick_flag_zero, 12 * us);
    EXPECT_FALSE(b.flag(12 * us));
    EXPECT_TRUE(b.flag(15 * us));
    EXPECT_EQ(b.log.flag_sets, (std::vector<sim::time_ps>{5 * us, 15 * us}));
}

TEST(tick_timer_core_test, interrupt_request_follows_flag_and_enable) {
    bench b;
    b.timer.write(tick_field::irq_enable, 1, 0);
    b.start(1);
    b.timer.advance_to(2 * us);
    ASSERT_EQ(b.log.irqs.size(), 1u);
    EXPECT_EQ(b.log.irqs[0], std::make_pair(true, 2 * us));
    b.timer.write(tick_field::irq_enable, 0, 2 * us + 5);
    b.timer.write(tick_field::irq_enable, 1, 2 * us + 6);
    b.timer.clear_flags(models::tick_flag_zero, 2 * us + 7);
    ASSERT_EQ(b.log.irqs.size(), 4u);
    EXPECT_EQ(b.log.irqs[1], std::make_pair(false, 2 * us + 5));
    EXPECT_EQ(b.log.irqs[2], std::make_pair(true, 2 * us + 6));
    EXPECT_EQ(b.log.irqs[3], std::make_pair(false, 2 * us + 7));
}

TEST(tick_timer_core_test, divided_clock_counts_every_divider_th_edge) {
    models::tick_config cfg;
    cfg.divider = 8;
    bench b(cfg);
    b.timer.write(tick_field::clock_choice, 1, 0);
    b.start(2);
    // Counted edges are 7, 15, 23, 31: load 2, count 1, count 0 (flag at edge 23).
    EXPECT_EQ(b.at(7 * us), 2u);
    EXPECT_EQ(b.at(22 * us), 1u);
    EXPECT_EQ(b.at(23 * us), 0u);
    EXPECT_EQ(b.log.flag_sets, std::vector<sim::time_ps>{23 * us});
}

TEST(tick_timer_core_test, disabled_counter_holds_its_value) {
    bench b;
    b.start(50);
    b.timer.write(tick_field::enable, 0, 10 * us);  // edges 1..10: 50, 49, ..., 41
    EXPECT_EQ(b.at(100 * us), 41u);
    b.timer.write(tick_field::enable, 1, 100 * us);
    EXPECT_EQ(b.at(101 * us), 40u);
}

TEST(tick_timer_core_test, reload_value_wider_than_the_counter_is_cut_to_its_bits) {
    bench b;
    b.timer.write(tick_field::reload, 0xff12'3456u, 0);
    EXPECT_EQ(b.timer.read(tick_field::reload, 0), 0x12'3456u);  // 24 bits
}

TEST(tick_timer_core_test, a_long_stretch_costs_nothing_per_tick) {
    bench b;
    b.start(999);
    // One second of a 1 MHz clock with the flag left set: the counter is computed, not ticked.
    const sim::time_ps second = 1'000'000 * us;
    const std::uint32_t v = b.at(second + 123 * us);
    // After the load at edge 1, edge k holds 999 - ((k - 1) mod 1000).
    EXPECT_EQ(v, 999u - (1'000'123u - 1u) % 1000u);
    EXPECT_EQ(b.timer.events_processed(), 1u);
}

TEST(tick_timer_core_test, no_event_while_counting_from_zero_with_reload_zero) {
    bench b;
    b.start(0);
    sim::time_ps at = 0;
    EXPECT_FALSE(b.timer.next_event(at));
    EXPECT_EQ(b.at(50 * us), 0u);
    EXPECT_FALSE(b.flag(50 * us));
}

TEST(tick_timer_core_test, out_of_range_instance_is_refused) {
    sim::clock_domain clock(sim::frequency::hz(1000));
    models::tick_config cfg;
    cfg.divider = 1;
    EXPECT_THROW(models::tick_timer_core(cfg, clock), std::invalid_argument);
    cfg.divider = 8;
    cfg.counter_bits = 33;
    EXPECT_THROW(models::tick_timer_core(cfg, clock), std::invalid_argument);
}

}  // namespace
