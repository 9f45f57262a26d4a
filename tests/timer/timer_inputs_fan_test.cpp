#include "models/timer/timer_inputs.h"

#include "sim/stimulus/fan_tach.h"
#include "tests/support/scripted_timer.h"

#include <gtest/gtest.h>

namespace {

using models::timer_inputs;
using tickbench_test::scripted_timer;

constexpr models::time_ps ms = 1'000'000'000;

struct level_log : models::input_observer {
    std::vector<std::pair<bool, models::time_ps>> seen;
    void on_input(unsigned, bool level, models::time_ps at) override {
        seen.push_back({level, at});
    }
};

std::unique_ptr<sim::stimulus::fan_tach> fan_of(std::uint32_t max_rpm) {
    sim::stimulus::fan_settings s;
    s.max_rpm = max_rpm;
    s.time_constant = 0;
    return std::make_unique<sim::stimulus::fan_tach>(s);
}

std::optional<models::time_ps> next_event_of(const timer_inputs& in) {
    models::time_ps at = 0;
    if (!in.next_event(at)) return std::nullopt;
    return at;
}

TEST(timer_inputs_fan_test, a_fan_turns_its_producers_pin_into_tachometer_edges) {
    // The producer's pin 2 goes high at 1 ms and stays: from window 2 on, the fan runs at its full
    // 6000 rpm, 100 revolutions a second, 2 pulses each: an edge every 2.5 ms.
    scripted_timer producer, consumer;
    timer_inputs in(consumer);
    level_log log;
    in.add_observer(&log);
    producer.script = {{1 * ms, 2, true}};
    producer.observers.push_back(
        &in.follow_fan(models::input_of_channel(0), producer, 2, fan_of(6000)));
    // Before anything is known, the end of window 0 is an event: the fan must learn more there.
    EXPECT_EQ(next_event_of(in), 1 * ms);
    in.advance_to(1 * ms);
    EXPECT_EQ(producer.reached, 1 * ms);
    EXPECT_EQ(next_event_of(in), 2 * ms);  // window 1 stands still; window 2 is not known yet
    in.advance_to(2 * ms);
    // Window 2 runs at 6000 rpm: its first edge is a quarter turn in, at 4.5 ms, beyond what the
    // pin up to 2 ms determines (window 3 could run at another speed); the consumer comes back at
    // 3 ms to learn more.
    EXPECT_EQ(next_event_of(in), 3 * ms);
    in.advance_to(4 * ms);
    const auto first = next_event_of(in);
    ASSERT_TRUE(first.has_value());
    EXPECT_NEAR(static_cast<double>(*first), 4.5 * ms, 1.0);
    in.advance_to(10 * ms);
    ASSERT_EQ(log.seen.size(), 3u);  // 4.5, 7 and 9.5 ms
    EXPECT_TRUE(log.seen[0].first);
    EXPECT_FALSE(log.seen[1].first);
    EXPECT_NEAR(static_cast<double>(log.seen[2].second), 9.5 * ms, 1.0);
    EXPECT_EQ(consumer.calls.back(), "advance " + std::to_string(10 * ms));
}

TEST(timer_inputs_fan_test, a_fan_claims_its_input) {
    scripted_timer producer, consumer;
    timer_inputs in(consumer);
    in.follow_fan(models::input_of_channel(0), producer, 0, fan_of(3000));
    EXPECT_TRUE(in.driven(models::input_of_channel(0)));
    EXPECT_THROW(in.follow_fan(models::input_of_channel(0), producer, 0, fan_of(3000)),
                 std::logic_error);
    EXPECT_THROW(in.set_input(models::input_of_channel(0), true, 5), std::logic_error);
}

}  // namespace
