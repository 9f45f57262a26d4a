#pragma once
// Random register programs for the differential test of the timer models.
//
// A program is a timer configuration, a timer clock and a timed list of operations (register
// writes and reads, flag clears, fault-input changes, timer clock changes), all at absolute
// picosecond times. The generator is seeded and deterministic. It places many operations within
// +/-2 timer clock ticks of counter wraps and reload events; it finds those instants by running the
// tick-exact reference on the program built so far and probing a copy of it forwards. Half the
// programs change the timer clock (stops and restarts too), one in eight runs long (many wraps, a
// wide counter near its wrap, a large prescaler), and every program writes some values the
// specification calls out of range. Most programs use the input side: input edges (glitches around
// the filter's length among them), chained pulses, quadrature sequences that reverse, captures,
// counting sources and trigger actions. timer_program_test measures these shares.

#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <string>
#include <vector>

namespace tickbench::differential {

enum class op_kind : std::uint32_t {
    write,
    read,
    clear_flags,
    fault_input,
    clock_change,
    input_edge,     // input `channel` (an input index) goes to level `value`
    initial_input,  // input `channel` starts at level `value` (only before every other op)
    chained_pulse,  // a trigger pulse from another timer reaches the chained input
};

// One timed operation. For clock_change, value is the new timer clock frequency in Hz (0: stop).
// For input_edge and initial_input, channel is the input (models::input_of_channel(c) or
// models::trigger_pin_input) and value its level.
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

// The program of a seed: a few hundred to a few thousand timer clock ticks, or for a long program
// up to forty thousand.
timer_program generate_program(std::uint64_t seed);
// Human-readable listing: configuration, clock and one line per operation.
std::string describe(const timer_program& p);
std::string describe(const program_op& op);
// Applies a program's clock change to a domain.
void apply_clock_change(sim::clock_domain& domain, const program_op& op);
// The timer clock ticks at or before the program's end, with its clock changes.
std::uint64_t run_ticks(const timer_program& p);
// Applies one operation to a model driven by `domain`; the value read for a read, else 0.
std::uint32_t apply_op(models::timer_core_if& model, sim::clock_domain& domain,
                       const program_op& op);

// Where a write stands against docs/timer-model.md, "Out-of-range writes".
enum class write_range {
    in_range,
    reserved_value,   // a value an enumerated field reserves
    missing_channel,  // a per-channel field of a channel the instance lacks
    too_wide,         // wider than the field's width or above its maximum
    not_data,         // to the read-only direction or to the flags
};
// The class of a write (reads and other operations are in_range).
write_range classify_write(const models::timer_config& cfg, const program_op& op);

}  // namespace tickbench::differential
