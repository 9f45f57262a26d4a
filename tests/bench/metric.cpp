#include "tests/bench/metric.h"

#include <deque>
#include <utility>

namespace bench {

std::vector<metric>& metrics() {
    static std::vector<metric> all;
    return all;
}

add_metric::add_metric(metric m) { metrics().push_back(std::move(m)); }

namespace {
std::string& running() {
    static std::string name;
    return name;
}
// A deque keeps each message where it is: Google Benchmark may hold on to the C string.
std::deque<std::string>& failure_list() {
    static std::deque<std::string> all;
    return all;
}
}  // namespace

void set_running(const std::string& name) { running() = name; }

void fail(benchmark::State& state, const std::string& message) {
    failure_list().push_back(running() + ": " + message);
    state.SkipWithError(failure_list().back().c_str());
}

std::vector<std::string> failures() { return {failure_list().begin(), failure_list().end()}; }

}  // namespace bench
