#include "sim/frequency.h"

#include <gtest/gtest.h>

#include <cstdint>

namespace {

TEST(frequency_test, reduces_on_construction) {
    const sim::frequency f(96'000'000, 2);
    EXPECT_EQ(f.num(), 48'000'000u);
    EXPECT_EQ(f.den(), 1u);
    EXPECT_EQ(sim::frequency(10, 4), sim::frequency(5, 2));
}

TEST(frequency_test, rejects_zero_denominator_and_overflow) {
    EXPECT_THROW(sim::frequency(1, 0), std::invalid_argument);
    EXPECT_THROW(sim::frequency(std::uint64_t{1} << 63, 1), sim::arithmetic_error);
    const sim::frequency big((std::uint64_t{1} << 62) + 1, 1);
    EXPECT_THROW(big.scaled(4, 1), sim::arithmetic_error);
}

TEST(frequency_test, scales_exactly) {
    // 8 MHz * 25 / 3 is not an integer: kept as an exact fraction.
    const sim::frequency f = sim::frequency::hz(8'000'000).scaled(25, 3);
    EXPECT_EQ(f.num(), 200'000'000u);
    EXPECT_EQ(f.den(), 3u);
    EXPECT_EQ(f.decimal_string(), "66666666.666667");
    EXPECT_EQ(f.exact_string(), "200000000/3 Hz");
}

TEST(frequency_test, ppb_offset_is_exact) {
    // +20 ppm of 8 MHz is 160 Hz exactly.
    EXPECT_EQ(sim::frequency::hz(8'000'000).offset_ppb(20'000), sim::frequency::hz(8'000'160));
    EXPECT_EQ(sim::frequency::hz(8'000'000).offset_ppb(-1'500), sim::frequency::hz(7'999'988));
}

TEST(frequency_test, orders_fractions) {
    EXPECT_LT(sim::frequency(200'000'000, 3), sim::frequency::hz(66'666'667));
    EXPECT_GT(sim::frequency(200'000'000, 3), sim::frequency::hz(66'666'666));
}

TEST(frequency_test, prints_for_people) {
    EXPECT_EQ(sim::frequency::hz(48'000'000).pretty(), "48 MHz");
    EXPECT_EQ(sim::frequency::hz(32'768).pretty(), "32.768 kHz");
    EXPECT_EQ(sim::frequency::hz(32'768).decimal_string(), "32768");
}

}  // namespace
