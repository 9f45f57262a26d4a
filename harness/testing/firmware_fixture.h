#pragma once
// A GoogleTest fixture for firmware linked into a C++ test binary (docs/firmware-api.md, "Testing
// firmware with GoogleTest").
//
// A test describes the part in its body or in SetUp() (clocks, timers from register layouts, the
// cpu's costs, firmware parameters, edge-case settings), then runs firmware for a stretch of
// simulated time and inspects what came back: how the run ended, the failure report, each firmware
// check with its place, counts, first failure and last evaluations, and every tick_log() line. Each
// run happens in a child process of its own, which builds the part from the description: SystemC
// elaborates once per process, and a firmware failure ends its process with exit code 3 by design.
// The test process itself never starts a kernel, so one test may run as many variants as it likes.
//
//     class fan_test : public harness::firmware_fixture {};
//     TEST_F(fan_test, duty_follows_the_request) {
//         add_pll_clock("sys", 12'000'000, 8);
//         add_timer("fan", "timer16_quad", "sys", 0x5000'0400);
//         const harness::firmware_run& r = run_firmware(fan_main, harness::ms(5));
//         EXPECT_TRUE(r.passed());
//     }

#include "harness/cpu.h"
#include "harness/firmware_context.h"
#include "harness/platform.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <deque>
#include <functional>
#include <map>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

// The folder of the shipped register layouts that add_timer() finds by name. The CMake target
// tickbench::firmware_fixture defines it for every file that includes this header: the source
// tree's models/layouts in a build, share/tickbench/layouts of an installed package.
#ifndef TICKBENCH_LAYOUT_DIR
#define TICKBENCH_LAYOUT_DIR ""
#endif

namespace harness {

// Durations for run_firmware(), in exact picoseconds.
constexpr time_ps us(std::uint64_t n) { return n * 1'000'000; }
constexpr time_ps ms(std::uint64_t n) { return n * 1'000'000'000; }
constexpr time_ps seconds(std::uint64_t n) { return n * sim::ps_per_second; }

// One tick_log() line of a run.
struct firmware_log_line {
    time_ps at = 0;
    std::string text;
};

// What a run of firmware produced, as the test process sees it.
struct firmware_run {
    run_outcome outcome = run_outcome::failed;
    int exit_code = -1;  // the child's exit code (0 completed, 3 firmware failure)
    int signal = 0;      // the signal that killed the child outright (should not happen)
    std::string report;  // the failure report text; empty when the run completed
    std::string output;  // everything the child wrote to stdout and stderr
    // One record per distinct tick_check()/TICK_ASSERT (name and place), in order of first
    // evaluation: passes, failures, the first failure and the last few evaluations.
    std::vector<firmware_check_record> checks;
    std::vector<firmware_log_line> log;  // every tick_log() line, in order
    time_ps firmware_time = 0;           // the firmware's local time when the run ended
    std::uint64_t accesses = 0;          // bus accesses the firmware made
    bool firmware_returned = false;      // the entry function returned before the run's end

    // Success when the run completed and every firmware check passed; otherwise the failure says
    // how the run ended, which checks failed and where, and the report.
    ::testing::AssertionResult passed() const;
    // The checks that failed at least once (a failed check ends the run, so at most one unless
    // the run was inspected after its end).
    std::vector<firmware_check_record> failed_checks() const;
    // The first check named `name` (the first place, if several places use the name), or nothing.
    std::optional<firmware_check_record> check(const std::string& name) const;
    // True when some log line contains `text`.
    bool logged(const std::string& text) const;
};

// A readable summary (outcome, checks, log lines, report), for assertion messages.
std::ostream& operator<<(std::ostream& out, const firmware_run& run);

class firmware_fixture : public ::testing::Test {
protected:
    // Shipped layouts come from TICKBENCH_LAYOUT_DIR as the test's own file sees it.
    firmware_fixture() : firmware_fixture(TICKBENCH_LAYOUT_DIR) {}
    // Shipped layouts come from `layout_dir` (empty: add_timer() takes layout paths only).
    explicit firmware_fixture(std::string layout_dir);

    // --- describing the part (kept in the test process, built in each run's child) ---

    // A crystal of `hz` Hz named `name`.
    void add_crystal_clock(const std::string& name, std::uint64_t hz);
    // A crystal "<name>_xtal" of `crystal_hz` feeding a PLL `name` that multiplies it by
    // `multiplier` and divides by `divider`: the usual way a part makes its system clock.
    void add_pll_clock(const std::string& name, std::uint64_t crystal_hz, std::uint64_t multiplier,
                       std::uint64_t divider = 1);
    // Anything else the clock tree can describe (dividers, muxes, gates, RC oscillators).
    void describe_clocks(std::function<void(sim::clock_tree&)> f);
    // A timer `name` at bus address `base`, counting `clock`, with the registers of `layout`: a
    // path to a layout file, or the name of a shipped layout ("timer16_quad"). The layout is loaded
    // now, so a bad one fails the test here. Its interrupt line is named after it; lines are
    // numbered in the order timers are added. The returned spec may be adjusted until the next run
    // (priority, injected interrupt delay, counter start value, running at start, access latency).
    timer_spec& add_timer(const std::string& name, const std::string& layout,
                          const std::string& clock, std::uint64_t base);
    // The cpu's set-up: its clock (by default the first clock added with the helpers above), bus
    // access cost, interrupt entry and exit latencies, quantum, start offset, hang limit.
    cpu_config& cpu() { return cpu_; }
    // A firmware parameter, as tick_param() returns it.
    void set_param(const std::string& name, const std::string& value) { params_[name] = value; }
    // Maps the timers' register windows for unmodified drivers (docs/firmware-api.md).
    void map_peripherals(bool on = true) { map_peripherals_ = on; }
    // Wall seconds without any call into the simulator that count as a hang (0: never).
    void set_hang_wall_seconds(double s) { hang_wall_seconds_ = s; }
    // Runs in the child on the platform just built, before the run starts (for anything the
    // helpers above do not cover).
    void before_run(std::function<void(platform&)> f) { before_run_ = std::move(f); }
    // Runs in the child after a run that firmware did not end (inspect the models there; a
    // tick_check() or tick_log() made here is recorded at the firmware's last local time).
    void after_run(std::function<void(platform&)> f) { after_run_ = std::move(f); }

    // --- running ---

    // Runs `firmware` as the entry function for `duration` of simulated time, in a child process,
    // and returns what happened (valid until the next run).
    const firmware_run& run_firmware(std::function<void()> firmware, time_ps duration);
    // Runs the `tick_firmware_main` linked into the test binary. Fails the test (and returns an
    // empty result) if there is none.
    const firmware_run& run_firmware_main(time_ps duration);
    // The result of the last run.
    const firmware_run& last_run() const { return last_; }

private:
    std::string layout_dir_;
    std::vector<std::function<void(sim::clock_tree&)>> clock_steps_;
    std::deque<timer_spec>
        timers_;  // a deque: add_timer() hands out references that must stay valid
    cpu_config cpu_;
    bool cpu_clock_chosen_ = false;
    std::map<std::string, std::string> params_;
    bool map_peripherals_ = false;
    double hang_wall_seconds_ = 10;
    std::function<void(platform&)> before_run_;
    std::function<void(platform&)> after_run_;
    firmware_run last_;
    unsigned runs_ = 0;
};

}  // namespace harness
