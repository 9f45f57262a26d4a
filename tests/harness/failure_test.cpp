// Firmware is not trusted: each way it can fail ends the run with a report naming the outcome, the
// simulated time, the last bus accesses with register names (and for crashes a host backtrace),
// every output closed, and exit code 3. Each case runs in a child process: that exit is the point.

#include "harness/firmware_context.h"
#include "harness/platform.h"
#include "harness/testing/run_in_child.h"
#include "tests/harness/demo_part.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <unistd.h>
#include <cstdlib>
#include <fstream>
#include <sstream>
#include <string>

namespace {

using test_support::stopwatch_base;
constexpr std::uint32_t limit = stopwatch_base + 0x02;
constexpr std::uint32_t count = stopwatch_base + 0x00;

// A few ordinary accesses before things go wrong, so the report has something to list.
void warm_up() {
    tick_write16(limit, 999);
    tick_write16(stopwatch_base + 0x10, 1);
    for (int i = 0; i < 20; ++i) (void)tick_read16(count);
}

// Runs `firmware` on the demo part in a child; returns its exit code and output.
harness::child_result run_part(std::function<void()> firmware, harness::cpu_config cpu = {},
                               double hang_seconds = 10, bool map = false,
                               const std::string& closer_file = "") {
    return harness::run_in_child(
        [&] {
            harness::platform p;
            p.set_hang_wall_seconds(hang_seconds);
            p.set_map_peripherals(map);
            if (!closer_file.empty())
                p.on_close([closer_file] { std::ofstream(closer_file) << "closed\n"; });
            test_support::build_demo_part(p, cpu, firmware);
            p.run(10'000'000'000);  // 10 ms
            return 0;
        },
        true);
}

bool has(const std::string& text, const std::string& what) {
    return text.find(what) != std::string::npos;
}

TEST(failure_test, report_text_keeps_long_register_names_and_ends_with_a_newline) {
    harness::failure_report r;
    r.outcome = harness::run_outcome::crashed;
    r.message = "SIGSEGV";
    r.at = 1'000'000;
    // A timer's name is the scenario's choice, of any length.
    const std::string name = std::string(150, 'x') + ".count";
    r.last_accesses = {{2'000, 0x5000'0400, 2, false, 7, false}};
    r.access_names = {name};
    const std::string text = r.text();
    EXPECT_TRUE(has(text, name + " 0x00000007\n")) << text;
    ASSERT_FALSE(text.empty());
    EXPECT_EQ(text.back(), '\n');
    // The columns of ordinary names stay as they were.
    r.access_names = {"stopwatch.count"};
    EXPECT_TRUE(has(r.text(),
                    "  2 ns               read  16-bit 0x50000400 stopwatch.count          "
                    "0x00000007\n"))
        << r.text();
}

TEST(failure_test, crash_outside_the_peripherals_is_reported_with_backtrace_and_accesses) {
    const std::string closed = ::testing::TempDir() + "closer_" + std::to_string(getpid());
    const auto r = run_part(
        [] {
            warm_up();
            *static_cast<volatile int*>(nullptr) = 1;
        },
        {}, 10, false, closed);
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware crashed")) << r.output;
    EXPECT_TRUE(has(r.output, "SIGSEGV")) << r.output;
    EXPECT_TRUE(has(r.output, "last 16 bus accesses")) << r.output;
    EXPECT_TRUE(has(r.output, "stopwatch.count")) << r.output;
    EXPECT_TRUE(has(r.output, "host backtrace")) << r.output;
    // Outputs written so far were closed.
    std::ifstream f(closed);
    std::string line;
    std::getline(f, line);
    EXPECT_EQ(line, "closed");
    std::remove(closed.c_str());
}

TEST(failure_test, abort_is_reported) {
    const auto r = run_part([] {
        warm_up();
        std::abort();
    });
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware aborted")) << r.output;
}

TEST(failure_test, failed_firmware_check_is_reported) {
    const auto r = run_part([] {
        warm_up();
        TICK_ASSERT(tick_read16(limit) == 1000);
    });
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware firmware-check-failed")) << r.output;
    EXPECT_TRUE(has(r.output, "tick_read16(limit) == 1000")) << r.output;
    EXPECT_TRUE(has(r.output, "stopwatch.limit")) << r.output;
}

TEST(failure_test, firmware_spinning_without_calls_is_a_hang) {
    const auto r = run_part(
        [] {
            warm_up();
            for (volatile int spin = 0;; spin = spin + 1) {
            }
        },
        {}, 0.3);
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware hung")) << r.output;
    EXPECT_TRUE(has(r.output, "no call into the simulator")) << r.output;
}

TEST(failure_test, accesses_without_simulated_time_moving_are_a_hang) {
    harness::cpu_config cpu;
    cpu.access_cycles = 0;  // a (mis)configured free bus: polling never moves time
    cpu.hang_accesses = 10'000;
    const auto r = run_part(
        [] {
            for (;;) (void)tick_read16(count);
        },
        cpu);
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware hung")) << r.output;
    EXPECT_TRUE(has(r.output, "without simulated time moving")) << r.output;
}

TEST(failure_test, unsupported_instruction_on_a_mapped_register_names_it) {
    const auto r = run_part(
        [] {
            warm_up();
            volatile std::uint64_t* p =
                reinterpret_cast<volatile std::uint64_t*>(std::uintptr_t{stopwatch_base});
            // Copying the register window with a string instruction is outside the decoder's forms.
            std::uint64_t buf[2];
            void* dst = buf;
            const void* src = const_cast<std::uint64_t*>(p);
            std::size_t n = 2;
            asm volatile("rep movsq" : "+D"(dst), "+S"(src), "+c"(n) : : "memory");
        },
        {}, 10, true);
    EXPECT_EQ(r.exit_code, 3) << r.output;
    EXPECT_TRUE(has(r.output, "firmware crashed")) << r.output;
    EXPECT_TRUE(has(r.output, "movsq")) << r.output;
}

TEST(failure_test, unmodified_driver_reaches_the_timer_through_pointers) {
    const auto r = run_part(
        [] {
            volatile std::uint16_t* regs =
                reinterpret_cast<volatile std::uint16_t*>(std::uintptr_t{stopwatch_base});
            regs[0x02 / 2] = 999;  // limit
            regs[0x10 / 2] |= 1;   // run: enable (a read-modify-write)
            tick_cycles(100);
            const std::uint16_t a = regs[0];
            tick_cycles(100);
            const std::uint16_t b = regs[0];
            TICK_ASSERT(regs[0x02 / 2] == 999);
            TICK_ASSERT(b > a);
            // 100 cycles of tick_cycles plus the access costs between the two reads.
            TICK_ASSERT(b - a >= 100 && b - a <= 110);
        },
        {}, 10, true);
    EXPECT_EQ(r.exit_code, 0) << r.output;
}

}  // namespace
