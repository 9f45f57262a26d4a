#pragma once
// The outcome of one finished check, as the report writers (sim/report/) need it.
//
// Values here are for people and CI tools: they are converted from the engine's exact integers
// into the report unit (seconds, hertz, percent, degrees, edges) as doubles. Verdicts were decided
// on the exact integers before this conversion.

#include "sim/checks/check_spec.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <optional>
#include <string>

namespace sim {

struct check_result {
    std::string name;
    check_kind kind = check_kind::period;
    // The kind as reports spell it when it is not one of check_kind: "firmware" for a firmware's
    // own checks (tick_check). Empty: to_string(kind).
    std::string kind_name;
    // The signal ("pwm.channel1"), the pair ("a -> b", "a / b") or the condition text.
    std::string signal;
    // Unit of expected and measured values: "s", "Hz", "%", "deg", "edges", "occurrences".
    std::string unit;

    // A nominal expected value, or bounds, in `unit` (for `never`: expected 0 occurrences).
    std::optional<double> expected;
    std::optional<double> expected_min;
    std::optional<double> expected_max;
    // The expectation in words with exact values ("40 us +/- 100 ppm", "at least 500 ns").
    std::string expected_text;
    // The tolerance ("100 ppm", "2 ticks of kernel", "0.5 %"); empty when exact or bounds.
    std::string tolerance_text;

    // How many values were measured (periods, pulses, gaps, edges, occurrences).
    std::uint64_t count = 0;
    // Smallest, mean and largest measured value in `unit`, when the kind measures values and at
    // least one was measured.
    std::optional<double> min;
    std::optional<double> mean;
    std::optional<double> max;

    bool passed = false;
    // Simulated time of the first failure, or of the end of the run when the check passed.
    time_ps at = 0;
    // Start of the first failing measurement when it spans time (the period, pulse, gap or delay
    // that ended at `at`); empty for a failure at one instant or a passed check.
    std::optional<time_ps> fail_from;
    // One sentence: the first failure and how many failed, or what passed, or why nothing could
    // be measured.
    std::string detail;

    // The kind as reports write it: kind_name, else to_string(kind).
    std::string kind_text() const { return kind_name.empty() ? to_string(kind) : kind_name; }
};

}  // namespace sim
