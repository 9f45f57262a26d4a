#pragma once
// Building a clock tree from the [clocks] tables of a scenario file (format in docs/scenario.md,
// "Clock tree"). Every mistake in the file, and every clock rule the described tree breaks (a VCO
// out of range, a loop, an unknown input), is reported as a scenario_error pointing at the file,
// line, column and key. This header keeps the TOML library out of its users' compiles; code that
// already holds a parsed TOML document uses sim/clock_tree_loader_toml.h instead.

#include "sim/clock_tree.h"
#include "sim/scenario_error.h"

#include <string>
#include <string_view>

namespace sim {

// Reads the TOML file at `path` and adds the clocks of its [clocks] table to `tree` (other
// top-level tables are left to other loaders). Throws scenario_error for an unreadable file, TOML
// syntax, schema mistakes and clock rule violations. The tree is untouched when the tables
// themselves are wrong; after a clock rule violation it holds the new nodes and should be
// discarded.
void load_clock_tree_file(const std::string& path, clock_tree& tree);

// The same from TOML text already in memory; `file` is the name used in messages.
void load_clock_tree_text(std::string_view toml_text, const std::string& file, clock_tree& tree);

}  // namespace sim
