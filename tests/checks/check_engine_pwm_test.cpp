// The check engine on real PWM from the fast timer: three complementary channels at 25 kHz from a
// 48 MHz kernel clock with a 1 us dead time, every kind at once.

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
    // Edge-aligned PWM frequency = f_kernel / ((prescaler + 1) x (period + 1)) = 48 MHz / 1920.
    // common practice, no single source
    auto f = make("ch0_frequency", check_kind::frequency, {"pwm.ch0"});
    f.expected_frequency = sim::frequency::hz(25'000);
    v.push_back(f);
    // The period is (prescaler + 1) x (period + 1) kernel ticks = 1920 / 48 MHz = 40 us.
    // common practice, no single source
    auto p = make("ch1_period", check_kind::period, {"pwm.ch1"});
    p.expected = 40 * us;
    v.push_back(p);
    // Duty of the main output with dead time = (compare - dead) / (period + 1): (480 - 48) / 1920.
    // common practice, no single source
    for (unsigned c = 0; c < 3; ++c) {
        auto d = make("ch" + std::to_string(c) + "_duty", check_kind::duty_cycle,
                      {"pwm.ch" + std::to_string(c)});
        d.expected =
            (480ULL * (c + 1) - dead_ticks) * 1'000'000'000ULL / 1920;  // 22.5 %, 47.5 %, 72.5 %
        d.settle = 100 * us;
        v.push_back(d);
    }
    // The complementary output's pulse = (period + 1 - compare - dead) ticks = 432 ticks = 9 us.
    // common practice, no single source
    auto w = make("ch2n_pulse", check_kind::pulse_width, {"pwm.ch2n"});
    w.expected = 9 * us;
    v.push_back(w);
    // Dead time = dead ticks / f_kernel = 48 / 48 MHz = 1 us between one output falling and the
    // other rising. common practice, no single source
    for (unsigned c = 0; c < 3; ++c) {
        const std::string ch = "pwm.ch" + std::to_string(c);
        auto g =
            make("ch" + std::to_string(c) + "_dead_time", check_kind::dead_time, {ch, ch + "n"});
        g.minimum = 1 * us;
        g.maximum = 1 * us;
        v.push_back(g);
    }
    // Main rises dead ticks after the counter wraps; the complementary output rises dead ticks
    // after the compare match: the delay is compare / f_kernel = 10 us, 90 deg of 40 us.
    // common practice, no single source
    auto ph = make("ch0_to_ch0n_phase", check_kind::phase, {"pwm.ch0", "pwm.ch0n"});
    ph.phase_as_angle = true;
    ph.expected = 90'000'000;
    v.push_back(ph);
    // Edge-aligned channels all start their pulse at the wrap: 0 phase between main outputs.
    // common practice, no single source
    auto ph0 = make("ch0_to_ch2_phase", check_kind::phase, {"pwm.ch0", "pwm.ch2"});
    ph0.expected = 0;
    v.push_back(ph0);
    // The complementary output answers the main output's fall one dead time later.
    // common practice, no single source
    auto lat = make("ch1_fall_to_ch1n_rise", check_kind::latency, {"pwm.ch1", "pwm.ch1n"});
    lat.edge = sim::edge_select::falling;
    lat.maximum = 1 * us;
    v.push_back(lat);
    // Rising edges of ch0 in 10 ms: one per 40 us period, the first 1 us after the start
    // (the dead time), so at 1 us + k x 40 us for k = 0..249. common practice, no single source
    auto n = make("ch0_rises", check_kind::edge_count, {"pwm.ch0"});
    n.expected = 250;
    v.push_back(n);
    auto nv = make("no_shoot_through", check_kind::never, {});
    nv.condition = "(ch0 and ch0n) or (ch1 and ch1n) or (ch2 and ch2n)";
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
    auto g = make("ch0_dead_time", check_kind::dead_time, {"pwm.ch0", "pwm.ch0n"});
    g.minimum = 2 * us;
    auto d = make("ch0_duty", check_kind::duty_cycle, {"pwm.ch0"});
    d.expected = 250'000'000;  // 25 %: what the duty would be without dead time
    d.tol = sim::tolerance::ticks_of(47, "kernel", sim::frequency::hz(48'000'000));
    sim::check_engine engine({g, d});
    pwm_bench bench(engine, dead_ticks);
    bench.run_to(1 * ms);
    const auto& gap = engine.results()[0];
    EXPECT_FALSE(gap.passed);
    // ch0 falls at the compare match (480 ticks = 10 us), ch0n rises 1 us later.
    EXPECT_EQ(gap.at, 11 * us);
    EXPECT_NE(
        gap.detail.find(
            "gap 1 us from pwm.ch0 falling to pwm.ch0n rising is below the minimum 2 us at 11 us"),
        std::string::npos)
        << gap.detail;
    const auto& duty = engine.results()[1];
    EXPECT_FALSE(duty.passed);  // 48 ticks short, 47 allowed
    EXPECT_NE(duty.detail.find("falls short of 25 % +/- 47 ticks of kernel"), std::string::npos)
        << duty.detail;
}

}  // namespace
