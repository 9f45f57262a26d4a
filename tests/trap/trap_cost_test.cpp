// The cost of one trapped access (fault, decode, callback, completion), measured and printed;
// no assertion on time, which depends on the machine. The target is 20 us.

#include "fake_peripheral.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <chrono>
#include <cstdint>
#include <cstdio>
#include <vector>

namespace trap_test {
namespace {

TEST(trap_cost_test, median_cost_of_a_trapped_read) {
    fake_peripheral p;
    p.map();
    p.recording = false;
    p.set<std::uint32_t>(0x4, 42);
    auto* reg = reinterpret_cast<volatile std::uint32_t*>(peripheral_base + 0x4);
    constexpr int samples = 100000;
    std::vector<std::int64_t> ns(samples);
    std::uint64_t sum = 0;
    for (int i = 0; i < samples; ++i) {
        const auto t0 = std::chrono::steady_clock::now();
        sum += *reg;
        const auto t1 = std::chrono::steady_clock::now();
        ns[static_cast<std::size_t>(i)] =
            std::chrono::duration_cast<std::chrono::nanoseconds>(t1 - t0).count();
    }
    EXPECT_EQ(sum, 42u * samples);
    std::sort(ns.begin(), ns.end());
    const auto median = ns[samples / 2];
    const auto p99 = ns[samples * 99 / 100];
    std::printf("trapped_access: median %.2f us, p99 %.2f us over %d reads\n", median / 1000.0,
                p99 / 1000.0, samples);
    ::testing::Test::RecordProperty("trapped_access_median_ns", static_cast<int>(median));
}

}  // namespace
}  // namespace trap_test
