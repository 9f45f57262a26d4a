#pragma once
// A quadrature encoder on a shaft turning at a speed that follows a profile: two outputs, A and B,
// a quarter of a line apart (A leads B when the shaft turns forward, i.e. at a positive speed).
//
// The speed profile is a list of points (time, rpm), linear in between; it holds the first point's
// speed before it and the last point's after it, and may pass through zero (the shaft reverses).
// The position is the exact integral of the speed: over a ramp from r0 to r1 rpm lasting T ps, the
// position after tau ps, in units of 1/(120 x 10^12) of a quarter line, is
//     P0 + K x (2 r0 T tau + (r1 - r0) tau^2) / T      (K = 4 x lines, quarter lines per turn)
// which is a whole number at every segment's end, so positions never accumulate rounding. The
// outputs at picosecond t are the quadrature state of floor(position(t) / quarter line): state 0
// has A and B low, 1 A high, 2 both high, 3 B high. An edge is thus placed at the first picosecond
// at which the floor has changed: going forward, at or after the exact instant the position reaches
// a quarter line (less than 1 ps late); going backward, where the position is below it (1 ps after
// an exact instant that is a whole picosecond). Never early. Crossings are found by bisection on
// the position, each step an exact sign test in 256-bit integers, so the result is exact whatever
// the profile's length.

#include "sim/stimulus/edge_source.h"
#include "sim/wide_int.h"

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

namespace sim::stimulus {

struct speed_point {
    time_ps at = 0;
    std::int64_t rpm = 0;  // signed: negative turns backward
};

struct encoder_settings {
    std::uint32_t lines = 0;         // lines per revolution, 1..1000000
    std::vector<speed_point> speed;  // at least one point, times strictly increasing
};

// What is wrong with `s`, one sentence each; empty when fine.
std::vector<std::string> encoder_problems(const encoder_settings& s);

// Which output of the encoder.
enum class encoder_output { a, b };

class quadrature_encoder final : public edge_source {
public:
    // Throws std::invalid_argument with the first of encoder_problems().
    quadrature_encoder(const encoder_settings& s, encoder_output which);

    bool initial_level() const override { return level_of(0); }
    std::optional<edge> next_edge(time_ps from) override;

    // The count of quarter lines at time t (floor of the position): 4 x lines per forward turn.
    // For tests and messages; costs a walk from the start.
    std::int64_t count_at(time_ps t) const;

private:
    struct segment {
        i128 t0 = 0;      // start time, ps
        i128 length = 0;  // T in ps; 0: holds on for ever (constant speed)
        i128 r0 = 0;      // rpm at t0
        i128 slope = 0;   // r1 - r0 (0 for a constant segment)
        i128 p0 = 0;      // position at t0, in 1/(120e12) quarter lines
    };
    bool level_of(std::int64_t count) const;
    // Whether position(t0 + tau) >= x in segment s.
    bool at_or_above(const segment& s, i128 tau, i128 x) const;
    // The next crossing after time t from count c: its time and the new count.
    std::optional<std::pair<i128, std::int64_t>> next_crossing(std::size_t& seg, i128 t,
                                                               std::int64_t c) const;

    std::vector<segment> segments_;
    i128 k_ = 0;  // quarter lines per revolution
    encoder_output which_;
    // Cursor: the count at time t_, every crossing up to t_ consumed, segment seg_ holds t_ + 1.
    i128 t_ = 0;
    std::int64_t count_ = 0;
    std::size_t seg_ = 0;
    std::optional<edge> last_;
};

}  // namespace sim::stimulus
