#include "sim/clock_tree.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace {

using sim::frequency;
constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps second = sim::ps_per_second;

sim::crystal_params crystal(std::uint64_t hz, std::int64_t ppb = 0) {
    sim::crystal_params p;
    p.nominal = frequency::hz(hz);
    p.offset_ppb = ppb;
    return p;
}

bool mentions(const std::vector<std::string>& problems, const std::string& a,
              const std::string& b) {
    for (const auto& p : problems)
        if (p.find(a) != std::string::npos && p.find(b) != std::string::npos) return true;
    return false;
}

TEST(clock_tree_test, crystal_at_100_ppm_counts_8_million_plus_minus_800_in_a_1s_gate) {
    // A crystal's tolerance is of the order of 100 ppm (common practice, no source): a 1 s gate on
    // an 8 MHz crystal counts 8 000 000 +/- 800 cycles.
    for (std::int64_t ppb : {-100'000, 0, 100'000}) {
        sim::clock_tree t;
        t.add_crystal("xtal", crystal(8'000'000, ppb));
        t.start();
        const auto& d = t.domain("xtal");
        const std::uint64_t counted = d.tick_at(second) - d.tick_at(0);
        EXPECT_EQ(static_cast<std::int64_t>(counted), 8'000'000 + ppb * 8 / 1000);
    }
}

TEST(clock_tree_test, pll_output_is_input_times_multiplier_over_dividers) {
    // PLL output = input x multiplier / (input divider x output divider) (common practice, no
    // source).
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    sim::pll_params p;
    p.input_divider = 3;
    p.multiplier = 50;
    p.output_divider = 2;
    t.add_pll("pll", "xtal", p);
    t.start();
    EXPECT_EQ(t.domain("pll").freq_at(0), frequency(8'000'000ULL * 50, 6));
    EXPECT_EQ(t.domain("pll").freq_at(0).decimal_string(), "66666666.666667");
}

TEST(clock_tree_test, pll_output_stops_for_the_lock_time) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    sim::pll_params p;
    p.multiplier = 6;
    p.lock_time = 100 * us;
    t.add_pll("pll", "xtal", p);
    t.start();
    const auto& d = t.domain("pll");
    EXPECT_FALSE(d.running_at(99 * us));
    const auto e = d.edge_at_or_after(0);
    ASSERT_TRUE(e);
    EXPECT_EQ(e->at, 100 * us);
    EXPECT_EQ(e->tick, 0u);
    // Reprogrammed at 1 ms: stops, relocks 100 us later at the new frequency, ticks run on.
    p.multiplier = 3;
    const sim::time_ps locked = t.set_pll("pll", p, 1000 * us);
    EXPECT_EQ(locked, 1100 * us);
    EXPECT_FALSE(d.running_at(1050 * us));
    EXPECT_EQ(d.freq_at(1100 * us), frequency::hz(24'000'000));
    // The edge at exactly 1 ms (tick 43200) came before the change; the next is the relocked one.
    const std::uint64_t at_change = d.tick_at(1000 * us);
    EXPECT_EQ(at_change, 48'000'000ULL * 900 / 1'000'000);
    EXPECT_EQ(d.time_of(at_change), 1000 * us);
    EXPECT_EQ(d.time_of(at_change + 1), 1100 * us);
}

TEST(clock_tree_test, watch_crystal_is_two_to_the_fifteen) {
    // A 32.768 kHz watch crystal is 2^15 Hz, so a 15-stage binary divider gives 1 Hz
    // (common practice, no source).
    sim::clock_tree t;
    t.add_crystal("watch_xtal", crystal(32'768));
    t.add_divider("one_hz", "watch_xtal", 1u << 15);
    t.start();
    const auto& d = t.domain("one_hz");
    EXPECT_EQ(d.freq_at(0), frequency::hz(1));
    for (std::uint64_t s = 0; s < 5; ++s) EXPECT_EQ(d.time_of(s), s * second);
}

TEST(clock_tree_test, divider_edges_are_exactly_parent_edges) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    sim::pll_params p;
    p.multiplier = 14;
    p.output_divider = 3;
    t.add_pll("pll", "xtal", p);
    t.add_divider("slow", "pll", 7);
    t.start();
    for (std::uint64_t k = 0; k < 500; ++k)
        EXPECT_EQ(t.domain("slow").time_of(k), t.domain("pll").time_of(7 * k));
}

TEST(clock_tree_test, divider_change_waits_for_the_next_output_edge) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(1'000'000));
    t.add_divider("div", "xtal", 4);
    t.start();
    // Output edges at 0, 4, 8, 12 us... A change at 9 us takes effect at the edge at 12 us.
    EXPECT_EQ(t.set_divider("div", 2, 9 * us), 12 * us);
    const auto& d = t.domain("div");
    EXPECT_EQ(d.time_of(2), 8 * us);
    EXPECT_EQ(d.time_of(3), 12 * us);
    EXPECT_EQ(d.time_of(4), 14 * us);
    EXPECT_EQ(d.time_of(5), 16 * us);
}

TEST(clock_tree_test, mux_switch_holds_between_the_old_and_new_edge) {
    sim::clock_tree t;
    t.add_crystal("a", crystal(1'000'000));  // edges every 1 us
    t.add_crystal("b", crystal(300'000));    // edges every 3.333 us
    t.add_mux("sys", {"a", "b"}, 0);
    std::vector<sim::time_ps> heard;
    t.subscribe("sys", "timer1", [&](sim::time_ps from) { heard.push_back(from); });
    t.start();
    // Request at 5.5 us: a's edge at 6 us still passes; b's next edge after 6 us is 6.666667 us.
    const sim::time_ps eff = t.select("sys", "b", 5'500'000);
    EXPECT_EQ(eff, 6'666'667u);
    const auto& d = t.domain("sys");
    EXPECT_EQ(d.time_of(6), 6 * us);
    EXPECT_EQ(d.time_of(7), 6'666'667u);
    EXPECT_EQ(d.time_of(8), 10 * us);
    EXPECT_EQ(d.freq_at(7 * us), frequency::hz(300'000));
    ASSERT_EQ(heard.size(), 1u);
    EXPECT_EQ(heard[0], 6 * us + 1);
}

TEST(clock_tree_test, gate_closes_and_opens_with_continuous_ticks) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(1'000'000));
    t.add_gate("timer_clock", "xtal", true);
    int told = 0;
    t.subscribe("timer_clock", "timer", [&](sim::time_ps) { ++told; });
    t.start();
    t.set_gate("timer_clock", false, 3'500'000);
    // Opened at 10 us: the edge at 10 us came before the write; the next one passes.
    t.set_gate("timer_clock", true, 10 * us);
    const auto& d = t.domain("timer_clock");
    EXPECT_EQ(d.time_of(3), 3 * us);
    EXPECT_EQ(d.time_of(4), 11 * us);
    EXPECT_EQ(d.tick_at(12 * us), 5u);
    EXPECT_EQ(told, 2);
}

TEST(clock_tree_test, change_flows_to_a_hundred_consumers_with_exact_time) {
    sim::clock_tree t;
    // The demo part's fast RC oscillator (demo values, examples/parts/demo_part.toml): 16 MHz
    // +/- 2 %, this sample 0.6 % fast, trimmed in steps of 0.1 %.
    t.add_rc_oscillator("rc", [] {
        sim::rc_params p;
        p.nominal = frequency::hz(16'000'000);
        p.tolerance_ppb = 20'000'000;
        p.deviation_ppb = 6'000'000;
        p.trim_step_ppb = 1'000'000;
        p.trim_min = -32;
        p.trim_max = 31;
        return p;
    }());
    t.add_divider("half", "rc", 2);
    std::vector<sim::time_ps> heard(100, 0);
    for (int i = 0; i < 100; ++i)
        t.subscribe("half", "consumer" + std::to_string(i),
                    [&heard, i](sim::time_ps from) { heard[i] = from; });
    t.start();
    EXPECT_EQ(t.domain("rc").freq_at(0), frequency::hz(16'096'000));
    const sim::time_ps eff = t.set_trim("rc", -6, 1000 * us);
    EXPECT_EQ(t.domain("rc").freq_at(eff), frequency::hz(16'000'000));
    // Every consumer hears of it once, from the first edge of the divided clock that moved: after
    // the oscillator's first new-frequency edge and within one divided period (125 ns) of it.
    for (sim::time_ps h : heard) EXPECT_EQ(h, heard[0]);
    EXPECT_GE(heard[0], eff);
    EXPECT_LE(heard[0], eff + 125'000);
}

TEST(clock_tree_test, unchanged_result_is_not_propagated) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(1'000'000));
    t.add_gate("g", "xtal", true);
    int told = 0;
    t.subscribe("g", "c", [&](sim::time_ps) { ++told; });
    t.start();
    t.set_gate("g", true, 5 * us);
    EXPECT_EQ(told, 0);
}

TEST(clock_tree_test, invalid_configurations_name_the_node_and_rule) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    t.add_crystal("xtal", crystal(16'000'000));
    t.add_divider("zero", "xtal", 0);
    t.add_divider("orphan", "nowhere", 2);
    t.add_mux("sel", {"xtal"}, 3);
    const auto p = t.problems();
    EXPECT_TRUE(mentions(p, "'xtal'", "defined twice"));
    EXPECT_TRUE(mentions(p, "divider 'zero'", "factor is 0"));
    EXPECT_TRUE(mentions(p, "divider 'orphan'", "unknown input 'nowhere'"));
    EXPECT_TRUE(mentions(p, "mux 'sel'", "selected input 3 does not exist"));
    EXPECT_THROW(t.start(), sim::clock_config_error);
}

TEST(clock_tree_test, loops_are_rejected) {
    sim::clock_tree t;
    t.add_divider("a", "b", 2);
    t.add_divider("b", "a", 2);
    EXPECT_TRUE(mentions(t.problems(), "clock loop", "a, b"));
}

TEST(clock_tree_test, vco_out_of_range_is_rejected_before_the_run_and_at_run_time) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    sim::pll_params p;
    p.multiplier = 100;  // 800 MHz VCO
    // The demo part's VCO range (demo values, examples/parts/demo_part.toml).
    p.vco_range = {frequency::hz(150'000'000), frequency::hz(330'000'000)};
    t.add_pll("pll", "xtal", p);
    EXPECT_TRUE(mentions(t.problems(), "pll 'pll'", "VCO frequency"));
    EXPECT_TRUE(mentions(t.problems(), "800 MHz", "outside the allowed 150 MHz to 330 MHz"));

    sim::clock_tree ok;
    ok.add_crystal("xtal", crystal(8'000'000));
    p.multiplier = 40;  // 320 MHz
    ok.add_pll("pll", "xtal", p);
    ok.start();
    p.multiplier = 60;
    EXPECT_THROW(ok.set_pll("pll", p, 10 * us), sim::clock_config_error);
}

TEST(clock_tree_test, consumer_needing_a_running_clock_on_a_closed_gate_is_rejected) {
    sim::clock_tree t;
    t.add_crystal("xtal", crystal(8'000'000));
    t.add_gate("g", "xtal", false);
    t.subscribe("g", "watchdog", nullptr, true);
    EXPECT_TRUE(mentions(t.problems(), "consumer 'watchdog'", "clock 'g'"));
    EXPECT_THROW(t.subscribe("missing", "x", nullptr), sim::clock_config_error);
}

TEST(clock_tree_test, rc_deviation_outside_tolerance_is_rejected) {
    sim::clock_tree t;
    sim::rc_params p;
    p.nominal = frequency::hz(16'000'000);
    p.tolerance_ppb = 20'000'000;
    p.deviation_ppb = 30'000'000;
    t.add_rc_oscillator("rc", p);
    EXPECT_TRUE(mentions(t.problems(), "rc-oscillator 'rc'", "outside the tolerance band"));
}

TEST(clock_tree_test, plan_lists_nodes_sources_first_with_what_they_feed) {
    sim::clock_tree t;
    t.add_divider("bus", "sys", 3);
    t.add_crystal("xtal", crystal(12'000'000));
    sim::pll_params p;
    p.multiplier = 8;
    t.add_pll("pll", "xtal", p);
    t.add_mux("sys", {"xtal", "pll"}, 1);
    t.subscribe("bus", "timer1", nullptr);
    t.start();
    const auto rows = t.plan();
    ASSERT_EQ(rows.size(), 4u);
    EXPECT_EQ(rows[0].name, "xtal");
    EXPECT_EQ(rows.back().name, "bus");
    // 12 MHz x 8 / 3.
    EXPECT_EQ(rows.back().freq, frequency::hz(32'000'000));
    EXPECT_EQ(rows.back().feeds, std::vector<std::string>{"timer1"});
    EXPECT_EQ(rows[0].feeds, (std::vector<std::string>{"pll", "sys"}));
}

TEST(clock_tree_test, offset_ppb_measures_against_nominal) {
    EXPECT_EQ(sim::offset_ppb(frequency::hz(8'000'800), frequency::hz(8'000'000)), 100'000);
    EXPECT_EQ(sim::offset_ppb(frequency::hz(7'999'200), frequency::hz(8'000'000)), -100'000);
}

}  // namespace
