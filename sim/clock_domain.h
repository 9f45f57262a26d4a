#pragma once
// The exact time base: where every edge of a clock lies in simulated time.
//
// A clock domain never accumulates periods (a rounded 48 MHz period drifts 16 ppm). It is a
// timeline of segments; within a segment edge k lies at
//     round((base + (k - first_tick) * step_num) / step_den)  picoseconds,
// where step_num/step_den is the exact period in ps and base is the exact (sub-picosecond) time of
// the segment's first edge scaled by step_den. All of it is 128-bit integer arithmetic, so the
// error of any edge is under half a picosecond however long the run. Tick indices run on across
// segments: a frequency change or a stop does not restart the count. tick_at() and time_of() are
// the only conversions between time and tick index in the project (docs/architecture.md, "Exact
// time").

#include "sim/frequency.h"
#include "sim/invariant_divider.h"

#include <cstdint>
#include <limits>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace sim {

// Simulated time in picoseconds, the kernel's resolution.
using time_ps = std::uint64_t;
// Picoseconds per second.
inline constexpr std::uint64_t ps_per_second = 1'000'000'000'000ULL;
// The last representable instant (2^64 - 1 ps, about 213.5 days): SystemC's sc_time is a 64-bit
// count of the resolution unit (IEEE 1666-2011, 5.11), so nothing may be scheduled past it.
inline constexpr time_ps max_time_ps = std::numeric_limits<time_ps>::max();

// Thrown when an edge or an event would lie beyond max_time_ps; raised before the wrap.
class time_limit_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};
// Throws time_limit_error for `what` ("clock edge"...).
[[noreturn]] void throw_time_limit(const char* what);

// One edge of a clock: its tick index and its time.
struct clock_edge {
    std::uint64_t tick = 0;
    time_ps at = 0;
};

// A stretch of a clock's life with one frequency, or stopped.
class clock_segment {
public:
    // A running segment whose first edge (index first_tick) lies exactly at origin ps.
    static clock_segment running(std::uint64_t first_tick, time_ps origin, const frequency& f);
    // The same, with seeded phase jitter: each edge is displaced later by a pseudo-random amount in
    // [0, jitter] ps drawn from (seed, edge index). jitter must stay under half the period.
    static clock_segment running(std::uint64_t first_tick, time_ps origin, const frequency& f,
                                 time_ps jitter, std::uint64_t seed);
    // A stopped stretch beginning at `from`; the next edge, when the clock restarts, is next_tick.
    static clock_segment stopped(std::uint64_t next_tick, time_ps from);
    // The segment whose edge k is edge (parent_tick + (k - first_tick) * factor) of `parent`:
    // a divider or a gate passing every factor-th edge, exact to the parent's sub-ps phase.
    static clock_segment derived(const clock_segment& parent, std::uint64_t parent_tick,
                                 std::uint64_t first_tick, std::uint64_t factor);

    bool is_running() const { return running_; }
    std::uint64_t first_tick() const { return first_tick_; }
    // The time the segment begins: its first edge when running, the stop time otherwise.
    time_ps start() const { return start_; }
    const frequency& freq() const { return freq_; }
    // For a derived segment: the parent edge that is this segment's first edge, and how many parent
    // edges make one edge here. A source segment reports its own first tick and 1.
    std::uint64_t source_tick() const { return source_tick_; }
    std::uint64_t factor() const { return factor_; }
    // Parent tick of edge k (k >= first_tick) of a derived segment.
    std::uint64_t source_tick_of(std::uint64_t k) const {
        return source_tick_ + (k - first_tick_) * factor_;
    }
    time_ps jitter() const { return jitter_; }
    // Exact period in ps as a fraction (numerator, denominator); 0/1 when stopped.
    std::uint64_t period_num() const { return step_num_; }
    std::uint64_t period_den() const { return step_den_; }
    // Same timing, tick numbering and parentage: used to skip propagating a change that changed
    // nothing.
    bool same_as(const clock_segment& o) const;
    // True when this running segment only restates `prev`: the same edges, numbering and parentage
    // from its first tick on, so appending it would change nothing.
    bool continues(const clock_segment& prev) const;

    // Time of edge k (k >= first_tick) of a running segment; throws time_limit_error past the
    // limit. Inline: every timer event asks it.
    time_ps time_of(std::uint64_t k) const {
        return jitter_ == 0 ? nominal_time_of(k) : jittered_time_of(k);
    }
    // Index of the first edge at or after t of a running segment (first_tick if t <= start).
    std::uint64_t tick_at(time_ps t) const;

private:
    time_ps nominal_time_of(std::uint64_t k) const {
        const u128 n = k - first_tick_;
        if (beyond_limit_ || n > last_n_) throw_time_limit("clock edge");
        // round half up of x / d as (2x + d) / (2d), inside 128 bits (set_limit); most edges fit
        // a 64-bit dividend, divided without a hardware divide.
        const u128 x = base_ + n * step_num_;
        const u128 num = 2 * x + step_den_;
        if ((num >> 64) == 0) return half_step_den_.divide(static_cast<std::uint64_t>(num));
        return static_cast<time_ps>(num / (2 * static_cast<u128>(step_den_)));
    }
    time_ps jittered_time_of(std::uint64_t k) const;
    std::uint64_t nominal_tick_at(time_ps t) const;
    // Sets last_n_ from base_ and the step (called once the segment's timing is set).
    void set_limit();
    std::uint64_t source_tick_ = 0;
    std::uint64_t factor_ = 1;
    time_ps jitter_ = 0;
    std::uint64_t jitter_seed_ = 0;
    std::uint64_t jitter_base_ = 0;  // jitter index of the first edge
    std::uint64_t jitter_step_ = 1;  // jitter index step per edge
    bool running_ = false;
    std::uint64_t first_tick_ = 0;
    time_ps start_ = 0;
    frequency freq_;
    u128 base_ = 0;               // exact time of the first edge, times step_den_
    std::uint64_t step_num_ = 0;  // period = step_num_ / step_den_ ps
    std::uint64_t step_den_ = 1;
    // Largest edge offset (k - first_tick_) whose time still fits the time base, computed once so
    // that time_of needs no 128-bit division to check it.
    u128 last_n_ = 0;
    bool beyond_limit_ = false;        // even the first edge lies past the limit
    invariant_divider half_step_den_;  // divides by 2 * step_den_
};

// A clock's whole timeline: segments in time order, tick indices continuous across them.
class clock_domain {
public:
    // A clock with no edges yet (stopped since time 0).
    clock_domain();
    // A clock running at f from the edge at `origin` (index 0).
    clock_domain(const frequency& f, time_ps origin = 0);

    // Time of edge k; throws std::out_of_range if the clock is stopped for ever before edge k, and
    // time_limit_error if the edge lies past max_time_ps. Inline for the common case, an edge of
    // the last segment.
    time_ps time_of(std::uint64_t k) const {
        if (!segments_.empty()) {
            const clock_segment& s = segments_.back();
            if (s.is_running() && k >= s.first_tick()) return s.time_of(k);
        }
        return time_of_earlier(k);
    }
    // Index of the first edge at or after t, i.e. the number of edges strictly before t.
    std::uint64_t tick_at(time_ps t) const;
    // The first edge at or after t, or nothing when the clock stays stopped from then on.
    std::optional<clock_edge> edge_at_or_after(time_ps t) const;
    // The first edge strictly after t.
    std::optional<clock_edge> edge_after(time_ps t) const;
    // Frequency in force at time t (0 Hz while stopped).
    frequency freq_at(time_ps t) const;
    bool running_at(time_ps t) const { return !freq_at(t).is_zero(); }

    // A change at time t comes after any edge at t (as every event at t does). From the first edge
    // after t (from t + 1 ps when stopped), run at f. Returns the edge at which the new frequency
    // starts: that edge keeps its old time, the next is one new period on.
    clock_edge change_frequency(time_ps t, const frequency& f);
    // Stop at time t: the edge at t, if any, has happened; edges after t do not.
    void stop(time_ps t);
    // Append a segment that starts at or after the last one's start (for clock-tree nodes).
    void append(const clock_segment& s);
    // Forget segments wholly before t (keeps queries at or after t exact, bounds memory).
    void forget_before(time_ps t);
    // Remove the segments that start at or after t (a clock-tree node rebuilding its future); the
    // removed ones are returned so the caller can tell whether anything changed.
    std::vector<clock_segment> truncate_from(time_ps t);

    const std::vector<clock_segment>& segments() const { return segments_; }
    const clock_segment& last() const { return segments_.back(); }
    // The segment in force at time t (the last that starts at or before t).
    const clock_segment& segment_at(time_ps t) const;

private:
    // Index of the segment holding tick k.
    std::size_t segment_of_tick(std::uint64_t k) const;
    // time_of for an edge before the last segment, or of a stopped last segment.
    time_ps time_of_earlier(std::uint64_t k) const;
    std::vector<clock_segment> segments_;
};

}  // namespace sim

namespace sim {
// A time for messages and logs: exact, in the largest unit that keeps it readable ("1.25 ms",
// "20833333333333 ps" is shown as "20.833333333333 s").
std::string format_time(time_ps t);
}  // namespace sim
