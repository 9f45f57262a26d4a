#pragma once
// An exact frequency as a reduced fraction of hertz.
//
// Clock trees multiply and divide frequencies (PLLs, prescalers, ppm offsets), and a floating
// point value would carry rounding into every edge time computed from it. A frequency here is
// num/den Hz with both parts reduced and every operation checked for overflow, so the time base
// can compute edge times exactly (docs/architecture.md, "Exact time").

#include "sim/wide_int.h"

#include <cstdint>
#include <stdexcept>
#include <string>

namespace sim {

// Thrown when exact arithmetic would overflow its integer range.
class arithmetic_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

class frequency {
public:
    // A stopped clock: 0 Hz.
    constexpr frequency() = default;
    // num/den Hz, reduced; den must not be 0 and num/den must fit 63-bit parts after reducing.
    frequency(std::uint64_t num, std::uint64_t den);
    // A whole number of hertz.
    static frequency hz(std::uint64_t hz) { return frequency(hz, 1); }

    std::uint64_t num() const { return num_; }
    std::uint64_t den() const { return den_; }
    bool is_zero() const { return num_ == 0; }
    // Approximate value for display only; never use it in time arithmetic.
    double approx_hz() const { return static_cast<double>(num_) / static_cast<double>(den_); }

    // this * mul / div, exactly; throws arithmetic_error on overflow and std::invalid_argument
    // when div is 0.
    frequency scaled(std::uint64_t mul, std::uint64_t div) const;
    // this * (10^9 + ppb) / 10^9: the frequency offset by a signed number of parts per billion.
    frequency offset_ppb(std::int64_t ppb) const;

    // "num/den Hz" when den is not 1, else "num Hz".
    std::string exact_string() const;
    // Decimal hertz with up to 6 fraction digits, exact digits (no floating point).
    std::string decimal_string() const;
    // Engineering display such as "48 MHz" or "32.768 kHz" (rounded to 6 significant places).
    std::string pretty() const;

    friend bool operator==(const frequency& a, const frequency& b) {
        return a.num_ == b.num_ && a.den_ == b.den_;
    }
    friend bool operator!=(const frequency& a, const frequency& b) { return !(a == b); }
    friend bool operator<(const frequency& a, const frequency& b);
    friend bool operator<=(const frequency& a, const frequency& b) { return !(b < a); }
    friend bool operator>(const frequency& a, const frequency& b) { return b < a; }
    friend bool operator>=(const frequency& a, const frequency& b) { return !(a < b); }

private:
    std::uint64_t num_ = 0;
    std::uint64_t den_ = 1;
};

// Greatest common divisor of two 128-bit unsigned values (0 with 0 gives 0).
u128 gcd128(u128 a, u128 b);

}  // namespace sim
