// The running state of each check kind; see check_state.h.

#include "sim/checks/condition.h"
#include "sim/checks/detail/check_state.h"

#include <algorithm>

namespace sim::detail {

namespace {

bool matches(edge_select e, bool level) {
    switch (e) {
        case edge_select::rising:
            return level;
        case edge_select::falling:
            return !level;
        case edge_select::both:
            return true;
    }
    return false;
}

// Display value of x / t parts of `whole`, rounded to the nearest unit.
std::uint64_t ratio_shown(u128 x, u128 t, u128 whole) {
    return static_cast<std::uint64_t>((x * whole + t / 2) / t);
}

// Frequency, period and duty cycle: one measurement per period between reference edges.
class periodic_check final : public check_state {
public:
    using check_state::check_state;
    bool instant_driven() const override { return false; }
    std::size_t object_bytes() const override { return sizeof(*this); }

    void start(const std::uint8_t* levels) override { level_ = levels[ids_[0]] != 0; }

    void on_change(unsigned, bool level, time_ps at) override {
        const bool was = level_;
        level_ = level;
        note_change(at);
        if (!in_window(at)) {
            if (at > until_) close_window(until_);
            return;
        }
        if (was) high_ += at - segment_start_;
        segment_start_ = at;
        if (!matches(spec_.edge, level)) return;
        if (has_ref_) measure(at - ref_at_, high_, at);
        has_ref_ = true;
        ref_at_ = at;
        high_ = 0;
    }

    void finish(time_ps end) override {
        close_window(std::min(end, until_));
        if (count_ == 0 && !failed_)
            fail_no_data(end, std::string("complete period of ") + names_[0]);
        conclude_open(end, "periods", "period");
    }

private:
    // The window closed at `stop`: a period still open then that is already longer than allowed
    // (it can only get longer) fails, as a pulse or an unanswered event does. A duty cycle has no
    // bound on the period, so it judges complete periods only.
    void close_window(time_ps stop) {
        if (closed_) return;
        closed_ = true;
        if (!has_ref_ || stop <= ref_at_ || spec_.kind == check_kind::duty_cycle) return;
        const time_ps open = stop - ref_at_;
        const verdict v =
            spec_.kind == check_kind::frequency
                ? (judge_frequency(open) == verdict::below ? verdict::below : verdict::ok)
                : (judge(open, 1, 1) == verdict::above ? verdict::above : verdict::ok);
        if (v == verdict::ok) return;
        open_failed_ = true;
        fail_span(ref_at_, stop, [&] {
            return std::string("no ") + to_string(spec_.edge) + " edge of " + names_[0] +
                   " since " + format_time(ref_at_) + ": the period still open at " +
                   format_time(stop) + " is already " + format_time(open) + ", so its " +
                   (spec_.kind == check_kind::frequency ? "frequency " : "length ") +
                   failure_phrase(v);
        });
    }

    void measure(time_ps period, time_ps high, time_ps at) {
        switch (spec_.kind) {
            case check_kind::period: {
                add_stat(period);
                const verdict v = judge(period, 1, 1);
                if (v != verdict::ok)
                    fail_span(at - period, at, [&] {
                        return "period " + format_time(period) + " " + failure_phrase(v) + " at " +
                               format_time(at);
                    });
                return;
            }
            case check_kind::frequency: {
                if (period == 0) {
                    fail(at, [&] { return "zero-length period (a glitch) at " + format_time(at); });
                    return;
                }
                add_stat(period);
                const verdict v = judge_frequency(period);
                if (v != verdict::ok) {
                    fail_span(at - period, at, [&] {
                        return "frequency " + frequency(ps_per_second, period).decimal_string() +
                               " Hz (period " + format_time(period) + ") " + failure_phrase(v) +
                               " at " + format_time(at);
                    });
                }
                return;
            }
            default: {  // duty_cycle
                if (period == 0) {
                    fail(at, [&] { return "zero-length period (a glitch) at " + format_time(at); });
                    return;
                }
                const std::uint64_t shown = ratio_shown(high, period, ppb_per_whole);
                add_stat(shown);
                const verdict v = judge(high, period, ppb_per_whole);
                if (v != verdict::ok) {
                    fail_span(at - period, at, [&] {
                        return "duty cycle " + value_text(shown) + " (high " + format_time(high) +
                               " of " + format_time(period) + ") " + failure_phrase(v) + " at " +
                               format_time(at);
                    });
                }
                return;
            }
        }
    }

    bool level_ = false;
    bool closed_ = false;
    bool has_ref_ = false;
    time_ps ref_at_ = 0;
    time_ps segment_start_ = 0;
    time_ps high_ = 0;  // high time since the reference edge
};

// Pulse width: each high (or low) pulse that starts and ends in the window.
class pulse_check final : public check_state {
public:
    using check_state::check_state;
    bool instant_driven() const override { return false; }
    std::size_t object_bytes() const override { return sizeof(*this); }
    void start(const std::uint8_t*) override {}

    void on_change(unsigned, bool level, time_ps at) override {
        note_change(at);
        if (!in_window(at)) {
            if (at > until_) close_window(until_);
            open_ = false;
            return;
        }
        if (level == spec_.high_pulses) {
            open_ = true;
            open_at_ = at;
            return;
        }
        if (!open_) return;
        open_ = false;
        const time_ps width = at - open_at_;
        add_stat(width);
        const verdict v = judge(width, 1, 1);
        if (v != verdict::ok) {
            fail_span(open_at_, at, [&] {
                return level_word() + " pulse " + format_time(width) + " " + failure_phrase(v) +
                       " at " + format_time(at);
            });
        }
    }

    void finish(time_ps end) override {
        close_window(std::min(end, until_));
        if (count_ == 0 && !failed_)
            fail_no_data(end, "complete " + level_word() + " pulse of " + names_[0]);
        conclude_open(end, "pulses", "pulse");
    }

private:
    std::string level_word() const { return spec_.high_pulses ? "high" : "low"; }
    // The window closed at `stop` (at `until`, or the run's end): a pulse still open then that is
    // already too long fails, whether it ends after `until` or never.
    void close_window(time_ps stop) {
        if (closed_) return;
        closed_ = true;
        if (!open_ || stop < open_at_) return;
        const time_ps width = stop - open_at_;
        if (judge(width, 1, 1) != verdict::above) return;
        open_failed_ = true;
        fail_span(open_at_, stop, [&] {
            return level_word() + " pulse from " + format_time(open_at_) + " still open after " +
                   format_time(width) + ", " + failure_phrase(verdict::above);
        });
    }
    bool closed_ = false;
    bool open_ = false;
    time_ps open_at_ = 0;
};

// Edge count: edges of the chosen direction in the window.
class count_check final : public check_state {
public:
    using check_state::check_state;
    bool instant_driven() const override { return false; }
    std::size_t object_bytes() const override { return sizeof(*this); }
    void start(const std::uint8_t*) override {}

    void on_change(unsigned, bool level, time_ps at) override {
        note_change(at);
        if (!in_window(at) || !matches(spec_.edge, level)) return;
        ++count_;
        if (!failed_ && judge(count_, 1, 1) == verdict::above) {
            fail(at, [&] {
                return std::string(to_string(spec_.edge)) + " edge number " +
                       std::to_string(count_) + " at " + format_time(at) + " " +
                       failure_phrase(verdict::above);
            });
        }
    }

    void finish(time_ps end) override {
        finished_ = true;
        end_ = end;
        const verdict v = judge(count_, 1, 1);
        if (v == verdict::below && !failed_) {
            fail(std::min(end, until_), [&] {
                if (!moved_)
                    return names_[0] + " never changed " + window_text() + "; expected " +
                           expected_text_;
                return std::to_string(count_) + " " + to_string(spec_.edge) + " edges " +
                       window_text() + " " + failure_phrase(v);
            });
        }
        if (failed_) {
            detail_ = fail_sentence_;
            if (v == verdict::above) detail_ += "; " + std::to_string(count_) + " in all";
        } else {
            detail_ = std::to_string(count_) + " " + to_string(spec_.edge) + " edges " +
                      window_text() + ", expected " + expected_text_;
        }
    }
};

// Shared by the instant-driven kinds: levels of slots A and B at the last instant, and which edges
// the current instant made.
class pair_check : public check_state {
public:
    using check_state::check_state;
    bool instant_driven() const override { return true; }
    void start(const std::uint8_t* levels) override {
        a_ = levels[ids_[0]] != 0;
        b_ = levels[ids_[1]] != 0;
    }

protected:
    // Takes the new levels; returns whether A and B changed (rose_a_, fell_a_...).
    void step(const std::uint8_t* levels) {
        const bool na = levels[ids_[0]] != 0, nb = levels[ids_[1]] != 0;
        rose_a_ = !a_ && na;
        fell_a_ = a_ && !na;
        rose_b_ = !b_ && nb;
        fell_b_ = b_ && !nb;
        a_ = na;
        b_ = nb;
    }
    bool a_edge(edge_select e) const {
        return (rose_a_ && e != edge_select::falling) || (fell_a_ && e != edge_select::rising);
    }
    bool b_edge(edge_select e) const {
        return (rose_b_ && e != edge_select::falling) || (fell_b_ && e != edge_select::rising);
    }

    bool a_ = false, b_ = false;
    bool rose_a_ = false, fell_a_ = false, rose_b_ = false, fell_b_ = false;
};

// Phase: from an edge of A to the next edge of B, as time or as an angle of A's last period.
class phase_check final : public pair_check {
public:
    using pair_check::pair_check;
    std::size_t object_bytes() const override { return sizeof(*this); }

    void on_instant(const std::uint8_t* levels, time_ps at) override {
        step(levels);
        note_change(at);
        if (!in_window(at)) return;
        // A first: B's edge at the same instant as A's is a delay of 0, not a full period.
        if (a_edge(spec_.edge)) {
            has_prev_ = has_last_;
            a_prev_ = a_last_;
            has_last_ = true;
            a_last_ = at;
            pending_ = true;
        }
        if (!b_edge(spec_.response_edge) || !pending_) return;
        pending_ = false;
        const time_ps delay = at - a_last_;
        if (!spec_.phase_as_angle) {
            add_stat(delay);
            const verdict v = judge(delay, 1, 1);
            if (v != verdict::ok)
                fail_span(a_last_, at, [&] {
                    return "phase " + format_time(delay) + " " + failure_phrase(v) + " at " +
                           format_time(at);
                });
            return;
        }
        if (!has_prev_ || a_last_ == a_prev_) return;  // no period of A yet to measure the angle in
        const time_ps period = a_last_ - a_prev_;
        const std::uint64_t shown = ratio_shown(delay, period, micro_degrees_per_turn);
        add_stat(shown);
        const verdict v = judge(delay, period, micro_degrees_per_turn);
        if (v != verdict::ok) {
            fail_span(a_last_, at, [&] {
                return "phase " + value_text(shown) + " (" + format_time(delay) + " of " +
                       format_time(period) + ") " + failure_phrase(v) + " at " + format_time(at);
            });
        }
    }

    void finish(time_ps end) override {
        if (count_ == 0 && !failed_)
            fail_no_data(end, "edge of " + names_[1] + " after an edge of " + names_[0] +
                                  (spec_.phase_as_angle
                                       ? " (with a full period of " + names_[0] + " before it)"
                                       : ""));
        conclude(end, "edge pairs");
    }

private:
    bool pending_ = false;
    bool has_last_ = false, has_prev_ = false;
    time_ps a_last_ = 0, a_prev_ = 0;
};

// Latency: from an event (edge of A) to the response (next edge of B). Events while one waits are
// folded into it, so each latency is measured from the oldest unanswered event (the worst case).
class latency_check final : public pair_check {
public:
    using pair_check::pair_check;
    std::size_t object_bytes() const override { return sizeof(*this); }

    void on_instant(const std::uint8_t* levels, time_ps at) override {
        step(levels);
        note_change(at);
        if (!in_window(at)) return;
        bool answered = false;
        if (pending_ && b_edge(spec_.response_edge)) {
            measure(at);
            answered = true;
        }
        if (a_edge(spec_.edge)) {
            if (!pending_) {
                pending_ = true;
                since_ = at;
            } else {
                ++folded_;
            }
        }
        if (!answered && pending_ && b_edge(spec_.response_edge)) measure(at);
    }

    void finish(time_ps end) override {
        if (pending_) {
            const time_ps stop = std::min(end, until_);
            if (judge(stop - since_, 1, 1) == verdict::above) {
                fail_span(since_, stop, [&] {
                    return "no response on " + names_[1] + " to the event at " +
                           format_time(since_) + " after " + format_time(stop - since_) + ", " +
                           failure_phrase(verdict::above);
                });
            }
        }
        if (count_ == 0 && !failed_)
            fail_no_data(end, "event on " + names_[0] + " answered on " + names_[1]);
        conclude(end, "responses");
    }

private:
    void measure(time_ps at) {
        pending_ = false;
        const time_ps latency = at - since_;
        add_stat(latency);
        const verdict v = judge(latency, 1, 1);
        if (v != verdict::ok) {
            fail_span(since_, at, [&] {
                return "latency " + format_time(latency) + " from the event at " +
                       format_time(since_) + " " + failure_phrase(v) + " at " + format_time(at);
            });
        }
    }
    bool pending_ = false;
    time_ps since_ = 0;
    std::uint64_t folded_ = 0;
};

// Tracks a level condition across instants and reports each time it starts holding inside the
// window (a stretch that began before the window counts at the window's start).
struct hold_tracker {
    bool holding = false;
    bool counted = false;
    time_ps since = 0;

    // The condition is `now` from `at` on; report(t) is called for a new occurrence at t.
    template <class report_fn>
    void update(bool now, time_ps at, time_ps start, time_ps until, report_fn report) {
        if (now && !holding) {
            holding = true;
            since = at;
            counted = at >= start && at <= until;
            if (counted) report(at);
        } else if (!now && holding) {
            holding = false;
            if (!counted && since <= until && at > start) report(std::max(since, start));
        }
    }
    template <class report_fn>
    void finish(time_ps end, time_ps start, time_ps until, report_fn report) {
        if (holding && !counted && since <= until && end >= start) report(std::max(since, start));
    }
};

// Dead time: the gap from one output falling to the other rising, and never both high.
class dead_time_check final : public pair_check {
public:
    using pair_check::pair_check;
    std::size_t object_bytes() const override { return sizeof(*this); }

    void start(const std::uint8_t* levels) override {
        pair_check::start(levels);
        overlap_.update(a_ && b_, 0, start_, until_, [&](time_ps t) { report_overlap(t); });
    }

    void on_instant(const std::uint8_t* levels, time_ps at) override {
        step(levels);
        note_change(at);
        if (in_window(at)) {
            // Falls first, so a fall and the other's rise at one instant are a gap of 0.
            if (fell_a_) {
                has_fall_a_ = true;
                fall_a_ = at;
            }
            if (fell_b_) {
                has_fall_b_ = true;
                fall_b_ = at;
            }
            if (rose_a_ && has_fall_b_ && (!has_fall_a_ || fall_b_ >= fall_a_))
                measure(at - fall_b_, 1, at);
            if (rose_b_ && has_fall_a_ && (!has_fall_b_ || fall_a_ >= fall_b_))
                measure(at - fall_a_, 0, at);
        }
        overlap_.update(a_ && b_, at, start_, until_, [&](time_ps t) { report_overlap(t); });
    }

    void finish(time_ps end) override {
        overlap_.finish(end, start_, until_, [&](time_ps t) { report_overlap(t); });
        if (count_ == 0 && !failed_)
            fail_no_data(end, "gap between " + names_[0] + " and " + names_[1]);
        failures_ -= overlaps_;  // conclude() counts failed gaps; overlaps are reported apart
        conclude(end, "gaps");
        if (overlaps_ > 0)
            detail_ +=
                "; " + std::to_string(overlaps_) + (overlaps_ == 1 ? " overlap" : " overlaps");
    }

private:
    // A gap from output `from` falling to the other rising.
    void measure(time_ps gap, unsigned from, time_ps at) {
        add_stat(gap);
        const verdict v = judge(gap, 1, 1);
        if (v != verdict::ok) {
            fail_span(at - gap, at, [&] {
                return "gap " + format_time(gap) + " from " + names_[from] + " falling to " +
                       names_[1 - from] + " rising " + failure_phrase(v) + " at " + format_time(at);
            });
        }
    }
    void report_overlap(time_ps t) {
        ++overlaps_;
        fail(t,
             [&] { return names_[0] + " and " + names_[1] + " both high at " + format_time(t); });
    }

    hold_tracker overlap_;
    std::uint64_t overlaps_ = 0;
    bool has_fall_a_ = false, has_fall_b_ = false;
    time_ps fall_a_ = 0, fall_b_ = 0;
};

// Never: a level condition that must not hold at any instant of the window.
class never_check final : public check_state {
public:
    explicit never_check(const check_spec& spec)
        : check_state(spec), condition_(condition::parse(spec.condition)) {
        names_ = condition_.signals();
    }
    bool instant_driven() const override { return true; }
    std::size_t object_bytes() const override { return sizeof(*this); }

    void start(const std::uint8_t* levels) override { update(levels, 0); }
    void on_instant(const std::uint8_t* levels, time_ps at) override {
        note_change(at);
        update(levels, at);
    }
    void finish(time_ps end) override {
        tracker_.finish(end, start_, until_, [&](time_ps t) { report(t); });
        finished_ = true;
        end_ = end;
        if (!failed_ && !moved_) {
            fail(std::min(end, until_), [&] {
                return "no signal of the condition changed " + window_text() + " (" +
                       signals_text() + ")";
            });
        }
        if (failed_) {
            detail_ = fail_sentence_;
            if (count_ > 1) detail_ += "; " + std::to_string(count_) + " occurrences";
        } else {
            detail_ = "\"" + spec_.condition + "\" never held " + window_text();
        }
    }

private:
    void update(const std::uint8_t* levels, time_ps at) {
        const bool now =
            condition_.eval([&](std::uint32_t slot) { return levels[ids_[slot]] != 0; });
        tracker_.update(now, at, start_, until_, [&](time_ps t) { report(t); });
    }
    void report(time_ps t) {
        ++count_;
        fail(t, [&] { return "\"" + spec_.condition + "\" held at " + format_time(t); });
    }

    condition condition_;
    hold_tracker tracker_;
};

}  // namespace

std::unique_ptr<check_state> make_check_state(const check_spec& spec) {
    switch (spec.kind) {
        case check_kind::frequency:
        case check_kind::period:
        case check_kind::duty_cycle:
            return std::make_unique<periodic_check>(spec);
        case check_kind::pulse_width:
            return std::make_unique<pulse_check>(spec);
        case check_kind::edge_count:
            return std::make_unique<count_check>(spec);
        case check_kind::phase:
            return std::make_unique<phase_check>(spec);
        case check_kind::latency:
            return std::make_unique<latency_check>(spec);
        case check_kind::dead_time:
            return std::make_unique<dead_time_check>(spec);
        case check_kind::never:
            return std::make_unique<never_check>(spec);
    }
    return nullptr;
}

}  // namespace sim::detail
