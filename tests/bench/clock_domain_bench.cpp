// Metrics of the exact time base: the cost of one conversion between tick index and time.
//
// The clock runs at 48 MHz * 7 / 9 (= 112/3 MHz), a PLL-derived frequency whose period is not a
// whole number of picoseconds, so every conversion takes the full 128-bit path.

#include "sim/clock_domain.h"
#include "sim/frequency.h"
#include "tests/bench/metric.h"

#include <benchmark/benchmark.h>

#include <cstdint>

namespace {

sim::frequency pll_derived() { return sim::frequency::hz(48'000'000).scaled(7, 9); }

void tick_to_time(benchmark::State& state) {
    const sim::clock_domain d(pll_derived());
    // Edge 10^9 at 10^9 * 3 * 10^12 / (112 * 10^6) ps = 26 785 714 285 714.28..., rounded down.
    if (d.time_of(1'000'000'000) != 26'785'714'285'714ULL)
        return bench::fail(state, "wrong edge time");
    // Indices spread over about a month of simulated time, stepping by an odd stride.
    constexpr std::uint64_t first = 1'000'000'000, stride = 1'000'003, last = 100'000'000'000'000;
    std::uint64_t k = first;
    for (auto _ : state) {
        benchmark::DoNotOptimize(d.time_of(k));
        k += stride;
        if (k > last) k = first;
    }
}
const bench::add_metric tick_to_time_metric{
    {"tick_to_time_ns", "ns", "clock_domain::time_of(k) at 48 MHz * 7 / 9", tick_to_time}};

void time_to_tick(benchmark::State& state) {
    const sim::clock_domain d(pll_derived());
    if (d.tick_at(26'785'714'285'714ULL) != 1'000'000'000) return bench::fail(state, "wrong tick");
    // Instants spread over about 11 days of simulated time, stepping by an odd number of ps.
    constexpr sim::time_ps first = sim::ps_per_second, stride = 999'999'937,
                           last = 1'000'000 * sim::ps_per_second;
    sim::time_ps t = first;
    for (auto _ : state) {
        benchmark::DoNotOptimize(d.tick_at(t));
        t += stride;
        if (t > last) t = first;
    }
}
const bench::add_metric time_to_tick_metric{
    {"time_to_tick_ns", "ns", "clock_domain::tick_at(t) at 48 MHz * 7 / 9", time_to_tick}};

}  // namespace
