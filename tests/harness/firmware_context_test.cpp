// The firmware's own checks in constant memory (harness/firmware_context.h): each check keeps
// counts, its first failure and a small ring of its last evaluations, never a history, so a check
// evaluated once per tick for hours costs no more memory than one evaluated once.
//
// The end-to-end test counts the heap bytes live in the run's child process while its firmware
// calls tick_check() millions of times: this binary replaces the global operator new and delete
// with counting ones (what a test can measure exactly, unlike the process's resident size).

#include "harness/firmware_context.h"
#include "harness/testing/firmware_fixture.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <malloc.h>
#include <atomic>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <new>
#include <string>

namespace {

// Heap bytes allocated through operator new and not yet freed, in this process.
std::atomic<long long> live_heap_bytes{0};

}  // namespace

// These operators are the allocation functions of this binary: a free() of what they malloc()ed
// is the matching release, whatever GCC infers after inlining them into a caller.
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wmismatched-new-delete"
void* operator new(std::size_t n) {
    void* p = std::malloc(n == 0 ? 1 : n);
    if (p == nullptr) throw std::bad_alloc();
    live_heap_bytes += static_cast<long long>(malloc_usable_size(p));
    return p;
}
void* operator new[](std::size_t n) { return ::operator new(n); }
void operator delete(void* p) noexcept {
    if (p == nullptr) return;
    live_heap_bytes -= static_cast<long long>(malloc_usable_size(p));
    std::free(p);
}
void operator delete[](void* p) noexcept { ::operator delete(p); }
void operator delete(void* p, std::size_t) noexcept { ::operator delete(p); }
void operator delete[](void* p, std::size_t) noexcept { ::operator delete(p); }
// The nothrow forms go to the same pair, so that memory from one form is never released through
// another's allocator (the library's temporary buffers use them; the sanitizers catch a mix-up).
void* operator new(std::size_t n, const std::nothrow_t&) noexcept {
    void* p = std::malloc(n == 0 ? 1 : n);
    if (p != nullptr) live_heap_bytes += static_cast<long long>(malloc_usable_size(p));
    return p;
}
void* operator new[](std::size_t n, const std::nothrow_t& t) noexcept {
    return ::operator new(n, t);
}
void operator delete(void* p, const std::nothrow_t&) noexcept { ::operator delete(p); }
void operator delete[](void* p, const std::nothrow_t&) noexcept { ::operator delete(p); }
#pragma GCC diagnostic pop

namespace {

class firmware_context_test : public harness::firmware_fixture {
protected:
    void SetUp() override {
        add_pll_clock("sys", 12'000'000, 8);
        // The demo part's 16-bit timer (demo values, examples/parts/demo_part.toml), untouched.
        add_timer("pwm", "timer16_quad", "sys", 0x5000'0400);
        // Millions of checks take no simulated time and make no other call: no hang.
        set_hang_wall_seconds(0);
    }
};

constexpr long evaluations = 3'000'000;

TEST_F(firmware_context_test, a_check_evaluated_millions_of_times_keeps_constant_memory) {
    const harness::firmware_run& r = run_firmware(
        [] {
            long long warm = 0;
            for (long i = 1; i <= evaluations; ++i) {
                TICK_ASSERT(i > 0);
                tick_check(1, "every tick", "loop.c", 10);
                // Measured once every check has been seen and kept: only evaluations follow.
                if (i == 1000) warm = live_heap_bytes.load();
            }
            const long long grown = live_heap_bytes.load() - warm;
            tick_log("heap grown by %lld bytes", grown);
        },
        harness::us(10));
    ASSERT_TRUE(r.passed()) << r.report;
    EXPECT_TRUE(r.logged("heap grown by 0 bytes")) << (r.log.empty() ? "no log" : r.log[0].text);
    // One record per check, with every evaluation counted.
    ASSERT_EQ(r.checks.size(), 2u);
    EXPECT_EQ(r.checks[0].name, "i > 0");
    EXPECT_EQ(r.checks[0].passes, static_cast<std::uint64_t>(evaluations));
    EXPECT_EQ(r.checks[1].file, "loop.c");
    EXPECT_EQ(r.checks[1].evaluations(), static_cast<std::uint64_t>(evaluations));
    EXPECT_EQ(r.checks[1].recent().size(), harness::firmware_check_record::recent_capacity);
}

TEST_F(firmware_context_test, a_record_counts_and_keeps_the_first_failure_and_the_last_few) {
    harness::firmware_check_record r;
    const std::size_t n = harness::firmware_check_record::recent_capacity + 5;
    for (std::size_t i = 1; i <= n; ++i) r.add(i != 3 && i != 7, i * 1000);
    EXPECT_EQ(r.evaluations(), n);
    EXPECT_EQ(r.passes, n - 2);
    EXPECT_EQ(r.failures, 2u);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.first_at, 1000u);
    EXPECT_EQ(r.last_at, n * 1000);
    EXPECT_EQ(r.first_failure_evaluation, 3u);
    EXPECT_EQ(r.first_failure_at, 3000u);
    EXPECT_EQ(r.at, 3000u);  // the first failure
    // The last recent_capacity evaluations, oldest first: numbers 6 to n, of which 7 failed.
    const auto recent = r.recent();
    ASSERT_EQ(recent.size(), harness::firmware_check_record::recent_capacity);
    for (std::size_t k = 0; k < recent.size(); ++k) {
        const std::size_t number = n - recent.size() + 1 + k;
        EXPECT_EQ(recent[k].at, number * 1000);
        EXPECT_EQ(recent[k].passed, number != 7);
    }
    // A copy rebuilt from its fields and ring reads the same.
    harness::firmware_check_record copy = r;
    copy.restore_recent({});
    copy.restore_recent(recent);
    const auto again = copy.recent();
    ASSERT_EQ(again.size(), recent.size());
    for (std::size_t k = 0; k < again.size(); ++k) EXPECT_EQ(again[k].at, recent[k].at);
}

TEST_F(firmware_context_test, a_record_that_only_passed_reports_its_latest_evaluation) {
    harness::firmware_check_record r;
    r.add(true, 5);
    r.add(true, 9);
    EXPECT_TRUE(r.passed);
    EXPECT_EQ(r.at, 9u);
    EXPECT_EQ(r.first_failure_evaluation, 0u);
    ASSERT_EQ(r.recent().size(), 2u);
    EXPECT_EQ(r.recent()[0].at, 5u);
}

TEST_F(firmware_context_test, checks_are_told_apart_by_name_file_and_line_in_first_seen_order) {
    harness::firmware_check_log log;
    // A name built in one buffer each time: the text counts, not the pointer.
    char name[16] = "first";
    log.record(name, "a.c", 1, true, 10);
    std::snprintf(name, sizeof name, "second");
    log.record(name, "a.c", 1, true, 20);
    log.record("first", "a.c", 2, false, 30);
    log.record("first", "b.c", 1, true, 40);
    log.record("first", "a.c", 1, true, 50);
    const auto& records = log.records();
    ASSERT_EQ(records.size(), 4u);
    EXPECT_EQ(records[0].name, "first");
    EXPECT_EQ(records[0].evaluations(), 2u);
    EXPECT_EQ(records[1].name, "second");
    EXPECT_EQ(records[2].line, 2);
    EXPECT_FALSE(records[2].passed);
    EXPECT_EQ(records[3].file, "b.c");
    log.clear();
    EXPECT_TRUE(log.empty());
}

TEST_F(firmware_context_test, the_log_does_not_grow_with_evaluations) {
    harness::firmware_check_log log;
    log.record("a", "x.c", 1, true, 0);
    log.record("b", "x.c", 2, true, 0);
    const std::size_t after_first = log.footprint_bytes();
    for (sim::time_ps t = 1; t <= 100'000; ++t) {
        log.record("a", "x.c", 1, true, t);
        log.record("b", "x.c", 2, t % 3 != 0, t);
    }
    EXPECT_EQ(log.footprint_bytes(), after_first);
    EXPECT_EQ(log.records()[1].failures, 33'333u);
}

}  // namespace
