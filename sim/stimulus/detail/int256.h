#pragma once
// Just enough 256-bit signed arithmetic to decide the sign of a sum of products of 128-bit values
// exactly: the quadrature encoder's position test (quadrature_encoder.cpp) multiplies a squared
// picosecond count by a speed ramp, which overflows 128 bits for long profiles.

#include "sim/wide_int.h"

#include <cstdint>

namespace sim::stimulus::detail {

// Two's complement, w[0] least significant.
struct i256 {
    std::uint64_t w[4] = {0, 0, 0, 0};
};

inline i256 negate(i256 a) {
    i256 r;
    unsigned carry = 1;
    for (int i = 0; i < 4; ++i) {
        const u128 s = static_cast<u128>(~a.w[i]) + carry;
        r.w[i] = static_cast<std::uint64_t>(s);
        carry = static_cast<unsigned>(s >> 64);
    }
    return r;
}

inline i256 add(i256 a, const i256& b) {
    unsigned carry = 0;
    for (int i = 0; i < 4; ++i) {
        const u128 s = static_cast<u128>(a.w[i]) + b.w[i] + carry;
        a.w[i] = static_cast<std::uint64_t>(s);
        carry = static_cast<unsigned>(s >> 64);
    }
    return a;
}

// a x b, exactly, for |a|, |b| < 2^127.
inline i256 multiply(i128 a, i128 b) {
    const bool negative = (a < 0) != (b < 0);
    const u128 x = static_cast<u128>(a < 0 ? -a : a);
    const u128 y = static_cast<u128>(b < 0 ? -b : b);
    const std::uint64_t xl = static_cast<std::uint64_t>(x),
                        xh = static_cast<std::uint64_t>(x >> 64);
    const std::uint64_t yl = static_cast<std::uint64_t>(y),
                        yh = static_cast<std::uint64_t>(y >> 64);
    i256 r;
    const u128 ll = static_cast<u128>(xl) * yl;
    const u128 lh = static_cast<u128>(xl) * yh;
    const u128 hl = static_cast<u128>(xh) * yl;
    const u128 hh = static_cast<u128>(xh) * yh;
    r.w[0] = static_cast<std::uint64_t>(ll);
    const u128 mid = (ll >> 64) + static_cast<std::uint64_t>(lh) + static_cast<std::uint64_t>(hl);
    r.w[1] = static_cast<std::uint64_t>(mid);
    const u128 high = (mid >> 64) + (lh >> 64) + (hl >> 64) + static_cast<std::uint64_t>(hh);
    r.w[2] = static_cast<std::uint64_t>(high);
    r.w[3] = static_cast<std::uint64_t>((high >> 64) + (hh >> 64));
    return negative ? negate(r) : r;
}

inline bool is_negative(const i256& a) { return (a.w[3] >> 63) != 0; }

}  // namespace sim::stimulus::detail
