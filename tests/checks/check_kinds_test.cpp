// Each check kind on hand-made edge sequences: pass and fail, tolerance kinds, windows, glitches,
// and the "no data is not a pass" rule.

#include "tests/checks/edge_script.h"

#include <gtest/gtest.h>

namespace {

using sim::check_kind;
using sim::check_spec;
using sim::tolerance;
using tickbench::test_support::edge_script;

constexpr sim::time_ps ns = 1'000;
constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps ms = 1'000'000'000;

check_spec make(check_kind kind, std::vector<std::string> signals, std::string name = "c") {
    check_spec s;
    s.name = std::move(name);
    s.kind = kind;
    s.signals = std::move(signals);
    return s;
}

sim::check_result run_one(const edge_script& script, const check_spec& spec, sim::time_ps end) {
    const auto results = script.run({spec}, end);
    EXPECT_EQ(results.size(), 1u);
    return results.at(0);
}

TEST(check_kinds_test, period_passes_on_a_steady_square_wave) {
    edge_script s;
    s.signal("pwm.a").square("pwm.a", 0, 40 * us, 10 * us, 100);
    check_spec c = make(check_kind::period, {"pwm.a"});
    c.expected = 40 * us;
    c.tol = tolerance::relative_ppb(100'000);
    const auto r = run_one(s, c, 4 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 99u);
    EXPECT_DOUBLE_EQ(*r.min, 40e-6);
    EXPECT_DOUBLE_EQ(*r.mean, 40e-6);
    EXPECT_DOUBLE_EQ(*r.max, 40e-6);
    EXPECT_EQ(r.at, 4 * ms);
    EXPECT_EQ(r.unit, "s");
    EXPECT_EQ(r.tolerance_text, "100 ppm");
    EXPECT_EQ(r.detail, "99 periods, all within 40 us +/- 100 ppm");
}

TEST(check_kinds_test, period_fails_one_tick_outside_a_ppm_tolerance_at_the_exact_edge) {
    // 100 ppm of 40 us is 4 ns: 4 ns passes, 4.001 ns does not.
    edge_script s;
    s.signal("a");
    s.set("a", true, 0).set("a", false, 10 * us);
    s.set("a", true, 40 * us + 4 * ns).set("a", false, 50 * us);      // +4 ns: inside
    s.set("a", true, 80 * us + 8 * ns + 1).set("a", false, 90 * us);  // +4.001 ns: outside
    s.set("a", true, 120 * us + 8 * ns + 1);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.tol = tolerance::relative_ppb(100'000);
    const auto r = run_one(s, c, 130 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 80 * us + 8 * ns + 1);
    EXPECT_EQ(r.count, 3u);
    EXPECT_EQ(r.detail, "period 40.004001 us exceeds 40 us +/- 100 ppm at 80.008001 us");
}

TEST(check_kinds_test, period_absolute_and_tick_tolerances) {
    // Edges of a 48 MHz clock lie on whole ps after rounding: one tick (62500/3 ps) of deviation
    // measures 20833 or 20834 ps, and a 1-tick tolerance must accept both.
    edge_script s;
    s.signal("a");
    s.set("a", true, 0).set("a", false, 1 * us);
    s.set("a", true, 40 * us + 20'833).set("a", false, 41 * us);
    s.set("a", true, 80 * us + 20'833 + 20'834).set("a", false, 81 * us);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.tol = tolerance::ticks_of(1, "timer_clock", sim::frequency::hz(48'000'000));
    auto r = run_one(s, c, 120 * us);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.tolerance_text, "1 tick of timer_clock");
    s.set("a", true,
          120 * us + 20'833 + 20'834 + 41'667 + 2);  // two ticks late (and 1 ps beyond rounding)
    r = run_one(s, c, 150 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_NE(r.detail.find("exceeds 40 us +/- 1 tick of timer_clock"), std::string::npos)
        << r.detail;

    c.tol = tolerance::absolute_units(20 * ns);
    r = run_one(s, c, 150 * us);
    EXPECT_FALSE(r.passed);  // 20.833 ns is beyond 20 ns
    EXPECT_EQ(r.at, 40 * us + 20'833);
    EXPECT_EQ(r.tolerance_text, "20 ns");
}

TEST(check_kinds_test, frequency_checks_each_period_exactly) {
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 20 * us, 50);
    check_spec c = make(check_kind::frequency, {"a"});
    c.expected_frequency = sim::frequency::hz(25'000);
    auto r = run_one(s, c, 2 * ms);
    EXPECT_TRUE(r.passed) << r.detail;  // exact
    EXPECT_EQ(r.unit, "Hz");
    EXPECT_DOUBLE_EQ(*r.mean, 25'000.0);
    EXPECT_DOUBLE_EQ(*r.expected, 25'000.0);

    // 25 kHz + 1 Hz: the period is 1e12 / 25001 ps, not whole; 39998 ns + ... is below.
    edge_script t;
    t.signal("a");
    t.set("a", true, 0)
        .set("a", false, 10 * us)
        .set("a", true, 39'998'400)
        .set("a", false, 50 * us);
    t.set("a", true, 79'996'800);
    c.tol = tolerance::absolute_hz(sim::frequency::hz(1));
    r = run_one(t, c, 100 * us);  // 1e12 / 39998400 = 25001.000... Hz: just above 25001
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 39'998'400u);
    EXPECT_NE(r.detail.find("frequency 25001.00004 Hz"), std::string::npos) << r.detail;
    EXPECT_NE(r.detail.find("exceeds 25 kHz +/- 1 Hz"), std::string::npos) << r.detail;
    c.tol = tolerance::relative_ppb(41'000);  // 41 ppm of 25 kHz is 1.025 Hz
    r = run_one(t, c, 100 * us);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 2u);
}

TEST(check_kinds_test, duty_cycle_with_absolute_points) {
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 10);
    s.set("a", true, 400 * us).set("a", false, 410 * us + 400 * ns);  // 26 %
    s.set("a", true, 440 * us);
    check_spec c = make(check_kind::duty_cycle, {"a"});
    c.expected = 250'000'000;                      // 25 %
    c.tol = tolerance::absolute_units(5'000'000);  // 0.5 % points
    const auto r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.count, 11u);
    EXPECT_EQ(r.unit, "%");
    EXPECT_DOUBLE_EQ(*r.min, 25.0);
    EXPECT_DOUBLE_EQ(*r.max, 26.0);
    EXPECT_EQ(r.at, 440 * us);
    EXPECT_EQ(r.detail, "duty cycle 26 % (high 10.4 us of 40 us) exceeds 25 % +/- 0.5 % at 440 us");
}

TEST(check_kinds_test, pulse_width_bounds_catch_a_glitch) {
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 5);
    s.set("a", true, 300 * us).set("a", false, 300 * us);  // zero-width glitch at one instant
    check_spec c = make(check_kind::pulse_width, {"a"});
    c.minimum = 9 * us;
    c.maximum = 11 * us;
    const auto r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.count, 6u);
    EXPECT_EQ(r.at, 300 * us);
    EXPECT_EQ(r.detail, "high pulse 0 ps is below the minimum 9 us at 300 us");
    EXPECT_DOUBLE_EQ(*r.expected_min, 9e-6);
    EXPECT_FALSE(r.expected.has_value());

    c.high_pulses = false;  // low pulses are 30 us
    c.minimum = 29 * us;
    c.maximum = 31 * us;
    c.until = 200 * us;
    const auto low = run_one(s, c, 1 * ms);
    EXPECT_TRUE(low.passed) << low.detail;
    EXPECT_EQ(low.count, 4u);
}

TEST(check_kinds_test, a_pulse_stuck_open_past_its_maximum_fails) {
    edge_script s;
    s.signal("a").set("a", true, 10 * us).set("a", false, 12 * us).set("a", true, 20 * us);
    check_spec c = make(check_kind::pulse_width, {"a"});
    c.maximum = 5 * us;
    const auto r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 100 * us);
    EXPECT_NE(r.detail.find("still open after 80 us"), std::string::npos) << r.detail;
}

TEST(check_kinds_test, edge_count_exact_bounds_and_zero) {
    edge_script s;
    s.signal("a").signal("quiet").square("a", 0, 10 * us, 5 * us, 10);
    check_spec c = make(check_kind::edge_count, {"a"});
    c.expected = 10;
    EXPECT_TRUE(run_one(s, c, 1 * ms).passed);
    c.edge = sim::edge_select::both;
    c.expected = 20;
    EXPECT_TRUE(run_one(s, c, 1 * ms).passed);
    c.expected.reset();
    c.maximum = 15;
    auto r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 75 * us);  // the 16th edge: the fall at 75 us
    EXPECT_EQ(r.count, 20u);
    EXPECT_EQ(r.unit, "edges");

    check_spec q = make(check_kind::edge_count, {"quiet"});
    q.expected = 0;
    r = run_one(s, q, 1 * ms);
    EXPECT_TRUE(r.passed)
        << r.detail;  // 0 expected on a signal that never moved: the one pass on no data
    q.expected = 3;
    r = run_one(s, q, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.detail, "quiet never changed during the run; expected 3 edges exactly");
}

TEST(check_kinds_test, a_signal_that_never_moved_fails_every_measuring_kind) {
    edge_script s;
    s.signal("a", true).signal("b");
    for (check_kind k : {check_kind::period, check_kind::duty_cycle, check_kind::pulse_width}) {
        check_spec c = make(k, {"a"});
        c.expected = k == check_kind::duty_cycle ? 500'000'000 : 40 * us;
        const auto r = run_one(s, c, 1 * ms);
        EXPECT_FALSE(r.passed) << to_string(k);
        EXPECT_EQ(r.detail, "a never changed during the run") << to_string(k);
        EXPECT_EQ(r.at, 1 * ms);
        EXPECT_EQ(r.count, 0u);
        EXPECT_FALSE(r.mean.has_value());
    }
    check_spec n = make(check_kind::never, {});
    n.condition = "a and b";
    const auto r = run_one(s, n, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.detail, "no signal of the condition changed during the run (a and b)");
}

TEST(check_kinds_test, window_and_settle_skip_start_up) {
    // Irregular start-up periods, then steady 40 us from 1 ms on.
    edge_script s;
    s.signal("a");
    s.square("a", 0, 30 * us, 10 * us, 10);
    s.square("a", 1 * ms, 40 * us, 10 * us, 50);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    auto r = run_one(s, c, 4 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 30 * us);
    c.settle = 1 * ms;
    c.until = 3 * ms;  // the wave stops after its last rise at 2.96 ms
    r = run_one(s, c, 4 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 49u);
    c.settle = 0;
    c.from = 1 * ms;
    c.until = 2 * ms;  // rises at 1 ms + k * 40 us up to 2 ms: 26 rises, 25 periods
    r = run_one(s, c, 4 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 25u);
    c.from = 3 * ms;
    c.until = 4 * ms;  // the wave stopped at 3 ms
    r = run_one(s, c, 4 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.detail, "a never changed between 3 ms and 4 ms");
    EXPECT_EQ(r.at, 4 * ms);
}

TEST(check_kinds_test, phase_as_time_and_angle_with_coincident_edges) {
    edge_script s;
    s.signal("a").signal("b").signal("c");
    for (unsigned k = 0; k < 20; ++k) {
        // b is reported before a at the same instant: still a phase of 0, not a full period.
        s.set("b", true, k * 30 * us)
            .set("a", true, k * 30 * us)
            .set("c", true, k * 30 * us + 10 * us);
        s.set("a", false, k * 30 * us + 5 * us)
            .set("b", false, k * 30 * us + 5 * us)
            .set("c", false, k * 30 * us + 15 * us);
    }
    check_spec c = make(check_kind::phase, {"a", "c"});
    c.phase_as_angle = true;
    c.expected = 120'000'000;  // 120 deg
    c.tol = tolerance::absolute_units(1'000);
    auto r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 19u);  // the first pair has no period of a before it
    EXPECT_EQ(r.unit, "deg");
    EXPECT_DOUBLE_EQ(*r.mean, 120.0);

    c.phase_as_angle = false;
    c.expected = 10 * us;
    c.tol = {};
    r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 20u);

    check_spec z = make(check_kind::phase, {"a", "b"});
    z.expected = 0;
    r = run_one(s, z, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_DOUBLE_EQ(*r.max, 0.0);

    c.expected = 9 * us;
    c.tol = tolerance::absolute_units(500 * ns);
    r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.detail, "phase 10 us exceeds 9 us +/- 500 ns at 10 us; 20 of 20 edge pairs failed");
}

TEST(check_kinds_test, dead_time_gap_minimum_and_overlap) {
    edge_script s;
    s.signal("h").signal("l");
    for (unsigned k = 0; k < 10; ++k) {
        const sim::time_ps t = k * 40 * us;
        s.set("h", true, t + 1 * us).set("h", false, t + 10 * us);
        s.set("l", true, t + 11 * us).set("l", false, t + 40 * us);
    }
    check_spec c = make(check_kind::dead_time, {"h", "l"});
    c.minimum = 1 * us;
    auto r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 19u);  // 10 falls of h followed by l, 9 falls of l followed by h
    EXPECT_DOUBLE_EQ(*r.min, 1e-6);
    EXPECT_EQ(r.signal, "h / l");

    c.minimum = 2 * us;
    r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 11 * us);
    EXPECT_EQ(r.detail,
              "gap 1 us from h falling to l rising is below the minimum 2 us at 11 us; 19 of 19 "
              "gaps failed");

    // A fall and the other's rise at one instant is a gap of 0, not an overlap, in either order.
    edge_script z;
    z.signal("h", true).signal("l");
    z.set("l", true, 10 * us)
        .set("h", false, 10 * us)
        .set("l", false, 20 * us)
        .set("h", true, 20 * us);
    c.minimum = 0;
    r = run_one(z, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 2u);

    // Both high for 1 ns: an overlap, failing at its start.
    s.set("h", true, 500 * us)
        .set("l", true, 500 * us + 500 * ns)
        .set("h", false, 500 * us + 501 * ns);
    s.set("l", false, 520 * us);
    c.minimum = 1 * us;
    r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 500 * us + 500 * ns);
    EXPECT_EQ(r.detail, "h and l both high at 500.5 us; 1 overlap");
}

TEST(check_kinds_test, latency_maximum_and_missing_response) {
    edge_script s;
    s.signal("req").signal("ack");
    s.set("req", true, 10 * us)
        .set("ack", true, 13 * us)
        .set("req", false, 20 * us)
        .set("ack", false, 21 * us);
    s.set("req", true, 30 * us)
        .set("ack", true, 37 * us)
        .set("req", false, 40 * us)
        .set("ack", false, 41 * us);
    check_spec c = make(check_kind::latency, {"req", "ack"});
    c.maximum = 5 * us;
    auto r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.count, 2u);
    EXPECT_EQ(r.at, 37 * us);
    EXPECT_EQ(r.detail, "latency 7 us from the event at 30 us is above the maximum 5 us at 37 us");
    EXPECT_DOUBLE_EQ(*r.max, 7e-6);

    c.maximum = 8 * us;
    r = run_one(s, c, 100 * us);
    EXPECT_TRUE(r.passed) << r.detail;
    s.set("req", true, 50 * us);  // never answered
    r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 100 * us);
    EXPECT_NE(r.detail.find("no response on ack to the event at 50 us after 50 us"),
              std::string::npos)
        << r.detail;
}

TEST(check_kinds_test, never_condition_with_windows_and_same_instant_swaps) {
    edge_script s;
    s.signal("bridge.high").signal("bridge.low", true).signal("fault");
    // A clean swap at 10 us (reported in the "wrong" order), a real overlap from 50 us to 52 us.
    s.set("bridge.high", true, 10 * us).set("bridge.low", false, 10 * us);
    s.set("bridge.high", false, 30 * us).set("bridge.low", true, 30 * us);
    s.set("bridge.high", true, 50 * us).set("bridge.low", false, 52 * us);
    s.set("bridge.high", false, 60 * us).set("bridge.low", true, 61 * us);
    check_spec c = make(check_kind::never, {});
    c.condition = "bridge.high and bridge.low and not fault";
    auto r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 50 * us);
    EXPECT_EQ(r.count, 1u);
    EXPECT_EQ(r.unit, "occurrences");
    EXPECT_EQ(r.detail, "\"bridge.high and bridge.low and not fault\" held at 50 us");
    EXPECT_EQ(r.signal, c.condition);

    c.until = 40 * us;
    r = run_one(s, c, 100 * us);
    EXPECT_TRUE(r.passed) << r.detail;
    c.until.reset();
    c.from = 51 * us;  // inside the overlap: it counts at the window's start
    r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 51 * us);
    c.from = 0;
    c.condition = "(high and low) or (not high and not low)";  // bare names resolve when unique
    r = run_one(s, c, 100 * us);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.count, 2u);  // the overlap, and both low from 60 us to 61 us
}

// The window rules of docs/scenario.md ("Which periods and pulses a check counts"): a measurement
// counts when both its edges lie in [from + settle, until], both ends included.

TEST(check_kinds_test, window_edges_exactly_at_from_and_until_count) {
    // Rises at 100, 140, ..., 300 us; each high for 10 us.
    edge_script s;
    s.signal("a").square("a", 100 * us, 40 * us, 10 * us, 6);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.from = 100 * us;   // the rise at 100 us starts the first period
    c.until = 300 * us;  // the rise at 300 us ends the last one
    auto r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 5u);
    EXPECT_EQ(r.at, 1 * ms);
    EXPECT_EQ(r.detail, "5 periods, all 40 us exactly");

    // One picosecond later on either side loses the period at that side.
    c.from = 100 * us + 1;
    c.until = 300 * us - 1;
    r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 3u);

    // settle moves the start: from 60 us + 40 us of settling is 100 us, included.
    c.from = 60 * us;
    c.settle = 40 * us;
    c.until = 300 * us;
    EXPECT_EQ(run_one(s, c, 1 * ms).count, 5u);

    // Pulses and edges alike: the high pulse from 100 us to 110 us counts from `from` = 100 us,
    // and the fall at 310 us ends a pulse with `until` = 310 us.
    check_spec p = make(check_kind::pulse_width, {"a"});
    p.expected = 10 * us;
    p.from = 100 * us;
    p.until = 310 * us;
    r = run_one(s, p, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 6u);
    check_spec e = make(check_kind::edge_count, {"a"});
    e.edge = sim::edge_select::both;
    e.from = 100 * us;
    e.until = 310 * us;
    e.expected = 12;
    r = run_one(s, e, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
}

TEST(check_kinds_test, window_first_edge_after_from_only_starts_a_measurement) {
    // High from 90 us to 110 us, then rises every 40 us from 140 us.
    edge_script s;
    s.signal("a").set("a", true, 90 * us).set("a", false, 110 * us);
    s.square("a", 140 * us, 40 * us, 10 * us, 4);
    // The first edge after `from` is a fall: it starts nothing; the first rise starts the first
    // period, and the pulse that began before `from` is not measured.
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.from = 100 * us;
    c.until = 300 * us;
    auto r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 3u);
    check_spec p = make(check_kind::pulse_width, {"a"});
    p.maximum = 15 * us;  // the 20 us pulse straddling `from` would fail
    p.from = 100 * us;
    p.until = 300 * us;
    r = run_one(s, p, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 4u);
}

TEST(check_kinds_test, window_a_period_or_pulse_straddling_until_is_not_measured) {
    // Periods of 40 us, high for 10 us, from 0; `until` falls inside the period from 80 us.
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 5);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.until = 105 * us;
    auto r = run_one(s, c, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 2u);  // 0-40 and 40-80; 80-120 straddles `until`
    check_spec p = make(check_kind::pulse_width, {"a"});
    p.expected = 10 * us;
    p.until = 85 * us;  // inside the pulse from 80 us to 90 us
    r = run_one(s, p, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_EQ(r.count, 2u);
}

TEST(check_kinds_test, window_a_pulse_still_open_at_until_fails_when_already_too_long) {
    // A pulse from 100 us stuck high until 900 us: by `until` = 500 us it is already 400 us long.
    // It fails at `until` whether it ends after `until` or never, as an unanswered latency event
    // does.
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 2).set("a", true, 100 * us);
    check_spec p = make(check_kind::pulse_width, {"a"});
    p.maximum = 20 * us;
    p.until = 500 * us;
    auto r = run_one(s, p, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 500 * us);
    EXPECT_EQ(r.detail,
              "high pulse from 100 us still open after 400 us, is above the maximum 20 us");
    s.set("a", false, 900 * us);
    r = run_one(s, p, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 500 * us);
    EXPECT_EQ(r.count, 2u);
    EXPECT_EQ(r.detail,
              "high pulse from 100 us still open after 400 us, is above the maximum 20 us");
    // Still within the maximum at `until`: not measured, no verdict on it.
    p.until = 110 * us;
    r = run_one(s, p, 1 * ms);
    EXPECT_TRUE(r.passed) << r.detail;
}

TEST(check_kinds_test, window_a_signal_that_stops_inside_it_fails_period_and_frequency) {
    // A 25 kHz wave that stops after its rise at 160 us, in a window running to 1 ms.
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 5);
    check_spec c = make(check_kind::period, {"a"});
    c.expected = 40 * us;
    c.tol = tolerance::relative_ppb(100'000);
    auto r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.count, 4u);
    EXPECT_EQ(r.at, 1 * ms);
    EXPECT_EQ(r.detail,
              "no rising edge of a since 160 us: the period still open at 1 ms is already 840 us, "
              "so its length exceeds 40 us +/- 100 ppm");
    check_spec f = make(check_kind::frequency, {"a"});
    f.expected_frequency = sim::frequency::hz(25'000);
    r = run_one(s, f, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.detail,
              "no rising edge of a since 160 us: the period still open at 1 ms is already 840 us, "
              "so its frequency falls short of 25 kHz exactly");
    // With an earlier failure, the open period is named after it and not counted among them.
    s.set("a", true, 200 * us + 5 * ns).set("a", false, 210 * us);
    r = run_one(s, c, 1 * ms);
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 200 * us + 5 * ns);
    EXPECT_EQ(r.detail,
              "period 40.005 us exceeds 40 us +/- 100 ppm at 200.005 us; the last period, still "
              "open when the window closed, was already too long");
    // The window ends where the wave does: the period open at `until` is no longer than 40 us.
    c.until = 200 * us;  // just before the late rise
    EXPECT_TRUE(run_one(s, c, 1 * ms).passed);
    // A duty cycle bounds no period: it judges complete periods only.
    check_spec d = make(check_kind::duty_cycle, {"a"});
    d.expected = 250'000'000;
    r = run_one(s, d, 1 * ms);
    EXPECT_FALSE(r.passed);  // 10 us of the 40.005 us period is not exactly 25 %
    EXPECT_EQ(r.count, 5u);
}

TEST(check_kinds_test, window_period_changes_are_judged_per_period) {
    // Two periods of 40 us at 25 % high, then two of 50 us at 50 % high.
    edge_script s;
    s.signal("a").square("a", 0, 40 * us, 10 * us, 2).square("a", 80 * us, 50 * us, 25 * us, 2);
    s.set("a", true, 180 * us);
    check_spec f = make(check_kind::frequency, {"a"});
    f.expected_frequency = sim::frequency::hz(25'000);
    f.until = 180 * us;
    auto r = run_one(s, f, 180 * us);
    // Each period is one frequency: 25 kHz twice, then 20 kHz twice.
    EXPECT_FALSE(r.passed);
    EXPECT_EQ(r.at, 130 * us);
    EXPECT_EQ(r.count, 4u);
    EXPECT_DOUBLE_EQ(*r.min, 20'000.0);
    EXPECT_DOUBLE_EQ(*r.max, 25'000.0);
    // The mean is periods over their total time: 4 periods in 180 us.
    EXPECT_DOUBLE_EQ(*r.mean, 4 / 180e-6);
    // A duty cycle is high time over its own period, each period alone; the mean is the plain
    // mean of the periods' values, not weighted by their length.
    check_spec d = make(check_kind::duty_cycle, {"a"});
    d.minimum = 200'000'000;
    d.maximum = 600'000'000;
    r = run_one(s, d, 180 * us);
    EXPECT_TRUE(r.passed) << r.detail;
    EXPECT_DOUBLE_EQ(*r.min, 25.0);
    EXPECT_DOUBLE_EQ(*r.max, 50.0);
    EXPECT_DOUBLE_EQ(*r.mean, 37.5);
}

TEST(check_kinds_test, an_unknown_signal_name_is_refused_at_begin) {
    edge_script s;
    s.signal("pwm.a");
    check_spec c = make(check_kind::period, {"pwm.b"}, "p");
    c.expected = 1;
    try {
        s.run({c}, 1);
        FAIL() << "no error";
    } catch (const std::invalid_argument& e) {
        EXPECT_STREQ(e.what(), "check 'p': no signal named 'pwm.b'; declared signals: pwm.a");
    }
}

}  // namespace
