#pragma once
// The human summary: summary.txt, also printed by the command (docs/architecture.md,
// "Outputs").
//
// An aligned table, one row per check: verdict, name, kind, signal and the measured mean (or
// count) with the number of values measured; under each failed row an indented line with the
// failure sentence; then one totals line ("9 checks: 8 passed, 1 failed"); then any notes the
// caller adds (other outputs worth a look, such as the firmware's log).

#include "sim/checks/check_result.h"

#include <string>
#include <vector>

namespace sim {

// The summary text (ends with '\n'), with `notes` as lines after the totals.
std::string summary_text(const std::vector<check_result>& results,
                         const std::vector<std::string>& notes = {});
// Writes summary_text() to `path`; throws output_error naming the file and the reason.
void write_summary(const std::string& path, const std::vector<check_result>& results,
                   const std::vector<std::string>& notes = {});
// "25 kHz", "40 us", "25 %", "120 deg", "7 edges": a report-unit value for people.
std::string measured_text(double value, const std::string& unit);

}  // namespace sim
