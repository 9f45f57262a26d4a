#pragma once
// The bus side of one peripheral instance without any SystemC: 8/16/32-bit reads and writes at an
// offset and a time, turned into functional field reads and writes through a layout, on a
// timer_core_if for a "timer" layout and on a field_port for the other kinds.
//
// Kept apart from the TLM target so the firmware runner's fast path and unit tests can use it with
// no kernel (STYLE: behaviour apart from the kernel shell). Registers are little-endian: byte k of
// a register (k = 0 its least significant byte) sits at offset + k. Rules
// (docs/register-layouts.md, "Bus semantics"):
// - a write touches only the fields whose bits the access covers, in register order then bit order;
//   other fields of the register are not rewritten. A field the access covers only in part is
//   merged: the register file reads the field's current value from the model, replaces the covered
//   bits and writes the result. A field holding only some bits of a functional value (value_bit, or
//   a value split over several fields) is merged the same way with the model's value.
// - read-only and clear-on-read fields ignore writes; write-one-to-clear fields turn the 1 bits
//   written into clear_flags(mask), write-zero-to-clear fields the 0 bits written; write-only
//   fields read 0; clear-on-read fields clear, after the whole access is read, exactly the set flag
//   bits the access returned. An inverted field's raw bits are the inverse of its value bits.
// - a coded field looks the raw value written up in its value table and writes every functional
//   field the entry sets; a reserved raw value (not in the table) changes nothing and is logged as
//   a warning on "bus". It reads the raw value last accepted while that entry still matches the
//   model's fields, else the first raw value of the first entry that matches them (a field set
//   through another register, enable cleared by one-pulse), else the raw value last accepted.
// - reserved bits (no field) read 0 and ignore writes. An access that touches no register at all is
//   a reserved location: it reads 0, writes nothing, and the unmapped policy decides what is said.
// - accesses are applied at max(t, the latest time seen), since the model needs non-decreasing
// time.

#include "models/layout/field_port.h"
#include "models/layout/register_layout.h"
#include "models/layout/unmapped_access.h"
#include "models/timer/timer_types.h"

#include <cstdint>
#include <string>
#include <vector>

namespace models {

// How one access went.
struct access_outcome {
    bool reserved = false;  // the access touched no register (a reserved location)
    bool failed = false;    // the policy is `error`: the bus must report an address error
    std::string message;    // the reserved-location message, empty otherwise
};

class register_file {
public:
    // Serves `layout` (copied) for `core`, an instance configured as `config`. `peripheral` names
    // the instance in messages, `base` is the bus address of offset 0 (messages only). Throws
    // std::invalid_argument if the layout maps a field or channel the configured instance lacks.
    register_file(const register_layout& layout, timer_core_if& core, const timer_config& config,
                  std::string peripheral = "timer", unmapped_policy policy = unmapped_policy::warn,
                  std::uint64_t base = 0);
    // Serves `layout` (copied), of a kind other than "timer", for the model behind `port`. Throws
    // std::invalid_argument for a "timer" layout.
    register_file(const register_layout& layout, field_port& port, std::string peripheral,
                  unmapped_policy policy = unmapped_policy::warn, std::uint64_t base = 0);

    // Reads `length` bytes (1..4) at `offset` at time t; `value` gets them, little-endian.
    access_outcome read(std::uint32_t offset, unsigned length, std::uint32_t& value,
                        sim::time_ps t);
    // Writes the low `length` bytes (1..4) of `value` at `offset` at time t, little-endian.
    access_outcome write(std::uint32_t offset, unsigned length, std::uint32_t value,
                         sim::time_ps t);
    // Writes every register's reset value into its read-write fields at time t, so the model starts
    // where the layout says firmware finds it (write-only and flag fields are left alone).
    void apply_reset(sim::time_ps t);

    // The layout served (the register file's own copy).
    const register_layout& layout() const { return layout_; }
    // The instance name used in messages.
    const std::string& peripheral() const { return peripheral_; }
    // The policy for reserved locations.
    unmapped_policy policy() const { return policy_; }
    // Changes the policy for reserved locations.
    void set_policy(unmapped_policy p) { policy_ = p; }
    // Sets the bus address of offset 0 (used in messages).
    void set_base(std::uint64_t base) { base_ = base; }
    // The bus address of offset 0.
    std::uint64_t base() const { return base_; }

private:
    struct field_entry {
        field_map map;
        bool merge_value = false;  // other fields hold other bits of the same functional value
        const code_table* table = nullptr;  // coded fields: the value table
        std::uint32_t raw = 0;              // coded fields: the raw value last accepted
    };
    struct register_entry {
        const register_map* reg = nullptr;
        std::vector<field_entry> fields;
    };

    sim::time_ps clamp(sim::time_ps t);
    // Writes the covered bits of `value` (register-aligned) into reg's fields.
    void write_fields(register_entry& r, std::uint32_t value, std::uint32_t covered, sim::time_ps t,
                      bool reset_only);
    // Writes the covered bits of a coded field: looks the raw value up and applies its entry.
    void write_coded(const register_entry& r, field_entry& fe, std::uint32_t value,
                     std::uint32_t covered, sim::time_ps t);
    // The raw value a coded field reads (see the rules above).
    std::uint32_t coded_raw(const field_entry& fe, sim::time_ps t);
    // Whether every field the entry sets holds the entry's value in the model.
    bool matches(const field_entry& fe, const code_entry& e, sim::time_ps t);
    // The model's value of plain field f, written value, flag clear: to whichever model is served.
    std::uint32_t read_model(const field_map& f, sim::time_ps t);
    void write_model(const field_map& f, std::uint32_t value, sim::time_ps t);
    void clear_model(std::uint32_t mask, sim::time_ps t);
    // Builds registers_ from layout_.
    void index_registers();
    access_outcome reserved(bool is_write, std::uint32_t offset, unsigned length,
                            sim::time_ps t) const;

    register_layout layout_;
    timer_core_if* core_ = nullptr;  // a "timer" layout's model
    field_port* port_ = nullptr;     // any other kind's model
    timer_config config_;
    std::string peripheral_;
    unmapped_policy policy_;
    std::uint64_t base_;
    // Calls visit(entry, covered bytes mask) for each register the access [offset, offset + length)
    // overlaps, in offset order; false when it overlaps none (a reserved location).
    template <typename Visit>
    bool for_each_overlap(std::uint32_t offset, unsigned length, Visit visit);
    std::vector<register_entry> registers_;  // offset order, parallel to layout_.registers
    sim::time_ps last_ = 0;
};

}  // namespace models
