#pragma once
// The progress line of `tickbench run` on a terminal: simulated time, real-time factor and the
// wall time left, redrawn in place on stderr four times a second and erased at the end. The
// command shows it only when stderr is a terminal, so nothing of it reaches CI logs.
//
// The simulated time shown is the latest instant the models have reported (the timers compute
// their outputs ahead of the kernel, so the kernel's own time says little about the work done). A
// thread of its own reads it: the simulation is never interrupted for the display.

#include "sim/clock_domain.h"

#include <chrono>
#include <condition_variable>
#include <functional>
#include <mutex>
#include <thread>

namespace harness::run {

class progress_line {
public:
    // A line for a run of `duration`; `now` gives the simulated time reached (called from the
    // display thread, so it must be safe to call concurrently with the simulation).
    progress_line(sim::time_ps duration, std::function<sim::time_ps()> now);
    ~progress_line();
    progress_line(const progress_line&) = delete;
    progress_line& operator=(const progress_line&) = delete;

    // Starts redrawing.
    void start();
    // Stops redrawing and clears the line (idempotent).
    void stop();

private:
    void draw();

    sim::time_ps duration_;
    std::function<sim::time_ps()> now_;
    std::chrono::steady_clock::time_point begun_;
    bool shown_ = false;
    std::thread thread_;
    std::mutex mutex_;
    std::condition_variable wake_;
    bool stopping_ = false;
};

}  // namespace harness::run
