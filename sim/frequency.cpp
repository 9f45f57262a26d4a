#include "sim/frequency.h"

#include <cstdio>
#include <limits>

namespace sim {

namespace {
constexpr std::uint64_t part_limit = std::uint64_t{1} << 63;

frequency from_wide(u128 num, u128 den) {
    if (den == 0) throw std::invalid_argument("frequency: denominator is 0");
    const u128 g = num == 0 ? den : gcd128(num, den);
    num /= g;
    den /= g;
    if (num >= part_limit || den >= part_limit)
        throw arithmetic_error("frequency: exact value does not fit 63-bit numerator/denominator");
    return frequency(static_cast<std::uint64_t>(num), static_cast<std::uint64_t>(den));
}

}  // namespace

std::string u128_text(u128 v) {
    if (v == 0) return "0";
    std::string s;
    while (v != 0) {
        s.insert(s.begin(), static_cast<char>('0' + static_cast<int>(v % 10)));
        v /= 10;
    }
    return s;
}

u128 gcd128(u128 a, u128 b) {
    while (b != 0) {
        const u128 t = a % b;
        a = b;
        b = t;
    }
    return a;
}

frequency::frequency(std::uint64_t num, std::uint64_t den) {
    if (den == 0) throw std::invalid_argument("frequency: denominator is 0");
    const std::uint64_t g = num == 0 ? den : static_cast<std::uint64_t>(gcd128(num, den));
    num /= g;
    den /= g;
    if (num >= part_limit || den >= part_limit)
        throw arithmetic_error("frequency: value does not fit 63-bit numerator/denominator");
    num_ = num;
    den_ = den;
}

frequency frequency::scaled(std::uint64_t mul, std::uint64_t div) const {
    if (div == 0) throw std::invalid_argument("frequency: division by 0");
    return from_wide(static_cast<u128>(num_) * mul, static_cast<u128>(den_) * div);
}

frequency frequency::offset_ppb(std::int64_t ppb) const {
    constexpr std::int64_t billion = 1'000'000'000;
    if (ppb <= -billion) throw std::invalid_argument("frequency: offset of -100% or more");
    return scaled(static_cast<std::uint64_t>(billion + ppb), billion);
}

bool operator<(const frequency& a, const frequency& b) {
    return static_cast<u128>(a.num_) * b.den_ < static_cast<u128>(b.num_) * a.den_;
}

std::string frequency::exact_string() const {
    if (den_ == 1) return std::to_string(num_) + " Hz";
    return std::to_string(num_) + "/" + std::to_string(den_) + " Hz";
}

std::string frequency::decimal_string() const {
    const std::uint64_t whole = num_ / den_;
    const u128 rem = num_ % den_;
    if (rem == 0) return std::to_string(whole);
    // Six fraction digits, rounded half up, exact integer arithmetic.
    u128 frac = (rem * 1'000'000 * 2 + den_) / (2 * static_cast<u128>(den_));
    u128 w = whole;
    if (frac == 1'000'000) {
        ++w;
        frac = 0;
    }
    std::string f = u128_text(frac);
    f.insert(f.begin(), 6 - f.size(), '0');
    while (!f.empty() && f.back() == '0') f.pop_back();
    return f.empty() ? u128_text(w) : u128_text(w) + "." + f;
}

std::string frequency::pretty() const {
    const double hz = approx_hz();
    const char* unit = "Hz";
    double v = hz;
    if (hz >= 1e9) {
        v = hz / 1e9;
        unit = "GHz";
    } else if (hz >= 1e6) {
        v = hz / 1e6;
        unit = "MHz";
    } else if (hz >= 1e3) {
        v = hz / 1e3;
        unit = "kHz";
    }
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.6g %s", v, unit);
    return buf;
}

}  // namespace sim
