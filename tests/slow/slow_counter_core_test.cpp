#include "models/slow/slow_counter_core.h"

#include <gtest/gtest.h>

#include <vector>

namespace {

using models::slow_field;
constexpr sim::time_ps ns = 1'000;
constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps period = 32 * us;  // 31.25 kHz: edge k lies at k * 32 us, edge 0 at 0

// Records what a slow-clock counter reports.
struct slow_log final : models::slow_observer {
    std::vector<sim::time_ps> flag_sets;
    std::vector<std::pair<bool, sim::time_ps>> irqs;
    void on_flags_set(std::uint32_t, sim::time_ps at) override { flag_sets.push_back(at); }
    void on_irq(bool level, sim::time_ps at) override { irqs.emplace_back(level, at); }
};

models::slow_config config(unsigned latency = 2, sim::time_ps window = 40 * ns) {
    models::slow_config c;
    c.write_latency = latency;
    c.read_window = window;
    return c;
}

struct bench {
    explicit bench(models::slow_config cfg = config())
        : clock(sim::frequency::hz(31'250)), counter(cfg, clock, &log) {}
    // Enabled at time 0 and settled there, as a reset value would be: counts from edge 1 on.
    void start_counting() {
        counter.write(slow_field::enable, 1, 0);
        counter.settle(0);
    }
    std::uint32_t count(sim::time_ps t) { return counter.read(slow_field::count, t); }
    sim::clock_domain clock;
    slow_log log;
    models::slow_counter_core counter;
};

TEST(slow_counter_core_test, counts_every_edge_once_settled) {
    bench b;
    b.start_counting();
    EXPECT_EQ(b.count(0), 0u);
    EXPECT_EQ(b.count(period + 40 * ns), 1u);
    EXPECT_EQ(b.count(10 * period + 40 * ns), 10u);
    EXPECT_EQ(b.counter.read(slow_field::busy, 0), 0u);
}

TEST(slow_counter_core_test, a_read_within_the_window_after_an_edge_returns_the_value_before_it) {
    bench b;
    b.start_counting();
    // Edge 5 at 160 us brings the counter to 5; the synchroniser sees it 40 ns later.
    EXPECT_EQ(b.count(5 * period + 39 * ns), 4u);
    EXPECT_EQ(b.count(5 * period + 40 * ns), 5u);
}

TEST(slow_counter_core_test, reading_until_two_reads_agree_returns_the_value_in_force) {
    bench b;
    b.start_counting();
    // A driver whose reads are 50 ns apart, longer than the window, starting 10 ns after edge 7.
    sim::time_ps t = 7 * period + 10 * ns;
    std::uint32_t last = b.count(t);
    EXPECT_EQ(last, 6u);  // the single read is stale
    for (;;) {
        t += 50 * ns;
        const std::uint32_t again = b.count(t);
        if (again == last) break;
        last = again;
    }
    EXPECT_EQ(last, 7u);
    EXPECT_EQ(t, 7 * period + 110 * ns);
}

TEST(slow_counter_core_test, a_write_takes_effect_at_the_latency_th_edge_and_is_busy_until_then) {
    bench b(config(3));
    b.start_counting();
    // Written 1 us after edge 10: edges 11 and 12 pass, the value is in force from edge 13 on.
    const sim::time_ps t = 10 * period + us;
    b.counter.write(slow_field::count, 1000, t);
    EXPECT_EQ(b.counter.read(slow_field::busy, t), 1u);
    EXPECT_EQ(b.counter.read(slow_field::busy, 13 * period - 1), 1u);
    EXPECT_EQ(b.count(13 * period - 1), 12u);
    EXPECT_EQ(b.counter.read(slow_field::busy, 13 * period), 0u);
    EXPECT_EQ(b.count(13 * period + 40 * ns), 1000u);
    EXPECT_EQ(b.count(14 * period + 40 * ns), 1001u);
}

TEST(slow_counter_core_test, a_second_write_while_busy_is_lost) {
    bench b;
    b.start_counting();
    b.counter.write(slow_field::count, 100, us);
    b.counter.write(slow_field::count, 200, 2 * us);
    EXPECT_EQ(b.count(10 * period), 100u + 10 - 3);
    // Waiting for busy to clear lets the second write through.
    sim::time_ps t = 10 * period;
    b.counter.write(slow_field::count, 300, t);
    while (b.counter.read(slow_field::busy, t) != 0) t += us;
    EXPECT_EQ(b.count(t + 40 * ns), 300u);
    b.counter.write(slow_field::alarm, 7, t);
    b.counter.write(slow_field::count, 200, t + us);  // lost: the alarm write is pending
    while (b.counter.read(slow_field::busy, t) != 0) t += us;
    EXPECT_EQ(b.counter.read(slow_field::alarm, t), 7u);
    EXPECT_GT(b.count(t + 40 * ns), 300u);
    EXPECT_LT(b.count(t + 40 * ns), 310u);
}

TEST(slow_counter_core_test, fields_written_at_one_instant_travel_together) {
    bench b;
    b.counter.write(slow_field::prescale, 2, us);
    b.counter.write(slow_field::enable, 1, us);
    b.counter.write(slow_field::count, 50, us);
    // Written after edge 0: edge 1 passes, edge 2 puts the write in force.
    EXPECT_EQ(b.counter.read(slow_field::enable, 2 * period - 1), 0u);
    EXPECT_EQ(b.counter.read(slow_field::enable, 2 * period), 1u);
    EXPECT_EQ(b.counter.read(slow_field::prescale, 2 * period), 2u);
    // Counting every 4th edge of the free-running divide: edges 3, 7, 11...
    EXPECT_EQ(b.count(3 * period + 40 * ns), 51u);
    EXPECT_EQ(b.count(7 * period + 40 * ns), 52u);
    EXPECT_EQ(b.count(11 * period + 39 * ns), 52u);
    EXPECT_EQ(b.count(11 * period + 40 * ns), 53u);
}

TEST(slow_counter_core_test, the_alarm_sets_its_flag_and_interrupt_at_the_matching_edge) {
    bench b;
    b.start_counting();
    b.counter.write(slow_field::irq_enable, 1, 0);
    b.counter.write(slow_field::alarm, 20, us);  // in force from edge 3
    sim::time_ps at = 0;
    ASSERT_TRUE(b.counter.next_event(at));
    EXPECT_EQ(at, 2 * period);
    b.counter.advance_to(at);
    ASSERT_TRUE(b.counter.next_event(at));
    EXPECT_EQ(at, 20 * period);
    b.counter.advance_to(25 * period);
    EXPECT_EQ(b.log.flag_sets, std::vector<sim::time_ps>{20 * period});
    ASSERT_EQ(b.log.irqs.size(), 1u);
    EXPECT_EQ(b.log.irqs[0], std::make_pair(true, 20 * period));
    EXPECT_EQ(b.counter.read(slow_field::flags, 25 * period), models::slow_flag_alarm);
    b.counter.clear_flags(models::slow_flag_alarm, 25 * period);
    EXPECT_EQ(b.log.irqs.back(), std::make_pair(false, 25 * period));
    // The next match is a whole wrap of the 32-bit counter away.
    ASSERT_TRUE(b.counter.next_event(at));
    EXPECT_EQ(at, (20 + (std::uint64_t(1) << 32)) * period);
}

TEST(slow_counter_core_test, the_counter_wraps_at_its_width) {
    models::slow_config c = config();
    c.counter_bits = 4;
    bench b(c);
    b.start_counting();
    EXPECT_EQ(b.count(17 * period + 40 * ns), 1u);
}

TEST(slow_counter_core_test, work_is_per_event_not_per_edge) {
    bench b;
    b.start_counting();
    b.counter.write(slow_field::alarm, 1'000'000, us);
    b.counter.advance_to(2'000'000 * period);
    EXPECT_EQ(b.count(2'000'000 * period + 40 * ns), 2'000'000u);
    // The alarm write taking effect and the alarm flag: two instants for two million edges.
    EXPECT_EQ(b.counter.events_processed(), 3u);  // and the settle at reset
}

TEST(slow_counter_core_test, bad_instances_are_refused_with_the_accepted_range) {
    models::slow_config c;
    c.write_latency = 0;
    EXPECT_THROW(c.validate(), std::invalid_argument);
    c.write_latency = 2;
    c.counter_bits = 33;
    try {
        c.validate();
        FAIL() << "counter_bits 33 accepted";
    } catch (const std::invalid_argument& e) {
        EXPECT_NE(std::string(e.what()).find("accepted: 1 to 32"), std::string::npos);
    }
}

}  // namespace
