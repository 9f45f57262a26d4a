// The failure report page (sim/report/report_html.h): round time-axis labels, the window chosen
// around a failure, the cap on points per trace, and a page that fetches nothing.

#include "sim/report/report_html.h"

#include <gtest/gtest.h>

#include <algorithm>

namespace {

using sim::time_ps;
using sim::wave_trace;

std::vector<std::string> labels(const sim::time_axis& a) {
    std::vector<std::string> out;
    for (const sim::axis_tick& t : a.ticks) out.push_back(t.label);
    return out;
}

// A square wave: edges every `half` ps from `first` to `last`, starting low.
wave_trace square(time_ps first, time_ps last, time_ps half) {
    wave_trace t;
    t.name = "pwm.out";
    for (time_ps at = first; at <= last; at += half) t.edges.push_back(at);
    t.known_to = last + half;
    return t;
}

// Axis steps of 1, 2 or 5 times a power of ten, labelled in whole units: common practice for
// plot axes, no source.
TEST(report_html_test, the_time_axis_has_round_steps_in_whole_units) {
    const sim::time_axis a = sim::make_time_axis(0, 330'000'000, 8);
    EXPECT_EQ(a.step, 50'000'000u);
    EXPECT_EQ(a.unit, "us");
    EXPECT_EQ(labels(a), (std::vector<std::string>{"0 us", "50 us", "100 us", "150 us", "200 us",
                                                   "250 us", "300 us"}));
    // A short window far into the run: ticks on multiples of the step, in ns.
    const sim::time_axis b = sim::make_time_axis(1'200'000'095'000ULL, 1'200'000'160'000ULL, 8);
    EXPECT_EQ(b.step, 10'000u);
    EXPECT_EQ(b.unit, "ns");
    EXPECT_EQ(labels(b).front(), "1200000100 ns");
    EXPECT_EQ(labels(b).back(), "1200000160 ns");
    // Picoseconds, and seconds.
    EXPECT_EQ(
        labels(sim::make_time_axis(0, 7, 8)),
        (std::vector<std::string>{"0 ps", "1 ps", "2 ps", "3 ps", "4 ps", "5 ps", "6 ps", "7 ps"}));
    const sim::time_axis s = sim::make_time_axis(0, 20'000'000'000'000ULL, 6);
    EXPECT_EQ(s.step, 5'000'000'000'000ULL);
    EXPECT_EQ(labels(s).back(), "20 s");
    // A 2 ms step is labelled in ms, a 20 ns one in ns.
    EXPECT_EQ(sim::make_time_axis(0, 14'000'000'000ULL, 8).unit, "ms");
    EXPECT_EQ(sim::make_time_axis(0, 150'000, 8).step, 20'000u);
    for (unsigned max : {2u, 3u, 5u, 8u, 11u}) {
        const sim::time_axis x = sim::make_time_axis(123'456, 98'765'432, max);
        EXPECT_LE(x.ticks.size(), max);
        EXPECT_GE(x.ticks.size(), 1u);
    }
}

TEST(report_html_test, the_window_holds_the_failure_and_a_few_edges_each_side) {
    // 40 us periods for a whole second (50 000 edges); the failing period is 2 ms in.
    const wave_trace t = square(0, 1'000'000'000'000ULL, 20'000'000);
    sim::window_limits limits;
    const sim::time_window w = sim::select_window({t}, 2'000'000'000, 2'040'000'000, limits);
    EXPECT_LE(w.from, 2'000'000'000u);
    EXPECT_GE(w.to, 2'040'000'000u);
    std::size_t inside = 0;
    for (time_ps e : t.edges) inside += e >= w.from && e <= w.to ? 1 : 0;
    // The focus's 3 edges and at most context_edges more on each side, and the margin may show
    // one more on each side.
    EXPECT_LE(inside, 3 + 2 * limits.context_edges + 2);
    EXPECT_GE(inside, 3 + 2 * limits.context_edges - 2);
}

TEST(report_html_test, the_window_narrows_so_that_dense_edges_stay_apart) {
    // A slow signal fails over [1 ms, 1.5 ms] while a fast one toggles every 10 ns around it: at
    // 4 px per edge in 760 px no more than 190 edges' worth of 10 ns fit, so the window stops
    // widening near the focus instead of taking in the fast signal's edges.
    wave_trace slow;
    slow.name = "slow";
    slow.edges = {1'000'000'000, 1'500'000'000};
    slow.known_to = 3'000'000'000;
    const wave_trace fast = square(0, 3'000'000'000, 10'000);
    sim::window_limits limits;
    const sim::time_window w =
        sim::select_window({slow, fast}, 1'000'000'000, 1'500'000'000, limits);
    EXPECT_LE(w.from, 1'000'000'000u);
    EXPECT_GE(w.to, 1'500'000'000u);
    // Nothing beyond the focus and its margin: the next fast edge outside would be 10 ns from
    // its neighbour, far under 4 px of a 500 us window.
    EXPECT_LT(w.to - w.from, 600'000'000u);
    // With a focus of one instant and only the fast signal, edges 10 ns apart are added while
    // they stay 4 px apart: the window keeps to a few of them.
    const sim::time_window p = sim::select_window({fast}, 1'000'005'000, 1'000'005'000, limits);
    EXPECT_LT(p.to - p.from, 400'000u);
    EXPECT_LE(p.from, 1'000'005'000u);
    EXPECT_GE(p.to, 1'000'005'000u);
}

TEST(report_html_test, a_focus_with_no_edges_shows_what_is_known) {
    wave_trace flat;
    flat.name = "idle";
    flat.known_to = 5'000'000;
    const sim::time_window w = sim::select_window({flat}, 2'000'000, 2'000'000, {});
    EXPECT_EQ(w.from, 0u);
    EXPECT_GE(w.to, 5'000'000u);
}

TEST(report_html_test, a_trace_path_follows_the_edges) {
    wave_trace t;
    t.name = "x";
    t.before = false;
    t.edges = {100, 300};
    t.known_to = 1000;
    // 100 px over 1000 ps: an edge every 10 px per 100 ps; high at y 10, low at y 30.
    EXPECT_EQ(sim::trace_path(t, {0, 1000}, 100, 10, 20, 100), "M0 30 H10 V10 H30 V30 H100");
    // A window inside the known stretch starts at the level there.
    EXPECT_EQ(sim::trace_path(t, {200, 400}, 100, 10, 20, 100), "M0 10 H50 V30 H100");
    // Not known before 250: the path starts there.
    t.known_from = 250;
    EXPECT_EQ(sim::trace_path(t, {200, 400}, 100, 10, 20, 100), "M25 10 H50 V30 H100");
}

TEST(report_html_test, a_trace_path_never_exceeds_its_point_cap) {
    const wave_trace t = square(0, 10'000'000, 1'000);  // 10 000 edges
    for (std::size_t cap : {10u, 50u, 600u, 5000u}) {
        const std::string d = sim::trace_path(t, {0, 10'000'000}, 750, 0, 20, cap);
        EXPECT_LE(sim::path_points(d), cap) << "cap " << cap;
        EXPECT_GE(sim::path_points(d), 2u);
    }
    // Few edges: every one drawn.
    const wave_trace few = square(500, 9'500, 1'000);
    EXPECT_EQ(sim::path_points(sim::trace_path(few, {0, 10'000}, 750, 0, 20, 600)),
              2 + 2 * few.edges.size());
}

sim::report_model failing_model() {
    sim::report_model m;
    m.scenario = "pwm <test>";
    m.end = 3'000'000'000;
    m.clocks.push_back({"xtal", "crystal", "8000000", "8000000", "nominal 8 MHz", "sys"});
    sim::report_check c;
    c.name = "period & more";
    c.kind = "period";
    c.signal = "pwm.out";
    c.expected = "40 us";
    c.measured = "mean 40 us over 70";
    c.at = 2'050'000'000;
    c.from = 2'000'000'000;
    c.span_label = "measured 50 us";
    c.marks.push_back({2'040'000'000, "expected 40 us"});
    c.detail = "period 50 us exceeds 40 us";
    c.traces.push_back(square(0, 3'000'000'000, 20'000'000));
    m.checks.push_back(c);
    sim::report_check p = c;
    p.name = "passing";
    p.passed = true;
    p.from.reset();
    p.marks.clear();
    p.traces[0].edges = {2'900'000'000, 2'920'000'000, 2'940'000'000};
    m.checks.push_back(p);
    return m;
}

TEST(report_html_test, the_failure_picture_marks_the_failure_and_the_expected_value) {
    const sim::report_model m = failing_model();
    const std::string svg = sim::failure_svg(m.checks[0], m);
    EXPECT_NE(svg.find("first failure at 2.05 ms"), std::string::npos);
    EXPECT_NE(svg.find("measured 50 us"), std::string::npos);
    EXPECT_NE(svg.find("expected 40 us"), std::string::npos);
    EXPECT_NE(svg.find("#d1242f"), std::string::npos);
    EXPECT_NE(svg.find(">pwm.out<"), std::string::npos);
    EXPECT_NE(svg.find(" us</text>"), std::string::npos);  // axis labels
    const std::string thumb = sim::thumbnail_svg(m.checks[1], m);
    EXPECT_NE(thumb.find("<path"), std::string::npos);
    EXPECT_EQ(thumb.find("#d1242f"), std::string::npos);
}

TEST(report_html_test, the_page_is_self_contained_and_escapes_its_text) {
    const std::string h = sim::report_html_text(failing_model());
    EXPECT_EQ(h.rfind("<!DOCTYPE html>", 0), 0u);
    for (const char* banned : {"<script", "src=", "<link", "@import", "url(", "href=\"http"})
        EXPECT_EQ(h.find(banned), std::string::npos) << banned;
    EXPECT_NE(h.find("pwm &lt;test&gt;"), std::string::npos);
    EXPECT_NE(h.find("period &amp; more"), std::string::npos);
    EXPECT_NE(h.find("id=\"failure-1\""), std::string::npos);
    EXPECT_NE(h.find("<h2>Clock plan</h2>"), std::string::npos);
    EXPECT_NE(h.find("nominal 8 MHz"), std::string::npos);
    // One full picture for the failure, one thumbnail for the passed check.
    std::size_t waves = 0, thumbs = 0;
    for (std::size_t at = h.find("class=\"wave\""); at != std::string::npos;
         at = h.find("class=\"wave\"", at + 1))
        ++waves;
    for (std::size_t at = h.find("class=\"thumb\""); at != std::string::npos;
         at = h.find("class=\"thumb\"", at + 1))
        ++thumbs;
    EXPECT_EQ(waves, 1u);
    EXPECT_EQ(thumbs, 1u);
    // A second of 40 us periods in the model still makes a small page.
    EXPECT_LT(h.size(), 40'000u);
}

}  // namespace
