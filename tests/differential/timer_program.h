#pragma once
// Random register programs for the differential test of the timer models.
//
// A program is a timer configuration, a timer clock and a timed list of operations (register
// writes and reads, flag clears, fault-input changes, timer clock changes), all at absolute
// picosecond times. The generator is seeded and deterministic. It places many operations within
// +/-2 timer clock ticks of counter wraps and reload events; it finds those instants by running the
// tick-exact reference on the program built so far and probing a copy of it forwards.

#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <string>
#include <vector>

namespace tickbench::differential {

enum class op_kind : std::uint32_t { write, read, clear_flags, fault_input, clock_change };

// One timed operation. For clock_change, value is the new timer clock frequency in Hz (0: stop).
struct program_op {
    sim::time_ps at = 0;
    op_kind kind = op_kind::write;
    models::timer_field field = models::timer_field::enable;
    unsigned channel = 0;
    std::uint32_t value = 0;
};

struct timer_program {
    std::uint64_t seed = 0;
    models::timer_config config;
    std::uint64_t clock_hz = 48'000'000;  // initial timer clock frequency, clock running from 0 ps
    std::vector<program_op> ops;          // non-decreasing times
    sim::time_ps end = 0;                 // the run stops after every tick at or before end
};

// The program of a seed: a few hundred to a few thousand timer clock ticks.
timer_program generate_program(std::uint64_t seed);
// Human-readable listing: configuration, clock and one line per operation.
std::string describe(const timer_program& p);
std::string describe(const program_op& op);
// Applies a program's clock change to a domain.
void apply_clock_change(sim::clock_domain& domain, const program_op& op);

}  // namespace tickbench::differential
