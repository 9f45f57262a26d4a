#pragma once
// The failure report's content (report.html): the checks with their verdicts, the clock plan, and
// for each check the stretch of waveform to draw with its marks. It is plain data, built at the
// end of a run from the check results and the wave_recorder's traces, written to report.json
// (docs/cli.md, "report.json") and read back by `tickbench report`, so that both render the
// same page from the same model. Every text a page shows is decided here, as a string, and every
// time is an integer of picoseconds, so a model read back from its JSON is equal to the one
// written.

#include "sim/checks/check_result.h"
#include "sim/checks/check_spec.h"
#include "sim/clock_tree.h"
#include "sim/report/wave_recorder.h"

#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace sim {

// One node of the clock plan, as `tickbench clocks` shows it.
struct report_clock {
    std::string name;
    std::string kind;
    std::string hz;        // decimal hertz, or "stopped"
    std::string hz_exact;  // "num/den" or a whole number
    std::string settings;
    std::string feeds;  // comma-separated, "-" for none
    bool operator==(const report_clock& o) const;
};

// A labelled instant drawn on a check's picture (an expected edge, a bound).
struct report_mark {
    time_ps at = 0;
    std::string label;
    bool operator==(const report_mark& o) const;
};

struct report_check {
    std::string name;
    std::string kind;
    std::string signal;    // the signal, pair or condition as the other reports write it
    std::string expected;  // the expectation in words
    std::string tolerance;
    std::string measured;  // "mean 40 us over 74", "3 edges"
    bool passed = false;
    time_ps at = 0;  // the first failure, or the end of the run
    // The first failing measurement spans [from, at] when it is a period, pulse, gap or delay.
    std::optional<time_ps> from;
    std::string detail;
    std::string span_label;          // words on the span's arrow ("measured 41.2 us")
    std::vector<report_mark> marks;  // expected values placed on the time axis
    std::vector<wave_trace> traces;  // what to draw, slot by slot; empty for firmware checks
    bool operator==(const report_check& o) const;
};

struct report_model {
    std::string scenario;  // the scenario's name
    time_ps end = 0;       // the end of the run
    std::vector<report_clock> clocks;
    std::vector<report_check> checks;
    bool operator==(const report_model& o) const;
};

bool operator==(const wave_trace& a, const wave_trace& b);

// The clock plan rows as the report shows them.
std::vector<report_clock> report_clocks(const std::vector<clock_plan_row>& rows);

// The report entry of one check: `result` with `traces`, and the marks that `spec` allows (the
// expected or bounding instants of a failed period, pulse, gap, delay or duty cycle, measured from
// the start of the failing measurement). `spec` is null for firmware checks.
report_check make_report_check(const check_spec* spec, const check_result& result,
                               std::vector<wave_trace> traces);

// report.json's text for `model` (one JSON document, fixed key order, ending with a newline).
std::string report_json_text(const report_model& model);

// Writes report_json_text() to `path`; throws output_error naming the file and the reason.
void write_report_json(const std::string& path, const report_model& model);

// Thrown for a report.json that cannot be read: the message names the file, the line and column
// where known, and what was expected.
class report_format_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

// Reads report.json's `text` (from `origin`, for messages); throws report_format_error.
report_model parse_report_json(const std::string& text, const std::string& origin);

}  // namespace sim
