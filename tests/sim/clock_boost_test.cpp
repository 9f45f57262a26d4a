// The boost node: a timer clock that is twice its bus clock while the bus divider divides by more
// than 1, and equal to it while the divider passes every edge.

#include "sim/clock_tree.h"

#include <gtest/gtest.h>

#include <string>

namespace {

using sim::frequency;
constexpr sim::time_ps ns = 1'000;
constexpr sim::time_ps us = 1'000'000;

// 48 MHz source, bus divider, boost x2 on the bus, into t.
void bus_tree(sim::clock_tree& t, std::uint64_t bus_factor, std::uint64_t boost = 2) {
    sim::crystal_params x;
    x.nominal = frequency::hz(48'000'000);
    t.add_crystal("src", x);
    t.add_divider("bus", "src", bus_factor);
    t.add_boost("timers", "bus", boost);
}

TEST(clock_boost_test, divider_of_1_passes_the_bus_clock_unchanged) {
    sim::clock_tree t;
    bus_tree(t, 1);
    t.start();
    EXPECT_EQ(t.domain("timers").freq_at(0), frequency::hz(48'000'000));
    // Same edges as the bus.
    for (std::uint64_t k : {0u, 1u, 7u, 1000u})
        EXPECT_EQ(t.domain("timers").time_of(k), t.domain("bus").time_of(k));
}

TEST(clock_boost_test, divider_of_2_and_4_doubles_the_bus_clock) {
    for (std::uint64_t q : {2u, 4u}) {
        sim::clock_tree t;
        bus_tree(t, q);
        t.start();
        const frequency bus = frequency::hz(48'000'000).scaled(1, q);
        EXPECT_EQ(t.domain("timers").freq_at(0), bus.scaled(2, 1)) << q;
        // Every second timer edge is a bus edge, exactly.
        for (std::uint64_t k : {0u, 1u, 5u, 999u})
            EXPECT_EQ(t.domain("timers").time_of(2 * k), t.domain("bus").time_of(k)) << q;
        // And the ones between lie on edges of the source.
        EXPECT_EQ(t.domain("timers").time_of(1), t.domain("src").time_of(q / 2)) << q;
    }
}

TEST(clock_boost_test, odd_divider_doubles_too) {
    sim::clock_tree t;
    bus_tree(t, 3);
    t.start();
    EXPECT_EQ(t.domain("timers").freq_at(0), frequency::hz(32'000'000));
    EXPECT_EQ(t.domain("timers").tick_at(us), 32u);
}

TEST(clock_boost_test, follows_a_divider_change_at_run_time) {
    sim::clock_tree t;
    bus_tree(t, 1);
    t.start();
    const auto& timers = t.domain("timers");
    const auto& src = t.domain("src");
    // The divider's next edge after 1 us still comes with factor 1 (it is source edge 49); from
    // there the bus divides by 4 and the timers run at twice that, on every second source edge.
    const sim::time_ps effective = t.set_divider("bus", 4, us);
    EXPECT_EQ(effective, src.time_of(49));
    EXPECT_EQ(timers.tick_at(effective), 49u);
    EXPECT_EQ(timers.time_of(49), src.time_of(49));
    for (std::uint64_t m = 1; m <= 100; ++m)
        EXPECT_EQ(timers.time_of(49 + m), src.time_of(49 + 2 * m)) << m;
    // Before the change: 48 edges in the first microsecond, untouched.
    EXPECT_EQ(timers.tick_at(us), 48u);
    EXPECT_EQ(timers.freq_at(effective + us), frequency::hz(24'000'000));
    // Back to 1 at 5 us: x1 again, every source edge.
    const sim::time_ps back = t.set_divider("bus", 1, 5 * us);
    const std::uint64_t k = timers.tick_at(back);
    EXPECT_EQ(timers.time_of(k), back);
    const std::uint64_t s0 = src.tick_at(back);
    for (std::uint64_t m = 1; m <= 100; ++m)
        EXPECT_EQ(timers.time_of(k + m), src.time_of(s0 + m)) << m;
    EXPECT_EQ(timers.freq_at(back + us), frequency::hz(48'000'000));
}

TEST(clock_boost_test, consumers_hear_the_change_at_the_first_new_edge) {
    sim::clock_tree t;
    bus_tree(t, 1);
    sim::time_ps heard = 0;
    t.subscribe("timers", "timer", [&](sim::time_ps from) { heard = from; });
    t.start();
    // From divider 1 to 2 the timer clock stays 48 MHz (x1 of 48, x2 of 24): nothing to hear.
    t.set_divider("bus", 2, 100 * ns);
    EXPECT_EQ(heard, 0u);
    // To 4 it halves: consumers hear of it from the divider's edge that starts the new factor,
    // the last edge the old and new timelines share.
    const sim::time_ps effective = t.set_divider("bus", 4, 200 * ns);
    EXPECT_EQ(heard, effective);
}

TEST(clock_boost_test, plan_shows_the_factor_in_force) {
    sim::clock_tree t;
    bus_tree(t, 2);
    t.start();
    bool found = false;
    for (const auto& r : t.plan(0))
        if (r.name == "timers") {
            found = true;
            EXPECT_EQ(r.kind, sim::clock_kind::boost);
            EXPECT_EQ(r.settings, "x2 while bus divides by more than 1 (now x2)");
            EXPECT_EQ(r.freq, frequency::hz(48'000'000));
        }
    EXPECT_TRUE(found);
    sim::clock_tree one;
    bus_tree(one, 1);
    one.start();
    for (const auto& r : one.plan(0)) {
        if (r.name == "timers") {
            EXPECT_EQ(r.settings, "x2 while bus divides by more than 1 (now x1)");
        }
    }
}

TEST(clock_boost_test, input_must_be_a_divider) {
    sim::clock_tree t;
    sim::crystal_params x;
    x.nominal = frequency::hz(8'000'000);
    t.add_crystal("src", x);
    t.add_boost("timers", "src", 2);
    bool found = false;
    for (const std::string& p : t.problems())
        found = found || p == "boost 'timers': input 'src' is a crystal; accepted: a divider (the "
                              "boost multiplies while that divider divides by more than 1)";
    EXPECT_TRUE(found);
    EXPECT_THROW(t.start(), sim::clock_config_error);
}

}  // namespace
