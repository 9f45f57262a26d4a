#include "sim/clock_domain.h"

#include "sim/seeded_hash.h"

#include <algorithm>
#include <string>

namespace sim {

namespace {
constexpr u128 u64_max = std::numeric_limits<std::uint64_t>::max();

[[noreturn]] void throw_limit(const char* what) { throw_time_limit(what); }
}  // namespace

void throw_time_limit(const char* what) {
    throw time_limit_error(std::string(what) +
                           ": simulated time would pass 2^64-1 ps (about 213.5 days), the limit "
                           "of a 64-bit picosecond time base");
}

clock_segment clock_segment::running(std::uint64_t first_tick, time_ps origin, const frequency& f) {
    if (f.is_zero()) return stopped(first_tick, origin);
    // period = 10^12 * den / num ps, kept as an unreduced-safe fraction that fits 64-bit parts.
    u128 num = static_cast<u128>(ps_per_second) * f.den();
    u128 den = f.num();
    const u128 g = gcd128(num, den);
    num /= g;
    den /= g;
    if (num > u64_max || den >= (u128{1} << 63))
        throw arithmetic_error("clock period of " + f.exact_string() +
                               " does not fit the 64-bit exact time base");
    clock_segment s;
    s.running_ = true;
    s.first_tick_ = first_tick;
    s.start_ = origin;
    s.freq_ = f;
    s.step_num_ = static_cast<std::uint64_t>(num);
    s.step_den_ = static_cast<std::uint64_t>(den);
    s.base_ = static_cast<u128>(origin) * s.step_den_;
    s.source_tick_ = first_tick;
    s.jitter_base_ = first_tick;
    s.set_limit();
    return s;
}

void clock_segment::set_limit() {
    // round half up of x / d as (2x + d) / (2d); x < 2^64 * d keeps 2x + d inside 128 bits.
    const u128 d = step_den_;
    const u128 x_limit = u64_max * d + d / 2;  // largest x whose rounding still fits 64 bits
    beyond_limit_ = base_ > x_limit;
    last_n_ = beyond_limit_ || step_num_ == 0 ? 0 : (x_limit - base_) / step_num_;
    half_step_den_ = invariant_divider(2 * step_den_);
}

clock_segment clock_segment::running(std::uint64_t first_tick, time_ps origin, const frequency& f,
                                     time_ps jitter, std::uint64_t seed) {
    clock_segment s = running(first_tick, origin, f);
    if (!s.running_ || jitter == 0) return s;
    if (static_cast<u128>(jitter) * 2 * s.step_den_ >= s.step_num_)
        throw std::invalid_argument("clock jitter of " + std::to_string(jitter) +
                                    " ps is not under half the period of " + f.exact_string());
    s.jitter_ = jitter;
    s.jitter_seed_ = seed;
    return s;
}

bool clock_segment::same_as(const clock_segment& o) const {
    return running_ == o.running_ && first_tick_ == o.first_tick_ && start_ == o.start_ &&
           freq_ == o.freq_ && base_ == o.base_ && step_num_ == o.step_num_ &&
           step_den_ == o.step_den_ && source_tick_ == o.source_tick_ && factor_ == o.factor_ &&
           jitter_ == o.jitter_ && jitter_seed_ == o.jitter_seed_ &&
           jitter_base_ == o.jitter_base_ && jitter_step_ == o.jitter_step_;
}

clock_segment clock_segment::stopped(std::uint64_t next_tick, time_ps from) {
    clock_segment s;
    s.first_tick_ = next_tick;
    s.start_ = from;
    return s;
}

clock_segment clock_segment::derived(const clock_segment& parent, std::uint64_t parent_tick,
                                     std::uint64_t first_tick, std::uint64_t factor) {
    if (!parent.running_) return stopped(first_tick, parent.start_);
    if (factor == 0) throw std::invalid_argument("derived clock: factor 0");
    const u128 step = static_cast<u128>(parent.step_num_) * factor;
    if (step > u64_max)
        throw arithmetic_error("divided clock period does not fit the 64-bit exact time base");
    clock_segment s;
    s.running_ = true;
    s.first_tick_ = first_tick;
    s.start_ = parent.time_of(parent_tick);
    s.freq_ = parent.freq_.scaled(1, factor);
    s.step_num_ = static_cast<std::uint64_t>(step);
    s.step_den_ = parent.step_den_;
    s.base_ = parent.base_ + static_cast<u128>(parent_tick - parent.first_tick_) * parent.step_num_;
    s.source_tick_ = parent_tick;
    s.factor_ = factor;
    // Jitter indices wrap harmlessly: they only seed the hash.
    s.jitter_ = parent.jitter_;
    s.jitter_seed_ = parent.jitter_seed_;
    s.jitter_base_ = parent.jitter_base_ + (parent_tick - parent.first_tick_) * parent.jitter_step_;
    s.jitter_step_ = parent.jitter_step_ * factor;
    s.set_limit();
    return s;
}

bool clock_segment::continues(const clock_segment& prev) const {
    if (!running_ || !prev.running_ || first_tick_ < prev.first_tick_) return false;
    const std::uint64_t n = first_tick_ - prev.first_tick_;
    return step_num_ == prev.step_num_ && step_den_ == prev.step_den_ && freq_ == prev.freq_ &&
           base_ == prev.base_ + static_cast<u128>(n) * prev.step_num_ && factor_ == prev.factor_ &&
           source_tick_ == prev.source_tick_ + n * prev.factor_ && jitter_ == prev.jitter_ &&
           jitter_seed_ == prev.jitter_seed_ && jitter_step_ == prev.jitter_step_ &&
           jitter_base_ == prev.jitter_base_ + n * prev.jitter_step_;
}

time_ps clock_segment::jittered_time_of(std::uint64_t k) const {
    const time_ps t = nominal_time_of(k);
    const std::uint64_t idx = jitter_base_ + (k - first_tick_) * jitter_step_;
    const time_ps d = seeded_draw(jitter_seed_, idx) % (jitter_ + 1);
    if (t > max_time_ps - d) throw_limit("clock edge");
    return t + d;
}

std::uint64_t clock_segment::tick_at(time_ps t) const {
    if (jitter_ == 0) return nominal_tick_at(t);
    // Displacements are in [0, jitter] and jitter < period/2, so the answer is at most two edges
    // past the nominal edge at or after t - jitter.
    std::uint64_t k = nominal_tick_at(t > jitter_ ? t - jitter_ : 0);
    while (time_of(k) < t) ++k;
    return k;
}

std::uint64_t clock_segment::nominal_tick_at(time_ps t) const {
    if (t <= start_) return first_tick_;
    // Smallest n with round((base + n*S)/D) >= t, i.e. 2(base + n*S) >= (2t - 1)D.
    const u128 d = step_den_;
    const u128 need = (2 * static_cast<u128>(t) - 1) * d;
    const u128 have = 2 * base_;
    if (need <= have) return first_tick_;
    const u128 s2 = 2 * static_cast<u128>(step_num_);
    const u128 gap = need - have + s2 - 1;
    if ((gap >> 64) == 0 && (s2 >> 64) == 0)  // the common case: a 64-bit division
        return first_tick_ + static_cast<std::uint64_t>(gap) / static_cast<std::uint64_t>(s2);
    const u128 n = gap / s2;
    return first_tick_ + static_cast<std::uint64_t>(n);
}

clock_domain::clock_domain() { segments_.push_back(clock_segment::stopped(0, 0)); }

clock_domain::clock_domain(const frequency& f, time_ps origin) {
    segments_.push_back(clock_segment::running(0, origin, f));
}

std::size_t clock_domain::segment_of_tick(std::uint64_t k) const {
    if (segments_.empty())
        throw std::out_of_range("clock edge " + std::to_string(k) + " never happens");
    const std::size_t last = segments_.size() - 1;
    if (segments_[last].first_tick() <= k) return last;
    auto it = std::upper_bound(
        segments_.begin(), segments_.end(), k,
        [](std::uint64_t v, const clock_segment& s) { return v < s.first_tick(); });
    if (it == segments_.begin())
        throw std::out_of_range("clock edge " + std::to_string(k) + " was forgotten");
    return static_cast<std::size_t>(it - segments_.begin()) - 1;
}

const clock_segment& clock_domain::segment_at(time_ps t) const {
    static const clock_segment never = clock_segment::stopped(0, 0);
    if (segments_.empty()) return never;
    if (segments_.back().start() <= t) return segments_.back();
    auto it = std::upper_bound(segments_.begin(), segments_.end(), t,
                               [](time_ps v, const clock_segment& s) { return v < s.start(); });
    if (it == segments_.begin()) return segments_.front();
    return *(it - 1);
}

time_ps clock_domain::time_of_earlier(std::uint64_t k) const {
    const clock_segment& s = segments_[segment_of_tick(k)];
    if (!s.is_running())
        throw std::out_of_range("clock edge " + std::to_string(k) +
                                " never happens: the clock is stopped");
    return s.time_of(k);
}

std::optional<clock_edge> clock_domain::edge_at_or_after(time_ps t) const {
    // Find the segment in force at t; if it is stopped, the next running segment's first edge.
    auto it = std::upper_bound(segments_.begin(), segments_.end(), t,
                               [](time_ps v, const clock_segment& s) { return v < s.start(); });
    std::size_t i =
        it == segments_.begin() ? 0 : static_cast<std::size_t>(it - segments_.begin()) - 1;
    for (; i < segments_.size(); ++i) {
        const clock_segment& s = segments_[i];
        if (!s.is_running()) continue;
        const std::uint64_t k = s.tick_at(t);
        const bool ends_before = i + 1 < segments_.size() && k >= segments_[i + 1].first_tick();
        if (!ends_before) return clock_edge{k, s.time_of(k)};
    }
    return std::nullopt;
}

std::optional<clock_edge> clock_domain::edge_after(time_ps t) const {
    if (t == max_time_ps) return std::nullopt;
    return edge_at_or_after(t + 1);
}

std::uint64_t clock_domain::tick_at(time_ps t) const {
    if (segments_.empty()) return 0;
    const clock_segment& s = segment_at(t);
    if (!s.is_running()) return s.first_tick();
    return s.tick_at(t);
}

frequency clock_domain::freq_at(time_ps t) const {
    const clock_segment& s = segment_at(t);
    return s.is_running() && s.start() <= t ? s.freq() : frequency{};
}

std::vector<clock_segment> clock_domain::truncate_from(time_ps t) {
    auto it = std::lower_bound(segments_.begin(), segments_.end(), t,
                               [](const clock_segment& s, time_ps v) { return s.start() < v; });
    std::vector<clock_segment> removed(it, segments_.end());
    segments_.erase(it, segments_.end());
    return removed;
}

void clock_domain::append(const clock_segment& s) {
    if (segments_.empty()) {
        segments_.push_back(s);
        return;
    }
    // A segment whose first edge lies after s begins never produced an edge: s replaces it.
    while (segments_.size() > 1 && segments_.back().start() > s.start()) segments_.pop_back();
    const clock_segment& l = segments_.back();
    if (s.start() < l.start()) throw std::logic_error("clock segment appended out of time order");
    if (s.first_tick() < l.first_tick()) throw std::logic_error("clock segment goes back in ticks");
    if (s.start() == l.start() && s.first_tick() == l.first_tick())
        segments_.back() = s;
    else
        segments_.push_back(s);
}

clock_edge clock_domain::change_frequency(time_ps t, const frequency& f) {
    if (t == max_time_ps) throw time_limit_error("clock change at the last representable instant");
    const clock_segment& l = segments_.back();
    clock_edge origin;
    if (l.is_running()) {
        origin.tick = l.tick_at(t + 1);
        origin.at = l.time_of(origin.tick);
    } else {
        origin.tick = l.first_tick();
        origin.at = std::max(t + 1, l.start());
    }
    append(clock_segment::running(origin.tick, origin.at, f));
    return origin;
}

void clock_domain::stop(time_ps t) {
    if (t == max_time_ps) return;
    const clock_segment& l = segments_.back();
    if (!l.is_running()) return;
    append(clock_segment::stopped(l.tick_at(t + 1), std::max(t + 1, l.start())));
}

void clock_domain::forget_before(time_ps t) {
    std::size_t keep = 0;
    while (keep + 1 < segments_.size() && segments_[keep + 1].start() <= t) ++keep;
    segments_.erase(segments_.begin(), segments_.begin() + static_cast<std::ptrdiff_t>(keep));
}

}  // namespace sim

namespace sim {
std::string format_time(time_ps t) {
    struct unit {
        time_ps scale;
        const char* name;
        int digits;
    };
    static const unit units[] = {{ps_per_second, "s", 12},
                                 {1'000'000'000ULL, "ms", 9},
                                 {1'000'000ULL, "us", 6},
                                 {1'000ULL, "ns", 3}};
    for (const unit& u : units) {
        if (t < u.scale) continue;
        std::string frac = std::to_string(t % u.scale);
        frac.insert(frac.begin(), static_cast<std::size_t>(u.digits) - frac.size(), '0');
        while (!frac.empty() && frac.back() == '0') frac.pop_back();
        return std::to_string(t / u.scale) + (frac.empty() ? "" : "." + frac) + " " + u.name;
    }
    return std::to_string(t) + " ps";
}
}  // namespace sim
