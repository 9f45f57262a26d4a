#pragma once
// The assertion log: checks.jsonl, one JSON object per line per check (docs/architecture.md,
// "Outputs").
//
// Each line holds exactly these keys, in this order:
//   check     string   the check's name
//   signal    string   the signal, the pair ("a -> b", "a / b") or the never-condition
//   kind      string   "frequency", "period", "duty_cycle", "pulse_width", "edge_count", "phase",
//                      "dead_time", "latency" or "never"
//   expected  number   the nominal value in `unit`, or an object with "min" and/or "max" for
//                      bounds (for never: 0)
//   tolerance string   "100 ppm", "0.5 %", "2 ticks of kernel"...; null when exact or bounds
//   measured  object   "count" (values measured: periods, pulses, gaps, edges, occurrences) and,
//                      for kinds that measure values and measured any, "min", "mean", "max"
//   unit      string   "s", "Hz", "%", "deg", "edges" or "occurrences"
//   verdict   string   "pass" or "fail"
//   at_s      number   simulated seconds of the first failure, or of the end of the run
//   detail    string   one sentence saying what failed or what passed

#include "sim/checks/check_result.h"

#include <string>
#include <vector>

namespace sim {

// The file's text: one line per result, each ending in '\n'.
std::string checks_jsonl_text(const std::vector<check_result>& results);
// Writes checks_jsonl_text() to `path`; throws output_error naming the file and the reason.
void write_checks_jsonl(const std::string& path, const std::vector<check_result>& results);

}  // namespace sim
