#pragma once
// The running state of one check inside the check engine, and the factory for each kind.
//
// Each check keeps a fixed handful of integers (last edge, open pulse, pending event, running
// minimum, maximum and sum), never a list of edges, so its memory does not grow with the run. Two
// ways of being fed, chosen by kind:
//   - edge-driven kinds (frequency, period, duty_cycle, pulse_width, edge_count) see every change
//     at once, so a glitch (a rise and a fall at one instant) shows as a zero-length pulse;
//   - instant-driven kinds (phase, latency, dead_time, never) look at the levels once per instant,
//     after every change of that instant, so the order in which a model reports simultaneous
//     changes (a fall of one output and a rise of the other at one time) cannot fake an overlap or
//     a full-period phase. A rise and fall of one signal within one instant is invisible to them.
// Every kind measures inside one window, [from + settle, until] with both ends included: a
// measurement counts when all its edges lie inside, and the kinds whose open measurement can only
// grow (period, frequency, pulse width, latency) judge it when the window closes and fail it if it
// is already too long (docs/scenario.md, "Which periods and pulses a check counts").
// Internal to sim/checks.

#include "sim/checks/check_result.h"
#include "sim/checks/check_spec.h"
#include "sim/clock_domain.h"
#include "sim/signal_sink.h"
#include "sim/wide_int.h"

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <vector>

namespace sim::detail {

class check_state {
public:
    explicit check_state(check_spec spec);
    virtual ~check_state() = default;
    check_state(const check_state&) = delete;
    check_state& operator=(const check_state&) = delete;

    // Whether the engine feeds this check per instant (true) or per change (false).
    virtual bool instant_driven() const = 0;
    // The run begins; levels[ids()[slot]] is each signal's initial level.
    virtual void start(const std::uint8_t* levels) = 0;
    // Edge-driven: signal `slot` took `level` (a real change) at `at`.
    virtual void on_change(unsigned slot, bool level, time_ps at);
    // Instant-driven: every change at `at` is in; levels[ids()[slot]] are the levels from `at` on.
    virtual void on_instant(const std::uint8_t* levels, time_ps at);
    // The run ended at `end`: decide the verdict.
    virtual void finish(time_ps end) = 0;

    const check_spec& spec() const { return spec_; }
    // The signal names this check watches, slot by slot.
    const std::vector<std::string>& signal_names() const { return names_; }
    // Called once, when the check first fails, with the failure's time (which may lie before the
    // instant of the change that revealed it).
    void on_first_failure(std::function<void(time_ps)> hook) { first_failure_ = std::move(hook); }
    // Signal id of each slot (set by the engine before start()).
    void bind(std::vector<signal_id> ids) { ids_ = std::move(ids); }
    const std::vector<signal_id>& ids() const { return ids_; }
    // The finished check (after finish()).
    check_result result() const;
    // Bytes this check holds, heap included; constant once the run has begun.
    std::size_t footprint_bytes() const;
    // sizeof the most derived object.
    virtual std::size_t object_bytes() const = 0;

protected:
    // Result of comparing one value with the expectation.
    enum class verdict : std::int8_t { below = -1, ok = 0, above = 1 };

    bool in_window(time_ps t) const { return t >= start_ && t <= until_; }
    // Notes a change at `at` for the "signal never moved" rule.
    void note_change(time_ps at) {
        if (in_window(at)) moved_ = true;
    }
    // The value X * W / T in the check's unit (T = W = 1 for times and counts) against the
    // expectation: expected with tolerance, or bounds. Ticks tolerances apply to the time X.
    verdict judge(u128 x, u128 t, u128 w) const;
    // A frequency check's period T ps against expected_frequency and the tolerance.
    verdict judge_frequency(time_ps period) const;
    // Counts one measured value (display value `shown` in the stat unit: ps, ppb, micro-degrees).
    void add_stat(std::uint64_t shown);
    // Records one failure at `at`; the earliest failure's sentence is kept. make_sentence() is
    // called only when its sentence is kept, so repeated failures allocate nothing.
    template <class sentence_fn>
    void fail(time_ps at, sentence_fn make_sentence) {
        fail_span(at, at, make_sentence, false);
    }
    // fail() for a measurement that spans [from, at] (a period, a pulse, a gap, a delay): the
    // report draws that span.
    template <class sentence_fn>
    void fail_span(time_ps from, time_ps at, sentence_fn make_sentence, bool spans = true) {
        ++failures_;
        if (failed_ && at >= fail_at_) return;
        const bool first = !failed_;
        failed_ = true;
        fail_at_ = at;
        fail_from_ = from;
        fail_spans_ = spans;
        fail_sentence_ = make_sentence();
        if (first && first_failure_) first_failure_(at);
    }
    // "exceeds 40 us +/- 100 ppm" / "is below the minimum 2 us".
    std::string failure_phrase(verdict v) const;
    // A stat-unit value in words ("40.002 us", "25.1 %", "120 deg", "7 edges").
    std::string value_text(std::uint64_t shown) const;

    // "during the run" or "between 1 ms and 2 ms".
    std::string window_text() const;
    // The watched signals in words ("pwm.channel1", "a and b").
    std::string signals_text() const;
    // Failure sentence for no data; `what` names what could not be measured.
    void fail_no_data(time_ps end, const std::string& what);
    // Sets the pass/fail detail at the end, from the measurements.
    void conclude(time_ps end, const char* noun_plural);
    // conclude() for the kinds that judge a measurement still open when the window closed (set
    // open_failed_ when it failed): that one is not among the `noun_plural` counted, and the
    // detail names it when an earlier failure holds the sentence.
    void conclude_open(time_ps end, const char* noun_plural, const char* noun);

    check_spec spec_;
    std::vector<std::string> names_;
    std::vector<signal_id> ids_;
    time_ps start_ = 0;
    time_ps until_ = max_time_ps;
    bool moved_ = false;

    std::uint64_t count_ = 0;
    std::uint64_t min_ = 0;
    std::uint64_t max_ = 0;
    u128 sum_ = 0;

    std::uint64_t failures_ = 0;
    bool open_failed_ = false;  // a measurement still open when the window closed failed
    bool failed_ = false;
    time_ps fail_at_ = 0;
    time_ps fail_from_ = 0;
    bool fail_spans_ = false;
    std::string fail_sentence_;
    std::function<void(time_ps)> first_failure_;

    bool finished_ = false;
    time_ps end_ = 0;
    std::string detail_;
    std::string expected_text_;
    std::string tolerance_text_;
};

// A new running check for `spec` (which must be valid).
std::unique_ptr<check_state> make_check_state(const check_spec& spec);

// Exact decimal text of value / 10^digits, trailing zeros dropped ("0.5", "25").
std::string fixed_text(u128 value, unsigned digits);

}  // namespace sim::detail
