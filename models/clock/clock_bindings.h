#pragma once
// Binding a clock-control layout to a clock tree: every node its fields name must exist in the
// scenario's tree and be of a kind the field acts on, and a field must be wide enough for the
// values the node takes (docs/clock-control.md, "Layout"). A layout is read on its own, without
// a tree, so these checks run when a scenario puts the two together; each finding points at the
// field's `clock` key in the layout file.

#include "models/layout/register_layout.h"
#include "sim/clock_tree.h"
#include "sim/scenario_error.h"

#include <vector>

namespace models {

// Every mismatch between `layout` (kind "clock_control") and `tree`; empty when they fit.
std::vector<sim::scenario_finding> check_clock_bindings(const register_layout& layout,
                                                        const sim::clock_tree& tree);

}  // namespace models
