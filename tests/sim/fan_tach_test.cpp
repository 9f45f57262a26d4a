#include "sim/stimulus/fan_tach.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

namespace {

using sim::time_ps;
using sim::stimulus::edge;
using sim::stimulus::fan_settings;
using sim::stimulus::fan_tach;

constexpr time_ps us = 1'000'000;
constexpr time_ps ms = 1'000 * us;

// Feeds `fan` a PWM of `period` with `high` time from `from` to `until`, then says the pin is known
// up to `until`.
void pwm(fan_tach& fan, time_ps from, time_ps until, time_ps period, time_ps high) {
    for (time_ps t = from; t < until; t += period) {
        if (high > 0) fan.drive(true, t);
        if (high < period) fan.drive(false, t + high);
    }
    fan.known_until(until);
}

std::vector<edge> edges_before(fan_tach& fan, time_ps until) {
    std::vector<edge> v;
    time_ps from = 0;
    while (auto e = fan.next_edge(from)) {
        if (e->at >= until) break;
        v.push_back(*e);
        from = e->at + 1;
    }
    return v;
}

fan_settings settings(std::uint32_t max_rpm, time_ps time_constant) {
    fan_settings s;
    s.max_rpm = max_rpm;
    s.time_constant = time_constant;
    return s;
}

TEST(fan_tach_test, half_duty_without_lag_turns_at_half_speed) {
    // 3000 rpm at 100 %, no lag, 1 ms windows, 2 pulses per revolution; a 25 kHz PWM at 50 %.
    fan_tach fan(settings(3000, 0));
    pwm(fan, 0, 100 * ms, 40 * us, 20 * us);
    EXPECT_EQ(fan.speed_in(0), 0.0);  // window 0 has no drive before it
    ASSERT_TRUE(fan.speed_in(1).has_value());
    EXPECT_DOUBLE_EQ(*fan.speed_in(1), 1500.0);
    // 1500 rpm is 25 revolutions a second, 4 edges each: an edge every 10 ms, the first one a
    // quarter turn after window 1 starts at 1 ms.
    const std::vector<edge> e = edges_before(fan, 100 * ms);
    ASSERT_EQ(e.size(), 9u);
    for (std::size_t k = 0; k < e.size(); ++k) {
        const time_ps want = 1 * ms + (k + 1) * 10 * ms;
        EXPECT_LE(e[k].at > want ? e[k].at - want : want - e[k].at, 1u) << "edge " << k;
        EXPECT_EQ(e[k].level, k % 2 == 0) << "edge " << k;
    }
}

TEST(fan_tach_test, speed_follows_a_first_order_lag) {
    // A first-order lag covers 1 - 1/e (63.2 %) of a step in one time constant: the definition of
    // the lag (common practice, no source).
    fan_tach fan(settings(4000, 100 * ms));
    pwm(fan, 0, 300 * ms, 40 * us, 40 * us);  // always high: 100 %
    // Window k runs at the speed reached after k windows of drive: 1 ms each, k x 1 ms.
    ASSERT_TRUE(fan.speed_in(300).has_value());
    EXPECT_FALSE(fan.speed_in(301).has_value());  // needs the pin up to 301 ms
    EXPECT_NEAR(*fan.speed_in(100), 4000.0 * (1.0 - std::exp(-1.0)), 1e-6);
    EXPECT_NEAR(*fan.speed_in(300), 4000.0 * (1.0 - std::exp(-3.0)), 1e-6);
    EXPECT_LT(*fan.speed_in(50), *fan.speed_in(51));
}

TEST(fan_tach_test, answers_only_as_far_as_the_pin_is_known) {
    fan_tach fan(settings(6000, 0));
    EXPECT_EQ(fan.determined_until(), 1 * ms);
    EXPECT_EQ(fan.next_edge(0), std::nullopt);  // window 0 stands still; window 1 is not known
    fan.drive(true, 0);
    fan.known_until(2500 * us);
    EXPECT_EQ(fan.determined_until(), 3 * ms);
    // 6000 rpm: 100 revolutions a second, an edge every 2.5 ms from 1 ms on. The first, at 3.5 ms,
    // is not determined by a pin known up to 2.5 ms (window 3 could still run at another speed).
    EXPECT_EQ(fan.next_edge(0), std::nullopt);
    fan.known_until(4 * ms);
    auto first = fan.next_edge(0);
    ASSERT_TRUE(first.has_value());
    EXPECT_NEAR(static_cast<double>(first->at), static_cast<double>(3500 * us), 1.0);
    EXPECT_TRUE(first->level);
    // Asking again from the same instant gives the same edge; past it, nothing is known yet.
    EXPECT_EQ(fan.next_edge(0), first);
    EXPECT_EQ(fan.next_edge(first->at + 1), std::nullopt);
    fan.known_until(6 * ms);
    auto second = fan.next_edge(first->at + 1);
    ASSERT_TRUE(second.has_value());
    EXPECT_NEAR(static_cast<double>(second->at), static_cast<double>(6000 * us), 1.0);
    EXPECT_FALSE(second->level);
}

TEST(fan_tach_test, a_pin_held_low_never_turns_the_fan) {
    fan_tach fan(settings(3000, 10 * ms));
    pwm(fan, 0, 50 * ms, 40 * us, 0);
    EXPECT_EQ(*fan.speed_in(49), 0.0);
    EXPECT_TRUE(edges_before(fan, 50 * ms).empty());
}

TEST(fan_tach_test, slowing_down_stretches_the_edges) {
    // Full drive for 100 ms, then none: the edges come further and further apart.
    fan_tach fan(settings(3000, 20 * ms));
    pwm(fan, 0, 100 * ms, 40 * us, 40 * us);
    pwm(fan, 100 * ms, 300 * ms, 40 * us, 0);
    const std::vector<edge> e = edges_before(fan, 300 * ms);
    ASSERT_GT(e.size(), 10u);
    const std::size_t n = e.size();
    EXPECT_GT(e[n - 1].at - e[n - 2].at, e[n - 3].at - e[n - 4].at);
    EXPECT_GT(e[n - 1].at - e[n - 2].at, 5 * ms);
    for (std::size_t k = 1; k < n; ++k) EXPECT_GT(e[k].at, e[k - 1].at);
}

TEST(fan_tach_test, refuses_settings_it_cannot_run) {
    fan_settings s = settings(0, 0);
    EXPECT_FALSE(sim::stimulus::fan_problems(s).empty());
    EXPECT_THROW(fan_tach{s}, std::invalid_argument);
    s = settings(3000, 0);
    s.pulses_per_revolution = 0;
    EXPECT_THROW(fan_tach{s}, std::invalid_argument);
    s.pulses_per_revolution = 2;
    s.averaging = 0;
    EXPECT_THROW(fan_tach{s}, std::invalid_argument);
}

}  // namespace
