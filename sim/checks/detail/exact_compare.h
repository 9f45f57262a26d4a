#pragma once
// Exact comparison of products of 128-bit integers, for the check engine's tolerance tests.
//
// A tolerance test such as |1e12 d - n T| * 1e9 <= ppb * n * T multiplies values that each fit
// 128 bits but whose products may not; comparing the full 256-bit products keeps every verdict
// exact without floating point. Internal to sim/checks.

#include "sim/wide_int.h"

#include <cstdint>

namespace sim::detail {

// A 256-bit unsigned value as two 128-bit halves.
struct u256 {
    u128 hi = 0;
    u128 lo = 0;
};

// The full product a * b.
inline u256 mul_wide(u128 a, u128 b) {
    const u128 mask = ~std::uint64_t{0};
    const u128 a0 = a & mask, a1 = a >> 64, b0 = b & mask, b1 = b >> 64;
    const u128 p00 = a0 * b0, p01 = a0 * b1, p10 = a1 * b0, p11 = a1 * b1;
    const u128 mid = (p00 >> 64) + (p01 & mask) + (p10 & mask);
    u256 r;
    r.lo = (mid << 64) | (p00 & mask);
    r.hi = p11 + (p01 >> 64) + (p10 >> 64) + (mid >> 64);
    return r;
}

// -1, 0 or 1 as a * b is below, equal to or above c * d.
inline int compare_products(u128 a, u128 b, u128 c, u128 d) {
    const u256 x = mul_wide(a, b), y = mul_wide(c, d);
    if (x.hi != y.hi) return x.hi < y.hi ? -1 : 1;
    if (x.lo != y.lo) return x.lo < y.lo ? -1 : 1;
    return 0;
}

}  // namespace sim::detail
