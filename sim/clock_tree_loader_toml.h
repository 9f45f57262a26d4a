#pragma once
// The TOML-level entry points of the clock tree loader, for scenario loaders that parse a file once
// and hand each section to its reader. Including this pulls in toml++, a large header: prefer
// sim/clock_tree_loader.h where a path or a string will do.

#include "sim/clock_tree.h"
#include "sim/scenario_error.h"

#include <toml++/toml.h>

#include <string>
#include <string_view>

namespace sim {

// Parses a TOML file; syntax errors and an unreadable file become scenario_error.
toml::table read_toml_file(const std::string& path);
// Parses TOML text; `file` is the name used in messages.
toml::table read_toml_text(std::string_view text, const std::string& file);

// Adds the clocks described by root's [clocks] table to `tree`, then checks the tree's rules.
// Throws scenario_error with every finding (located at file:line:column and key path). The tree is
// untouched when the tables themselves are wrong; after a clock rule violation it holds the new
// nodes and should be discarded.
void load_clocks(const toml::table& root, const std::string& file, clock_tree& tree);

}  // namespace sim
