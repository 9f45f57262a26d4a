// The processor's run-ahead stops at the run's end (harness/cpu.h): firmware still running when the
// end comes is held there, what it would do later never reaches the models, and the models are not
// brought past the end, however long the quantum lets the firmware run ahead of the kernel.

#include "examples/parts/demo_timers.h"
#include "harness/testing/firmware_fixture.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <cinttypes>
#include <cstdio>
#include <string>

namespace {

// The demo part's 16-bit timer in peripheral slot 1 (demo values, examples/parts/demo_part.toml).
constexpr std::uint32_t pwm = 0x5000'0400;

// A 96 MHz CPU and timer clock: 96 cycles are 1 us.
constexpr std::uint32_t cycles_per_ms = 96'000;

// The latest time of anything the timer reported to its observers (pins, flags, interrupt line).
struct latest_report final : models::timer_observer {
    harness::time_ps latest = 0;
    void note(harness::time_ps at) { latest = at > latest ? at : latest; }
    void on_pin(unsigned, bool, harness::time_ps at) override { note(at); }
    void on_flags_set(std::uint32_t, harness::time_ps at) override { note(at); }
    void on_irq(bool, harness::time_ps at) override { note(at); }
    void on_trigger(harness::time_ps at) override { note(at); }
};

// Starts a 100 kHz PWM (960 counts of 96 MHz) on channel 1: 4 bus accesses.
void start_pwm() {
    tick_write16(pwm + Q16_LIMIT, 959);
    tick_write16(pwm + Q16_MATCH(0), 480);
    tick_write16(pwm + Q16_SHAPE_AB, Q16_SHAPE_BYTE(0, Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) |
                                                           Q16_SHAPE_MAIN_ENABLE));
    tick_write16(pwm + Q16_RUN, Q16_RUN_ENABLE);
}

class cpu_test : public harness::firmware_fixture {
protected:
    void SetUp() override {
        add_pll_clock("sys", 12'000'000, 8);
        add_timer("pwm", "timer16_quad", "sys", pwm).observers.push_back(&seen_);
        // The firmware may run 50 ms ahead of the kernel, far past the 2.5 ms run.
        cpu().quantum = harness::ms(50);
        after_run([this](harness::platform& p) {
            // Inspection in the child: what the models reported last, the last access's time.
            char line[96];
            std::snprintf(line, sizeof line, "latest report %" PRIu64, seen_.latest);
            tick_log("%s", line);
            const auto accesses = p.cpu()->last_accesses();
            std::snprintf(line, sizeof line, "last access %" PRIu64,
                          accesses.empty() ? harness::time_ps{0} : accesses.back().at);
            tick_log("%s", line);
        });
    }

    // The number after `prefix` in the log line that starts with it (0 when there is none).
    static harness::time_ps logged_number(const harness::firmware_run& r,
                                          const std::string& prefix) {
        for (const harness::firmware_log_line& l : r.log)
            if (l.text.rfind(prefix, 0) == 0) return std::stoull(l.text.substr(prefix.size()));
        return 0;
    }

    latest_report seen_;  // the child's copy is the one the run fills
};

constexpr harness::time_ps run_end = harness::us(2500);

TEST_F(cpu_test, firmware_still_running_at_the_end_stops_there) {
    const harness::firmware_run& r = run_firmware(
        [] {
            start_pwm();
            // A control loop that never sleeps: 1 ms of work, then a new duty.
            for (std::uint16_t duty = 100;; duty = static_cast<std::uint16_t>(duty + 100)) {
                tick_cycles(cycles_per_ms);
                tick_write16(pwm + Q16_MATCH(0), duty);
                tick_log("duty %u", static_cast<unsigned>(duty));
            }
        },
        run_end);
    ASSERT_TRUE(r.passed()) << r;
    // Held at the end, not a quantum later.
    EXPECT_EQ(r.firmware_time, run_end) << r;
    // The writes near 1 ms and 2 ms happened; the one near 3 ms never reached the bus.
    EXPECT_EQ(r.accesses, 4u + 2u) << r;
    EXPECT_TRUE(r.logged("duty 200")) << r;
    EXPECT_FALSE(r.logged("duty 300")) << r;
    for (const harness::firmware_log_line& l : r.log) EXPECT_LE(l.at, run_end) << l.text;
    EXPECT_LE(logged_number(r, "last access "), run_end) << r;
    // The models reached the end (a 10 us PWM reports every few microseconds), and no further.
    const harness::time_ps latest = logged_number(r, "latest report ");
    EXPECT_LE(latest, run_end) << r;
    EXPECT_GT(latest, run_end - harness::us(10)) << r;
}

TEST_F(cpu_test, a_handler_due_after_the_end_never_runs) {
    const harness::firmware_run& r = run_firmware(
        [] {
            start_pwm();
            // A reload interrupt every 1 ms: the 16-bit timer counting 96 MHz / 96 (1 MHz) to 1000.
            tick_write16(pwm + Q16_SCALE, 95);
            tick_write16(pwm + Q16_LIMIT, 999);
            tick_write8(pwm + Q16_KICK, Q16_KICK_FORCE_RELOAD);
            tick_write16(pwm + Q16_STATUS_CLEAR, DEMO_FLAG_RELOAD);
            tick_write16(pwm + Q16_NOTIFY, DEMO_FLAG_RELOAD);
            const int line = tick_irq_line("pwm");
            tick_irq_set_handler(static_cast<unsigned>(line), [] {
                tick_write16(pwm + Q16_STATUS_CLEAR, DEMO_FLAG_RELOAD);
                tick_log("reload");
            });
            tick_irq_line_enable(static_cast<unsigned>(line));
            for (;;) tick_wait_for_interrupt();
        },
        run_end);
    ASSERT_TRUE(r.passed()) << r;
    EXPECT_EQ(r.firmware_time, run_end) << r;
    // Reloads at about 1 ms and 2 ms; the one at 3 ms lies after the end. Two log lines of the
    // inspection follow.
    ASSERT_EQ(r.log.size(), 2u + 2u) << r;
    EXPECT_EQ(r.log[1].text, "reload");
    EXPECT_LE(r.log[1].at, run_end);
    EXPECT_LE(logged_number(r, "latest report "), run_end) << r;
}

}  // namespace
