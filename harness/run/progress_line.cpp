// The terminal progress line; see progress_line.h.

#define SC_INCLUDE_DYNAMIC_PROCESSES
#include "harness/run/progress_line.h"

#include <systemc>

#include <cstdio>

namespace harness::run {

void progress_line::start() {
    begun_ = last_draw_ = std::chrono::steady_clock::now();
    const sim::time_ps step = duration_ / 1000 == 0 ? 1 : duration_ / 1000;
    sc_core::sc_spawn_options opts;
    sc_core::sc_spawn(
        [this, step] {
            for (sim::time_ps t = step; t < duration_; t += step) {
                sc_core::wait(sc_core::sc_time::from_value(step));
                draw(sc_core::sc_time_stamp().value());
            }
        },
        "tickbench_progress", &opts);
}

void progress_line::draw(sim::time_ps now) {
    const auto wall = std::chrono::steady_clock::now();
    if (wall - last_draw_ < std::chrono::milliseconds(250)) return;
    last_draw_ = wall;
    const double elapsed = std::chrono::duration<double>(wall - begun_).count();
    const double sim_s = static_cast<double>(now) / static_cast<double>(sim::ps_per_second);
    const double factor = elapsed > 0 ? sim_s / elapsed : 0;
    const double left = now > 0 ? elapsed * static_cast<double>(duration_ - now) / static_cast<double>(now) : 0;
    std::fprintf(stderr, "\r\033[Ksimulated %s of %s, %.3gx real time, %.0f s left", sim::format_time(now).c_str(),
                 sim::format_time(duration_).c_str(), factor, left);
    std::fflush(stderr);
    shown_ = true;
}

void progress_line::erase() {
    if (!shown_) return;
    std::fputs("\r\033[K", stderr);
    std::fflush(stderr);
    shown_ = false;
}

}  // namespace harness::run
