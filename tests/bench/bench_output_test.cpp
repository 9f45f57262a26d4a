// Smoke test of tickbench-bench's machine-readable output: shape only, never timings.

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>

#include <cstdio>
#include <string>

namespace {

struct run_result {
    int exit_code = -1;
    std::string out;
};

// Runs tickbench-bench with `args` and captures its standard output.
run_result run_bench(const std::string& args) {
    const std::string command = std::string("'") + TICKBENCH_BENCH_PATH + "' " + args;
    run_result r;
    FILE* p = popen(command.c_str(), "r");
    if (p == nullptr) return r;
    char buf[4096];
    std::size_t n = 0;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) r.out.append(buf, n);
    const int status = pclose(p);
    r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    return r;
}

TEST(bench_output_test, json_mode_prints_one_object_of_metrics) {
    const run_result r = run_bench("--json --quick");
    ASSERT_EQ(r.exit_code, 0) << r.out;
    // parse() rejects anything after the object, so this also checks "exactly one object".
    nlohmann::json j;
    ASSERT_NO_THROW(j = nlohmann::json::parse(r.out)) << r.out;
    ASSERT_TRUE(j.is_object()) << r.out;
    for (const char* key : {"tick_to_time_ns", "time_to_tick_ns", "clock_change_100_consumers_us"})
        EXPECT_TRUE(j.contains(key)) << key << " missing in " << r.out;
    for (const auto& [name, m] : j.items()) {
        ASSERT_TRUE(m.is_object()) << name;
        EXPECT_EQ(m.size(), 2u) << name;
        ASSERT_TRUE(m.contains("value") && m["value"].is_number()) << name;
        EXPECT_GE(m["value"].get<double>(), 0.0) << name;
        ASSERT_TRUE(m.contains("unit") && m["unit"].is_string()) << name;
        EXPECT_FALSE(m["unit"].get<std::string>().empty()) << name;
    }
}

TEST(bench_output_test, unknown_argument_exits_with_2) {
    EXPECT_EQ(run_bench("--no-such-option 2>/dev/null").exit_code, 2);
}

}  // namespace
