#pragma once
// The clock-control block: registers through which firmware reprograms the modelled clock tree at
// run time, switching multiplexers, programming and enabling PLLs, changing dividers and opening
// gates (docs/clock-control.md).
//
// The block holds almost no state of its own: every request becomes a run-time change of the
// sim::clock_tree at the instant of the bus write, so every consumer of the tree (timers, the cpu,
// the tick timer, the watchdog, the waveform) follows it at the edge it takes effect. A request
// the clock rules forbid is refused as hardware refuses it: a bit of the `refused` flags is set
// and the old setting stays. The rules are the tree's own (the checks `tickbench check` runs), not
// a copy. Plain C++, no SystemC.

#include "models/event_source.h"
#include "models/layout/field_port.h"
#include "sim/clock_tree.h"

#include <cstdint>
#include <string>
#include <vector>

namespace models {

using sim::time_ps;

// Functional fields of a clock-control block (layout names in to_string()). All but `refused`
// name a node of the clock tree.
enum class clock_field : std::uint32_t {
    source,              // mux: switch to this input (its index in the mux's inputs)
    source_now,          // mux, read-only: the input followed now (the old one until the switch)
    divide,              // divider: divide factor, 1 or more
    pll_enable,          // pll: 1 starts it (ready one lock time later), 0 stops it
    pll_multiplier,      // pll: multiplier, 1 or more; written while the PLL is stopped
    pll_input_divider,   // pll: input divider, 1 or more; written while the PLL is stopped
    pll_output_divider,  // pll: output divider, 1 or more; written while the PLL is stopped
    ready,               // any node, read-only: 1 while its output runs
    open,                // gate: 1 opens it (its output starts after the field's start-up time)
    refused,             // flags: why requests were refused (the refused_* bits)
};
inline constexpr std::uint32_t clock_field_count = 10;
// Readable name of a field ("pll_enable"...), for layouts and messages.
const char* to_string(clock_field f);
// The node kinds field f may name; empty for `refused`, which names none.
std::vector<sim::clock_kind> node_kinds_of(clock_field f);
// Bits of field f's value.
unsigned value_width(clock_field f);

// Bits of the `refused` flags: set when a request is refused, cleared by the firmware.
inline constexpr std::uint32_t refused_not_ready = 1u << 0;      // select a stopped input
inline constexpr std::uint32_t refused_out_of_range = 1u << 1;   // a value the rules forbid
inline constexpr std::uint32_t refused_in_use = 1u << 2;         // stop what a mux selects
inline constexpr std::uint32_t refused_while_running = 1u << 3;  // PLL factors while it runs
inline constexpr unsigned refused_bits = 4;

// A layout numbers a clock-control field by its functional field and the slot of the node it
// names (slot 0: no node), so two multiplexers' `source` fields are told apart.
constexpr std::uint32_t clock_field_number(clock_field f, std::uint32_t slot) {
    return slot << 8 | static_cast<std::uint32_t>(f);
}
constexpr clock_field clock_field_of(std::uint32_t number) {
    return static_cast<clock_field>(number & 0xffu);
}
constexpr std::uint32_t clock_slot_of(std::uint32_t number) { return number >> 8; }

// The node of one slot.
struct clock_slot {
    std::string node;
    time_ps start_up = 0;  // gates: from an `open` request to the first edge passed
};

class clock_control_core final : public field_port, public event_source {
public:
    // A block over `tree` (started, outliving the block); slots[i] is slot i + 1.
    clock_control_core(sim::clock_tree& tree, std::vector<clock_slot> slots);

    // Requests act at the instant of the write; nothing happens between writes.
    void advance_to(time_ps) override {}
    bool next_event(time_ps&) const override { return false; }

    std::uint32_t read_field(std::uint32_t field, time_ps t) override;
    void write_field(std::uint32_t field, std::uint32_t value, time_ps t) override;
    void clear_flag_bits(std::uint32_t mask, time_ps) override { refused_ &= ~mask; }

    // The refused_* bits set and not cleared yet.
    std::uint32_t refused() const { return refused_; }
    // Why the latest request was refused, in words ("" if none was).
    const std::string& last_refusal() const { return last_refusal_; }

private:
    struct slot_state {
        clock_slot slot;
        sim::clock_kind kind = sim::clock_kind::external;
        sim::pll_params pll;       // pll: the factors and enable as written
        std::uint32_t divide = 1;  // divider: the factor as written
        bool open = true;          // gate: as written
        std::size_t source = 0;    // mux: the input requested last
        std::size_t previous = 0;  // mux: the input before the last switch
        time_ps switch_at = 0;     // mux: when the last switch takes effect
    };
    // Sets refusal bit `bit` and keeps `why` for last_refusal().
    void refuse(std::uint32_t bit, const std::string& why);
    // Whether some multiplexer selects `node`, or a node made from it, at t or will once its
    // pending switch is done.
    bool in_use(const std::string& node, time_ps t) const;
    // The slot a field number names, or null (the block's own `refused`, or no such slot).
    slot_state* slot_of(std::uint32_t field);

    sim::clock_tree& tree_;
    std::vector<slot_state> slots_;
    std::uint32_t refused_ = 0;
    std::string last_refusal_;
};

}  // namespace models
