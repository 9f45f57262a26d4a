#pragma once
// Scenario spellings of check values: tolerances ("100 ppm", "3 ticks", "20 ns"), phase angles
// ("120 deg", "25 %") and duty cycles ("25 %"), read exactly into the integers of check_spec.h.
//
// Kept apart from check_spec.h because it builds on the quantity parser of the scenario library
// (tickbench::scenario); the check engine itself needs none of it.

#include "sim/checks/check_spec.h"

#include <cstdint>
#include <string_view>

namespace sim {

// Reads a tolerance as written in a scenario, for a check of kind `kind`:
//   "100 ppm", "50 ppb", "0.5 %"  relative to the expected value for times and frequencies, and
//                                 absolute points of the whole for duty_cycle and angle phases;
//   "3 ticks"                     ticks (the caller fills the clock with ticks_of);
//   a time ("20 ns")              absolute, for the time kinds;
//   a frequency ("2 Hz")          absolute, for frequency checks;
//   "2 deg"                       absolute, for angle phases;
//   a whole number ("2")          absolute edges, for edge_count.
// Throws quantity_error saying what would be accepted.
tolerance parse_tolerance(std::string_view text, const check_spec& spec);
// An angle in micro-degrees: "120 deg", or a fraction of a turn in % ("25 %" is 90 deg).
std::uint64_t parse_angle(std::string_view text);
// A ratio of a whole in ppb: "25 %", "250000 ppm"; it must lie in [0 %, 100 %].
std::uint64_t parse_duty(std::string_view text);

}  // namespace sim
