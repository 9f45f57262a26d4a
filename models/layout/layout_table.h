#pragma once
// A register layout as a table a person reads: one row per register, with its offset, width, reset
// value and fields, then (for a layout with value tables) one row per value table entry.
// docs/register-layouts.md shows the shipped layouts in exactly this form, and a test compares the
// two, so the documentation of a layout is the layout. `tickbench layout` prints it, or the JSON
// form for tools.

#include "models/layout/register_layout.h"

#include <string>

namespace models {

// One register's fields as text, in bit order: "0 enable, 1..2 mode, 7 direction (read-only)";
// per-channel fields carry their channel ("compare[1]"), fields that hold higher bits of their
// value say which ("8..9 flags value bits 8..9"), inverted fields say so ("0 enable (inverted)"),
// and coded fields name their value table ("3+1..2 counting (coded)").
std::string describe_fields(const register_map& reg, const register_layout& layout);

// The whole layout as a Markdown table: a header row, a separator row and one row per register
// ("| 0x10 | `run` | 16 | 0x0010 | 0 enable, ... |"), each line ending in a newline. A layout with
// value tables gets a blank line and a second table, one row per entry:
// "| `counting` | 2, 3 | mode = center, slope = down |".
std::string layout_table_markdown(const register_layout& layout);

// The whole layout as one JSON document (name, kind, size, instance, registers with their fields,
// value tables), for tools.
std::string layout_json(const register_layout& layout);

}  // namespace models
