#pragma once
// A sweep's results and its three reports (docs/cli.md, "sweep"): sweep.jsonl (a header line,
// then one line per point in point order), junit.xml (one test case per point, named by its axis
// values) and summary.txt (per group of the outer axes, the failing values of the last axis
// compressed into ranges). `tickbench sweep` and `tickbench merge` both write them through
// write_sweep_reports(), so a merge of shards is byte for byte the unsharded sweep's reports.

#include "harness/run/sweep_plan.h"

#include <cstdint>
#include <string>
#include <vector>

namespace harness::run {

// What one point's run ended as.
struct point_record {
    std::uint64_t index = 0;
    // "pass", "fail" (a check or the firmware failed) or "error" (bad input, or the run's process
    // ended without a result).
    std::string verdict = "pass";
    // The exit code `tickbench run` gives the same point: 0, 1, 2, 3 or 4 (docs/cli.md).
    int exit_code = 0;
    // "passed", "checks-failed", the firmware's failure ("crashed", "aborted",
    // "firmware-check-failed", "hung", "failed"), "bad-input" or "internal-error".
    std::string outcome = "passed";
    // The failure report's or the error's first line; empty for passed and checks-failed.
    std::string message;
    // Each failed check as its checks.jsonl object (one line, no newline).
    std::vector<std::string> failed_checks;
};

// Identifies a sweep: what a shard's header holds so that merge can refuse a stranger.
struct sweep_header {
    std::string scenario;                                   // the path as given
    std::string scenario_digest;                            // of the file's bytes, 16 hex digits
    std::vector<std::pair<std::string, std::string>> axes;  // name and VALUES as given
    std::uint64_t points = 0;
    shard part;
    bool partial = false;  // stopped before every point of `part` ran
};

// The record as its sweep.jsonl line (no newline); `plan` gives the axis values.
std::string record_line(const sweep_plan& plan, const point_record& r);
// Reads a line written by record_line(). Throws sweep_error naming `where` (file:line).
point_record parse_record_line(const std::string& line, const std::string& where);

std::string header_line(const sweep_header& h);
sweep_header parse_header_line(const std::string& line, const std::string& where);

// The digest of the file at `path` (FNV-1a, 64 bits), as 16 hex digits; throws sweep_error when
// it cannot be read.
std::string file_digest(const std::string& path);

// The reports' texts. `records` are sorted by index.
std::string sweep_jsonl_text(const sweep_header& h, const sweep_plan& plan,
                             const std::vector<point_record>& records);
std::string sweep_junit_text(const sweep_header& h, const sweep_plan& plan,
                             const std::vector<point_record>& records);
std::string sweep_summary_text(const sweep_header& h, const sweep_plan& plan,
                               const std::vector<point_record>& records);

// "3-5, 9-11, 15": sorted value positions of one axis as ranges of consecutive positions, each
// shown by its values ("A-B" for whole numbers, "A to B" otherwise).
std::string compress_ranges(const std::vector<std::string>& values,
                            const std::vector<std::size_t>& positions);

// The verdict of a whole sweep.
struct sweep_totals {
    std::uint64_t run = 0;
    std::uint64_t failed_checks = 0;    // points whose checks failed, firmware fine
    std::uint64_t failed_firmware = 0;  // points whose firmware failed (any exit code but 1)
    std::uint64_t errors = 0;           // bad input at a point
    std::uint64_t internal = 0;         // a point's process ended without a result
    bool partial = false;
};
sweep_totals totals_of(const std::vector<point_record>& records, bool partial);

// Writes sweep.jsonl, junit.xml and summary.txt into `dir` (created if missing) and returns the
// summary's text. Throws sim::output_error.
std::string write_sweep_reports(const std::string& dir, const sweep_header& h,
                                const sweep_plan& plan, const std::vector<point_record>& records);

// `tickbench merge`: reads the sweep.jsonl of each folder in `dirs` (shards of one sweep), checks
// that they are shards of the same sweep, each given once, and writes the reports of the whole
// sweep into `out_dir`. Returns the summary text and the totals. Throws sweep_error.
sweep_totals merge_sweeps(const std::vector<std::string>& dirs, const std::string& out_dir,
                          std::string& summary);

}  // namespace harness::run
