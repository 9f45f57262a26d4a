#pragma once
// Scenario keys replaced by dotted path before the scenario is read (`tickbench sweep --vary
// clocks.xtal.frequency=...`, docs/cli.md): the value goes into the parsed TOML as if the file had
// it, so every rule and message of the loader applies to it. Only the loader and its tests include
// this header (it brings toml++).

#include <toml++/toml.h>

#include <string>
#include <utility>
#include <vector>

namespace harness::run {

// Sets each (path, value) in `root`. Every table on the path must exist in the file (the last key
// may be new: the loader then judges it like any key). The value keeps the type of the value it
// replaces when that is a string; otherwise it is read as a TOML value ("8", "true", "1.5") and
// taken as a string when it is not one ("7.9 MHz"). Throws sim::scenario_error naming the path and
// the keys that exist where it went wrong; `file` names the scenario in messages.
void apply_key_overrides(toml::table& root,
                         const std::vector<std::pair<std::string, std::string>>& keys,
                         const std::string& file);

}  // namespace harness::run
