// Constant memory: the engine's state does not grow with the length of the run, and feeding it a
// change allocates nothing. Allocations are counted by replacing the global operator new in this
// test binary; counting is switched on only around the engine's change() calls.

#include "sim/checks/check_engine.h"
#include "tests/checks/pwm_bench.h"

#include <gtest/gtest.h>

#include <atomic>
#include <cstdlib>
#include <new>

namespace {

std::atomic<bool> counting{false};
std::atomic<std::uint64_t> allocations{0};

}  // namespace

void* operator new(std::size_t n) {
    if (counting.load(std::memory_order_relaxed))
        allocations.fetch_add(1, std::memory_order_relaxed);
    if (void* p = std::malloc(n == 0 ? 1 : n)) return p;
    throw std::bad_alloc();
}
void operator delete(void* p) noexcept { std::free(p); }
void operator delete(void* p, std::size_t) noexcept { std::free(p); }
// Every other form goes to the same malloc/free pair, so that memory from one form is never
// released through another's allocator (the library's temporary buffers use the nothrow form).
void* operator new(std::size_t n, const std::nothrow_t&) noexcept {
    if (counting.load(std::memory_order_relaxed))
        allocations.fetch_add(1, std::memory_order_relaxed);
    return std::malloc(n == 0 ? 1 : n);
}
void* operator new[](std::size_t n) { return operator new(n); }
void* operator new[](std::size_t n, const std::nothrow_t& t) noexcept { return operator new(n, t); }
void operator delete(void* p, const std::nothrow_t&) noexcept { std::free(p); }
void operator delete[](void* p) noexcept { std::free(p); }
void operator delete[](void* p, std::size_t) noexcept { std::free(p); }
void operator delete[](void* p, const std::nothrow_t&) noexcept { std::free(p); }

namespace {

using sim::check_kind;
using sim::check_spec;
using tickbench::test_support::pwm_bench;

constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps ms = 1'000'000'000;

std::vector<check_spec> one_of_each_kind() {
    std::vector<check_spec> v;
    const auto add = [&](check_kind k, std::vector<std::string> sig) -> check_spec& {
        check_spec s;
        s.name = std::string(to_string(k)) + std::to_string(v.size());
        s.kind = k;
        s.signals = std::move(sig);
        v.push_back(s);
        return v.back();
    };
    add(check_kind::frequency, {"pwm.channel1"}).expected_frequency = sim::frequency::hz(25'000);
    add(check_kind::period, {"pwm.channel2"}).expected = 40 * us;
    add(check_kind::duty_cycle, {"pwm.channel3"}).minimum = 0;
    add(check_kind::pulse_width, {"pwm.channel1_complement"}).maximum = 40 * us;
    add(check_kind::edge_count, {"pwm.channel2_complement"}).minimum = 1;
    add(check_kind::phase, {"pwm.channel1", "pwm.channel2"}).maximum = 40 * us;
    add(check_kind::dead_time, {"pwm.channel3", "pwm.channel3_complement"}).minimum = 1 * us;
    add(check_kind::latency, {"pwm.channel1", "pwm.channel1_complement"}).maximum = 40 * us;
    auto& n = add(check_kind::never, {});
    n.signals.clear();
    n.condition = "channel1 and channel1_complement";
    return v;
}

struct run_stats {
    std::uint64_t changes = 0;
    std::uint64_t allocations = 0;
    std::size_t footprint_after_begin = 0;
    std::size_t footprint_before_end = 0;
    bool passed = false;
};

run_stats run_for(sim::time_ps duration) {
    sim::check_engine engine(one_of_each_kind());
    pwm_bench::before_change = [] { counting = true; };
    pwm_bench::after_change = [] { counting = false; };
    allocations = 0;
    pwm_bench bench(engine, 48);
    run_stats s;
    s.footprint_after_begin = engine.footprint_bytes();
    bench.advance_to(duration);
    pwm_bench::before_change = nullptr;
    pwm_bench::after_change = nullptr;
    s.changes = bench.changes();
    s.allocations = allocations;
    s.footprint_before_end = engine.footprint_bytes();
    bench.run_to(duration);
    s.passed = engine.all_passed();
    for (const auto& r : engine.results()) EXPECT_TRUE(r.passed) << r.name << ": " << r.detail;
    return s;
}

TEST(memory_test, a_ten_times_longer_run_holds_the_same_state_and_allocates_nothing_per_change) {
    const run_stats short_run = run_for(20 * ms);
    const run_stats long_run = run_for(200 * ms);
    EXPECT_TRUE(short_run.passed);
    EXPECT_TRUE(long_run.passed);
    EXPECT_GT(long_run.changes, 9 * short_run.changes);
    EXPECT_EQ(short_run.allocations, 0u);
    EXPECT_EQ(long_run.allocations, 0u);
    EXPECT_EQ(short_run.footprint_after_begin, long_run.footprint_after_begin);
    EXPECT_EQ(short_run.footprint_before_end, short_run.footprint_after_begin);
    EXPECT_EQ(long_run.footprint_before_end, long_run.footprint_after_begin);
}

}  // namespace
