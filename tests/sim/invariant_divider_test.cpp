// The invariant divider against the hardware division, on divisors of every size and dividends at
// the edges of their range.

#include "sim/invariant_divider.h"

#include <gtest/gtest.h>

#include <random>

namespace {

TEST(invariant_divider_test, agrees_with_division_everywhere) {
    std::mt19937_64 random(2026);
    std::vector<std::uint64_t> divisors = {1,
                                           2,
                                           3,
                                           7,
                                           10,
                                           2 * 41'666'666ULL,
                                           2 * 96'000'000ULL,
                                           0x8000'0000'0000'0000ULL,
                                           0x8000'0000'0000'0001ULL,
                                           ~std::uint64_t{0}};
    for (int i = 0; i < 2000; ++i)
        divisors.push_back(std::max<std::uint64_t>(1, random() >> (random() % 64)));
    for (const std::uint64_t d : divisors) {
        const sim::invariant_divider div(d);
        EXPECT_EQ(div.divisor(), d);
        std::vector<std::uint64_t> dividends = {
            0, 1, d - 1, d, d + 1, 2 * d, ~std::uint64_t{0}, ~std::uint64_t{0} - 1};
        for (int j = 0; j < 200; ++j) dividends.push_back(random() >> (random() % 64));
        for (const std::uint64_t n : dividends) ASSERT_EQ(div.divide(n), n / d) << n << " / " << d;
    }
}

}  // namespace
