// Crashes that are not peripheral accesses, and trapped accesses the engine cannot complete,
// end in the crash hook with a message naming the signal, the addresses and (for an unsupported
// instruction) the instruction; if the hook returns, the process dies of the signal.

#include "fake_peripheral.h"

#include <emmintrin.h>
#include <gtest/gtest.h>
#include <unistd.h>

#include <csignal>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <string>

namespace trap_test {

// A function with external linkage, so that the dynamic symbol table names it in the backtrace.
[[gnu::noinline]] void write_through_a_bad_pointer() {
    volatile int* p = reinterpret_cast<volatile int*>(0x10);
    asm volatile("" : "+r"(p));
    *p = 1;
    asm volatile("");  // keeps the write from being a tail position
}

// Recurses until the stack runs out; the frame's array keeps it from becoming a loop.
[[gnu::noinline]] int recurse_forever(int depth) {
    if (depth < 0) return 0;  // never true; tells the compiler the recursion can end
    volatile char frame[512];
    frame[0] = static_cast<char>(depth);
    return recurse_forever(depth + 1) + frame[0];
}

namespace {

using harness::crash_info;
using harness::trap_engine;

constexpr int hook_exit_code = 3;

// The runner's way: write the report to stderr and leave with a code of its own.
void report_and_exit(const crash_info& info) {
    const std::string text = "CRASH-HOOK " + harness::describe(info);
    (void)!write(STDERR_FILENO, text.data(), text.size());
    _exit(hook_exit_code);
}

class crash_test : public ::testing::Test {
protected:
    void SetUp() override { GTEST_FLAG_SET(death_test_style, "threadsafe"); }
};

// Opaque to the optimiser, so that the faulting accesses are really made.
template <typename T>
T* opaque(std::uint64_t address) {
    T* p = reinterpret_cast<T*>(address);
    asm volatile("" : "+r"(p));
    return p;
}

TEST_F(crash_test, null_pointer_write_reaches_the_hook) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            *opaque<volatile int>(0) = 1;
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "CRASH-HOOK SIGSEGV: write of unmapped address 0x0\n.*fault address 0x0\n.*host "
        "backtrace:\n.*#0 ");
}

TEST_F(crash_test, backtrace_names_the_crashing_function) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            write_through_a_bad_pointer();
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "#0 0x[0-9a-f]+ trap_test::write_through_a_bad_pointer\\(\\)\\+0x[0-9a-f]+ "
        "\\(trap_tests\\)\n"
        " *#1 0x[0-9a-f]+ .*\\(trap_tests\\)");
}

TEST_F(crash_test, abort_reaches_the_hook) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            std::abort();
        },
        ::testing::ExitedWithCode(hook_exit_code), "CRASH-HOOK SIGABRT: abort\\(\\) called.*abort");
}

TEST_F(crash_test, unsupported_instruction_on_a_mapped_region_names_it) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            fake_peripheral p;
            p.map("simd target");
            __m128i v = _mm_loadu_si128(opaque<const __m128i>(peripheral_base + 0x20));
            asm volatile("" : "+x"(v));  // keeps the whole 16-byte load in an SSE register
            volatile int sink = _mm_cvtsi128_si32(v);
            (void)sink;
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "CRASH-HOOK SIGSEGV: trapped access to region 'simd target' failed: unsupported "
        "instruction "
        "'movdqu xmm0, (xmmword ptr )?\\[r[a-z0-9]+\\]' at 0x[0-9a-f]+ accessing 0x50000020 "
        "\\(only 1-, "
        "2-, 4- and 8-byte accesses are emulated\\)");
}

TEST_F(crash_test, string_instruction_on_a_mapped_region_is_refused) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            fake_peripheral p;
            p.map("strings");
            void* destination = opaque<void>(peripheral_base);
            unsigned long count = 4;
            asm volatile("rep stosl" : "+D"(destination), "+c"(count) : "a"(0) : "memory");
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "unsupported instruction 'rep stosd.*' at 0x[0-9a-f]+ accessing 0x50000000 \\(implicit "
        "memory operands\\)");
}

TEST_F(crash_test, access_past_the_end_of_a_region_is_refused) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            fake_peripheral p;
            p.map("short");
            *opaque<volatile std::uint64_t>(peripheral_base + peripheral_size - 4) = 1;
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "an access of 8 bytes at 0x500000fc runs past the end of region 'short' \\[0x50000000, "
        "0x50000100\\)");
}

TEST_F(crash_test, access_between_regions_on_a_trapped_page_is_a_crash) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            fake_peripheral p;
            p.map("low");
            (void)*opaque<volatile std::uint32_t>(peripheral_base + 0x800);
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "SIGSEGV: read of 0x50000800: a trapped peripheral page, but no mapped region holds this "
        "address");
}

TEST_F(crash_test, access_after_unmapping_is_a_crash) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            {
                fake_peripheral p;
                p.map();
            }
            (void)*opaque<volatile std::uint32_t>(peripheral_base);
        },
        ::testing::ExitedWithCode(hook_exit_code), "SIGSEGV: read of unmapped address 0x50000000");
}

TEST_F(crash_test, a_callback_that_throws_is_a_crash) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            auto region = trap_engine::instance().map_region(
                "throwing", peripheral_base, 0x10,
                [](harness::access&) { throw std::runtime_error("model refused"); });
            (void)*opaque<volatile std::uint32_t>(peripheral_base);
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "the access callback of region 'throwing' threw: model refused");
}

TEST_F(crash_test, stack_overflow_is_reported_from_the_signal_stack) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            recurse_forever(0);
        },
        ::testing::ExitedWithCode(hook_exit_code),
        "CRASH-HOOK SIGSEGV: write of .*recurse_forever");
}

TEST_F(crash_test, integer_division_by_zero_reaches_the_hook) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            volatile int numerator = 1000;
            volatile int zero = 0;
            volatile int result = numerator / zero;
            (void)result;
        },
        ::testing::ExitedWithCode(hook_exit_code), "CRASH-HOOK SIGFPE: integer division by zero");
}

TEST_F(crash_test, illegal_instruction_reaches_the_hook) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(report_and_exit);
            asm volatile("ud2");
        },
        ::testing::ExitedWithCode(hook_exit_code), "CRASH-HOOK SIGILL: illegal instruction");
}

TEST_F(crash_test, a_hook_that_returns_lets_the_signal_kill_the_process) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook([](const crash_info& info) {
                std::fprintf(stderr, "hook saw %s\n", info.signal_name.c_str());
            });
            *opaque<volatile int>(0) = 1;
        },
        ::testing::KilledBySignal(SIGSEGV), "hook saw SIGSEGV");
}

TEST_F(crash_test, without_a_hook_the_report_goes_to_stderr) {
    EXPECT_EXIT(
        {
            trap_engine::instance().install();
            std::abort();
        },
        ::testing::KilledBySignal(SIGABRT), "SIGABRT: abort\\(\\) called.*host backtrace");
}

TEST_F(crash_test, a_crash_inside_the_hook_still_ends_the_process) {
    EXPECT_EXIT(
        {
            trap_engine::instance().set_crash_hook(
                [](const crash_info&) { *opaque<volatile int>(8) = 1; });
            std::abort();
        },
        ::testing::KilledBySignal(SIGSEGV), "");
}

}  // namespace
}  // namespace trap_test
