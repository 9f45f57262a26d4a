#pragma once
// A square wave source: a clock-like signal on a timer input (a tachometer, a sensor's PWM, a
// reference frequency to capture).
//
// Edges are computed, never accumulated (docs/architecture.md, "Exact time"): rising edge k lies
// at start + phase + k x period, falling edge k one high time later, each rounded half up to the
// picosecond, then displaced later by its own seeded jitter draw. The period is an exact fraction
// of picoseconds (the frequency with its ppm offset); the high time and an angle phase are kept to
// 1/d ps, d being the numerator of the exact frequency, so each edge lies within half a picosecond
// of its exact instant plus at most 1/(2d) ps, and exactly on the rounded instant whenever the high
// time and phase are whole picoseconds. Before `start` and from `stop` on the source holds its idle
// level; at `start` it takes the wave's level there (an edge when that differs).

#include "sim/frequency.h"
#include "sim/stimulus/edge_source.h"
#include "sim/wide_int.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace sim::stimulus {

struct square_settings {
    frequency freq;                        // nominal frequency, above 0 Hz
    std::int64_t offset_ppb = 0;           // frequency error, parts per billion (-10^8..10^8)
    std::uint64_t duty_ppb = 500'000'000;  // high time / period, strictly between 0 and 10^9
    time_ps phase_ps = 0;                  // delay of the rising edges after `start` ...
    std::uint64_t phase_udeg = 0;          // ... plus this angle of a period (micro-degrees)
    time_ps jitter = 0;                    // each edge displaced later by 0..jitter ps
    std::uint64_t seed = 0;                // seeds the jitter draws
    time_ps start = 0;                     // the wave begins here
    std::optional<time_ps> stop;           // and ends here (after start), or never
    bool idle_level = false;               // level before start and from stop on
};

// What is wrong with `s` on its face, one sentence each ("stop must come after start"); empty when
// fine. The jitter's bound needs the exact period: the constructor checks it.
std::vector<std::string> square_problems(const square_settings& s);

class square_wave final : public edge_source {
public:
    // Throws std::invalid_argument with the first of square_problems(), or arithmetic_error when
    // the exact period does not fit 128-bit arithmetic.
    explicit square_wave(const square_settings& s);

    bool initial_level() const override { return s_.idle_level; }
    std::optional<edge> next_edge(time_ps from) override;

    // The exact period in ps as a fraction.
    u128 period_num() const { return pn_; }
    u128 period_den() const { return pd_; }

private:
    // Time of wave edge j (even: rising edge j/2, odd: falling edge), from j = -4 on.
    i128 time_of(std::int64_t j) const;
    // The first wave edge at or after x.
    std::int64_t first_at_or_after(i128 x) const;

    square_settings s_;
    u128 pn_ = 0, pd_ = 1;  // period = pn / pd ps
    i128 phase_units_ = 0;  // phase in 1/pd ps, reduced to one period
    i128 high_units_ = 0;   // high time in 1/pd ps
    bool level_at_start_ = false;
};

}  // namespace sim::stimulus
