#pragma once
// Runs timer models on register programs, compares their event logs and shrinks disagreements.

#include "tests/differential/timer_program.h"
#include "tests/support/timer_event_log.h"

#include "models/timer/timer_types.h"

#include <cstddef>
#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace tickbench::differential {

// Makes a model under test: same constructor arguments as both timer models.
using model_factory = std::function<std::unique_ptr<models::timer_core_if>(
    const models::timer_config&, const sim::clock_domain&, models::timer_observer*)>;

// What a model did on a program: its canonical event log (reads included), and the message of an
// exception if it threw (the log then ends where it threw).
struct run_result {
    std::vector<test_support::timer_event> events;
    std::string error;
    // The first reported pin edge, flag set, interrupt line change or trigger that does not lie on
    // an edge of the timer clock (empty when every one does): outputs, flags and the interrupt
    // line change only on the timer's clock (docs/timer-model.md, "Time").
    std::string off_clock;
};

run_result run_program(const timer_program& p, const model_factory& make);

// The first place two runs differ, if any.
struct disagreement {
    std::size_t index = 0;  // index of the first differing event
    std::string text;       // the differing events with a little context
};
std::optional<disagreement> compare_runs(const run_result& expected, const run_result& actual);

// Runs both models; the disagreement between them, if any (`expected` is the oracle).
std::optional<disagreement> differ(const timer_program& p, const model_factory& expected,
                                   const model_factory& actual);

// A smaller program on which the models still disagree (delta debugging: drop chunks of operations,
// then single ones, and cut the run short, while the disagreement persists). `budget` bounds the
// number of program runs; a candidate spanning more than four times the ticks of `p` is passed
// over.
timer_program shrink(const timer_program& p, const model_factory& expected,
                     const model_factory& actual, std::size_t budget = 2000);

// Seed, shrunk program and first differing event, for a failure message.
std::string report_disagreement(const timer_program& original, const model_factory& expected,
                                const model_factory& actual);

}  // namespace tickbench::differential
