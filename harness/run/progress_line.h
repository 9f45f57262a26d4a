#pragma once
// The progress line of `tickbench run` on a terminal: simulated time, real-time factor and the
// wall time left, redrawn in place on stderr at most four times a second and erased at the end.
// The command shows it only when stderr is a terminal, so nothing of it reaches CI logs.

#include "sim/clock_domain.h"

#include <chrono>

namespace harness::run {

class progress_line {
public:
    // A line for a run of `duration`; start() must be called before the kernel runs.
    explicit progress_line(sim::time_ps duration) : duration_(duration) {}
    ~progress_line() { erase(); }
    progress_line(const progress_line&) = delete;
    progress_line& operator=(const progress_line&) = delete;

    // Spawns a kernel thread that wakes every 1/1000 of the run and redraws when due.
    void start();
    // Clears the line (idempotent).
    void erase();

private:
    void draw(sim::time_ps now);

    sim::time_ps duration_;
    std::chrono::steady_clock::time_point begun_;
    std::chrono::steady_clock::time_point last_draw_;
    bool shown_ = false;
};

}  // namespace harness::run
