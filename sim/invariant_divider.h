#pragma once
// Division of 64-bit values by a divisor fixed in advance, by one multiply and two shifts.
//
// A clock segment divides by the same number for every edge it converts, and a hardware divide
// costs tens of cycles on the hot path of every timer event. The method is the classic one for
// division by invariant integers (a rounded-up reciprocal m and shifts chosen from the divisor's
// size); it is exact for every 64-bit dividend.

#include "sim/wide_int.h"

#include <cstdint>

namespace sim {

class invariant_divider {
public:
    invariant_divider() = default;
    // A divider by d (d >= 1).
    explicit invariant_divider(std::uint64_t d) : d_(d) {
        unsigned l = 0;  // ceil(log2 d)
        while (l < 64 && (std::uint64_t{1} << l) < d) ++l;
        const u128 two_l = u128{1} << l;
        m_ = static_cast<std::uint64_t>(((u128{1} << 64) * (two_l - d)) / d + 1);
        shift1_ = l == 0 ? 0 : 1;
        shift2_ = l == 0 ? 0 : l - 1;
    }
    // n / d, rounded down.
    std::uint64_t divide(std::uint64_t n) const {
        const std::uint64_t t = static_cast<std::uint64_t>((static_cast<u128>(m_) * n) >> 64);
        return (t + ((n - t) >> shift1_)) >> shift2_;
    }
    std::uint64_t divisor() const { return d_; }

private:
    std::uint64_t d_ = 1;
    std::uint64_t m_ = 1;
    unsigned shift1_ = 0, shift2_ = 0;
};

}  // namespace sim
