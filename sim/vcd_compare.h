#pragma once
// Compares the waveforms of two runs edge by edge: what `tickbench compare` reports (docs/cli.md).
//
// Both files are read side by side through sim::vcd_reader, the one behind in time first, so the
// comparison holds only the edges not yet paired, never a whole waveform. An edge is a change of a
// signal's value (a repeated value is no edge; the first value a signal gets is its first edge).
// Per signal, the edges of run a and run b are paired in order:
//
// - the same value within the tolerance: a match;
// - one run has edges the other lacks (a glitch, an extra pulse) when skipping them brings the two
//   back into step within the tolerance: one difference listing the extra edges;
// - otherwise the same value further apart than the tolerance: a shifted edge; different values at
//   times within the tolerance: a value difference; else the earlier edge is one the other run
//   lacks.
//
// An edge waits for its pair while the other run has not yet been read far enough to decide; a
// signal whose edges pile up past a bound (max_waiting_edges) without a counterpart in the other
// run has the oldest reported as lacking it, so memory stays bounded even then.

#include "sim/clock_domain.h"
#include "sim/vcd_reader.h"

#include <cstdint>
#include <string>
#include <vector>

namespace sim {

// What to compare and how much to keep.
struct vcd_compare_options {
    time_ps tolerance = 0;  // largest time between two edges that still match
    // Signals to compare by full name ("pwm.channel1"); empty: every signal of either run.
    std::vector<std::string> signals;
    // With every signal compared: a signal only one run has is listed but is not a difference.
    bool only_common = false;
    std::size_t kept_per_signal = 5;  // differences kept (shown) per signal; the rest are counted
    std::size_t max_waiting_edges = 4096;
};

// One difference on one signal.
struct vcd_difference {
    enum class kind {
        shifted,  // the same edge in both, further apart than the tolerance (at_a, at_b, value_a)
        value,    // edges within the tolerance to different values (at_a, at_b, value_a, value_b)
        only_a,   // edges in run a that run b lacks: `count` of them, from at_a to last_a
        only_b,   // edges in run b that run a lacks: from at_b to last_b
    };
    kind what = kind::shifted;
    time_ps at_a = 0;
    time_ps at_b = 0;
    time_ps last_a = 0;
    time_ps last_b = 0;
    std::string value_a;  // the first edge's value (only_a: of the first extra edge)
    std::string value_b;
    std::uint64_t count = 1;  // edges the difference covers on the side that has them
    // The earliest time the difference concerns, for ordering and messages.
    time_ps at() const;
};

// The comparison of one signal.
struct vcd_signal_comparison {
    std::string name;
    bool in_a = false;
    bool in_b = false;
    std::uint32_t width_a = 0;
    std::uint32_t width_b = 0;
    std::uint64_t edges_a = 0;  // edges seen in run a
    std::uint64_t edges_b = 0;
    std::uint64_t differences = 0;     // all of them, kept or not
    std::vector<vcd_difference> kept;  // the first ones, in the order found
    bool counts = true;  // false: only in one run, and only_common asked not to count it

    // True when the signal is in both runs with the same width and no difference.
    bool same() const;
    // True when this signal makes the runs differ.
    bool differs() const { return counts && !same(); }
};

// The comparison of two files.
struct vcd_comparison {
    std::vector<vcd_signal_comparison> signals;  // run a's order, then signals only run b has
    time_ps end_a = 0;                           // each file's last time
    time_ps end_b = 0;
    bool ends_differ = false;  // the last times are further apart than the tolerance

    // True when no signal differs and the files end within the tolerance.
    bool same() const;
    // How many signals differ.
    std::size_t differing_signals() const;
};

// Compares the rest of `a` and `b` (readers fresh from their header). Throws vcd_error on a
// malformed file, and when a signal asked for is in neither file (naming the closest one).
vcd_comparison compare_vcd(vcd_reader& a, vcd_reader& b, const vcd_compare_options& options);

}  // namespace sim
