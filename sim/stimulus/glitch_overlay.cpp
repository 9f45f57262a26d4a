#include "sim/stimulus/glitch_overlay.h"

#include "sim/seeded_hash.h"

#include <stdexcept>

namespace sim::stimulus {

std::vector<std::string> glitch_problems(const glitch_settings& s) {
    std::vector<std::string> p;
    if (s.width == 0) p.push_back("the width must be above 0 ps");
    if (s.rate && !s.at.empty()) p.push_back("give the glitch times or a rate, not both");
    if (!s.rate && s.at.empty()) p.push_back("give the glitch times or a rate");
    for (std::size_t i = 1; i < s.at.size(); ++i)
        if (s.at[i] <= s.at[i - 1] + s.width)
            p.push_back("glitch " + std::to_string(i) + " at " + format_time(s.at[i]) +
                        " starts before glitch " + std::to_string(i - 1) + " has ended");
    if (s.rate) {
        if (s.rate->is_zero()) {
            p.push_back("the rate must be above 0 Hz");
        } else {
            const u128 mean =
                (2 * static_cast<u128>(ps_per_second) * s.rate->den() + s.rate->num()) /
                (2 * static_cast<u128>(s.rate->num()));
            if (mean < static_cast<u128>(s.width) + 1)
                p.push_back("the rate is too high for the width: the mean time between glitches (" +
                            format_time(static_cast<time_ps>(mean)) + ") must exceed the width");
        }
    }
    if (s.stop && *s.stop <= s.start) p.push_back("stop must come after start");
    return p;
}

glitch_overlay::glitch_overlay(std::unique_ptr<edge_source> base, const glitch_settings& s)
    : base_(std::move(base)), s_(s) {
    const auto problems = glitch_problems(s);
    if (!problems.empty()) throw std::invalid_argument("glitches: " + problems.front());
    if (s_.rate)
        mean_gap_ = static_cast<time_ps>(
            (2 * static_cast<u128>(ps_per_second) * s_.rate->den() + s_.rate->num()) /
            (2 * static_cast<u128>(s_.rate->num())));
    base_level_ = base_->initial_level();
    level_ = base_level_;
}

std::optional<time_ps> glitch_overlay::glitch_start(std::uint64_t i) {
    std::optional<time_ps> t;
    if (!s_.rate) {
        if (i < s_.at.size()) t = s_.at[i];
    } else if (i == 0) {
        t = s_.start + seeded_draw(s_.seed, 0) % (2 * mean_gap_);
    } else if (next_start_) {
        // Called in order: next_start_ holds glitch i - 1's start.
        const time_ps span = 2 * mean_gap_ - 2 * s_.width - 1;
        const time_ps gap = s_.width + 1 + seeded_draw(s_.seed, i) % span;
        if (*next_start_ <= max_time_ps - gap) t = *next_start_ + gap;
    }
    if (t && s_.stop && *t >= *s_.stop) t.reset();
    if (t && *t > max_time_ps - s_.width) t.reset();
    return t;
}

std::optional<edge> glitch_overlay::next_edge(time_ps from) {
    if (last_ && from <= last_->at) return last_;
    for (;;) {
        if (!next_known_) {
            next_start_ = glitch_start(index_);
            next_known_ = true;
        }
        const std::optional<edge> b = base_->next_edge(x_);
        std::optional<time_ps> g;
        if (inside_)
            g = *next_start_ + s_.width;
        else
            g = next_start_;
        if (!b && !g) return std::nullopt;
        const time_ps m = !b ? *g : !g ? b->at : std::min(b->at, *g);
        if (b && b->at == m) base_level_ = b->level;
        if (g && *g == m) {
            if (inside_) {
                inside_ = false;
                ++index_;
                next_known_ = false;
            } else {
                inside_ = true;
            }
        }
        x_ = m + 1;
        const bool now = base_level_ != inside_;
        if (now == level_) continue;
        level_ = now;
        if (m < from) continue;
        last_ = edge{m, now};
        return last_;
    }
}

}  // namespace sim::stimulus
