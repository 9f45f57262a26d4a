#pragma once
// The description of one check: what to measure on which signals, what value or bounds it must
// keep, with what tolerance, and over which stretch of the run (docs/architecture.md, "Outputs").
//
// A check_spec is plain data so that any front end can fill it: the scenario loader builds one per
// TOML table, tests build them by hand. Every value is an exact integer in the check kind's own
// unit (see check_unit below) or an exact sim::frequency: no floating point reaches a comparison.
// validate() says what is wrong with a spec before a run starts; check_spec_text.h reads the
// scenario spellings ("100 ppm", "3 ticks", "120 deg") into these integers.

#include "sim/clock_domain.h"
#include "sim/frequency.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace sim {

// What a check measures.
enum class check_kind : std::uint32_t {
    frequency,    // per period of one signal: 1 / period, against an exact frequency
    period,       // time between consecutive reference edges of one signal
    duty_cycle,   // high time over the period, per period (reference edge to reference edge)
    pulse_width,  // length of each high (or low) pulse
    edge_count,   // number of edges in the window
    phase,        // from an edge of signal A to the next edge of signal B, as time or angle
    dead_time,    // gap from one output falling to the other rising; never both high
    latency,      // from an event (edge of A) to the response (next edge of B)
    never,        // a condition on signal levels that must never hold
};
// The kind's name as written in scenarios and reports ("duty_cycle").
const char* to_string(check_kind k);
// The kind named `text`, or nothing.
std::optional<check_kind> check_kind_from_string(std::string_view text);

// Which edges of a signal count.
enum class edge_select : std::uint32_t { rising, falling, both };
// "rising", "falling" or "both".
const char* to_string(edge_select e);
// The edge selection named `text`, or nothing.
std::optional<edge_select> edge_select_from_string(std::string_view text);

// Integer units of check values, per kind (check_unit):
//   period, pulse_width, dead_time, latency, phase as time: picoseconds;
//   duty_cycle: parts per billion of the period (25 % is 250'000'000);
//   phase as angle: micro-degrees of the period of A (90 deg is 90'000'000);
//   edge_count: edges.
// A frequency check uses check_spec::expected_frequency instead.
inline constexpr std::uint64_t ppb_per_whole = 1'000'000'000ULL;
inline constexpr std::uint64_t micro_degrees_per_turn = 360'000'000ULL;

// How far a measured value may lie from the expected one.
enum class tolerance_kind : std::uint32_t {
    exact,     // no deviation at all
    absolute,  // `amount` in the check's unit (absolute_frequency for frequency checks)
    relative,  // `amount` parts per billion of the expected value
    ticks,     // `amount` periods of a named clock, applied to the measured time
};

struct tolerance {
    tolerance_kind kind = tolerance_kind::exact;
    // absolute: in the check's unit; relative: ppb; ticks: number of clock periods.
    std::uint64_t amount = 0;
    // absolute tolerance of a frequency check.
    frequency absolute_frequency;
    // ticks: the clock's name (for messages) and its period in ps as an exact fraction, so a
    // 48 MHz tick is 62500/3 ps, not a rounded 20833 ps. Edge times are whole picoseconds, so a
    // tick tolerance also admits 1 ps of rounding.
    std::string clock;
    std::uint64_t tick_num = 0;
    std::uint64_t tick_den = 1;

    // `amount` in the check's unit.
    static tolerance absolute_units(std::uint64_t amount);
    // A frequency deviation (frequency checks only).
    static tolerance absolute_hz(const frequency& f);
    // Parts per billion of the expected value (100 ppm is 100'000).
    static tolerance relative_ppb(std::uint64_t ppb);
    // `count` periods of clock `clock` running at `f` (f must not be 0 Hz).
    static tolerance ticks_of(std::uint64_t count, std::string clock, const frequency& f);
    // `count` periods of clock `clock` whose period is a whole `period_ps`.
    static tolerance ticks_of(std::uint64_t count, std::string clock, time_ps period_ps);
};

// One check. Give either `expected` (with a tolerance) or bounds (`minimum`, `maximum`), per kind:
//   frequency:   expected_frequency and a tolerance (absolute_hz, relative or ticks of the period);
//   period, duty_cycle, pulse_width, phase: expected or bounds;
//   edge_count:  expected (tolerance: absolute edges) or bounds; 0 expected edges may pass on a
//                signal that never moves;
//   dead_time:   expected or bounds on the gap (usually a minimum); both outputs high always fails;
//   latency:     bounds (usually a maximum) or expected;
//   never:       `condition` only.
struct check_spec {
    std::string name;
    check_kind kind = check_kind::period;
    // Full signal names ("fan_timer.channel1"): one for the single-signal kinds; A then B for
    // phase, latency (event, response) and dead_time (the two outputs); none for `never`, whose
    // signals come from the condition.
    std::vector<std::string> signals;
    // never: a level condition over signal names with and, or, not and parentheses.
    std::string condition;

    // Reference edge (period, frequency, duty_cycle), counted edges (edge_count), edge of A
    // (phase, latency).
    edge_select edge = edge_select::rising;
    // Edge of B (phase, latency).
    edge_select response_edge = edge_select::rising;
    // pulse_width: measure high pulses (true) or low ones (false).
    bool high_pulses = true;
    // phase: as an angle of A's period (micro-degrees) instead of a time (ps).
    bool phase_as_angle = false;

    std::optional<std::uint64_t> expected;
    std::optional<frequency> expected_frequency;
    std::optional<std::uint64_t> minimum;
    std::optional<std::uint64_t> maximum;
    tolerance tol;

    // Measurements count only inside [from + settle, until]; settle skips start-up after `from`.
    time_ps from = 0;
    std::optional<time_ps> until;
    time_ps settle = 0;
};

// The unit of a kind's values in reports: "s", "Hz", "%", "deg", "edges" or "occurrences".
std::string check_unit(const check_spec& spec);

// One problem in a spec: the field it concerns ("tolerance", "signals"...) and what would be
// accepted, so a loader can point at the right TOML key.
struct check_spec_problem {
    std::string field;
    std::string message;
};

// Every problem of `spec`, empty when it can run. Signal names are not resolved here (the engine
// does that when the signals are declared); a `never` condition is parsed.
std::vector<check_spec_problem> validate(const check_spec& spec);

}  // namespace sim
