// Mapping regions at their real addresses: what can be mapped, what is refused and why, and
// pages shared between regions.

#include "fake_peripheral.h"

#include <gtest/gtest.h>
#include <sys/mman.h>

#include <cstdint>
#include <cstdio>
#include <string>

namespace trap_test {
namespace {

using harness::trap_engine;
using harness::trap_error;

void ignore_access(harness::access& a) { a.value = 0; }

std::string map_error(std::uint64_t base, std::uint64_t size, const char* name = "probe") {
    try {
        auto region = trap_engine::instance().map_region(name, base, size, ignore_access);
    } catch (const trap_error& e) {
        return e.what();
    }
    return "";
}

TEST(mapping_test, maps_common_peripheral_windows_in_the_low_4_gib) {
    // Common practice, no source: peripheral windows start at 0x4000_0000, 0x5000_0000 and
    // 0xe000_0000 on many 32-bit parts; a PIE test binary leaves the low 4 GiB free.
    for (std::uint64_t base : {0x4000'0000u, 0x5000'0000u, 0xe000'0000u, 0x2000'0000u}) {
#if defined(__SANITIZE_ADDRESS__)
        // AddressSanitizer keeps [0x8fff7000, 0x2008fff6fff) unmapped as its shadow gap (x86-64
        // layout, from memory): a window there cannot be mapped in a sanitizer build.
        if (base >= 0x8fff'7000u) continue;
#endif
        EXPECT_EQ(map_error(base, 0x400), "") << std::hex << base;
    }
}

TEST(mapping_test, refuses_a_range_that_collides_with_an_existing_mapping) {
    static int in_the_executable = 0;
    const auto address = reinterpret_cast<std::uint64_t>(&in_the_executable);
    const std::string error = map_error(address, 4, "clash");
    EXPECT_NE(error.find("region 'clash'"), std::string::npos) << error;
    EXPECT_NE(error.find("EEXIST"), std::string::npos) << error;
    char range[64];
    std::snprintf(range, sizeof range, "[0x%llx, 0x%llx)", static_cast<unsigned long long>(address),
                  static_cast<unsigned long long>(address + 4));
    EXPECT_NE(error.find(range), std::string::npos) << error;
}

TEST(mapping_test, refuses_addresses_below_mmap_min_addr_even_as_root) {
    // Root may map page 0; the engine refuses, so that null pointers keep crashing.
    const std::string error = map_error(0, 0x100, "null");
    EXPECT_NE(error.find("vm.mmap_min_addr"), std::string::npos) << error;
    EXPECT_NE(error.find("region 'null' [0x0, 0x100)"), std::string::npos) << error;
}

TEST(mapping_test, refuses_overlapping_regions_but_shares_pages) {
    fake_peripheral first;
    first.map("first");
    const std::string error = map_error(peripheral_base + 0x80, 0x100, "second");
    EXPECT_NE(error.find("overlaps region 'first'"), std::string::npos) << error;

    // A neighbour on the same page, as peripherals 256 bytes or 1 KiB apart are.
    fake_peripheral neighbour;
    neighbour.map("neighbour", peripheral_size);
    neighbour.set<std::uint32_t>(0, 0xc0ffee);
    first.set<std::uint32_t>(0, 0xbeef);
    EXPECT_EQ(*reinterpret_cast<volatile std::uint32_t*>(peripheral_base + peripheral_size),
              0xc0ffeeu);
    first.unmap();
    // The page stays trapped while the neighbour uses it.
    EXPECT_EQ(*reinterpret_cast<volatile std::uint32_t*>(peripheral_base + peripheral_size),
              0xc0ffeeu);
    first.map("first again");
    EXPECT_EQ(*reinterpret_cast<volatile std::uint32_t*>(peripheral_base), 0xbeefu);
}

TEST(mapping_test, unmapping_releases_the_pages) {
    {
        fake_peripheral p;
        p.map();
    }
    // Nothing is left at the address: a plain mapping there succeeds.
    void* want = reinterpret_cast<void*>(peripheral_base);
    void* got =
        mmap(want, 4096, PROT_READ, MAP_PRIVATE | MAP_ANONYMOUS | MAP_FIXED_NOREPLACE, -1, 0);
    EXPECT_EQ(got, want);
    if (got != MAP_FAILED) munmap(got, 4096);
}

TEST(mapping_test, refuses_empty_and_wrapping_ranges) {
    EXPECT_NE(map_error(peripheral_base, 0).find("size is 0"), std::string::npos);
    EXPECT_NE(map_error(~std::uint64_t{0} - 8, 0x100).find("wraps"), std::string::npos);
}

TEST(mapping_test, counts_served_accesses) {
    fake_peripheral p;
    p.map();
    const std::uint64_t before = trap_engine::instance().accesses_served();
    (void)*reinterpret_cast<volatile std::uint32_t*>(peripheral_base);
    *reinterpret_cast<volatile std::uint32_t*>(peripheral_base) = 1;
    EXPECT_EQ(trap_engine::instance().accesses_served() - before, 2u);
}

}  // namespace
}  // namespace trap_test
