// The consumer's firmware test through the installed fixture: the shipped layout is found by name.

#include "harness/testing/firmware_fixture.h"

#include <gtest/gtest.h>

namespace {

class pwm_test : public harness::firmware_fixture {
protected:
    void SetUp() override {
        add_pll_clock("sys", 8'000'000, 6);  // 48 MHz
        add_timer("pwm", "timer16_quad", "sys", 0x5000'0400);
    }
};

TEST_F(pwm_test, starts_the_timer_and_checks_its_period) {
    const harness::firmware_run& r = run_firmware_main(harness::us(200));
    EXPECT_TRUE(r.passed());
    EXPECT_TRUE(r.logged("pwm running, compare 480")) << r;
    ASSERT_EQ(r.checks.size(), 1u) << r;
    EXPECT_EQ(r.checks[0].passes, 1u);
}

TEST_F(pwm_test, takes_its_compare_value_from_a_parameter) {
    set_param("compare", "240");
    const harness::firmware_run& r = run_firmware_main(harness::us(200));
    EXPECT_TRUE(r.logged("pwm running, compare 240")) << r;
}

}  // namespace
