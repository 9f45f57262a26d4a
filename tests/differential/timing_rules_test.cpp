// The timing rules a bus write meets, on both timer models (docs/timer-model.md, "Time" and
// "Register writes"): what a write changes shows on the outputs, the flags and the interrupt line
// at the first edge of the timer clock after it; a compare latency of L keeps the old compare
// value for the L ticks after the write; the dead time counts on a scaled clock; a clipped dead
// time is reported.

#include "models/reference/reference_timer.h"
#include "models/timer/timer_core.h"
#include "tests/support/timer_event_log.h"

#include <gtest/gtest.h>

#include <spdlog/sinks/ostream_sink.h>
#include <spdlog/spdlog.h>

#include <memory>
#include <sstream>
#include <vector>

namespace {

using models::timer_field;
using tickbench::test_support::timer_event_kind;
using tickbench::test_support::timer_event_log;

constexpr sim::time_ps us = 1'000'000;  // one tick of the 1 MHz timer clock

template <class model>
struct rig {
    explicit rig(const models::timer_config& cfg)
        : clock(sim::frequency::hz(1'000'000)), timer(cfg, clock, &log) {}
    void set(timer_field f, std::uint32_t v, sim::time_ps at, unsigned c = 0) {
        timer.write(f, c, v, at);
    }
    sim::clock_domain clock;
    timer_event_log log;
    model timer;
};

models::timer_config complementary() {
    models::timer_config cfg;
    cfg.channels = 1;
    cfg.complementary = true;
    cfg.dead_time_scaled = true;
    return cfg;
}

template <class model>
class timing_rules_test : public ::testing::Test {};
using both_models = ::testing::Types<models::timer_core, models::reference::reference_timer>;
TYPED_TEST_SUITE(timing_rules_test, both_models);

TYPED_TEST(timing_rules_test, write_effects_show_at_the_next_clock_edge) {
    rig<TypeParam> r(complementary());
    r.set(timer_field::irq_enable, models::flag_reload | models::flag_fault, 0);
    r.set(timer_field::trigger_select, models::trigger_on_reload, 0);
    r.set(timer_field::main_enable, 1, 0);
    // A forced level written between ticks 1 and 2 shows at tick 2.
    r.set(timer_field::action, static_cast<std::uint32_t>(models::output_action::force_high),
          1 * us + us / 2);
    // A forced reload between ticks 3 and 4: its flag, the interrupt line and its trigger pulse
    // at tick 4. The flag clear between 5 and 6 drops the line at tick 6.
    r.set(timer_field::force_reload, 1, 3 * us + us / 4);
    r.timer.clear_flags(models::flag_reload, 5 * us + us / 2);
    // A fault (no latency) rising between 7 and 8 acts at tick 8; the rearm between 9 and 10
    // returns the pins at tick 10.
    r.set(timer_field::fault_enable, 1, 6 * us);
    r.timer.set_fault_input(true, 7 * us + 300'000);
    r.timer.set_fault_input(false, 8 * us + 700'000);
    r.timer.clear_flags(models::flag_fault, 9 * us);
    r.set(timer_field::rearm, 1, 9 * us + 100'000);
    r.timer.advance_to(12 * us);

    EXPECT_EQ(r.log.pin_edges(models::main_pin(0), true),
              (std::vector<sim::time_ps>{2 * us, 10 * us}));
    EXPECT_EQ(r.log.pin_edges(models::main_pin(0), false), (std::vector<sim::time_ps>{8 * us}));
    EXPECT_EQ(r.log.flag_sets(models::flag_reload), (std::vector<sim::time_ps>{4 * us}));
    EXPECT_EQ(r.log.flag_sets(models::flag_fault), (std::vector<sim::time_ps>{8 * us}));
    EXPECT_EQ(r.log.of_kind(timer_event_kind::trigger), (std::vector<sim::time_ps>{4 * us}));
    EXPECT_EQ(r.log.of_kind(timer_event_kind::irq),
              (std::vector<sim::time_ps>{4 * us, 6 * us, 8 * us, 10 * us}));
    // Registers hold a write at once: a read right after it sees it.
    EXPECT_EQ(r.timer.read(timer_field::action, 0, 12 * us),
              static_cast<std::uint32_t>(models::output_action::force_high));
}

// Firmware that sets an alarm at "now + n" on a free-running 16-bit counter: the tick at which the
// channel's match flag sets.
template <class model>
std::vector<sim::time_ps> alarm_flags(unsigned latency, std::uint32_t ahead) {
    models::timer_config cfg;
    cfg.channels = 1;
    cfg.compare_latency = latency;
    rig<model> r(cfg);
    r.set(timer_field::compare, 0xffff, 0);  // out of the way until the alarm is set
    r.set(timer_field::enable, 1, 0);
    const sim::time_ps now = 100 * us + us / 2;
    const std::uint32_t counter = r.timer.read(timer_field::counter, 0, now);
    EXPECT_EQ(counter, 100u);
    r.set(timer_field::compare, counter + ahead, now);
    r.timer.advance_to(70'000 * us);
    return r.log.flag_sets(models::flag_channel(0));
}

TYPED_TEST(timing_rules_test, compare_latency_one_misses_an_alarm_at_now_plus_one) {
    // The counter steps to 101 at tick 101, the first tick after the write, which still compares
    // against the old value: the alarm fires a whole counter range (65536 ticks) later.
    EXPECT_EQ(alarm_flags<TypeParam>(1, 1), (std::vector<sim::time_ps>{(101 + 65536) * us}));
    // At now + 2 it fires at once.
    EXPECT_EQ(alarm_flags<TypeParam>(1, 2), (std::vector<sim::time_ps>{102 * us}));
    // Without latency now + 1 is enough; with latency 2 it takes now + 3.
    EXPECT_EQ(alarm_flags<TypeParam>(0, 1), (std::vector<sim::time_ps>{101 * us}));
    EXPECT_EQ(alarm_flags<TypeParam>(2, 2), (std::vector<sim::time_ps>{(102 + 65536) * us}));
    EXPECT_EQ(alarm_flags<TypeParam>(2, 3), (std::vector<sim::time_ps>{103 * us}));
}

TYPED_TEST(timing_rules_test, dead_time_counts_on_the_scaled_clock) {
    for (std::uint32_t scale = 0; scale < 4; ++scale) {
        SCOPED_TRACE(scale);
        rig<TypeParam> r(complementary());
        r.set(timer_field::dead_time, 3, 0);
        r.set(timer_field::dead_time_scale, scale, 0);
        r.set(timer_field::period, 99, 0);
        r.set(timer_field::compare, 50, 0);
        r.set(timer_field::action, static_cast<std::uint32_t>(models::output_action::pwm_below), 0);
        r.set(timer_field::main_enable, 1, 0);
        r.set(timer_field::comp_enable, 1, 0);
        r.set(timer_field::enable, 1, 0);
        r.timer.advance_to(99 * us);  // the counter wraps at tick 100
        EXPECT_EQ(r.timer.read(timer_field::dead_time_scale, 0, 99 * us), scale);
        // The reference level rises at tick 1 and falls at tick 50: each output rises
        // 3 x 2^scale ticks after its want.
        const sim::time_ps d = (3u << scale) * us;
        EXPECT_EQ(r.log.pin_edges(models::main_pin(0), true), (std::vector<sim::time_ps>{us + d}));
        EXPECT_EQ(r.log.pin_edges(models::comp_pin(0), true),
                  (std::vector<sim::time_ps>{50 * us + d}));
    }
}

TYPED_TEST(timing_rules_test, without_a_scale_field_the_scale_stays_one) {
    models::timer_config cfg = complementary();
    cfg.dead_time_scaled = false;
    rig<TypeParam> r(cfg);
    r.set(timer_field::dead_time_scale, 3, 0);
    EXPECT_EQ(r.timer.read(timer_field::dead_time_scale, 0, 0), 0u);
}

TEST(dead_time_warning_test, a_clipped_dead_time_is_logged_with_the_simulated_time) {
    std::ostringstream out;
    auto logger = std::make_shared<spdlog::logger>(
        "timer", std::make_shared<spdlog::sinks::ostream_sink_st>(out));
    logger->set_pattern("%l %v");
    const auto previous = spdlog::get("timer");
    spdlog::drop("timer");
    spdlog::register_logger(logger);
    models::timer_config cfg = complementary();
    cfg.dead_time_max = 1023;
    sim::clock_domain clock(sim::frequency::hz(1'000'000));
    models::timer_core timer(cfg, clock, nullptr, "motor");
    timer.write(timer_field::dead_time, 0, 1000, 5 * us);
    EXPECT_EQ(out.str(), "");  // in range: nothing said
    timer.write(timer_field::dead_time, 0, 5000, 7 * us + 250);
    EXPECT_EQ(timer.read(timer_field::dead_time, 0, 8 * us), 1023u);
    EXPECT_EQ(out.str(),
              "warning motor: dead time 5000 written at 7000250 ps is above the instance's maximum "
              "1023; clipped to 1023\n");
    spdlog::drop("timer");
    if (previous) spdlog::register_logger(previous);
}

}  // namespace
