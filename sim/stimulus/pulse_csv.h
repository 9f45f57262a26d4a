#pragma once
// Reading a pulse list from a CSV file (docs/scenario.md, "Pulse files"): a header naming the time
// unit, `time_us` or `time_us,level` (units ps, ns, us, ms, s), then one edge per line. Times are
// decimal numbers read exactly (never through floating point) and must be whole picoseconds;
// levels are 0, 1, low or high. Blank lines and lines starting with # are skipped. Without a level
// column every line toggles the level.

#include "sim/stimulus/pulse_list.h"

#include <string>
#include <vector>

namespace sim::stimulus {

// The points of the CSV file at `path`; `shown` is the name messages give the file. Throws
// sim::scenario_error with a finding at file:line:column for each malformed line (saying what was
// wrong and what is accepted), or for an unreadable file.
std::vector<pulse_point> read_pulse_csv(const std::string& path, const std::string& shown);

// The same, from text already in memory.
std::vector<pulse_point> parse_pulse_csv(const std::string& text, const std::string& shown);

}  // namespace sim::stimulus
