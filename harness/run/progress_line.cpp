// The terminal progress line; see progress_line.h.

#include "harness/run/progress_line.h"

#include <cstdio>

namespace harness::run {

progress_line::progress_line(sim::time_ps duration, std::function<sim::time_ps()> now)
    : duration_(duration), now_(std::move(now)) {}

progress_line::~progress_line() { stop(); }

void progress_line::start() {
    begun_ = std::chrono::steady_clock::now();
    thread_ = std::thread([this] {
        std::unique_lock<std::mutex> lock(mutex_);
        while (!wake_.wait_for(lock, std::chrono::milliseconds(250), [this] { return stopping_; }))
            draw();
    });
}

void progress_line::draw() {
    const sim::time_ps now = now_();
    const double elapsed =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - begun_).count();
    const double sim_s = static_cast<double>(now) / static_cast<double>(sim::ps_per_second);
    const double factor = elapsed > 0 ? sim_s / elapsed : 0;
    const double left =
        now > 0 && now < duration_
            ? elapsed * static_cast<double>(duration_ - now) / static_cast<double>(now)
            : 0;
    std::fprintf(stderr, "\r\033[Ksimulated %s of %s, %.3g x real time, %.0f s left",
                 sim::format_time(now).c_str(), sim::format_time(duration_).c_str(), factor, left);
    std::fflush(stderr);
    shown_ = true;
}

void progress_line::stop() {
    {
        std::lock_guard<std::mutex> lock(mutex_);
        stopping_ = true;
    }
    wake_.notify_all();
    if (thread_.joinable() && thread_.get_id() != std::this_thread::get_id()) thread_.join();
    if (shown_) {
        std::fputs("\r\033[K", stderr);
        std::fflush(stderr);
        shown_ = false;
    }
}

}  // namespace harness::run
