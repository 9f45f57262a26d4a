#pragma once
// Register layouts: where a peripheral's functional fields sit in its address window
// (docs/architecture.md, "Registers are data").
//
// A layout's `kind` selects the model it describes and so the vocabulary its fields may name: the
// general-purpose timer's (models::timer_field, with channels and value tables) or another kind's
// own (models::tick_field for "tick_timer", models::watchdog_field for "watchdog"), listed by
// kind_field_names().
//
// A timer's behaviour is independent of where its fields sit in memory. A layout file (TOML, format
// in docs/register-layouts.md) names the peripheral kind, the window size, the instance it
// describes (counter width, channels...) and its registers, each with offset, width, reset value
// and fields; a field maps bits of the register to bits of one functional field
// (models::timer_field) with an access kind. A field may instead be coded: its raw value (one or
// more bit ranges) is looked up in a value table of the layout, and each listed raw value sets one
// or more functional fields at once, so a part's own encodings need no driver changes. The loader
// checks every rule and reports each mistake
// as a sim::scenario_error finding at file:line:column with the key path and what would be
// accepted, reading through the TOML reader every loader shares (sim/toml_reader.h). That reader
// and its TOML library stay in the .cpp: this header is cheap to include.

#include "models/clock/clock_control_core.h"
#include "models/slow/slow_counter_core.h"
#include "models/tick/tick_timer_core.h"
#include "models/timer/timer_types.h"
#include "models/watchdog/watchdog_core.h"
#include "sim/scenario_error.h"

#include <cstddef>
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
    write_zero_to_clear,  // reads give the flags, writing 0 to a bit clears that flag (flags only)
};
// Whether the access kind clears flags (and so suits only the flags field).
bool clears_flags(access_kind k);
// The layout-file spelling of an access kind ("read-write"...).
const char* to_string(access_kind k);
// The access kind spelled `text`, or none.
std::optional<access_kind> access_kind_from_string(std::string_view text);
// The functional field named `text` (as models::to_string spells it), or none.
std::optional<timer_field> timer_field_from_string(std::string_view text);

// One functional field a value table's entry sets, and the value it sets (the model's encoding).
struct code_assignment {
    timer_field field = timer_field::enable;
    std::uint32_t value = 0;
};

// One meaning in a value table: the raw values that mean it and the fields it sets.
struct code_entry {
    std::vector<std::uint32_t> raws;    // in file order, at least one
    std::vector<code_assignment> sets;  // in file order; empty: accepted, changes nothing
};

// A value table (`[codes]` of a layout file): what each raw value of a coded field means. A raw
// value it does not list is reserved.
struct code_table {
    std::string name;
    std::vector<code_entry> entries;  // in file order

    // The entry listing `raw`, or null when the raw value is reserved.
    const code_entry* find(std::uint32_t raw) const;
    // Every raw value the table lists, ascending.
    std::vector<std::uint32_t> accepted() const;
    // Whether some entry sets a per-channel field (a coded field using it then names a channel).
    bool sets_channel_field() const;
};

// "0, 2..5, 7": raw values (ascending) as messages and tables show them; runs of three or more
// become a range.
std::string raw_value_list(const std::vector<std::uint32_t>& raws);
// The readable value of `value` for functional field f ("center", "pwm_below", "match_1", "7").
std::string value_name(timer_field f, std::uint32_t value);
// The names a value table may use for f's values (empty for a numeric or 1-bit field).
std::vector<std::string> value_names(const timer_config& instance, timer_field f);

// A stretch of register bits [bit, bit + width).
struct bit_span {
    unsigned bit = 0;
    unsigned width = 1;
};

// One field of a register. A plain field: bits [bit, bit + width) of the register hold bits
// [value_bit, value_bit + width) of a functional field's value (each bit inverted when `invert`). A
// coded field: its raw value is the concatenation of `spans` (the first holds the low bits) and
// means what value table `codes` of the layout says.
struct field_map {
    timer_field field = timer_field::enable;  // plain fields of a "timer" layout only
    std::uint32_t kind_field = 0;  // plain fields of other kinds: the field's number in the kind
    unsigned channel = 0;    // for per-channel fields (coded: for those its table sets); else 0
    unsigned bit = 0;        // lowest register bit
    unsigned width = 1;      // 1..32: plain: bits in the register; coded: bits of the raw value
    unsigned value_bit = 0;  // lowest bit of the functional value held here (plain fields)
    access_kind access = access_kind::read_write;
    bool invert = false;  // plain fields: a raw bit is 1 when its value bit is 0, both ways
    std::optional<std::size_t> codes;  // coded fields: index into register_layout::codes
    std::vector<bit_span> spans;       // coded fields: the raw value's bits, low bits first

    // Whether the field is coded (looked up in a value table).
    bool coded() const { return codes.has_value(); }
    // The field's bits in its register, as a mask.
    std::uint32_t register_mask() const;
    // The field's raw value in the register value `reg` (coded: the spans concatenated).
    std::uint32_t raw_of(std::uint32_t reg) const;
    // The register bits that hold raw value `raw` (the inverse of raw_of).
    std::uint32_t place(std::uint32_t raw) const;
};

// The bits of f as tables and messages show them: "3", "0..15"; a coded field's ranges joined by
// "+", low raw bits first ("3+1..2").
std::string field_bits(const field_map& f);

// A clock-control field that names a node of the clock tree: kept with the place of its `clock`
// key, so that a node the scenario's tree lacks, or of the wrong kind, is reported there
// (check_clock_bindings, models/clock/clock_bindings.h).
struct clock_use {
    clock_field field = clock_field::ready;
    std::uint32_t slot = 0;       // 1-based index into register_layout::clock_slots
    unsigned width = 0;           // bits the field has in its register
    std::string register_name;    // for messages
    sim::scenario_finding where;  // file, line, column and key path; message empty
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
    std::string kind;        // peripheral kind: one of peripheral_kinds()
    std::string file;        // where it was loaded from, for messages
    std::uint32_t size = 0;  // the address window in bytes
    timer_config instance;   // kind "timer": what the timer instance has
    tick_config tick;        // kind "tick_timer": what the tick timer instance has
    watchdog_config watchdog;  // kind "watchdog": what the watchdog instance has
    slow_config slow;          // kind "slow_counter": what the slow-clock counter instance has
    // Kind "clock_control": the nodes its fields name, one slot per node, and every use.
    std::vector<clock_slot> clock_slots;
    std::vector<clock_use> clock_uses;
    std::vector<register_map> registers;
    std::vector<code_table> codes;  // value tables, in file order

    // The value table of coded field `f` (null for a plain field).
    const code_table* codes_of(const field_map& f) const;
    // The register covering byte `offset`, or null (a reserved location).
    const register_map* find(std::uint32_t offset) const;
    // The register named `name`, or null.
    const register_map* find(std::string_view name) const;
    // The register nearest to byte `offset` (ties go to the lower register).
    nearest_register nearest(std::uint64_t offset) const;
    // Functional fields the timer instance has that no register maps (with their channel), for
    // checking that a "timer" layout is complete (empty for other kinds). A field counts as mapped
    // if any of its bits is, or if a coded field sets it.
    std::vector<std::pair<timer_field, unsigned>> unmapped_fields() const;
    // The same for any kind, as names ("compare[1]" for a timer's channel field).
    std::vector<std::string> unmapped_field_names() const;
    // The name of the functional field plain field f maps, in this layout's kind.
    std::string field_name(const field_map& f) const;
    // The clock node a clock-control field acts on ("" for none or another kind).
    std::string clock_node(const field_map& f) const;
    // Whether plain field f maps the kind's flags field.
    bool maps_flags(const field_map& f) const;
};

// The peripheral kinds a layout may name: "timer", "tick_timer", "watchdog", "slow_counter",
// "clock_control".
const std::vector<std::string>& peripheral_kinds();
// The functional field names of kind `kind`, in field-number order (empty for an unknown kind).
std::vector<std::string> kind_field_names(std::string_view kind);

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
