#include "sim/stimulus/fan_tach.h"

#include <cmath>
#include <stdexcept>

namespace sim::stimulus {

namespace {
constexpr double ps_per_minute = 60e12;
}

std::vector<std::string> fan_problems(const fan_settings& s) {
    std::vector<std::string> v;
    if (s.max_rpm == 0 || s.max_rpm > 1'000'000)
        v.push_back("the maximum speed must be from 1 to 1000000 rpm");
    if (s.pulses_per_revolution == 0 || s.pulses_per_revolution > 1000)
        v.push_back("the pulses per revolution must be from 1 to 1000");
    if (s.averaging == 0) v.push_back("the averaging window must be above 0");
    return v;
}

fan_tach::fan_tach(const fan_settings& s) : s_(s) {
    const auto problems = fan_problems(s);
    if (!problems.empty()) throw std::invalid_argument("fan: " + problems.front());
    if (s.time_constant > 0)
        lag_ =
            -std::expm1(-static_cast<double>(s.averaging) / static_cast<double>(s.time_constant));
    speeds_.push_back(0.0);  // window 0
}

void fan_tach::account(time_ps to) {
    if (to < last_) return;
    const time_ps w = s_.averaging;
    while (to >= (open_ + 1) * w) {
        const time_ps end = (open_ + 1) * w;
        if (level_) high_ += end - last_;
        const double drive = static_cast<double>(high_) / static_cast<double>(w);
        const double now = speeds_.back();
        speeds_.push_back(now + (static_cast<double>(s_.max_rpm) * drive - now) * lag_);
        ++open_;
        high_ = 0;
        last_ = end;
    }
    if (level_) high_ += to - last_;
    last_ = to;
}

void fan_tach::drive(bool level, time_ps at) {
    account(at);
    level_ = level;
}

void fan_tach::known_until(time_ps t) { account(t); }

time_ps fan_tach::determined_until() const { return (open_ + 1) * s_.averaging; }

std::optional<double> fan_tach::speed_in(std::uint64_t window) const {
    if (window < first_ || window > open_) return std::nullopt;
    return speeds_[window - first_];
}

double fan_tach::rate_in(std::uint64_t window) const {
    return speeds_[window - first_] * 2.0 * s_.pulses_per_revolution / ps_per_minute;
}

bool fan_tach::next_window() {
    if (window_ >= open_) return false;
    lead_ += static_cast<double>(in_window_) - rate_in(window_) * static_cast<double>(s_.averaging);
    in_window_ = 0;
    ++window_;
    speeds_.pop_front();
    ++first_;
    return true;
}

std::optional<edge> fan_tach::next_edge(time_ps from) {
    const time_ps w = s_.averaging;
    for (;;) {
        if (window_ > open_) return std::nullopt;
        const double rate = rate_in(window_);
        const time_ps start = window_ * w;
        const time_ps end = start + w;
        while (rate > 0) {
            const double distance = lead_ + static_cast<double>(in_window_);
            if (distance > rate * static_cast<double>(w)) break;
            time_ps t = start + static_cast<time_ps>(std::ceil(distance / rate));
            if (t >= end) t = end - 1;  // the last picosecond of rounding stays in its window
            if (edges_ > 0 && t <= last_edge_) t = last_edge_ + 1;
            if (t >= from) return edge{t, (edges_ + 1) % 2 == 1};
            last_edge_ = t;
            ++edges_;
            ++in_window_;
        }
        if (!next_window()) return std::nullopt;
    }
}

}  // namespace sim::stimulus
