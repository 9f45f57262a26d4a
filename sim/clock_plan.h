#pragma once
// The clock plan report: every node of a clock tree with its exact frequency (as a fraction and in
// decimal hertz), its settings and what it feeds, as an aligned text table or as JSON. It is what
// `tickbench clocks` prints and what `tickbench check` shows before a run.

#include "sim/clock_tree.h"

#include <string>
#include <vector>

namespace sim {

// The plan as a text table, one line per node, sources first.
std::string clock_plan_text(const std::vector<clock_plan_row>& rows);
// The plan as a JSON document: {"clocks": [{"name", "kind", "settings", "hz_exact": "num/den",
// "hz": "decimal", "running", "inputs": [...], "feeds": [...]}, ...]}.
std::string clock_plan_json(const std::vector<clock_plan_row>& rows);

}  // namespace sim
