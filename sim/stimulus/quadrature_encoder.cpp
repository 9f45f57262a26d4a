#include "sim/stimulus/quadrature_encoder.h"

#include "sim/stimulus/detail/int256.h"

#include <stdexcept>

namespace sim::stimulus {

namespace {

using detail::add;
using detail::is_negative;
using detail::multiply;

// Position units per quarter line: 60 s/min x 10^12 ps/s, doubled by the ramp's 1/2.
constexpr i128 quarter = static_cast<i128>(120) * 1'000'000'000'000;
constexpr std::int64_t max_rpm = 1'000'000;
constexpr std::uint32_t max_lines = 1'000'000;

i128 floor_div(i128 a, i128 b) {
    if (b < 0) {
        a = -a;
        b = -b;
    }
    i128 q = a / b;
    if (a % b != 0 && a < 0) --q;
    return q;
}

int sign(i128 v) { return v > 0 ? 1 : v < 0 ? -1 : 0; }

}  // namespace

std::vector<std::string> encoder_problems(const encoder_settings& s) {
    std::vector<std::string> p;
    if (s.lines == 0 || s.lines > max_lines)
        p.push_back("the number of lines must lie from 1 to " + std::to_string(max_lines));
    if (s.speed.empty()) p.push_back("the speed profile needs at least one point (time, rpm)");
    for (std::size_t i = 0; i < s.speed.size(); ++i) {
        if (s.speed[i].rpm < -max_rpm || s.speed[i].rpm > max_rpm)
            p.push_back("point " + std::to_string(i) + ": the speed must lie within +-" +
                        std::to_string(max_rpm) + " rpm");
        if (i > 0 && s.speed[i].at <= s.speed[i - 1].at)
            p.push_back("point " + std::to_string(i) + " at " + format_time(s.speed[i].at) +
                        " does not come after the one before");
    }
    return p;
}

quadrature_encoder::quadrature_encoder(const encoder_settings& s, encoder_output which)
    : k_(static_cast<i128>(s.lines) * 4), which_(which) {
    const auto problems = encoder_problems(s);
    if (!problems.empty()) throw std::invalid_argument("encoder: " + problems.front());
    // Position 0 at time 0; before the first point the speed holds at the first point's.
    i128 p = 0;
    i128 t = 0;
    const auto push = [&](i128 length, i128 r0, i128 r1) {
        segments_.push_back({t, length, r0, r1 - r0, p});
        p += k_ * length * (r0 + r1);
        t += length;
    };
    if (s.speed.front().at > 0) push(s.speed.front().at, s.speed.front().rpm, s.speed.front().rpm);
    for (std::size_t i = 0; i + 1 < s.speed.size(); ++i)
        push(static_cast<i128>(s.speed[i + 1].at) - s.speed[i].at, s.speed[i].rpm,
             s.speed[i + 1].rpm);
    segments_.push_back({t, 0, s.speed.back().rpm, 0, p});
}

bool quadrature_encoder::level_of(std::int64_t count) const {
    const std::int64_t state = ((count % 4) + 4) % 4;
    return which_ == encoder_output::a ? (state == 1 || state == 2) : (state == 2 || state == 3);
}

bool quadrature_encoder::at_or_above(const segment& s, i128 tau, i128 x) const {
    if (s.length == 0) return 2 * k_ * s.r0 * tau + (s.p0 - x) >= 0;
    // T x (P(tau) - x) = K slope tau^2 + 2 K r0 T tau + T (p0 - x), exactly.
    detail::i256 f = multiply(k_ * s.slope, tau * tau);
    f = add(f, multiply(2 * k_ * s.r0, s.length * tau));
    f = add(f, multiply(s.length, s.p0 - x));
    return !is_negative(f);
}

std::optional<std::pair<i128, std::int64_t>> quadrature_encoder::next_crossing(
    std::size_t& seg, i128 t, std::int64_t c) const {
    const i128 up = (static_cast<i128>(c) + 1) * quarter;
    const i128 down = static_cast<i128>(c) * quarter;
    for (; seg < segments_.size(); ++seg) {
        const segment& s = segments_[seg];
        const i128 lo = std::max<i128>(t + 1 - s.t0, 0);
        const i128 hi = s.length != 0 ? s.length : static_cast<i128>(max_time_ps) - s.t0;
        if (lo > hi) continue;
        const i128 r1 = s.r0 + s.slope;
        // Monotone pieces: split where the speed passes through zero.
        struct piece {
            i128 a, b;
            int dir;
        } pieces[2];
        int n = 0;
        if (sign(s.r0) * sign(r1) < 0) {
            const i128 z = floor_div(-s.r0 * s.length, s.slope);
            pieces[n++] = {lo, std::min(hi, z), sign(s.r0)};
            pieces[n++] = {std::max(lo, z + 1), hi, sign(r1)};
        } else {
            pieces[n++] = {lo, hi, s.r0 != 0 ? sign(s.r0) : sign(r1)};
        }
        for (int i = 0; i < n; ++i) {
            const piece& pc = pieces[i];
            if (pc.a > pc.b || pc.dir == 0) continue;
            // At the piece's first instant either threshold may be passed (the turn may lie
            // between two picoseconds); after it only the one the motion heads for.
            if (at_or_above(s, pc.a, up)) return std::make_pair(s.t0 + pc.a, c + 1);
            if (!at_or_above(s, pc.a, down)) return std::make_pair(s.t0 + pc.a, c - 1);
            const auto hit = [&](i128 tau) {
                return pc.dir > 0 ? at_or_above(s, tau, up) : !at_or_above(s, tau, down);
            };
            if (!hit(pc.b)) continue;
            i128 a = pc.a, b = pc.b;  // hit(b), not hit(a)
            while (b - a > 1) {
                const i128 m = a + (b - a) / 2;
                if (hit(m))
                    b = m;
                else
                    a = m;
            }
            return std::make_pair(s.t0 + b, pc.dir > 0 ? c + 1 : c - 1);
        }
        if (s.length == 0) break;
    }
    return std::nullopt;
}

std::optional<edge> quadrature_encoder::next_edge(time_ps from) {
    if (last_ && from <= last_->at) return last_;
    for (;;) {
        const auto r = next_crossing(seg_, t_, count_);
        if (!r || r->first > static_cast<i128>(max_time_ps)) return std::nullopt;
        const bool before = level_of(count_);
        t_ = r->first;
        count_ = r->second;
        const bool after = level_of(count_);
        if (before == after || t_ < static_cast<i128>(from)) continue;
        last_ = edge{static_cast<time_ps>(t_), after};
        return last_;
    }
}

std::int64_t quadrature_encoder::count_at(time_ps t) const {
    std::size_t seg = 0;
    i128 at = 0;
    std::int64_t c = 0;
    for (;;) {
        const auto r = next_crossing(seg, at, c);
        if (!r || r->first > static_cast<i128>(t)) return c;
        at = r->first;
        c = r->second;
    }
}

}  // namespace sim::stimulus
