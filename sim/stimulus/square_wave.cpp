#include "sim/stimulus/square_wave.h"

#include "sim/seeded_hash.h"

#include <stdexcept>

namespace sim::stimulus {

namespace {

constexpr std::uint64_t udeg_per_turn = 360'000'000;
constexpr std::uint64_t ppb_whole = 1'000'000'000;

u128 checked_mul(u128 a, u128 b, const char* what) {
    u128 r;
    if (__builtin_mul_overflow(a, b, &r))
        throw arithmetic_error(std::string("square wave: ") + what +
                               " does not fit exact 128-bit arithmetic; use a frequency with a "
                               "smaller exact fraction");
    return r;
}

// floor(a / b) for b > 0.
i128 floor_div(i128 a, i128 b) {
    i128 q = a / b;
    if ((a % b != 0) && (a < 0)) --q;
    return q;
}

}  // namespace

std::vector<std::string> square_problems(const square_settings& s) {
    std::vector<std::string> p;
    if (s.freq.is_zero()) p.push_back("the frequency must be above 0 Hz");
    if (s.offset_ppb <= -100'000'000 || s.offset_ppb >= 100'000'000)
        p.push_back("the offset must lie within +-10 %");
    if (s.duty_ppb == 0 || s.duty_ppb >= ppb_whole)
        p.push_back("the duty cycle must lie strictly between 0 % and 100 %");
    if (s.phase_udeg >= udeg_per_turn) p.push_back("an angle phase must lie below 360 deg");
    if (s.stop && *s.stop <= s.start) p.push_back("stop must come after start");
    return p;
}

square_wave::square_wave(const square_settings& s) : s_(s) {
    const auto problems = square_problems(s);
    if (!problems.empty()) throw std::invalid_argument("square wave: " + problems.front());
    const frequency f = s.freq.offset_ppb(s.offset_ppb);
    pn_ = static_cast<u128>(ps_per_second) * f.den();
    pd_ = f.num();
    const u128 g = gcd128(pn_, pd_);
    pn_ /= g;
    pd_ /= g;
    const u128 phase_time = checked_mul(s.phase_ps, pd_, "the phase") % pn_;
    const u128 phase_angle =
        (2 * checked_mul(s.phase_udeg, pn_, "the phase") + udeg_per_turn) / (2 * udeg_per_turn);
    phase_units_ = static_cast<i128>((phase_time + phase_angle) % pn_);
    high_units_ =
        static_cast<i128>((2 * checked_mul(s.duty_ppb, pn_, "the high time") + ppb_whole) /
                          (2 * static_cast<u128>(ppb_whole)));
    const i128 low_units = static_cast<i128>(pn_) - high_units_;
    const i128 min_half = static_cast<i128>((s.jitter + 1) * pd_);
    if (high_units_ < min_half || low_units < min_half)
        throw std::invalid_argument(
            "square wave: the jitter must be shorter than the high time and the low time, by at "
            "least 1 ps; accepted: a smaller jitter, or a duty cycle nearer 50 %");
    // The level the wave has at `start`: the last edge at or before it, from an edge surely
    // before it (two periods back).
    const i128 start = static_cast<i128>(s.start);
    std::int64_t j = -4;
    while (time_of(j + 1) <= start) ++j;
    level_at_start_ = (j % 2) == 0;
}

i128 square_wave::time_of(std::int64_t j) const {
    const std::int64_t k = j >= 0 ? j / 2 : -((1 - j) / 2);
    const bool falling = (j & 1) != 0;
    const i128 units =
        static_cast<i128>(k) * static_cast<i128>(pn_) + phase_units_ + (falling ? high_units_ : 0);
    const i128 pd = static_cast<i128>(pd_);
    i128 t = static_cast<i128>(s_.start) + floor_div(2 * units + pd, 2 * pd);
    if (s_.jitter != 0)
        t += static_cast<i128>(seeded_draw(s_.seed, static_cast<std::uint64_t>(j + 4)) %
                               (s_.jitter + 1));
    return t;
}

std::int64_t square_wave::first_at_or_after(i128 x) const {
    // The rising edge at or before x nominally, two edges back to cover rounding and jitter.
    const i128 rel = (x - static_cast<i128>(s_.start)) * static_cast<i128>(pd_) - phase_units_;
    const i128 k = floor_div(rel, static_cast<i128>(pn_));
    std::int64_t j = static_cast<std::int64_t>(2 * k - 2);
    if (j < -4) j = -4;
    while (time_of(j) < x) ++j;
    return j;
}

std::optional<edge> square_wave::next_edge(time_ps from) {
    const i128 start = static_cast<i128>(s_.start);
    if (from <= s_.start && level_at_start_ != s_.idle_level)
        return edge{s_.start, level_at_start_};
    if (s_.stop && from > *s_.stop) return std::nullopt;
    const i128 x = std::max(static_cast<i128>(from), start + 1);
    const std::int64_t j = first_at_or_after(x);
    const i128 t = time_of(j);
    if (s_.stop && t >= static_cast<i128>(*s_.stop)) {
        // The wave ends: back to the idle level, unless the last edge before stop left it there.
        const bool before_stop = ((j - 1) % 2) == 0;
        if (before_stop == s_.idle_level || static_cast<i128>(from) > *s_.stop) return std::nullopt;
        return edge{*s_.stop, s_.idle_level};
    }
    if (t > static_cast<i128>(max_time_ps)) return std::nullopt;
    return edge{static_cast<time_ps>(t), (j % 2) == 0};
}

}  // namespace sim::stimulus
