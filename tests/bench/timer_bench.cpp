// Metrics of the timer models, each measured side by side in this run (issue: timer model).
//
// The workload is a 3-channel 25 kHz edge-aligned PWM (duties 25, 50, 75 %), the kind a motor or
// fan controller runs. Every SystemC workload runs in a child process of its own (isolated_run.h).
//
// - fast_vs_reference_speedup: wall time of the tick-exact reference driven by an sc_clock (one
//   method activation per timer clock tick, the way timer models are usually written in SystemC)
//   over the fast model in its module, both on 0.2 s simulated at a 48 MHz timer clock.
// - clock_independence_spread: the fast model's wall time for the same PWM at 1 MHz, 48 MHz and
//   1 GHz timer clocks; slowest over fastest.
// - edges_per_second: output edges per wall second from the fast model in its module, no tracing.
//
// The fast model's pins go to an observer, not to sc_signals, so its module asks nothing of the
// kernel (models/timer/timer_module.h); the reference drives its pin signals at every change.

#include "models/reference/reference_timer_module.h"
#include "models/timer/timer_module.h"
#include "sim/clock_tree.h"
#include "tests/bench/isolated_run.h"
#include "tests/bench/metric.h"
#include "tests/bench/pwm_workload.h"

#include <systemc>

#include <algorithm>
#include <chrono>
#include <vector>

namespace {

using models::timer_field;
using clock_type = std::chrono::steady_clock;

double seconds_since(clock_type::time_point t0) {
    return std::chrono::duration<double>(clock_type::now() - t0).count();
}

using bench::program_pwm;
using bench::pwm_config;

// Counts pin edges: the fast model's observer.
struct edge_counter final : models::timer_observer {
    std::uint64_t edges = 0;
    void on_pin(unsigned, bool, sim::time_ps) override { ++edges; }
    void on_flags_set(std::uint32_t, sim::time_ps) override {}
    void on_irq(bool, sim::time_ps) override {}
    void on_trigger(sim::time_ps) override {}
};

struct fast_result {
    double seconds;
    std::uint64_t edges;
};

// The fast model in its SystemC module, timer clock `hz`, for `simulated` ps. Child process only.
fast_result fast_pwm(std::uint64_t hz, sim::time_ps simulated) {
    sim::clock_tree tree;
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(hz);
    tree.add_crystal("timer_clock", x);
    models::timer_module timer("pwm", pwm_config(), tree, "timer_clock");
    edge_counter counter;
    timer.add_observer(&counter);
    tree.start();
    program_pwm(hz, [&](timer_field f, unsigned c, std::uint32_t v) { timer.write(f, c, v, 0); });
    // The kernel's one-time initialisation is not the model's cost: start it before timing.
    sc_core::sc_start(sc_core::SC_ZERO_TIME);
    const auto t0 = clock_type::now();
    sc_core::sc_start(sc_core::sc_time::from_value(simulated));
    // Nobody watches the pins through the kernel, so the module advances on demand: here, the
    // end of the run (a platform does the same, and its processor as it goes).
    timer.advance_to(simulated);
    return {seconds_since(t0), counter.edges};
}

// The reference, one activation per edge of an sc_clock at `hz`. Child process only.
double reference_pwm(std::uint64_t hz, sim::time_ps simulated) {
    sim::clock_domain timer_clock(sim::frequency::hz(hz));
    sc_core::sc_clock clk("clk", sc_core::sc_time::from_value(sim::ps_per_second / hz));
    models::reference::reference_timer_module timer("reference", pwm_config(), timer_clock);
    timer.clock(clk);
    program_pwm(
        hz, [&](timer_field f, unsigned c, std::uint32_t v) { timer.core().write(f, c, v, 0); });
    sc_core::sc_start(sc_core::SC_ZERO_TIME);
    const auto t0 = clock_type::now();
    sc_core::sc_start(sc_core::sc_time::from_value(simulated));
    return seconds_since(t0);
}

double fast_vs_reference_speedup(bool quick) {
    const sim::time_ps simulated = quick ? 2'000'000'000 : 200'000'000'000;  // 2 ms / 0.2 s
    // Interleaved rounds, best of each side: both see the same machine, and a busy moment on a
    // shared 2-core machine inflates neither side alone.
    double reference = 1e30, fast = 1e30;
    for (int round = 0; round < (quick ? 1 : 3); ++round) {
        reference = std::min(
            reference, bench::run_isolated([&] { return reference_pwm(48'000'000, simulated); }));
        for (int i = 0; i < 3; ++i)
            fast = std::min(
                fast, bench::run_isolated([&] { return fast_pwm(48'000'000, simulated).seconds; }));
    }
    return reference / fast;
}

double clock_independence_spread(bool quick) {
    const sim::time_ps simulated = quick ? 20'000'000'000 : 20'000'000'000'000;  // 20 ms / 20 s
    // Interleaved rounds, best time per clock (see fast_vs_reference_speedup).
    const std::uint64_t clocks[] = {1'000'000ULL, 48'000'000ULL, 1'000'000'000ULL};
    std::vector<double> times(3, 1e30);
    for (int round = 0; round < (quick ? 1 : 5); ++round)
        for (std::size_t k = 0; k < 3; ++k)
            times[k] = std::min(times[k], bench::run_isolated([&] {
                                    return fast_pwm(clocks[k], simulated).seconds;
                                }));
    return *std::max_element(times.begin(), times.end()) /
           *std::min_element(times.begin(), times.end());
}

double edges_per_second(bool quick) {
    const sim::time_ps simulated = quick ? 20'000'000'000 : 20'000'000'000'000;  // 20 ms / 20 s
    std::vector<double> rates;
    for (int i = 0; i < (quick ? 1 : 3); ++i)
        rates.push_back(bench::run_isolated([&] {
            const fast_result r = fast_pwm(48'000'000, simulated);
            return static_cast<double>(r.edges) / r.seconds;
        }));
    return *std::max_element(rates.begin(), rates.end());  // best run: the least disturbed
}

const bench::add_metric speedup{{"fast_vs_reference_speedup", "x",
                                 "reference (per-tick, sc_clock) wall time / fast model wall time, "
                                 "3-channel 25 kHz PWM at 48 MHz, 0.2 s simulated",
                                 nullptr, 0, fast_vs_reference_speedup}};
const bench::add_metric spread{
    {"clock_independence_spread", "x",
     "slowest / fastest wall time of the same PWM at 1 MHz, 48 MHz, 1 GHz", nullptr, 0,
     clock_independence_spread}};
const bench::add_metric edges{{"edges_per_second", "edges/s",
                               "output edges per wall second, fast model in its module, no tracing",
                               nullptr, 0, edges_per_second}};

}  // namespace
