// The classic split-read race, reproduced deterministically: a 16-bit counter extended to 32 bits
// by an overflow interrupt. The firmware (examples/counter_extension/firmware.c) reads a timestamp
// in a loop across a counter wrap; the sweep slides its start one CPU cycle at a time so every
// phase of its read loop meets the wrap. The naive read must fail (time goes backwards) at the same
// offsets every time; the careful read must never fail.

#include "harness/firmware_context.h"
#include "harness/platform.h"
#include "harness/testing/run_in_child.h"
#include "tests/harness/demo_part.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <vector>

extern "C" std::uint32_t counter_extension_backwards;

namespace {

constexpr sim::time_ps run_length = 50'000'000;  // 50 us: the loop and the wrap fit in it
// The wrap comes 150 counts (150 CPU cycles at 96 MHz) after time 0.
constexpr std::uint32_t counter_start = 0xffff - 150;
// An iteration of the read loop takes 6 (naive) to 12 (careful) CPU cycles; 64 start offsets cover
// every phase of it against the wrap several times over, and the loop (64 reads, at least 384
// cycles) spans the wrap at every offset.
constexpr unsigned offsets = 64;

// Runs the variant at each start offset; returns the offsets at which the firmware check failed.
std::vector<unsigned> sweep(harness::platform& p, const std::string& variant) {
    std::vector<unsigned> failed;
    for (unsigned offset = 0; offset < offsets; ++offset) {
        const auto r = harness::run_in_child(
            [&] {
                harness::firmware_context::get().params["variant"] = variant;
                p.cpu()->set_start_offset(offset);
                p.run(run_length);
                // The firmware's own check ends the run with exit code 3 when it fails.
                return harness::firmware_context::get().checks.empty() ? 4 : 0;
            },
            false, true);
        EXPECT_TRUE(r.exit_code == 0 || r.exit_code == 3)
            << variant << " offset " << offset << " exit " << r.exit_code;
        if (r.exit_code == 3) failed.push_back(offset);
    }
    return failed;
}

TEST(counter_extension_test, naive_read_fails_deterministically_careful_read_never) {
    harness::platform p;
    harness::cpu_config cpu;
    cpu.access_cycles = 2;
    test_support::build_demo_part(
        p, cpu, [] { tick_firmware_main(); }, counter_start);

    const std::vector<unsigned> naive = sweep(p, "naive");
    const std::vector<unsigned> careful = sweep(p, "careful");
    EXPECT_FALSE(naive.empty())
        << "the naive read never went backwards: the race was not reproduced";
    EXPECT_TRUE(careful.empty()) << "the careful read went backwards at " << careful.size()
                                 << " offsets";
    // Deterministic: the same offsets fail again.
    EXPECT_EQ(sweep(p, "naive"), naive);
    std::string list;
    for (unsigned o : naive) list += std::to_string(o) + " ";
    std::printf("naive read failed at %zu of %u start offsets: %s\n", naive.size(), offsets,
                list.c_str());
}

}  // namespace
