#pragma once
// Quantities with units, read from scenario text exactly: frequencies ("32.768 kHz"), times
// ("1.25 ms") and small ratios ("-20 ppm", "1.5 %"). A decimal string is taken digit by digit into
// integers, never through floating point, so "32.768 kHz" is exactly 32768 Hz and a value that is
// not a whole number of the target unit (0.1 ps, 0.0001 ppb) is refused rather than rounded.

#include "sim/clock_domain.h"
#include "sim/frequency.h"

#include <cstdint>
#include <stdexcept>
#include <string_view>

namespace sim {

// A quantity string that cannot be read; the message quotes it, says what was wrong and what
// would be accepted.
class quantity_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// A frequency: a non-negative decimal number and one of Hz, kHz, MHz, GHz ("32.768 kHz"); a bare
// number means hertz. The space before the unit is optional. Fractions of a hertz stay exact.
frequency parse_frequency(std::string_view text);

// A time: a non-negative decimal number and one of ps, ns, us, µs, ms, s ("1.25 ms"); it must be a
// whole number of picoseconds and at most max_time_ps.
time_ps parse_time(std::string_view text);

// A signed ratio in parts per billion: a decimal number and one of ppb, ppm, % ("-20 ppm" is
// -20000); it must be a whole number of ppb.
std::int64_t parse_ppb(std::string_view text);

// A temperature coefficient in parts per billion per degree Celsius squared: a decimal number and
// one of ppb/C2, ppm/C2 ("-0.034 ppm/C2" is -34); it must be a whole number of ppb/C2.
std::int64_t parse_ppb_per_c2(std::string_view text);

}  // namespace sim
