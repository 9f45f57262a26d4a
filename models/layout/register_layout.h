#pragma once
// Register layouts: where a timer's functional fields sit in its address window
// (docs/architecture.md, "Registers are data").
//
// A timer's behaviour is independent of where its fields sit in memory. A layout file (TOML, format
// in docs/register-layouts.md) names the peripheral kind, the window size, the instance it
// describes (counter width, channels...) and its registers, each with offset, width, reset value
// and fields; a field maps bits of the register to bits of one functional field
// (models::timer_field) with an access kind. The loader checks every rule and reports each mistake
// as a sim::scenario_error finding at file:line:column with the key path and what would be
// accepted, reading through the TOML reader every loader shares (sim/toml_reader.h). That reader
// and its TOML library stay in the .cpp: this header is cheap to include.

#include "models/timer/timer_types.h"
#include "sim/scenario_error.h"

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace models {

// How the bus sees one field.
enum class access_kind : std::uint32_t {
    read_write,          // reads give the value, writes set it
    read_only,           // reads give the value, writes are ignored
    write_one_to_clear,  // reads give the flags, writing 1 to a bit clears that flag (flags only)
    clear_on_read,  // reads give the flags and clear the bits read; writes ignored (flags only)
    write_only,     // writes set the value, reads give 0
};
// The layout-file spelling of an access kind ("read-write"...).
const char* to_string(access_kind k);
// The access kind spelled `text`, or none.
std::optional<access_kind> access_kind_from_string(std::string_view text);
// The functional field named `text` (as models::to_string spells it), or none.
std::optional<timer_field> timer_field_from_string(std::string_view text);

// One field of a register: bits [bit, bit + width) of the register hold bits
// [value_bit, value_bit + width) of a functional field's value.
struct field_map {
    timer_field field = timer_field::enable;
    unsigned channel = 0;    // for per-channel fields; 0 otherwise
    unsigned bit = 0;        // lowest register bit
    unsigned width = 1;      // 1..32
    unsigned value_bit = 0;  // lowest bit of the functional value held here
    access_kind access = access_kind::read_write;

    // The field's bits in its register, as a mask.
    std::uint32_t register_mask() const;
};

// One register: a named, naturally aligned 8/16/32-bit location of the window.
struct register_map {
    std::string name;
    std::uint32_t offset = 0;
    unsigned width = 32;            // bits: 8, 16 or 32
    std::uint32_t reset = 0;        // what the register reads right after reset
    std::vector<field_map> fields;  // in bit order, not overlapping

    // Width in bytes.
    unsigned bytes() const { return width / 8; }
    // Bits no field covers (they read 0 and ignore writes).
    std::uint32_t reserved_mask() const;
};

// Where an address lies relative to the register nearest to it.
struct nearest_register {
    const register_map* reg = nullptr;  // null when the layout has no register
    std::uint64_t distance = 0;         // bytes between the address and the register (0: inside)
    bool below = false;                 // the address lies below the register's first byte
};

// A whole layout, registers in offset order.
struct register_layout {
    std::string name;        // the layout's own name (the file's `name`, else the file name's stem)
    std::string kind;        // peripheral kind: "timer"
    std::string file;        // where it was loaded from, for messages
    std::uint32_t size = 0;  // the address window in bytes
    timer_config instance;   // what the timer instance has
    std::vector<register_map> registers;

    // The register covering byte `offset`, or null (a reserved location).
    const register_map* find(std::uint32_t offset) const;
    // The register named `name`, or null.
    const register_map* find(std::string_view name) const;
    // The register nearest to byte `offset` (ties go to the lower register).
    nearest_register nearest(std::uint64_t offset) const;
    // Functional fields the instance has that no register maps (with their channel), for checking
    // that a layout is complete. A field counts as mapped if any of its bits is.
    std::vector<std::pair<timer_field, unsigned>> unmapped_fields() const;
};

// Reads and checks the layout file at `path`. Throws sim::scenario_error listing every mistake.
register_layout load_register_layout_file(const std::string& path);
// The same from text in memory; `file` is the name used in messages.
register_layout load_register_layout_text(std::string_view toml_text, const std::string& file);

// Whether the instance has the functional field at all (dead time and the fault need complementary
// outputs, wrap_skip needs a wrap skip count, per-channel fields need the channel).
bool instance_has(const timer_config& instance, timer_field f, unsigned channel);
// Bits of the functional field's value in this instance (the counter width for counter values...).
unsigned value_width(const timer_config& instance, timer_field f);

}  // namespace models
