#pragma once
// Prescaler and period choices for a target output frequency (`tickbench plan`, docs/cli.md).
//
// A timer clocked at C with prescaler setting p and period setting n produces
//   edge-aligned (counting up, reload after n):        f = C / ((p + 1) (n + 1))
//   center-aligned (counting up to n and back down):   f = C / ((p + 1) 2 n)
// Every candidate is computed in exact integer arithmetic: the achieved frequency as a reduced
// fraction and the error as an exact fraction of the target (shown in ppm). Candidates come best
// first: smallest error, then finest duty resolution (most compare steps per period: n + 1 edge-
// aligned, n center-aligned). Settings with fewer than 2 steps are left out: they give only 0 or
// 100 % duty, no PWM.

#include "sim/frequency.h"
#include "sim/wide_int.h"

#include <cstdint>
#include <string>
#include <vector>

namespace harness::run {

struct plan_request {
    sim::frequency clock;
    sim::frequency target;
    unsigned counter_bits = 16;    // period setting range 0 .. 2^bits - 1 (1 .. for center)
    unsigned prescaler_bits = 16;  // prescaler setting range 0 .. 2^bits - 1
    bool center = false;
    std::size_t max_results = 10;
};

struct plan_choice {
    std::uint64_t prescaler = 0;  // register setting p
    std::uint64_t period = 0;     // register setting n
    sim::frequency achieved;
    std::uint64_t steps = 0;  // compare steps per period
    // |achieved - target| / target = error_num / error_den exactly (reduced); `below` when the
    // achieved frequency is under the target.
    sim::u128 error_num = 0;
    sim::u128 error_den = 1;
    bool below = false;

    // Whether the error exceeds 1 % of the target.
    bool off_by_more_than_a_percent() const { return error_num * 100 > error_den; }
    // The error in ppm, rounded to 3 decimals, with a sign ("+0.000", "-12.345").
    std::string error_ppm_text() const;
    // log2(steps) with 2 decimals, for display.
    std::string resolution_bits_text() const;
};

// The best choices, at most request.max_results. Throws std::invalid_argument for a zero clock or
// target or widths outside 1..32, sim::arithmetic_error when the fractions are too large to
// compare exactly.
std::vector<plan_choice> plan_periods(const plan_request& request);

}  // namespace harness::run
