// The failure report's waveform memory (sim/report/wave_recorder.h): rings of recent edges, the
// window frozen at a check's first failure with the edges after it, and a bound that does not
// grow with the run.

#include "sim/report/wave_recorder.h"
#include "sim/checks/check_engine.h"

#include <gtest/gtest.h>

namespace {

using sim::time_ps;
using sim::wave_recorder;
using sim::wave_trace;

wave_recorder declared(sim::recorder_limits limits, unsigned signals) {
    wave_recorder r(limits);
    for (unsigned i = 0; i < signals; ++i)
        r.declare(i, sim::signal_info{"t", "s" + std::to_string(i), false});
    r.begin();
    return r;
}

// Toggles signal `id` at every time in [first, last] stepping by `step`, starting from low.
void toggle(wave_recorder& r, sim::signal_id id, time_ps first, time_ps last, time_ps step,
            bool& level) {
    for (time_ps t = first; t <= last; t += step) {
        level = !level;
        r.change(id, level, t);
    }
}

TEST(wave_recorder_test, keeps_the_last_edges_of_a_passed_check) {
    sim::recorder_limits limits;
    limits.ring_edges = 4;
    limits.thumbnail_edges = 3;
    wave_recorder r = declared(limits, 1);
    r.watch({{0}});
    bool level = false;
    toggle(r, 0, 10, 100, 10, level);  // 10 edges: high at 10, low at 20, ... low at 100
    r.end(120);
    const std::vector<wave_trace> t = r.traces(0);
    ASSERT_EQ(t.size(), 1u);
    EXPECT_EQ(t[0].name, "t.s0");
    EXPECT_EQ(t[0].edges, (std::vector<time_ps>{80, 90, 100}));
    // The first edge (at 10) rose, so the one at 80 fell: the level before it was high.
    EXPECT_TRUE(t[0].before);
    EXPECT_EQ(t[0].known_from, 80u);
    EXPECT_EQ(t[0].known_to, 120u);
    EXPECT_FALSE(r.frozen(0));
}

TEST(wave_recorder_test, freezes_the_window_at_the_first_failure_and_keeps_edges_after_it) {
    sim::recorder_limits limits;
    limits.ring_edges = 4;
    limits.after_edges = 2;
    wave_recorder r = declared(limits, 2);
    r.watch({{1}, {0, 1}});
    bool level = false;
    toggle(r, 1, 1, 6, 1, level);
    r.failure_detected(1);
    r.failure_detected(1);  // a second report changes nothing
    toggle(r, 1, 7, 20, 1, level);
    r.end(30);
    ASSERT_TRUE(r.frozen(1));
    EXPECT_FALSE(r.frozen(0));
    const std::vector<wave_trace> t = r.traces(1);
    ASSERT_EQ(t.size(), 2u);
    // Signal 0 never moved: no edge, known from the start to the end.
    EXPECT_TRUE(t[0].edges.empty());
    EXPECT_EQ(t[0].known_from, 0u);
    EXPECT_EQ(t[0].known_to, 30u);
    // Signal 1: the four edges before the failure and the two after; nothing known past them.
    EXPECT_EQ(t[1].edges, (std::vector<time_ps>{3, 4, 5, 6, 7, 8}));
    EXPECT_FALSE(t[1].before);  // the edge at 3 rose
    EXPECT_EQ(t[1].known_from, 3u);
    EXPECT_EQ(t[1].known_to, 8u);
}

TEST(wave_recorder_test, a_failure_reported_before_watch_takes_effect_in_watch) {
    wave_recorder r = declared({}, 1);
    r.failure_detected(0);
    r.watch({{0}});
    r.change(0, true, 5);
    r.end(9);
    ASSERT_TRUE(r.frozen(0));
    EXPECT_EQ(r.traces(0)[0].edges, (std::vector<time_ps>{5}));
}

TEST(wave_recorder_test, ignores_repeated_levels_and_unwatched_signals) {
    wave_recorder r = declared({}, 2);
    r.watch({{0}});
    r.change(0, false, 1);  // already low
    r.change(0, true, 2);
    r.change(0, true, 3);
    r.change(1, true, 4);
    r.end(5);
    EXPECT_EQ(r.traces(0)[0].edges, (std::vector<time_ps>{2}));
    EXPECT_THROW(r.change(0, false, 3), std::logic_error);  // before the change at 4
}

TEST(wave_recorder_test, memory_stays_within_its_bound_however_long_the_run) {
    sim::recorder_limits limits;  // the defaults the runner uses
    wave_recorder r = declared(limits, 3);
    r.watch({{0}, {0, 1}, {2}});
    const std::size_t bound = r.bound_bytes();
    bool a = false, b = false;
    toggle(r, 0, 1, 50'000, 1, a);
    r.failure_detected(1);
    toggle(r, 1, 50'001, 150'000, 1, b);
    r.end(200'000);
    EXPECT_EQ(r.bound_bytes(), bound);
    for (const wave_trace& t : r.traces(1))
        EXPECT_LE(t.edges.size(), limits.ring_edges + limits.after_edges);
    EXPECT_LE(r.traces(0)[0].edges.size(), limits.thumbnail_edges);
    // Rings of 3 signals and frozen room for 3 slots, 8 bytes an edge, plus bookkeeping.
    EXPECT_LT(bound,
              3 * limits.ring_edges * 8 + 3 * (limits.ring_edges + limits.after_edges) * 8 + 4096);
}

// The engine tells the recorder of a check's first failure, and the result names the span of
// the failing measurement, which the frozen window holds.
TEST(wave_recorder_test, the_engine_reports_the_first_failure_and_its_span) {
    sim::check_spec spec;
    spec.name = "period";
    spec.kind = sim::check_kind::period;
    spec.signals = {"t.s0"};
    spec.expected = 100;
    sim::check_engine engine({spec});
    wave_recorder rec;
    std::vector<std::pair<std::size_t, time_ps>> reported;
    engine.set_failure_listener([&](std::size_t c, time_ps at) {
        reported.emplace_back(c, at);
        rec.failure_detected(c);
    });
    const sim::signal_info info{"t", "s0", false};
    engine.declare(0, info);
    rec.declare(0, info);
    engine.begin();
    rec.begin();
    rec.watch({engine.check_signals(0)});
    // Rising edges every 100 ps, then one period of 130 ps (rise at 530), then 100 again.
    time_ps t = 0;
    bool level = false;
    const auto edge = [&](time_ps at) {
        level = !level;
        engine.change(0, level, at);
        rec.change(0, level, at);
    };
    for (int k = 0; k < 5; ++k) {
        edge(t + 100);
        edge(t + 150);
        t += 100;
    }
    edge(t + 130);  // rise at 630: the period from 500 is 130
    edge(t + 180);
    edge(t + 230);
    engine.end(800);
    rec.end(800);
    ASSERT_EQ(reported.size(), 1u);
    EXPECT_EQ(reported[0], (std::pair<std::size_t, time_ps>{0, 630}));
    const sim::check_result& r = engine.results()[0];
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 630u);
    ASSERT_TRUE(r.fail_from.has_value());
    EXPECT_EQ(*r.fail_from, 500u);
    const wave_trace w = rec.traces(0)[0];
    ASSERT_FALSE(w.edges.empty());
    EXPECT_LE(w.edges.front(), 500u);
    EXPECT_EQ(w.edges.back(), 730u);  // the failing rise and the edges after it were kept
}

// Each kind that measures a stretch of time names it as the failing span: a pulse from its start,
// a gap from the fall that opened it, a latency from its event.
TEST(wave_recorder_test, failed_pulses_gaps_and_latencies_name_their_span) {
    sim::check_spec pulse;
    pulse.name = "pulse";
    pulse.kind = sim::check_kind::pulse_width;
    pulse.signals = {"t.a"};
    pulse.maximum = 50;
    sim::check_spec gap;
    gap.name = "gap";
    gap.kind = sim::check_kind::dead_time;
    gap.signals = {"t.a", "t.b"};
    gap.minimum = 20;
    sim::check_spec latency;
    latency.name = "latency";
    latency.kind = sim::check_kind::latency;
    latency.signals = {"t.a", "t.b"};
    latency.maximum = 5;
    sim::check_engine engine({pulse, gap, latency});
    engine.declare(0, sim::signal_info{"t", "a", false});
    engine.declare(1, sim::signal_info{"t", "b", false});
    engine.begin();
    engine.change(0, true, 100);   // a high for 70: too long a pulse, and b answers after 10
    engine.change(0, false, 170);  // a falls at 170
    engine.change(1, true, 180);   // b rises 10 after: too short a gap
    engine.end(300);
    const auto& r = engine.results();
    ASSERT_EQ(r.size(), 3u);
    for (const sim::check_result& x : r) EXPECT_FALSE(x.passed) << x.name;
    EXPECT_EQ(r[0].fail_from, std::optional<time_ps>(100));
    EXPECT_EQ(r[0].at, 170u);
    EXPECT_EQ(r[1].fail_from, std::optional<time_ps>(170));
    EXPECT_EQ(r[1].at, 180u);
    // The event at 100 (a rising) is answered by b's rise at 180.
    EXPECT_EQ(r[2].fail_from, std::optional<time_ps>(100));
    EXPECT_EQ(r[2].at, 180u);
}

}  // namespace
