// `tickbench plan`'s search against hand-computed cases (harness/run/period_plan.h).

#include "harness/run/period_plan.h"

#include <gtest/gtest.h>

namespace {

using harness::run::plan_periods;
using harness::run::plan_request;

plan_request request(std::uint64_t clock_hz, std::uint64_t target_hz, bool center = false) {
    plan_request r;
    r.clock = sim::frequency::hz(clock_hz);
    r.target = sim::frequency::hz(target_hz);
    r.center = center;
    return r;
}

// 48 MHz / 25 kHz = 1920 = 1 x 1920: prescaler 0, period 1919, exact, log2(1920) = 10.91 bits.
TEST(period_plan_test, edge_aligned_exact_hit_with_finest_resolution_first) {
    const auto c = plan_periods(request(48'000'000, 25'000));
    ASSERT_GE(c.size(), 3u);
    EXPECT_EQ(c[0].prescaler, 0u);
    EXPECT_EQ(c[0].period, 1919u);
    EXPECT_EQ(c[0].achieved, sim::frequency::hz(25'000));
    EXPECT_EQ(c[0].error_num, 0u);
    EXPECT_EQ(c[0].error_ppm_text(), "+0.000");
    EXPECT_EQ(c[0].resolution_bits_text(), "10.91");
    // Then the same division with coarser resolution: 2 x 960, 3 x 640.
    EXPECT_EQ(c[1].prescaler, 1u);
    EXPECT_EQ(c[1].period, 959u);
    EXPECT_EQ(c[2].prescaler, 2u);
    EXPECT_EQ(c[2].period, 639u);
}

// 96 MHz / (2 x 20 kHz) = 2400 = 1 x 2400: prescaler 0, period 2400, 2400 compare steps.
TEST(period_plan_test, center_aligned_counts_the_period_twice) {
    const auto c = plan_periods(request(96'000'000, 20'000, true));
    ASSERT_FALSE(c.empty());
    EXPECT_EQ(c[0].prescaler, 0u);
    EXPECT_EQ(c[0].period, 2400u);
    EXPECT_EQ(c[0].steps, 2400u);
    EXPECT_EQ(c[0].achieved, sim::frequency::hz(20'000));
}

// 8 MHz / 7 kHz = 1142.857...: 1143 gives 8e6/1143 = 6999.125 Hz, error -1/8001 = -124.984 ppm;
// 1142 gives +875.2 ppm, so 1143 (= 1 x 1143 = 3 x 381 = 9 x 127 = 127 x 9) comes first.
TEST(period_plan_test, inexact_target_reports_the_exact_error) {
    const auto c = plan_periods(request(8'000'000, 7'000));
    ASSERT_GE(c.size(), 4u);
    EXPECT_EQ(c[0].prescaler, 0u);
    EXPECT_EQ(c[0].period, 1142u);
    EXPECT_EQ(c[0].achieved, sim::frequency(8'000'000, 1143));
    EXPECT_TRUE(c[0].below);
    EXPECT_EQ(c[0].error_num, 1u);
    EXPECT_EQ(c[0].error_den, 8001u);
    EXPECT_EQ(c[0].error_ppm_text(), "-124.984");
    EXPECT_EQ(c[1].prescaler, 2u);
    EXPECT_EQ(c[1].period, 380u);
}

// 96 MHz / 1 Hz = 96,000,000 fits 65536 x 65536 = 4.29e9, but the period alone cannot hold it: the
// prescaler must be at least 96e6 / 65536 = 1464.8. 96e6 = 2^11 x 3 x 5^6 has no divisor from 1465
// to 1499, so the finest exact split is 1500 x 64000.
TEST(period_plan_test, slow_targets_need_the_prescaler) {
    const auto c = plan_periods(request(96'000'000, 1));
    ASSERT_FALSE(c.empty());
    EXPECT_EQ(c[0].error_num, 0u);
    EXPECT_EQ((c[0].prescaler + 1) * (c[0].period + 1), 96'000'000u);
    EXPECT_LE(c[0].period, 65535u);
    EXPECT_EQ(c[0].prescaler, 1499u);
}

// An 8-bit counter: 48 MHz / 25 kHz = 1920 needs a prescaler of at least 1920 / 256 = 7.5 -> 8 x
// 240.
TEST(period_plan_test, counter_width_limits_the_period) {
    plan_request r = request(48'000'000, 25'000);
    r.counter_bits = 8;
    const auto c = plan_periods(r);
    ASSERT_FALSE(c.empty());
    EXPECT_EQ(c[0].prescaler, 7u);
    EXPECT_EQ(c[0].period, 239u);
}

TEST(period_plan_test, max_results_limits_the_list) {
    plan_request r = request(48'000'000, 25'000);
    r.max_results = 2;
    EXPECT_EQ(plan_periods(r).size(), 2u);
}

// One compare step gives no PWM: 48 MHz / 24 MHz is reached only by 2 steps (prescaler 0, period
// 1), never by prescaler 1 with period 0; 100 MHz from 72 MHz is out of reach, 36 MHz nearest.
TEST(period_plan_test, settings_without_two_compare_steps_are_left_out) {
    for (const bool center : {false, true}) {
        for (const auto& c :
             plan_periods(request(48'000'000, 24'000'000 / (center ? 2 : 1), center)))
            EXPECT_GE(c.steps, 2u) << c.prescaler << " " << c.period;
    }
    const auto c = plan_periods(request(48'000'000, 24'000'000));
    ASSERT_FALSE(c.empty());
    EXPECT_EQ(c[0].period, 1u);
    EXPECT_FALSE(c[0].off_by_more_than_a_percent());
    const auto far = plan_periods(request(72'000'000, 100'000'000));
    ASSERT_FALSE(far.empty());
    EXPECT_EQ(far[0].achieved, sim::frequency::hz(36'000'000));
    EXPECT_TRUE(far[0].below);
    EXPECT_TRUE(far[0].off_by_more_than_a_percent());
}

TEST(period_plan_test, zero_frequencies_are_refused) {
    EXPECT_THROW(plan_periods(request(0, 1)), std::invalid_argument);
    EXPECT_THROW(plan_periods(request(1, 0)), std::invalid_argument);
}

}  // namespace
