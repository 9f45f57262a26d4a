// Metrics of the firmware harness (issue: firmware harness), each run in a child process of its own
// (isolated_run.h) on the same part: the demo part's 12 MHz crystal and a PLL to a 96 MHz system
// clock that clocks the CPU and both timers, a 32-bit timer "tick" (layout timer32_dual) at
// 0x5000_0000 on interrupt line 0 and a 16-bit timer "pwm" (layout timer16_quad) at 0x5000_0400 on
// line 1 (demo values, examples/parts/demo_part.toml).
//
// - bus_access_ns: wall ns per tick_read16() of the 16-bit counter, in a loop of reads that never
//   needs the kernel (the counter runs, nothing can interrupt); median of several runs.
// - trapped_access_us: the same read done by unmodified code through a volatile pointer into the
//   mapped peripheral page (one fault per access); median of several runs.
// - firmware_realtime_factor: simulated seconds per wall second of firmware that sleeps in
//   tick_wait_for_interrupt() and, on a 1 kHz reload interrupt of the 32-bit timer, writes new
//   duties to a 3-channel 25 kHz PWM on the 16-bit timer (preloaded compares); median of several
//   runs.

#include "examples/parts/demo_timers.h"
#include "harness/platform.h"
#include "models/layout/register_layout.h"
#include "tests/bench/isolated_run.h"
#include "tests/bench/metric.h"
#include "tickbench/firmware.h"

#include <algorithm>
#include <chrono>
#include <cstdint>
#include <string>
#include <vector>

namespace {

using clock_type = std::chrono::steady_clock;

constexpr std::uint32_t tick_base = 0x5000'0000;
constexpr std::uint32_t pwm_base = 0x5000'0400;
constexpr std::uint64_t crystal_hz = 12'000'000;
constexpr std::uint64_t cpu_hz = 96'000'000;

double seconds_since(clock_type::time_point t0) {
    return std::chrono::duration<double>(clock_type::now() - t0).count();
}

double median(std::vector<double> v) {
    std::sort(v.begin(), v.end());
    return v[v.size() / 2];
}

// Builds the part with `entry` as the firmware. Child process only.
void build_part(harness::platform& p, std::function<void()> entry, bool map_peripherals = false) {
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(crystal_hz);
    p.clocks().add_crystal("xtal", x);
    sim::pll_params pll;
    pll.multiplier = cpu_hz / crystal_hz;
    p.clocks().add_pll("sys", "xtal", pll);
    const std::string layouts = std::string(TICKBENCH_SOURCE_DIR) + "/models/layouts/";
    harness::timer_spec tick;
    tick.name = "tick";
    tick.layout = models::load_register_layout_file(layouts + "timer32_dual.toml");
    tick.clock = "sys";
    tick.base = tick_base;
    tick.irq_priority = 4;
    p.add_timer(std::move(tick));
    harness::timer_spec pwm;
    pwm.name = "pwm";
    pwm.layout = models::load_register_layout_file(layouts + "timer16_quad.toml");
    pwm.clock = "sys";
    pwm.base = pwm_base;
    p.add_timer(std::move(pwm));
    harness::cpu_config cpu;
    cpu.clock = "sys";
    p.set_firmware(cpu, std::move(entry));
    p.set_map_peripherals(map_peripherals);
    p.build();
}

// The 16-bit counter free-running at the CPU clock, no interrupt enabled.
void start_free_running_counter() {
    tick_write16(pwm_base + Q16_LIMIT, 0xffff);
    tick_write16(pwm_base + Q16_RUN, Q16_RUN_ENABLE);
}

// Wall ns per read of the counter through the C API, `reads` reads. Child process only.
double api_read_ns(long reads) {
    static double result;
    static long count;
    count = reads;
    harness::platform p;
    build_part(p, [] {
        start_free_running_counter();
        std::uint32_t sum = 0;
        const auto t0 = clock_type::now();
        for (long i = 0; i < count; ++i) sum += tick_read16(pwm_base + Q16_COUNT);
        result = seconds_since(t0) * 1e9 / static_cast<double>(count);
        benchmark::DoNotOptimize(sum);
    });
    p.run(1'000'000'000'000);  // 1 s: far more than the loop needs (2 CPU cycles per read)
    return result;
}

// Wall us per read of the counter by unmodified code through the mapped page. Child process only.
double trapped_read_us(long reads) {
    static double result;
    static long count;
    count = reads;
    harness::platform p;
    build_part(
        p,
        [] {
            start_free_running_counter();
            const auto* counter = reinterpret_cast<const volatile std::uint16_t*>(
                std::uintptr_t{pwm_base + Q16_COUNT});
            std::uint32_t sum = 0;
            const auto t0 = clock_type::now();
            for (long i = 0; i < count; ++i) sum += *counter;
            result = seconds_since(t0) * 1e6 / static_cast<double>(count);
            benchmark::DoNotOptimize(sum);
        },
        true);
    p.run(1'000'000'000'000);
    return result;
}

// The 1 kHz tick handler: takes the reload flag, steps the three duties. 25 kHz at 96 MHz is a
// period of 3840 counts.
constexpr std::uint32_t pwm_period = cpu_hz / 25'000;
std::uint32_t ticks;

void on_tick() {
    (void)tick_read32(tick_base + D32_TAKE);
    ++ticks;
    for (std::uint32_t c = 0; c < 3; ++c) {
        const std::uint32_t duty = (ticks * 7 + c * pwm_period / 3) % pwm_period;
        tick_write16(pwm_base + Q16_MATCH(c), static_cast<std::uint16_t>(duty));
    }
}

void tick_and_pwm_firmware() {
    // PWM: up counting, channels 0..2 active below their compare, compare preload on.
    tick_write16(pwm_base + Q16_LIMIT, pwm_period - 1);
    for (std::uint32_t c = 0; c < 3; ++c)
        tick_write16(pwm_base + Q16_MATCH(c), static_cast<std::uint16_t>(pwm_period * (c + 1) / 4));
    tick_write8(pwm_base + Q16_PRELOAD,
                Q16_PRELOAD_COMPARE(0) | Q16_PRELOAD_COMPARE(1) | Q16_PRELOAD_COMPARE(2));
    constexpr unsigned shape = Q16_SHAPE_ACTION(DEMO_ACTION_PWM_BELOW) | Q16_SHAPE_MAIN_ENABLE;
    tick_write16(pwm_base + Q16_SHAPE_AB, Q16_SHAPE_BYTE(0, shape) | Q16_SHAPE_BYTE(1, shape));
    tick_write16(pwm_base + Q16_SHAPE_CD, Q16_SHAPE_BYTE(2, shape));
    tick_write16(pwm_base + Q16_RUN, Q16_RUN_ENABLE);
    // Tick: reload at 1 kHz, reload interrupt on.
    const int line = tick_irq_line("tick");
    tick_irq_set_handler(static_cast<unsigned>(line), on_tick);
    tick_write32(tick_base + D32_LIMIT, cpu_hz / 1000 - 1);
    tick_write32(tick_base + D32_ALERTS, DEMO_FLAG_RELOAD);
    tick_irq_line_enable(static_cast<unsigned>(line));
    tick_write32(tick_base + D32_SETUP, D32_SETUP_ENABLE);
    for (;;) tick_wait_for_interrupt();
}

// Simulated seconds per wall second for `simulated` ps of the tick-and-PWM firmware.
double tick_and_pwm_factor(sim::time_ps simulated) {
    harness::platform p;
    build_part(p, tick_and_pwm_firmware);
    const auto t0 = clock_type::now();
    p.run(simulated);
    const double wall = seconds_since(t0);
    const std::uint64_t expected = simulated / 1'000'000'000;  // one tick per ms
    if (ticks + 1 < expected)
        throw std::runtime_error("the tick handler ran " + std::to_string(ticks) +
                                 " times, expected about " + std::to_string(expected));
    return static_cast<double>(simulated) / static_cast<double>(sim::ps_per_second) / wall;
}

double bus_access_ns(bool quick) {
    std::vector<double> runs;
    for (int i = 0; i < (quick ? 1 : 5); ++i)
        runs.push_back(
            bench::run_isolated([&] { return api_read_ns(quick ? 10'000 : 1'000'000); }));
    return median(runs);
}

double trapped_access_us(bool quick) {
    std::vector<double> runs;
    for (int i = 0; i < (quick ? 1 : 5); ++i)
        runs.push_back(
            bench::run_isolated([&] { return trapped_read_us(quick ? 1'000 : 20'000); }));
    return median(runs);
}

double firmware_realtime_factor(bool quick) {
    std::vector<double> runs;
    for (int i = 0; i < (quick ? 1 : 3); ++i)
        runs.push_back(bench::run_isolated([&] {
            return tick_and_pwm_factor(quick ? 20'000'000'000 : 2'000'000'000'000);  // 20 ms / 2 s
        }));
    return median(runs);
}

const bench::add_metric bus_access{{"bus_access_ns", "ns",
                                    "one tick_read16() of a running counter, no synchronisation "
                                    "needed (1 000 000 reads per run, median of 5 runs)",
                                    nullptr, 0, bus_access_ns}};
const bench::add_metric trapped_access{{"trapped_access_us", "us",
                                        "one volatile read of the same register through a mapped "
                                        "page (20 000 reads per run, median of 5 runs)",
                                        nullptr, 0, trapped_access_us}};
const bench::add_metric realtime{
    {"firmware_realtime_factor", "x",
     "simulated / wall seconds: 1 kHz tick interrupt updating a 3-channel "
     "25 kHz PWM, firmware asleep between ticks (2 s simulated, median of 3)",
     nullptr, 0, firmware_realtime_factor}};

}  // namespace
