// Unit tests of the tick-exact reference timer against docs/timer-model.md and against the
// consequences a firmware engineer checks on a scope.

#include "tests/reference/reference_fixture.h"

#include <gtest/gtest.h>

#include <set>
#include <vector>

namespace tickbench::test_reference {
namespace {

using models::comp_pin;
using models::count_mode;
using models::flag_channel;
using models::flag_fault;
using models::flag_reload;
using models::main_pin;
using models::match_slope;
using models::output_action;
using models::timer_config;
using test_support::timer_event_kind;

constexpr double f_timer = 48e6;

timer_config plain_config() {
    timer_config cfg;
    cfg.counter_bits = 16;
    cfg.channels = 4;
    cfg.prescaler_shadowed = false;
    return cfg;
}

// Starts channel 0 as pwm_below with main output enabled, counting in `mode`.
void start_pwm(reference_fixture& fx, count_mode mode, std::uint32_t prescaler,
               std::uint32_t period, std::uint32_t compare) {
    fx.write(0, timer_field::prescaler, prescaler);
    fx.write(0, timer_field::period, period);
    fx.write(0, timer_field::mode, static_cast<std::uint32_t>(mode));
    fx.write(0, timer_field::compare, compare);
    fx.write(0, timer_field::main_enable, 1);
    fx.write(0, timer_field::action, static_cast<std::uint32_t>(output_action::pwm_below));
    fx.write(0, timer_field::enable, 1);
}

// Frequency in Hz from rising edges rises[first] .. rises[first + n].
double measured_frequency(const std::vector<sim::time_ps>& rises, std::size_t first,
                          std::size_t n) {
    return static_cast<double>(n) * 1e12 /
           static_cast<double>(rises.at(first + n) - rises.at(first));
}

// Fraction of the period the pin is high, from the rise at rises[i], the next fall and the next
// rise.
double measured_duty(const std::vector<sim::time_ps>& rises, const std::vector<sim::time_ps>& falls,
                     std::size_t i) {
    const sim::time_ps rise = rises.at(i);
    sim::time_ps fall = 0;
    for (sim::time_ps f : falls)
        if (f > rise) {
            fall = f;
            break;
        }
    return static_cast<double>(fall - rise) / static_cast<double>(rises.at(i + 1) - rise);
}

TEST(reference_timer_test, edge_aligned_pwm_frequency_up_mode) {
    reference_fixture fx(plain_config());
    start_pwm(fx, count_mode::up, 2, 99, 25);
    fx.run_to(20'000);
    const auto rises = fx.log.pin_edges(main_pin(0), true);
    ASSERT_GE(rises.size(), 40u);
    // common practice, no single source: f_pwm = f_timer / ((prescaler + 1) x (period + 1))
    EXPECT_NEAR(measured_frequency(rises, 1, 30), f_timer / (3.0 * 100.0), 1e-3);
    EXPECT_EQ(fx.tick_of(rises[2]) - fx.tick_of(rises[1]), 3u * 100u);
}

TEST(reference_timer_test, edge_aligned_pwm_frequency_and_duty_down_mode) {
    reference_fixture fx(plain_config());
    start_pwm(fx, count_mode::down, 0, 199, 50);
    fx.run_to(20'000);
    const auto rises = fx.log.pin_edges(main_pin(0), true);
    const auto falls = fx.log.pin_edges(main_pin(0), false);
    ASSERT_GE(rises.size(), 40u);
    // common practice, no single source: f_pwm = f_timer / ((prescaler + 1) x (period + 1))
    EXPECT_NEAR(measured_frequency(rises, 1, 30), f_timer / 200.0, 1e-3);
    // common practice, no single source: pwm_below duty = compare / (period + 1)
    EXPECT_NEAR(measured_duty(rises, falls, 3), 50.0 / 200.0,
                1e-6);  // edge times are exact to 0.5 ps
}

TEST(reference_timer_test, edge_aligned_duty_up_mode) {
    reference_fixture fx(plain_config());
    start_pwm(fx, count_mode::up, 2, 99, 25);
    fx.run_to(5'000);
    const auto rises = fx.log.pin_edges(main_pin(0), true);
    const auto falls = fx.log.pin_edges(main_pin(0), false);
    // common practice, no single source: pwm_below duty = compare / (period + 1)
    EXPECT_NEAR(measured_duty(rises, falls, 2), 25.0 / 100.0,
                1e-6);  // edge times are exact to 0.5 ps
}

TEST(reference_timer_test, center_aligned_pwm_frequency_and_duty) {
    reference_fixture fx(plain_config());
    start_pwm(fx, count_mode::center, 1, 50, 20);
    fx.run_to(20'000);
    const auto rises = fx.log.pin_edges(main_pin(0), true);
    const auto falls = fx.log.pin_edges(main_pin(0), false);
    ASSERT_GE(rises.size(), 40u);
    // common practice, no single source: f_pwm = f_timer / ((prescaler + 1) x 2 x period)
    EXPECT_NEAR(measured_frequency(rises, 1, 30), f_timer / (2.0 * 2.0 * 50.0), 1e-3);
    // common practice, no single source: center-aligned pwm_below duty = compare / period
    EXPECT_NEAR(measured_duty(rises, falls, 2), 20.0 / 50.0,
                1e-6);  // edge times are exact to 0.5 ps
}

TEST(reference_timer_test, up_counter_takes_period_plus_one_values) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    std::set<std::uint32_t> seen;
    std::vector<std::uint32_t> sequence;
    for (std::uint64_t k = 1; k <= 30; ++k) sequence.push_back(fx.read(k, timer_field::counter));
    for (std::size_t i = 0; i < 10; ++i) seen.insert(sequence[i]);
    // common practice, no single source: an up-counter counting 0..P gives P + 1 steps per period
    EXPECT_EQ(seen.size(), 10u);
    EXPECT_EQ(*seen.rbegin(), 9u);
    const auto triggers = fx.log.of_kind(timer_event_kind::trigger);
    ASSERT_EQ(triggers.size(), 3u);
    EXPECT_EQ(fx.tick_of(triggers[1]) - fx.tick_of(triggers[0]), 10u);
}

TEST(reference_timer_test, preloaded_period_loads_at_reload_event_only) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period_preload, 1);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::force_reload, 1);  // loads the shadow now
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    fx.write(15, timer_field::period, 4);
    EXPECT_EQ(fx.read(15, timer_field::period), 4u);   // reads the shadow
    EXPECT_EQ(fx.read(19, timer_field::counter), 9u);  // still counting to the old period
    fx.run_to(31);
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{10, 20, 25, 30}));
}

TEST(reference_timer_test, immediate_period_below_counter_runs_on_to_max) {
    timer_config cfg = plain_config();
    cfg.counter_bits = 8;
    reference_fixture fx(cfg);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    EXPECT_EQ(fx.read(7, timer_field::counter), 7u);
    fx.write(7, timer_field::period, 3);
    fx.run_to(265);
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{256, 260, 264}));
}

TEST(reference_timer_test, shadowed_prescaler_waits_for_reload_event) {
    timer_config cfg = plain_config();
    cfg.prescaler_shadowed = true;
    reference_fixture fx(cfg);
    fx.write(0, timer_field::prescaler, 1);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::force_reload, 1);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    fx.write(5, timer_field::prescaler, 3);
    EXPECT_EQ(fx.read(5, timer_field::prescaler), 3u);
    fx.run_to(70);
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{20, 60}));
}

TEST(reference_timer_test, immediate_prescaler_keeps_pcount) {
    reference_fixture fx(plain_config());  // prescaler not shadowed
    fx.write(0, timer_field::prescaler, 1);
    fx.write(0, timer_field::period, 99);
    fx.write(0, timer_field::enable, 1);
    EXPECT_EQ(fx.read(4, timer_field::counter), 2u);
    fx.write(5, timer_field::prescaler, 3);  // pcount is 1 here
    EXPECT_EQ(fx.read(7, timer_field::counter), 2u);
    EXPECT_EQ(fx.read(8, timer_field::counter), 3u);
    EXPECT_EQ(fx.read(11, timer_field::counter), 3u);
    EXPECT_EQ(fx.read(12, timer_field::counter), 4u);
}

TEST(reference_timer_test, one_pulse_stops_at_the_first_reload_event) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 4);
    fx.write(0, timer_field::one_pulse, 1);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    EXPECT_EQ(fx.read(4, timer_field::enable), 1u);
    EXPECT_EQ(fx.read(5, timer_field::enable), 0u);
    EXPECT_EQ(fx.read(50, timer_field::counter), 0u);
    const auto triggers = fx.log.of_kind(timer_event_kind::trigger);
    ASSERT_EQ(triggers.size(), 1u);
    EXPECT_EQ(fx.tick_of(triggers[0]), 5u);
}

TEST(reference_timer_test, wrap_skip_spaces_reload_events) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::wrap_skip, 2);
    fx.write(0, timer_field::period, 3);
    // quiet_forced: the forced reload sets no flag.
    fx.write(0, timer_field::reload_policy,
             static_cast<std::uint32_t>(models::reload_policy::quiet_forced));
    fx.write(0, timer_field::force_reload, 1);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    EXPECT_EQ(fx.read(11, timer_field::flags) & flag_reload, 0u);
    EXPECT_EQ(fx.read(12, timer_field::flags) & flag_reload, flag_reload);
    fx.run_to(30);
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{12, 24}));
}

TEST(reference_timer_test, skip_count_starts_at_zero_after_reset) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::wrap_skip, 2);
    fx.write(0, timer_field::period, 3);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    fx.run_to(30);
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{4, 16, 28}));
}

TEST(reference_timer_test, forced_reload_restarts_counter_and_prescaler) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::prescaler, 1);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::trigger_select, models::trigger_on_reload);
    fx.write(0, timer_field::enable, 1);
    fx.write(13, timer_field::force_reload, 1);  // counter 6, pcount 1
    EXPECT_EQ(fx.read(13, timer_field::counter), 0u);
    EXPECT_EQ(fx.read(13, timer_field::force_reload), 0u);
    EXPECT_EQ(fx.read(14, timer_field::counter), 0u);
    EXPECT_EQ(fx.read(15, timer_field::counter), 1u);
    fx.run_to(40);
    // The forced reload's trigger pulse and flag show at the first tick after the write (14); the
    // counter then steps at 15, 17... and wraps from 9 at 33.
    std::vector<std::uint64_t> ticks;
    for (auto t : fx.log.of_kind(timer_event_kind::trigger)) ticks.push_back(fx.tick_of(t));
    EXPECT_EQ(ticks, (std::vector<std::uint64_t>{14, 33}));
    EXPECT_EQ(fx.log.flag_sets(flag_reload).size(), 1u);  // set at 14, never cleared
    EXPECT_EQ(fx.tick_of(fx.log.flag_sets(flag_reload)[0]), 14u);
}

TEST(reference_timer_test, forced_reload_in_down_mode_loads_period) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::mode, static_cast<std::uint32_t>(count_mode::down));
    fx.write(0, timer_field::enable, 1);
    fx.write(4, timer_field::force_reload, 1);
    EXPECT_EQ(fx.read(4, timer_field::counter), 9u);
    EXPECT_EQ(fx.read(4, timer_field::direction), 1u);
}

// Complementary channel 0 as pwm_below with both outputs enabled and the given dead time.
void start_complementary(reference_fixture& fx, std::uint32_t dead_time, std::uint32_t compare) {
    fx.write(0, timer_field::dead_time, dead_time);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::compare, compare);
    fx.write(0, timer_field::main_enable, 1);
    fx.write(0, timer_field::comp_enable, 1);
    fx.write(0, timer_field::action, static_cast<std::uint32_t>(output_action::pwm_below));
    fx.write(0, timer_field::enable, 1);
}

timer_config complementary_config() {
    timer_config cfg = plain_config();
    cfg.complementary = true;
    cfg.dead_time_max = 7;
    return cfg;
}

std::vector<std::uint64_t> ticks_of(const reference_fixture& fx,
                                    const std::vector<sim::time_ps>& ts) {
    std::vector<std::uint64_t> out;
    for (auto t : ts) out.push_back(fx.tick_of(t));
    return out;
}

TEST(reference_timer_test, dead_time_delays_each_rise) {
    reference_fixture fx(complementary_config());
    start_complementary(fx, 3, 5);
    fx.run_to(26);
    // The set-up written after tick 0 shows at tick 1: the reference level rises there, so the
    // main output rises 3 ticks later. It falls at once when the counter reaches 5, and the
    // complementary output rises 3 ticks after that.
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), true)),
              (std::vector<std::uint64_t>{4, 13, 23}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), false)),
              (std::vector<std::uint64_t>{5, 15, 25}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(comp_pin(0), true)),
              (std::vector<std::uint64_t>{8, 18}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(comp_pin(0), false)),
              (std::vector<std::uint64_t>{10, 20}));
}

TEST(reference_timer_test, dead_time_is_clipped_to_the_instance_maximum) {
    reference_fixture fx(complementary_config());
    fx.write(0, timer_field::dead_time, 1000);
    EXPECT_EQ(fx.read(0, timer_field::dead_time), 7u);
}

TEST(reference_timer_test, pulse_shorter_than_dead_time_vanishes) {
    reference_fixture fx(complementary_config());
    start_complementary(fx, 3, 2);
    fx.run_to(40);
    EXPECT_TRUE(fx.log.pin_edges(main_pin(0), true).empty());
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(comp_pin(0), true)),
              (std::vector<std::uint64_t>{5, 15, 25, 35}));
}

TEST(reference_timer_test, fault_forces_safe_levels_after_latency_until_rearm) {
    reference_fixture fx(complementary_config());
    fx.write(0, timer_field::fault_enable, 1);
    fx.write(0, timer_field::fault_latency, 2);
    fx.write(0, timer_field::comp_safe_level, 1);
    start_complementary(fx, 0, 5);
    // The input rises between ticks 20 and 21: the fault acts 2 ticks after tick 21.
    fx.timer.set_fault_input(true, fx.at(20) + 1000);
    fx.run_to(22);
    fx.log.clear();
    fx.run_to(23);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_fault)), (std::vector<std::uint64_t>{23}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), false)), (std::vector<std::uint64_t>{23}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(comp_pin(0), true)), (std::vector<std::uint64_t>{23}));
    fx.run_to(30);
    EXPECT_EQ(fx.log.events.size(), 3u);  // the counter no longer moves the pins
    fx.write(30, timer_field::rearm, 1);  // input still high: nothing
    EXPECT_FALSE(fx.timer.pin(main_pin(0)));
    fx.timer.set_fault_input(false, fx.at(31));
    EXPECT_FALSE(fx.timer.pin(main_pin(0)));  // the input falling does not end the fault
    fx.write(32, timer_field::rearm, 1);
    EXPECT_FALSE(fx.timer.pin(main_pin(0)));  // the pins return at the next tick
    fx.run_to(33);                            // counter 3: main high, comp low again
    EXPECT_TRUE(fx.timer.pin(main_pin(0)));
    EXPECT_FALSE(fx.timer.pin(comp_pin(0)));
    EXPECT_EQ(fx.log.pin_edges(main_pin(0), true).back(), fx.at(33));
    EXPECT_EQ(fx.read(32, timer_field::flags) & flag_fault, flag_fault);
}

TEST(reference_timer_test, a_fault_input_high_since_before_time_0_starts_no_fault) {
    reference_fixture fx(complementary_config());
    fx.timer.set_initial_input(models::fault_input, true);
    fx.write(0, timer_field::fault_enable, 1);
    start_complementary(fx, 0, 5);
    fx.run_to(20);
    EXPECT_TRUE(fx.log.flag_sets(flag_fault).empty());
    // Only a rise starts a fault: low between ticks 20 and 21, high again between 21 and 22.
    fx.timer.set_fault_input(false, fx.at(20) + 1000);
    fx.timer.set_fault_input(true, fx.at(21) + 1000);
    fx.run_to(23);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_fault)), (std::vector<std::uint64_t>{22}));
}

TEST(reference_timer_test, fault_without_latency_acts_at_the_next_tick) {
    reference_fixture fx(complementary_config());
    fx.write(0, timer_field::fault_enable, 1);
    fx.write(0, timer_field::main_safe_level, 1);
    fx.timer.set_fault_input(true, fx.at(3) + 7);
    fx.run_to(4);
    EXPECT_EQ(fx.log.pin_edges(main_pin(0), true), (std::vector<sim::time_ps>{fx.at(4)}));
    EXPECT_EQ(fx.log.flag_sets(flag_fault), (std::vector<sim::time_ps>{fx.at(4)}));
}

TEST(reference_timer_test, flags_raise_and_drop_the_interrupt_line) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 4);
    fx.write(0, timer_field::irq_enable, flag_reload);
    fx.write(0, timer_field::enable, 1);
    fx.timer.clear_flags(flag_reload, fx.at(7));
    fx.write(11, timer_field::irq_enable, 0);
    fx.write(12, timer_field::irq_enable, flag_reload | flag_channel(0));
    fx.run_to(13);
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_reload)), (std::vector<std::uint64_t>{5, 10}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(0))),
              (std::vector<std::uint64_t>{5}));  // compare 0 matches at the wrap
    std::vector<std::uint64_t> irq_ticks = ticks_of(fx, fx.log.of_kind(timer_event_kind::irq));
    // Flags set at ticks; the clear at 7 and the enable writes at 11 and 12 show at the next tick.
    EXPECT_EQ(irq_ticks, (std::vector<std::uint64_t>{5, 8, 10, 12, 13}));
    EXPECT_TRUE(fx.timer.irq());
}

TEST(reference_timer_test, channel_match_sets_flag_and_sends_trigger) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::compare, 3, 1);
    fx.write(0, timer_field::trigger_select, models::trigger_on_match(1));
    fx.write(0, timer_field::enable, 1);
    fx.run_to(25);
    EXPECT_EQ(ticks_of(fx, fx.log.of_kind(timer_event_kind::trigger)),
              (std::vector<std::uint64_t>{3, 13, 23}));
    EXPECT_EQ(ticks_of(fx, fx.log.flag_sets(flag_channel(1))), (std::vector<std::uint64_t>{3}));
}

TEST(reference_timer_test, center_mode_matches_only_on_the_chosen_slope) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::mode, static_cast<std::uint32_t>(count_mode::center));
    fx.write(0, timer_field::slope, static_cast<std::uint32_t>(match_slope::down));
    fx.write(0, timer_field::period, 10);
    fx.write(0, timer_field::compare, 4);
    fx.write(0, timer_field::trigger_select, models::trigger_on_match(0));
    fx.write(0, timer_field::enable, 1);
    fx.run_to(40);
    // Up 0..10 at ticks 1..10, down to 4 at tick 16, to 0 at 20, up to 4 at 24, down to 4 at 36.
    EXPECT_EQ(ticks_of(fx, fx.log.of_kind(timer_event_kind::trigger)),
              (std::vector<std::uint64_t>{16, 36}));
}

TEST(reference_timer_test, toggle_on_match_halves_the_frequency) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::compare, 0);
    fx.write(0, timer_field::main_enable, 1);
    fx.write(0, timer_field::action, static_cast<std::uint32_t>(output_action::toggle_on_match));
    fx.write(0, timer_field::enable, 1);
    fx.run_to(45);
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), true)),
              (std::vector<std::uint64_t>{10, 30}));
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), false)),
              (std::vector<std::uint64_t>{20, 40}));
}

class compare_latency_test : public ::testing::TestWithParam<unsigned> {};

TEST_P(compare_latency_test, new_compare_acts_after_the_latency) {
    timer_config cfg = plain_config();
    cfg.compare_latency = GetParam();
    reference_fixture fx(cfg);
    start_pwm(fx, count_mode::up, 0, 99, 50);
    fx.run_to(3);  // the first compare write takes effect by now whatever the latency
    fx.log.clear();
    const sim::time_ps t = fx.at(10) + 500;
    fx.timer.write(timer_field::compare, 0, 5, t);  // counter 10 >= 5: the level falls
    fx.run_to(20);
    // Tick 11 is the first after the write; with latency L, ticks 11 .. 10 + L still compare
    // against the old value, and tick 11 + L uses the new one.
    const auto falls = fx.log.pin_edges(main_pin(0), false);
    ASSERT_EQ(falls.size(), 1u);
    EXPECT_EQ(falls[0], fx.at(11 + GetParam()));
    EXPECT_EQ(fx.timer.read(timer_field::compare, 0, t), 5u);
}

INSTANTIATE_TEST_SUITE_P(latencies, compare_latency_test, ::testing::Values(0u, 1u, 2u));

TEST(reference_timer_test, preloaded_compare_shows_in_the_next_period_only) {
    reference_fixture fx(plain_config());
    fx.write(0, timer_field::compare_preload, 1);
    fx.write(0, timer_field::compare, 5);
    fx.write(0, timer_field::period, 9);
    fx.write(0, timer_field::force_reload, 1);
    fx.write(0, timer_field::main_enable, 1);
    fx.write(0, timer_field::action, static_cast<std::uint32_t>(output_action::pwm_below));
    fx.write(0, timer_field::enable, 1);
    fx.write(3, timer_field::compare, 8);  // mid-period: the fall at 5 stays
    fx.run_to(30);
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), false)),
              (std::vector<std::uint64_t>{5, 18, 28}));
}

// docs/timer-model.md, "Out-of-range writes": per-channel fields of a channel the instance lacks
// are ignored and read 0.
TEST(reference_timer_test, fields_of_a_channel_the_instance_lacks_are_ignored_and_read_zero) {
    timer_config cfg = plain_config();
    cfg.channels = 2;
    reference_fixture fx(cfg);
    start_pwm(fx, count_mode::up, 0, 9, 5);
    for (unsigned ch : {2u, 5u, 6u, 255u}) {
        fx.write(2, timer_field::compare, 3, ch);
        fx.write(2, timer_field::action, static_cast<std::uint32_t>(output_action::force_high), ch);
        fx.write(2, timer_field::main_enable, 1, ch);
        EXPECT_EQ(fx.read(3, timer_field::compare, ch), 0u) << "channel " << ch;
        EXPECT_EQ(fx.read(3, timer_field::action, ch), 0u) << "channel " << ch;
        EXPECT_EQ(fx.read(3, timer_field::main_enable, ch), 0u) << "channel " << ch;
    }
    fx.run_to(30);
    // Channel 0 runs on as written (it falls at compare 5 of each 10-tick period); no other pin
    // moves.
    EXPECT_EQ(ticks_of(fx, fx.log.pin_edges(main_pin(0), false)),
              (std::vector<std::uint64_t>{5, 15, 25}));
    for (const auto& e : fx.log.events) {
        if (e.kind != timer_event_kind::pin) continue;
        EXPECT_EQ(e.id, main_pin(0)) << e;
    }
}

}  // namespace
}  // namespace tickbench::test_reference
