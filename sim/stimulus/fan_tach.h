#pragma once
// A fan on a PWM output, seen through its tachometer: the tachometer's edges as a function of the
// duty cycle a timer's output pin gives the fan (docs/scenario.md, "Stimulus", kind `fan`).
//
// Unlike the other sources, this one answers the part: its edges depend on a pin that firmware
// drives, so they cannot be computed ahead from settings alone. The fan takes the pin's levels as
// they happen and turns them into edges only as far as the levels it has seen determine them. Its
// model, plain and stated so a test can recompute it:
//
// - Time is cut into windows of `averaging`; window j is [j x W, (j + 1) x W). The fan's drive in
//   window j is the pin's mean level over it (its high time / W, exact).
// - The speed is constant within a window. Window 0 runs at 0 rpm; window j + 1 at
//   s(j+1) = s(j) + (max_rpm x drive(j) - s(j)) x (1 - exp(-W / time_constant)): a first-order lag
//   sampled once per window, so after a step the speed covers 63 % of the way in one time
//   constant, as a motor with inertia does. Edges of window j + 1 are thus determined once the pin
//   is known up to (j + 1) x W.
// - The tachometer toggles every 1 / (2 x pulses_per_revolution) of a revolution (its output is a
//   square wave of pulses_per_revolution periods per revolution), starting low at angle 0. An edge
//   lies at the first picosecond at or after the instant the angle reaches its fraction of a
//   turn, and within its window.
//
// The angle is kept in double precision (a fraction of a revolution, not a time); edge times are
// whole picoseconds.

#include "sim/stimulus/edge_source.h"

#include <cstdint>
#include <deque>
#include <optional>
#include <string>
#include <vector>

namespace sim::stimulus {

struct fan_settings {
    std::uint32_t max_rpm = 0;                // speed at 100 % drive, above 0
    time_ps time_constant = 0;                // the lag's time constant; 0 follows at once
    std::uint32_t pulses_per_revolution = 2;  // tachometer periods per revolution, 1 to 1000
    time_ps averaging = 1'000'000'000;        // the window W, above 0
};

// What is wrong with `s`, one sentence each; empty when fine.
std::vector<std::string> fan_problems(const fan_settings& s);

class fan_tach {
public:
    // Throws std::invalid_argument with the first of fan_problems().
    explicit fan_tach(const fan_settings& s);

    // The tachometer's level before its first edge.
    bool initial_level() const { return false; }
    // The drive pin took `level` at `at`. Calls come in time order, and not before an instant
    // already passed to known_until() (a later one is taken as at that instant).
    void drive(bool level, time_ps at);
    // The drive pin's levels are known up to and including `t`.
    void known_until(time_ps t);
    // The instant from which edges are not determined yet: (complete windows + 1) x W.
    time_ps determined_until() const;
    // The first edge at or after `from`, if it lies before determined_until(); nothing otherwise.
    // `from` must not decrease from one call to the next.
    std::optional<edge> next_edge(time_ps from);
    // The speed in rpm during window `window`, once determined (for tests and reports).
    std::optional<double> speed_in(std::uint64_t window) const;

private:
    // Adds the pin's high time up to `to` into the windows, closing those that end at or before.
    void account(time_ps to);
    // Moves the cursor to the next window, if its speed is known.
    bool next_window();
    // Edges per picosecond in window `window` (first_ <= window <= open_).
    double rate_in(std::uint64_t window) const;

    fan_settings s_;
    double lag_ = 1.0;  // the part of the way to the target covered per window
    // The pin's levels, folded into windows as they come.
    bool level_ = false;
    time_ps last_ = 0;        // high time is accounted up to here
    std::uint64_t open_ = 0;  // the window being filled
    time_ps high_ = 0;        // its high time so far
    // Speeds of windows first_ to open_ (the cursor's window and every determined one after it).
    std::deque<double> speeds_;
    std::uint64_t first_ = 0;
    // The cursor: the window whose edges are handed out, and where its next edge lies. The angle
    // is kept as the distance to the next edge, in edges, at the window's start (in (0, 1] and
    // never a growing number, so it keeps its precision over any run length).
    std::uint64_t window_ = 0;
    double lead_ = 1.0;
    std::uint64_t in_window_ = 0;  // edges of window_ passed already
    std::uint64_t edges_ = 0;      // edges passed in all, whose parity is the level
    time_ps last_edge_ = 0;
};

}  // namespace sim::stimulus
