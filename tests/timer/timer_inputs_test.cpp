#include "models/timer/timer_inputs.h"

#include "sim/stimulus/pulse_list.h"
#include "sim/stimulus/square_wave.h"
#include "tests/support/scripted_timer.h"

#include <gtest/gtest.h>

namespace {

using models::timer_inputs;
using sim::stimulus::edge;
using sim::stimulus::pulse_list;
using tickbench_test::scripted_timer;

std::unique_ptr<pulse_list> pulses(std::vector<edge> e, bool initial = false) {
    return std::make_unique<pulse_list>(std::move(e), initial);
}

// The wrapped timer's next event as the inputs announce it, or nothing.
std::optional<models::time_ps> next_event_of(const timer_inputs& in) {
    models::time_ps at = 0;
    if (!in.next_event(at)) return std::nullopt;
    return at;
}

struct recorder : models::input_observer {
    std::vector<std::string> seen;
    void on_input(unsigned input, bool level, models::time_ps at) override {
        seen.push_back(std::to_string(input) + "=" + (level ? "1" : "0") + " @" +
                       std::to_string(at));
    }
};

TEST(timer_inputs_test, delivers_edges_in_time_order_before_the_call_that_passes_them) {
    scripted_timer t;
    timer_inputs in(t);
    recorder r;
    in.add_observer(&r);
    in.drive(models::input_of_channel(0), pulses({{10, true}, {30, false}}));
    in.drive(models::trigger_pin_input, pulses({{20, false}, {40, true}}, true));
    EXPECT_EQ(t.calls, (std::vector<std::string>{"initial 6=1"}));
    EXPECT_EQ(next_event_of(in), models::time_ps{10});
    in.read(models::timer_field::counter, 0, 25);
    in.advance_to(40);
    const std::vector<std::string> want = {"initial 6=1", "input 0=1 @10", "input 6=0 @20",
                                           "read @25",    "input 0=0 @30", "input 6=1 @40",
                                           "advance 40"};
    EXPECT_EQ(t.calls, want);
    EXPECT_EQ(r.seen, (std::vector<std::string>{"0=1 @10", "6=0 @20", "0=0 @30", "6=1 @40"}));
    EXPECT_EQ(next_event_of(in), std::nullopt);
}

TEST(timer_inputs_test, a_square_wave_is_asked_only_as_far_as_the_timer_goes) {
    scripted_timer t;
    timer_inputs in(t);
    sim::stimulus::square_settings s;
    s.freq = sim::frequency::hz(1'000'000'000);  // 1 GHz: 500 ps halves
    in.drive(models::input_of_channel(1), std::make_unique<sim::stimulus::square_wave>(s));
    in.advance_to(1000);
    // Edges at 0, 500 and 1000 ps, nothing beyond; the next one is announced.
    EXPECT_EQ(t.calls.size(), 4u);
    EXPECT_EQ(next_event_of(in), models::time_ps{1500});
}

TEST(timer_inputs_test, a_loopback_brings_its_producer_along_first) {
    scripted_timer producer, consumer;
    timer_inputs in(consumer);
    producer.script = {{100, 2, true}, {250, 2, false}, {260, 4, true}, {400, 2, true}};
    producer.observers.push_back(&in.follow_pin(models::input_of_channel(0), producer, 2));
    // The producer's next event counts among the consumer's: it may become an input edge.
    EXPECT_EQ(next_event_of(in), models::time_ps{100});
    in.write(models::timer_field::enable, 0, 1, 300);
    const std::vector<std::string> want = {"input 0=1 @100", "input 0=0 @250", "write @300"};
    EXPECT_EQ(consumer.calls, want);
    EXPECT_EQ(producer.reached, 300u);
    in.advance_to(1000);
    EXPECT_EQ(consumer.calls.back(), "advance 1000");
    EXPECT_EQ(consumer.calls[3], "input 0=1 @400");
}

TEST(timer_inputs_test, a_producer_run_ahead_keeps_its_edges_until_the_consumer_gets_there) {
    scripted_timer producer, consumer;
    timer_inputs in(consumer);
    producer.script = {{100, 0, true}, {200, 0, false}};
    producer.observers.push_back(&in.follow_pin(models::trigger_pin_input, producer, 0));
    producer.advance_to(500);  // firmware touched the producer at 500 already
    in.advance_to(150);
    EXPECT_EQ(consumer.calls, (std::vector<std::string>{"input 6=1 @100", "advance 150"}));
    EXPECT_EQ(next_event_of(in), models::time_ps{200});
}

TEST(timer_inputs_test, chained_pulses_reach_the_consumer_at_their_times) {
    scripted_timer producer, consumer;
    timer_inputs in(consumer);
    producer.script = {{70, -1, false}, {90, -1, false}};
    producer.observers.push_back(&in.follow_triggers(producer));
    in.advance_to(80);
    in.advance_to(100);
    const std::vector<std::string> want = {"pulse @70", "advance 80", "pulse @90", "advance 100"};
    EXPECT_EQ(consumer.calls, want);
    EXPECT_THROW(in.chained_pulse(120), std::logic_error);
    EXPECT_THROW(in.follow_triggers(producer), std::logic_error);
}

TEST(timer_inputs_test, an_input_without_a_source_is_set_from_outside_and_a_driven_one_is_not) {
    scripted_timer t;
    timer_inputs in(t);
    recorder r;
    in.add_observer(&r);
    in.drive(models::input_of_channel(0), pulses({{10, true}}));
    EXPECT_TRUE(in.driven(models::input_of_channel(0)));
    EXPECT_FALSE(in.driven(models::fault_input));
    EXPECT_THROW(in.set_input(models::input_of_channel(0), false, 20), std::logic_error);
    EXPECT_THROW(in.drive(models::input_of_channel(0), pulses({})), std::logic_error);
    in.set_input(models::fault_input, true, 20);
    in.set_input(models::fault_input, true, 25);  // no change: not passed on
    EXPECT_EQ(t.calls, (std::vector<std::string>{"input 0=1 @10", "fault=1 @20"}));
    EXPECT_EQ(r.seen, (std::vector<std::string>{"0=1 @10", "7=1 @20"}));
}

// The timer core refuses the fault input on its pin-input call, so a source on the fault input
// (a stimulus in a scenario) must reach it through the fault call; its initial level is a level.
TEST(timer_inputs_test, a_source_on_the_fault_input_reaches_the_timer_through_the_fault_call) {
    scripted_timer t;
    timer_inputs in(t);
    recorder r;
    in.add_observer(&r);
    in.drive(models::fault_input, pulses({{50, false}, {80, true}}, true));
    in.advance_to(100);
    const std::vector<std::string> want = {"initial 7=1", "fault=0 @50", "fault=1 @80",
                                           "advance 100"};
    EXPECT_EQ(t.calls, want);
    EXPECT_EQ(r.seen, (std::vector<std::string>{"7=0 @50", "7=1 @80"}));
}

}  // namespace
