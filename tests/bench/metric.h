#pragma once
// The benchmark metrics of tickbench-bench: a registry of named measurements.
//
// Each metric is one Google Benchmark function whose loop does one unit of work per iteration
// (one conversion, one clock change...) plus one registration line beside it. The main program
// runs every registered metric, takes the median time per iteration over the repetitions and
// prints it in the metric's unit, as a table or as one JSON object. Adding a metric therefore
// touches one source file and nothing else.

#include <benchmark/benchmark.h>

#include <cstdint>
#include <string>
#include <vector>

namespace bench {

// One named measurement.
struct metric {
    std::string name;         // key in the JSON output; ends in its unit, e.g. "tick_to_time_ns"
    std::string unit;         // "ns", "us" or "ms"
    std::string description;  // one line for the human table: what one iteration does
    void (*body)(benchmark::State&);
    // Iterations per repetition; 0 lets Google Benchmark choose (enough for a stable time). Fix
    // it when the body's setup is costly or its cost depends on how long it has run.
    std::int64_t fixed_iterations = 0;
    // Instead of a timed body: a measurement that computes its value itself, in `unit` (ratios of
    // two workloads run side by side, rates). `quick` asks for a smoke-sized run. Throws on
    // failure.
    double (*measure)(bool quick) = nullptr;
};

// Every registered metric, in registration order (one source file's metrics stay together).
std::vector<metric>& metrics();

// Registers a metric at static initialisation: `const bench::add_metric m{{...}};`.
struct add_metric {
    explicit add_metric(metric m);
};

// Marks the running metric as failed (its result would be meaningless) and stops its loop; the
// program then reports the message and exits non-zero.
void fail(benchmark::State& state, const std::string& message);

// Failure messages recorded by fail(), as "metric: message".
std::vector<std::string> failures();

// Names the metric whose body runs now, for fail()'s messages (set by the main program).
void set_running(const std::string& name);

}  // namespace bench
