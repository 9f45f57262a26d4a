// The check engine on real PWM from the fast timer: three complementary channels at 25 kHz from a
// 48 MHz timer clock with a 1 us dead time, every kind at once.

#include "sim/checks/check_engine.h"
#include "sim/report/summary_text.h"
#include "tests/checks/pwm_bench.h"

#include <gtest/gtest.h>

namespace {

using sim::check_kind;
using sim::check_spec;
using tickbench::test_support::pwm_bench;

constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps ms = 1'000'000'000;
constexpr std::uint32_t dead_ticks = 48;  // 1 us at 48 MHz

check_spec make(std::string name, check_kind kind, std::vector<std::string> signals) {
    check_spec s;
    s.name = std::move(name);
    s.kind = kind;
    s.signals = std::move(signals);
    return s;
}

std::vector<check_spec> pwm_checks() {
    std::vector<check_spec> v;
    // Edge-aligned PWM frequency = f_timer / ((prescaler + 1) x (period + 1)) = 48 MHz / 1920.
    // common practice, no single source
    auto f = make("channel1_frequency", check_kind::frequency, {"pwm.channel1"});
    f.expected_frequency = sim::frequency::hz(25'000);
    v.push_back(f);
    // The period is (prescaler + 1) x (period + 1) timer clock ticks = 1920 / 48 MHz = 40 us.
    // common practice, no single source
    auto p = make("channel2_period", check_kind::period, {"pwm.channel2"});
    p.expected = 40 * us;
    v.push_back(p);
    // Duty of the main output with dead time = (compare - dead) / (period + 1): (480 - 48) / 1920.
    // common practice, no single source
    for (unsigned c = 0; c < 3; ++c) {
        auto d = make("channel" + std::to_string(c + 1) + "_duty", check_kind::duty_cycle,
                      {"pwm.channel" + std::to_string(c + 1)});
        d.expected =
            (480ULL * (c + 1) - dead_ticks) * 1'000'000'000ULL / 1920;  // 22.5 %, 47.5 %, 72.5 %
        d.settle = 100 * us;
        v.push_back(d);
    }
    // The complementary output's pulse = (period + 1 - compare - dead) ticks = 432 ticks = 9 us.
    // common practice, no single source
    auto w =
        make("channel3_complement_pulse", check_kind::pulse_width, {"pwm.channel3_complement"});
    w.expected = 9 * us;
    v.push_back(w);
    // Dead time = dead ticks / f_timer = 48 / 48 MHz = 1 us between one output falling and the
    // other rising. common practice, no single source
    for (unsigned c = 0; c < 3; ++c) {
        const std::string ch = "pwm.channel" + std::to_string(c + 1);
        auto g = make("channel" + std::to_string(c + 1) + "_dead_time", check_kind::dead_time,
                      {ch, ch + "_complement"});
        g.minimum = 1 * us;
        g.maximum = 1 * us;
        v.push_back(g);
    }
    // Main rises dead ticks after the counter wraps; the complementary output rises dead ticks
    // after the compare match: the delay is compare / f_timer = 10 us, 90 deg of 40 us.
    // common practice, no single source
    auto ph = make("channel1_to_channel1_complement_phase", check_kind::phase,
                   {"pwm.channel1", "pwm.channel1_complement"});
    ph.phase_as_angle = true;
    ph.expected = 90'000'000;
    v.push_back(ph);
    // Edge-aligned channels all start their pulse at the wrap: 0 phase between main outputs.
    // common practice, no single source
    auto ph0 =
        make("channel1_to_channel3_phase", check_kind::phase, {"pwm.channel1", "pwm.channel3"});
    ph0.expected = 0;
    v.push_back(ph0);
    // The complementary output answers the main output's fall one dead time later.
    // common practice, no single source
    auto lat = make("channel2_fall_to_channel2_complement_rise", check_kind::latency,
                    {"pwm.channel2", "pwm.channel2_complement"});
    lat.edge = sim::edge_select::falling;
    lat.maximum = 1 * us;
    v.push_back(lat);
    // Rising edges of channel1 in 10 ms: one per 40 us period, the first 1 us after the start
    // (the dead time), so at 1 us + k x 40 us for k = 0..249. common practice, no single source
    auto n = make("channel1_rises", check_kind::edge_count, {"pwm.channel1"});
    n.expected = 250;
    v.push_back(n);
    auto nv = make("no_shoot_through", check_kind::never, {});
    nv.condition =
        "(channel1 and channel1_complement) or (channel2 and channel2_complement) or (channel3 and "
        "channel3_complement)";
    v.push_back(nv);
    return v;
}

TEST(check_engine_pwm_test, three_complementary_channels_pass_every_check) {
    sim::check_engine engine(pwm_checks());
    pwm_bench bench(engine, dead_ticks);
    bench.run_to(10 * ms);
    ASSERT_EQ(engine.results().size(), pwm_checks().size());
    for (const auto& r : engine.results()) {
        EXPECT_TRUE(r.passed) << r.name << ": " << r.detail;
        EXPECT_EQ(r.at, 10 * ms) << r.name;
    }
    EXPECT_TRUE(engine.all_passed());
    const auto& f = engine.results()[0];
    EXPECT_EQ(f.count, 249u);
    EXPECT_DOUBLE_EQ(*f.min, 25'000.0);
    EXPECT_DOUBLE_EQ(*f.max, 25'000.0);
    EXPECT_DOUBLE_EQ(*engine.results()[2].mean, 22.5);
    EXPECT_EQ(engine.results()[6].count, 2u * 250u - 1u);  // gaps: after each fall of either output
    const std::string summary = sim::summary_text(engine.results());
    EXPECT_NE(summary.find("\n14 checks: 14 passed, 0 failed\n"), std::string::npos) << summary;
}

TEST(check_engine_pwm_test, a_longer_required_dead_time_fails_on_the_first_gap) {
    auto g = make("channel1_dead_time", check_kind::dead_time,
                  {"pwm.channel1", "pwm.channel1_complement"});
    g.minimum = 2 * us;
    auto d = make("channel1_duty", check_kind::duty_cycle, {"pwm.channel1"});
    d.expected = 250'000'000;  // 25 %: what the duty would be without dead time
    d.tol = sim::tolerance::ticks_of(47, "timer_clock", sim::frequency::hz(48'000'000));
    sim::check_engine engine({g, d});
    pwm_bench bench(engine, dead_ticks);
    bench.run_to(1 * ms);
    const auto& gap = engine.results()[0];
    EXPECT_FALSE(gap.passed);
    // The first period starts at tick 1: channel1 falls at the compare match 480 ticks later
    // (tick 481, 10.020833 us), channel1_complement rises 1 us after that.
    EXPECT_EQ(gap.at, 11'020'833u);
    EXPECT_NE(gap.detail.find("gap 1 us from pwm.channel1 falling to pwm.channel1_complement "
                              "rising is below the minimum 2 us at 11.020833 us"),
              std::string::npos)
        << gap.detail;
    const auto& duty = engine.results()[1];
    EXPECT_FALSE(duty.passed);  // 48 ticks short, 47 allowed
    EXPECT_NE(duty.detail.find("falls short of 25 % +/- 47 ticks of timer_clock"),
              std::string::npos)
        << duty.detail;
}

}  // namespace
