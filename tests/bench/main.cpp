// tickbench-bench: runs every registered metric (metric.h) and prints one figure per metric.
//
//   tickbench-bench            a table for people
//   tickbench-bench --json     one JSON object: {"metric_name": {"value": 3.1, "unit": "ns"}, ...}
//   tickbench-bench --quick    few iterations, one repetition: a smoke run, not a measurement
//
// Timing comes from Google Benchmark (its loop, its iteration-count estimation and its guards
// against the optimiser); this program only chooses the repetitions, takes the median time per
// iteration and formats the result. Exit status: 0 ok, 1 a metric failed, 2 bad arguments.

#include "tests/bench/metric.h"

#include <benchmark/benchmark.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <exception>
#include <iomanip>
#include <iostream>
#include <map>
#include <set>
#include <sstream>
#include <string>
#include <vector>

namespace {

constexpr int full_repetitions = 5;
constexpr double full_min_seconds = 0.2;  // per repetition
constexpr benchmark::IterationCount quick_iterations = 200;

// Collects the time per iteration of every repetition, by metric name, and prints nothing.
class collecting_reporter : public benchmark::BenchmarkReporter {
public:
    bool ReportContext(const Context& context) override {
        cpus_ = context.cpu_info.num_cpus;
        mhz_ = context.cpu_info.cycles_per_second / 1e6;
        return true;
    }
    void ReportRuns(const std::vector<Run>& runs) override {
        for (const Run& r : runs)
            if (r.run_type == Run::RT_Iteration && r.iterations > 0)
                ns_per_iteration_[r.run_name.function_name].push_back(r.GetAdjustedRealTime());
    }
    // Median time per iteration in ns, or a negative value when the metric produced no run.
    double median_ns(const std::string& name) const {
        auto it = ns_per_iteration_.find(name);
        if (it == ns_per_iteration_.end() || it->second.empty()) return -1;
        std::vector<double> v = it->second;
        std::sort(v.begin(), v.end());
        const std::size_t n = v.size();
        return n % 2 == 1 ? v[n / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
    }
    std::size_t repetitions(const std::string& name) const {
        auto it = ns_per_iteration_.find(name);
        return it == ns_per_iteration_.end() ? 0 : it->second.size();
    }
    int cpus() const { return cpus_; }
    double mhz() const { return mhz_; }

private:
    std::map<std::string, std::vector<double>> ns_per_iteration_;
    int cpus_ = 0;
    double mhz_ = 0;
};

double ns_per_unit(const std::string& unit) {
    // Only the units of timed metrics; measured metrics report in their own unit.
    if (unit == "ns") return 1;
    if (unit == "us") return 1e3;
    if (unit == "ms") return 1e6;
    return 1e9;  // "s"
}

// Four significant digits are more than the run-to-run noise allows.
double rounded(double v) {
    if (v == 0) return 0;
    const double scale = std::pow(10.0, 3 - static_cast<int>(std::floor(std::log10(std::fabs(v)))));
    return std::round(v * scale) / scale;
}

void usage(std::ostream& out) {
    out << "usage: tickbench-bench [--json] [--quick] [--only NAME[,NAME...]]\n"
           "  --json   print one JSON object {\"metric\": {\"value\": number, \"unit\": text}}\n"
           "  --quick  few iterations and one repetition (a smoke run, not a measurement)\n"
           "  --only   run only the metrics named (comma-separated)\n";
}

}  // namespace

// libsystemc.so calls sc_main from its own entry point, so it carries an undefined reference to
// it. This program has its own main and never enters that path, but the linker still resolves the
// reference whenever it keeps the library (always in sanitizer builds, where Debian's compiler
// drops --as-needed). Reaching this would be a bug, hence the non-zero status.
extern "C" int sc_main(int /*argc*/, char* /*argv*/[]) { return 1; }

namespace {

int run(int argc, char** argv) {
    bool json = false;
    bool quick = false;
    std::set<std::string> only;
    for (int i = 1; i < argc; ++i) {
        const std::string a = argv[i];
        if (a == "--json") {
            json = true;
        } else if (a == "--quick") {
            quick = true;
        } else if (a == "--only" && i + 1 < argc) {
            std::stringstream names(argv[++i]);
            for (std::string n; std::getline(names, n, ',');) only.insert(n);
        } else if (a == "--help" || a == "-h") {
            usage(std::cout);
            return 0;
        } else {
            std::cerr << "tickbench-bench: unknown argument '" << a << "'\n";
            usage(std::cerr);
            return 2;
        }
    }

    if (!only.empty()) {
        auto& all = bench::metrics();
        for (const std::string& n : only)
            if (std::none_of(all.begin(), all.end(),
                             [&](const bench::metric& m) { return m.name == n; })) {
                std::cerr << "tickbench-bench: --only: no metric named '" << n << "'\n";
                return 2;
            }
        all.erase(std::remove_if(all.begin(), all.end(),
                                 [&](const bench::metric& m) { return only.count(m.name) == 0; }),
                  all.end());
    }
    // Google Benchmark reads its own flags too; give it none so the choices below hold.
    int bm_argc = 1;
    benchmark::Initialize(&bm_argc, argv);
    for (const bench::metric& m : bench::metrics()) {
        if (m.measure) continue;
        auto* b = benchmark::RegisterBenchmark(m.name.c_str(), [&m](benchmark::State& state) {
            bench::set_running(m.name);
            m.body(state);
        });
        b->Unit(benchmark::kNanosecond);
        if (quick)
            b->Iterations(quick_iterations)->Repetitions(1);
        else if (m.fixed_iterations > 0)
            b->Iterations(m.fixed_iterations)->Repetitions(full_repetitions);
        else
            b->MinTime(full_min_seconds)->Repetitions(full_repetitions);
    }
    collecting_reporter reporter;
    if (std::any_of(bench::metrics().begin(), bench::metrics().end(),
                    [](const bench::metric& m) { return m.measure == nullptr; }))
        benchmark::RunSpecifiedBenchmarks(&reporter);
    benchmark::Shutdown();

    bool ok = bench::failures().empty();
    for (const std::string& f : bench::failures()) std::cerr << "tickbench-bench: " << f << "\n";
    nlohmann::ordered_json out = nlohmann::ordered_json::object();
    for (const bench::metric& m : bench::metrics()) {
        if (m.measure) {
            try {
                out[m.name] = {{"value", rounded(m.measure(quick))}, {"unit", m.unit}};
            } catch (const std::exception& e) {
                std::cerr << "tickbench-bench: " << m.name << ": " << e.what() << "\n";
                ok = false;
            }
            continue;
        }
        const double ns = reporter.median_ns(m.name);
        if (ns < 0) {
            std::cerr << "tickbench-bench: " << m.name << ": no result\n";
            ok = false;
            continue;
        }
        out[m.name] = {{"value", rounded(ns / ns_per_unit(m.unit))}, {"unit", m.unit}};
    }
    if (!ok) return 1;

    if (json) {
        std::cout << out.dump(2) << "\n";
        return 0;
    }
    std::cout << "tickbench-bench: median of " << (quick ? 1 : full_repetitions)
              << (quick ? " quick repetition" : " repetitions") << " per metric";
    if (reporter.cpus() > 0)  // known once a timed metric has run
        std::cout << ", " << reporter.cpus() << " CPUs at " << std::fixed << std::setprecision(0)
                  << reporter.mhz() << " MHz";
    std::cout << "\n" << std::defaultfloat << std::setprecision(4);
#ifndef NDEBUG
    std::cout << "note: built without NDEBUG (assertions on); figures are not representative\n";
#endif
    std::size_t width = 6;
    for (const bench::metric& m : bench::metrics()) width = std::max(width, m.name.size());
    std::cout << std::left << std::setw(static_cast<int>(width)) << "metric"
              << "  " << std::right << std::setw(10) << "value"
              << "  unit  what one iteration does\n";
    for (const bench::metric& m : bench::metrics())
        std::cout << std::left << std::setw(static_cast<int>(width)) << m.name << "  " << std::right
                  << std::setw(10) << out[m.name]["value"].get<double>() << "  " << std::left
                  << std::setw(4) << m.unit << "  " << m.description << "\n";
    return 0;
}

}  // namespace

int main(int argc, char** argv) {
    try {
        return run(argc, argv);
    } catch (const std::exception& e) {
        std::cerr << "tickbench-bench: " << e.what() << "\n";
        return 1;
    }
}
