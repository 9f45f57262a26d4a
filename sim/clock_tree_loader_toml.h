#pragma once
// The TOML-level entry point of the clock tree loader, for scenario loaders that parse a file once
// (sim::read_toml_file, sim/toml_reader.h) and hand each section to its reader. Includes toml++, a
// large header, for toml::table: prefer sim/clock_tree_loader.h where a path or a string will do.

#include "sim/clock_tree.h"
#include "sim/scenario_error.h"

#include <toml++/toml.h>

#include <string>

namespace sim {

// Adds the clocks described by root's [clocks] table to `tree`, then checks the tree's rules.
// Throws scenario_error with every finding (located at file:line:column and key path). The tree is
// untouched when the tables themselves are wrong; after a clock rule violation it holds the new
// nodes and should be discarded.
void load_clocks(const toml::table& root, const std::string& file, clock_tree& tree);

}  // namespace sim
