// The GoogleTest fixture for C++ firmware tests (harness/testing/firmware_fixture.h): firmware
// written as lambdas runs on a described part in a child process, and the test sees how the run
// ended, the firmware's checks with their places and times, and its log lines.

#include "examples/parts/demo_timers.h"
#include "harness/testing/firmware_fixture.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <string>

namespace {

// Register offsets of the shipped layouts (examples/parts/demo_timers.h), in the demo part's
// peripheral slots 0 and 1 (demo values, examples/parts/demo_part.toml).
constexpr std::uint32_t stopwatch = 0x5000'0400;
constexpr std::uint32_t stopwatch_count = stopwatch + Q16_COUNT;
constexpr std::uint32_t stopwatch_limit = stopwatch + Q16_LIMIT;
constexpr std::uint32_t stopwatch_run = stopwatch + Q16_RUN;
constexpr std::uint32_t tick = 0x5000'0000;
constexpr std::uint32_t tick_setup = tick + D32_SETUP;
constexpr std::uint32_t tick_alerts = tick + D32_ALERTS;
constexpr std::uint32_t tick_take = tick + D32_TAKE;
constexpr std::uint32_t tick_limit = tick + D32_LIMIT;

// The part of every test here: a 96 MHz system clock (the demo part's 12 MHz crystal, PLL x8)
// clocking the cpu, a 32-bit timer "tick" (line 0) and a 16-bit timer "stopwatch" (line 1).
class fixture_test : public harness::firmware_fixture {
protected:
    void SetUp() override {
        add_pll_clock("sys", 12'000'000, 8);
        add_timer("tick", "timer32_dual", "sys", tick);
        add_timer("stopwatch", "timer16_quad", "sys", stopwatch);
    }
};

TEST_F(fixture_test, passing_checks_and_log_lines_come_back) {
    const harness::firmware_run& r = run_firmware(
        [] {
            tick_write16(stopwatch_limit, 0xffff);
            tick_write16(stopwatch_run, 1);
            const std::uint16_t a = tick_read16(stopwatch_count);
            tick_cycles(1000);
            const std::uint16_t b = tick_read16(stopwatch_count);
            tick_log("counted %u", static_cast<unsigned>(b - a));
            // 1000 annotated cycles plus one 2-cycle access, at one count per CPU cycle.
            TICK_ASSERT(b - a == 1002);
        },
        harness::us(100));
    EXPECT_TRUE(r.passed());
    EXPECT_EQ(r.outcome, harness::run_outcome::completed);
    EXPECT_EQ(r.exit_code, 0);
    EXPECT_TRUE(r.firmware_returned);
    EXPECT_EQ(r.accesses, 4u);
    ASSERT_EQ(r.checks.size(), 1u) << r;
    EXPECT_TRUE(r.checks[0].passed);
    EXPECT_EQ(r.checks[0].name, "b - a == 1002");
    EXPECT_NE(r.checks[0].file.find("fixture_test.cpp"), std::string::npos);
    EXPECT_GT(r.checks[0].at, 0u);
    EXPECT_TRUE(r.logged("counted 1002")) << r;
    EXPECT_NE(r.output.find("firmware: counted 1002"), std::string::npos) << r.output;
}

TEST_F(fixture_test, a_failing_check_ends_the_run_with_its_place_and_a_report) {
    const harness::firmware_run& r = run_firmware(
        [] {
            tick_write16(stopwatch_limit, 999);
            TICK_ASSERT(tick_read16(stopwatch_limit) == 999);
            TICK_ASSERT(tick_read16(stopwatch_limit) == 1000);
            tick_log("never reached");
        },
        harness::us(100));
    EXPECT_FALSE(r.passed());
    EXPECT_EQ(r.outcome, harness::run_outcome::check_failed);
    EXPECT_EQ(r.exit_code, 3);
    EXPECT_FALSE(r.firmware_returned);
    ASSERT_EQ(r.checks.size(), 2u) << r;
    EXPECT_TRUE(r.checks[0].passed);
    ASSERT_EQ(r.failed_checks().size(), 1u);
    const harness::firmware_check_record failed = r.failed_checks()[0];
    EXPECT_EQ(failed.name, "tick_read16(stopwatch_limit) == 1000");
    EXPECT_EQ(failed.line, r.checks[0].line + 1);
    EXPECT_FALSE(r.logged("never reached"));
    EXPECT_NE(r.report.find("firmware firmware-check-failed"), std::string::npos) << r.report;
    EXPECT_NE(r.report.find("stopwatch.limit"), std::string::npos) << r.report;
    // What a test author sees when such a run is expected to pass.
    const std::string message = r.passed().message();
    EXPECT_NE(message.find("check FAILED"), std::string::npos) << message;
    EXPECT_NE(message.find("fixture_test.cpp"), std::string::npos) << message;
}

TEST_F(fixture_test, interrupts_parameters_and_after_run_inspection) {
    set_param("ticks_wanted", "5");
    after_run([](harness::platform& p) {
        // Inspection in the child after the run: the tick timer has kept counting.
        TICK_ASSERT(p.timer("tick").read(models::timer_field::enable, 0, tick_now_ps()) == 1);
    });
    static unsigned ticks;
    const harness::firmware_run& r = run_firmware(
        [] {
            ticks = 0;
            const unsigned wanted =
                static_cast<unsigned>(std::atoi(tick_param("ticks_wanted", "1")));
            const int line = tick_irq_line("tick");
            TICK_ASSERT(line == 0);
            tick_irq_set_handler(static_cast<unsigned>(line), [] {
                (void)tick_read32(tick_take);
                ++ticks;
                tick_log("tick %u", ticks);
            });
            tick_write32(tick_limit, 96'000 - 1);  // 1 ms at 96 MHz
            tick_write32(tick_alerts, DEMO_FLAG_RELOAD);
            tick_irq_line_enable(static_cast<unsigned>(line));
            tick_write32(tick_setup, 1);
            while (ticks < wanted) tick_wait_for_interrupt();
        },
        harness::ms(10));
    EXPECT_TRUE(r.passed());
    EXPECT_TRUE(r.firmware_returned);
    ASSERT_EQ(r.log.size(), 5u) << r;
    EXPECT_EQ(r.log.back().text, "tick 5");
    // The fifth reload is at 5 ms; the handler's log line follows after the entry latency.
    EXPECT_GT(r.log.back().at, harness::ms(5));
    EXPECT_LT(r.log.back().at, harness::ms(5) + harness::us(1));
    ASSERT_EQ(r.checks.size(), 2u) << r;
    EXPECT_TRUE(r.checks[1].passed);
}

TEST_F(fixture_test, a_crash_is_an_outcome_not_a_dead_test) {
    const harness::firmware_run& r = run_firmware(
        [] {
            (void)tick_read16(stopwatch_count);
            *static_cast<volatile int*>(nullptr) = 1;
        },
        harness::us(100));
    EXPECT_EQ(r.outcome, harness::run_outcome::crashed) << r;
    EXPECT_EQ(r.exit_code, 3);
    EXPECT_NE(r.report.find("SIGSEGV"), std::string::npos) << r.report;
    EXPECT_NE(r.report.find("stopwatch.count"), std::string::npos) << r.report;
}

}  // namespace

namespace {

// A part with a processor and no peripheral at all runs: docs/scenario.md makes [timers] optional.
class no_timer_test : public harness::firmware_fixture {
protected:
    void SetUp() override { add_pll_clock("sys", 12'000'000, 8); }
};

TEST_F(no_timer_test, firmware_runs_on_a_part_without_timers) {
    const harness::firmware_run& r = run_firmware(
        [] {
            tick_cycles(96);
            tick_log("alone at %llu ps", static_cast<unsigned long long>(tick_now_ps()));
        },
        harness::us(10));
    EXPECT_TRUE(r.passed()) << r;
    EXPECT_TRUE(r.firmware_returned);
    // 96 cycles of the 96 MHz clock: 1 us.
    EXPECT_TRUE(r.logged("alone at 1000000 ps")) << r;
}

}  // namespace
