// Metrics of the timer models, each measured side by side in this run (interleaved.h: the same
// workload and the same number of samples on both sides, medians of interleaved rounds).
//
// The workload is a 3-channel 25 kHz edge-aligned PWM (duties 25, 50, 75 %) on a 48 MHz timer
// clock, the kind a motor or fan controller runs (pwm_workload.h). Every SystemC workload runs in
// a child process of its own (isolated_run.h).
//
// - fast_vs_reference_speedup: both models in their SystemC modules, both driving every pin
//   signal through the kernel: the tick-exact reference clocked by an sc_clock (one method
//   activation per timer clock tick, the way timer models are usually written in SystemC) and the
//   fast model waking the kernel only at its events; 0.2 s simulated; reference / fast.
// - model_only_speedup: the two models as plain C++ objects, no kernel, each told the same
//   writes and then advanced to 0.2 s, reporting edges to a counting observer; reference / fast.
// - clock_independence_spread: the fast model in its module for the same PWM at 1 MHz, 48 MHz and
//   1 GHz timer clocks; slowest median over fastest median.
// - edges_per_second: output edges per wall second from the fast model in its module, nobody
//   watching the pins through the kernel (waveforms and checks take edges this way); median.

#include "models/reference/reference_timer.h"
#include "models/reference/reference_timer_module.h"
#include "models/timer/timer_core.h"
#include "models/timer/timer_module.h"
#include "sim/clock_tree.h"
#include "tests/bench/interleaved.h"
#include "tests/bench/isolated_run.h"
#include "tests/bench/metric.h"
#include "tests/bench/pwm_workload.h"

#include <systemc>

#include <algorithm>
#include <chrono>
#include <stdexcept>
#include <vector>

namespace {

using models::timer_field;
using clock_type = std::chrono::steady_clock;

constexpr std::uint64_t workload_hz = 48'000'000;

double seconds_since(clock_type::time_point t0) {
    return std::chrono::duration<double>(clock_type::now() - t0).count();
}

using bench::program_pwm;
using bench::pwm_config;

// Counts pin edges.
struct edge_counter final : models::timer_observer {
    std::uint64_t edges = 0;
    void on_pin(unsigned, bool, sim::time_ps) override { ++edges; }
    void on_flags_set(std::uint32_t, sim::time_ps) override {}
    void on_irq(bool, sim::time_ps) override {}
    void on_trigger(sim::time_ps) override {}
};

struct timed_run {
    double seconds;
    std::uint64_t edges;
};

// The fast model in its SystemC module, timer clock `hz`, for `simulated` ps; with
// `drive_signals` every pin is an sc_signal driven through the kernel. Child process only.
timed_run fast_module_pwm(std::uint64_t hz, sim::time_ps simulated, bool drive_signals) {
    sim::clock_tree tree;
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(hz);
    tree.add_crystal("timer_clock", x);
    models::timer_module timer("pwm", pwm_config(), tree, "timer_clock");
    if (drive_signals)
        for (unsigned p = 0; p < timer.pin_count(); ++p) timer.pin(p);
    edge_counter counter;
    timer.add_observer(&counter);
    tree.start();
    program_pwm(hz, [&](timer_field f, unsigned c, std::uint32_t v) { timer.write(f, c, v, 0); });
    // The kernel's one-time initialisation is not the model's cost: start it before timing.
    sc_core::sc_start(sc_core::SC_ZERO_TIME);
    const auto t0 = clock_type::now();
    sc_core::sc_start(sc_core::sc_time::from_value(simulated));
    // Without kernel watchers the module advances on demand: here, at the end of the run (a
    // platform does the same, and its processor as it goes).
    timer.advance_to(simulated);
    return {seconds_since(t0), counter.edges};
}

// The reference in its module, one activation per edge of an sc_clock at `hz`, driving every pin
// signal. Child process only.
double reference_module_pwm(std::uint64_t hz, sim::time_ps simulated) {
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

// Either model as a plain C++ object: the workload's writes, then one advance to `simulated`.
template <class model>
timed_run plain_pwm(sim::time_ps simulated) {
    sim::clock_domain timer_clock(sim::frequency::hz(workload_hz));
    edge_counter counter;
    model timer(pwm_config(), timer_clock, &counter);
    program_pwm(workload_hz,
                [&](timer_field f, unsigned c, std::uint32_t v) { timer.write(f, c, v, 0); });
    const auto t0 = clock_type::now();
    timer.advance_to(simulated);
    return {seconds_since(t0), counter.edges};
}

int rounds(bool quick) { return quick ? 1 : 5; }

double fast_vs_reference_speedup(bool quick) {
    const sim::time_ps simulated = quick ? 2'000'000'000 : 200'000'000'000;  // 2 ms / 0.2 s
    const std::vector<double> m = bench::interleaved_medians(
        rounds(quick), {[&] {
                            return bench::run_isolated(
                                [&] { return reference_module_pwm(workload_hz, simulated); });
                        },
                        [&] {
                            return bench::run_isolated([&] {
                                return fast_module_pwm(workload_hz, simulated, true).seconds;
                            });
                        }});
    return m[0] / m[1];
}

double model_only_speedup(bool quick) {
    const sim::time_ps simulated = quick ? 2'000'000'000 : 200'000'000'000;  // 2 ms / 0.2 s
    std::uint64_t fast_edges = 0, reference_edges = 0;
    const std::vector<double> m = bench::interleaved_medians(
        rounds(quick), {[&] {
                            const timed_run r =
                                plain_pwm<models::reference::reference_timer>(simulated);
                            reference_edges = r.edges;
                            return r.seconds;
                        },
                        [&] {
                            const timed_run r = plain_pwm<models::timer_core>(simulated);
                            fast_edges = r.edges;
                            return r.seconds;
                        }});
    // Like with like: both models must have produced the same waveform.
    if (fast_edges != reference_edges)
        throw std::runtime_error("model_only_speedup: the models reported " +
                                 std::to_string(reference_edges) + " and " +
                                 std::to_string(fast_edges) + " edges");
    return m[0] / m[1];
}

double clock_independence_spread(bool quick) {
    const sim::time_ps simulated = quick ? 20'000'000'000 : 20'000'000'000'000;  // 20 ms / 20 s
    std::vector<std::function<double()>> sides;
    for (const std::uint64_t hz : {1'000'000ULL, 48'000'000ULL, 1'000'000'000ULL})
        sides.emplace_back([hz, simulated] {
            return bench::run_isolated(
                [&] { return fast_module_pwm(hz, simulated, false).seconds; });
        });
    const std::vector<double> m = bench::interleaved_medians(rounds(quick), sides);
    return *std::max_element(m.begin(), m.end()) / *std::min_element(m.begin(), m.end());
}

double edges_per_second(bool quick) {
    const sim::time_ps simulated = quick ? 20'000'000'000 : 20'000'000'000'000;  // 20 ms / 20 s
    std::vector<double> rates;
    for (int i = 0; i < rounds(quick); ++i)
        rates.push_back(bench::run_isolated([&] {
            const timed_run r = fast_module_pwm(workload_hz, simulated, false);
            return static_cast<double>(r.edges) / r.seconds;
        }));
    return bench::median(rates);
}

const bench::add_metric speedup{
    {"fast_vs_reference_speedup", "x",
     "reference module (sc_clock, per tick) / fast module, both driving their pin signals, "
     "3-channel 25 kHz PWM at 48 MHz, 0.2 s simulated, median of 5 interleaved rounds",
     nullptr, 0, fast_vs_reference_speedup}};
const bench::add_metric model_only{
    {"model_only_speedup", "x",
     "reference / fast model as plain C++ on the same PWM, 0.2 s simulated, median of 5 "
     "interleaved rounds",
     nullptr, 0, model_only_speedup}};
const bench::add_metric spread{
    {"clock_independence_spread", "x",
     "slowest / fastest median wall time of the same PWM at 1 MHz, 48 MHz, 1 GHz (20 s "
     "simulated, 5 interleaved rounds)",
     nullptr, 0, clock_independence_spread}};
const bench::add_metric edges{{"edges_per_second", "edges/s",
                               "output edges per wall second, fast model in its module, no "
                               "kernel watchers, 20 s simulated, median of 5 runs",
                               nullptr, 0, edges_per_second}};

}  // namespace
