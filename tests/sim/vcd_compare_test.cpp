// Comparing two waveforms edge by edge: identical files, an extra pulse, an edge shifted within and
// beyond the tolerance, value differences, signals missing from one file, the signal filter, the
// kept differences and the bound on edges waiting for a pair.

#include "sim/vcd_compare.h"

#include <gtest/gtest.h>

#include <sstream>
#include <string>
#include <vector>

namespace {

using kind = sim::vcd_difference::kind;

// A file of 1-bit signals in scope "t", times in ns; `body` holds "#time" lines and changes with
// the codes a, b, c... of the signals in order.
std::string vcd(const std::vector<std::string>& signals, const std::string& body) {
    std::string text = "$timescale 1 ns $end\n$scope module t $end\n";
    char code = 'a';
    for (const std::string& s : signals)
        text += std::string("$var wire 1 ") + code++ + " " + s + " $end\n";
    return text + "$upscope $end\n$enddefinitions $end\n" + body;
}

sim::vcd_comparison compare(const std::string& a, const std::string& b,
                            sim::vcd_compare_options options = {}) {
    std::istringstream in_a(a);
    std::istringstream in_b(b);
    sim::vcd_reader ra(in_a, "a.vcd");
    sim::vcd_reader rb(in_b, "b.vcd");
    return sim::compare_vcd(ra, rb, options);
}

const std::string pwm = "#0\n0a\n1b\n#10\n1a\n#20\n0a\n#30\n1a\n#40\n0a\n#50\n";

TEST(vcd_compare_test, finds_identical_waveforms_the_same) {
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, pwm));
    EXPECT_TRUE(c.same());
    ASSERT_EQ(c.signals.size(), 2u);
    EXPECT_EQ(c.signals[0].name, "t.x");
    EXPECT_EQ(c.signals[0].edges_a, 5u);  // the initial value and four changes
    EXPECT_EQ(c.signals[0].edges_b, 5u);
    EXPECT_EQ(c.end_a, 50'000u);
    EXPECT_EQ(c.differing_signals(), 0u);
}

// Repeated values are no edges, and timescales may differ: 10 ns is 10 ns in either unit.
TEST(vcd_compare_test, compares_times_not_units_and_ignores_repeated_values) {
    const std::string a = vcd({"x"}, "#0\n0a\n#10\n1a\n#15\n1a\n#20\n0a\n");
    std::string b = vcd({"x"}, "#0\n0a\n#10000\n1a\n#20000\n0a\n");
    b.replace(b.find("1 ns"), 4, "1 ps");
    EXPECT_TRUE(compare(a, b).same());
}

TEST(vcd_compare_test, reports_an_extra_pulse_as_edges_one_run_lacks) {
    const std::string b = "#0\n0a\n1b\n#10\n1a\n#20\n0a\n#24\n1a\n#26\n0a\n#30\n1a\n#40\n0a\n#50\n";
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b));
    EXPECT_FALSE(c.same());
    EXPECT_EQ(c.differing_signals(), 1u);
    const sim::vcd_signal_comparison& x = c.signals[0];
    ASSERT_EQ(x.differences, 1u);
    EXPECT_EQ(x.kept[0].what, kind::only_b);
    EXPECT_EQ(x.kept[0].count, 2u);
    EXPECT_EQ(x.kept[0].at_b, 24'000u);
    EXPECT_EQ(x.kept[0].last_b, 26'000u);
    EXPECT_EQ(x.kept[0].value_b, "1");
    EXPECT_TRUE(c.signals[1].same());
}

TEST(vcd_compare_test, reports_one_missing_edge_with_its_time_and_value) {
    const std::string b = "#0\n0a\n1b\n#10\n1a\n#20\n0a\n#30\n1a\n#50\n";
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b));
    const sim::vcd_signal_comparison& x = c.signals[0];
    ASSERT_EQ(x.differences, 1u);
    EXPECT_EQ(x.kept[0].what, kind::only_a);
    EXPECT_EQ(x.kept[0].at_a, 40'000u);
    EXPECT_EQ(x.kept[0].value_a, "0");
    EXPECT_EQ(x.kept[0].count, 1u);
}

TEST(vcd_compare_test, matches_a_shifted_edge_within_the_tolerance_and_reports_it_beyond) {
    const std::string b = "#0\n0a\n1b\n#10\n1a\n#23\n0a\n#30\n1a\n#40\n0a\n#50\n";
    sim::vcd_compare_options o;
    o.tolerance = 3'000;
    EXPECT_TRUE(compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b), o).same());
    o.tolerance = 2'999;
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b), o);
    const sim::vcd_signal_comparison& x = c.signals[0];
    ASSERT_EQ(x.differences, 1u);
    EXPECT_EQ(x.kept[0].what, kind::shifted);
    EXPECT_EQ(x.kept[0].at_a, 20'000u);
    EXPECT_EQ(x.kept[0].at_b, 23'000u);
    EXPECT_EQ(x.kept[0].value_a, "0");
    EXPECT_EQ(x.kept[0].at(), 20'000u);
}

// An edge shifted by more than the time to the signal's next edge is still one shifted edge when
// skipping edges does not bring the two runs into step.
TEST(vcd_compare_test, reports_an_edge_shifted_far_as_shifted) {
    const std::string a = vcd({"x"}, "#0\n0a\n#10\n1a\n#100\n");
    const std::string b = vcd({"x"}, "#0\n0a\n#60\n1a\n#100\n");
    const sim::vcd_comparison c = compare(a, b);
    ASSERT_EQ(c.signals[0].differences, 1u);
    EXPECT_EQ(c.signals[0].kept[0].what, kind::shifted);
    EXPECT_EQ(c.signals[0].kept[0].at_b, 60'000u);
}

TEST(vcd_compare_test, reports_vector_values_that_differ_at_one_time) {
    const std::string h = "$timescale 1 ns $end\n$var wire 4 a v $end\n$enddefinitions $end\n";
    const sim::vcd_comparison c = compare(h + "#0\nb0 a\n#10\nb101 a\n#20\nb110 a\n",
                                          h + "#0\nb0 a\n#10\nb111 a\n#20\nb110 a\n");
    ASSERT_EQ(c.signals[0].differences, 1u);
    const sim::vcd_difference& d = c.signals[0].kept[0];
    EXPECT_EQ(d.what, kind::value);
    EXPECT_EQ(d.value_a, "0101");
    EXPECT_EQ(d.value_b, "0111");
    EXPECT_EQ(d.at_a, 10'000u);
}

TEST(vcd_compare_test, counts_a_signal_only_one_run_has_unless_asked_for_common_ones_only) {
    const std::string a = vcd({"x", "y"}, pwm);
    const std::string b = vcd({"x"}, "#0\n0a\n#10\n1a\n#20\n0a\n#30\n1a\n#40\n0a\n#50\n");
    const sim::vcd_comparison c = compare(a, b);
    EXPECT_FALSE(c.same());
    ASSERT_EQ(c.signals.size(), 2u);
    EXPECT_TRUE(c.signals[1].in_a);
    EXPECT_FALSE(c.signals[1].in_b);
    EXPECT_TRUE(c.signals[1].differs());
    sim::vcd_compare_options o;
    o.only_common = true;
    const sim::vcd_comparison common = compare(a, b, o);
    EXPECT_TRUE(common.same());
    EXPECT_FALSE(common.signals[1].counts);
    // Asked for by name, a signal missing from one run differs even so.
    o.signals = {"t.y"};
    EXPECT_FALSE(compare(a, b, o).same());
}

TEST(vcd_compare_test, compares_only_the_signals_asked_for) {
    const std::string b = "#0\n0a\n0b\n#10\n1a\n#20\n0a\n#30\n1a\n#40\n0a\n#50\n";  // y differs
    sim::vcd_compare_options o;
    o.signals = {"t.x"};
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b), o);
    EXPECT_TRUE(c.same());
    ASSERT_EQ(c.signals.size(), 1u);
    EXPECT_EQ(c.signals[0].name, "t.x");
    o.signals = {"t.y"};
    EXPECT_FALSE(compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, b), o).same());
}

TEST(vcd_compare_test, refuses_a_signal_neither_run_has_and_names_the_closest) {
    sim::vcd_compare_options o;
    o.signals = {"t.z", "t.xx"};
    try {
        compare(vcd({"x", "y"}, pwm), vcd({"x", "y"}, pwm), o);
        FAIL() << "an unknown signal was accepted";
    } catch (const sim::vcd_error& e) {
        EXPECT_EQ(std::string(e.what()),
                  "signal \"t.z\" is in neither a.vcd nor b.vcd (did you mean \"t.x\"?); expected "
                  "full names such as \"t.x\"");
    }
}

TEST(vcd_compare_test, reports_files_that_end_at_different_times) {
    const std::string b = vcd({"x", "y"}, "#0\n0a\n1b\n#10\n1a\n#20\n0a\n#30\n1a\n#40\n0a\n#60\n");
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, pwm), b);
    EXPECT_TRUE(c.ends_differ);
    EXPECT_FALSE(c.same());
    EXPECT_EQ(c.differing_signals(), 0u);
    sim::vcd_compare_options o;
    o.tolerance = 10'000;
    EXPECT_TRUE(compare(vcd({"x", "y"}, pwm), b, o).same());
}

TEST(vcd_compare_test, keeps_the_first_differences_and_counts_the_rest) {
    std::string a = "#0\n0a\n";
    std::string b = "#0\n0a\n";
    for (int i = 1; i <= 20; ++i) {
        a += "#" + std::to_string(i * 10) + "\n" + std::to_string(i % 2) + "a\n";
        b += "#" + std::to_string(i * 10 + 1) + "\n" + std::to_string(i % 2) + "a\n";
    }
    sim::vcd_compare_options o;
    o.kept_per_signal = 3;
    const sim::vcd_comparison c = compare(vcd({"x"}, a), vcd({"x"}, b), o);
    EXPECT_EQ(c.signals[0].differences, 20u);
    ASSERT_EQ(c.signals[0].kept.size(), 3u);
    EXPECT_EQ(c.signals[0].kept[2].at_a, 30'000u);
    EXPECT_EQ(c.signals[0].kept[2].at_b, 31'000u);
}

// A signal that toggles in one run and stays put in the other: its edges cannot wait for a
// partner forever; every one is still accounted for.
TEST(vcd_compare_test, bounds_the_edges_waiting_for_a_partner) {
    std::string a = "#0\n0a\n0b\n";
    std::string b = "#0\n0a\n0b\n";
    const int n = 10'000;
    for (int i = 1; i <= n; ++i) {
        a += "#" + std::to_string(i) + "\n" + std::to_string(i % 2) + "a\n";
        b += "#" + std::to_string(i) + "\n" + std::to_string(i % 2) + "b\n";
    }
    sim::vcd_compare_options o;
    o.max_waiting_edges = 64;
    const sim::vcd_comparison c = compare(vcd({"x", "y"}, a), vcd({"x", "y"}, b), o);
    std::uint64_t only_a = 0;
    EXPECT_GT(c.signals[0].differences, 1u);
    EXPECT_LE(c.signals[0].differences, static_cast<std::uint64_t>(n / 32 + 2));
    // Every extra edge is covered by one difference; the kept ones say how many each covers.
    EXPECT_EQ(c.signals[0].kept[0].what, kind::only_a);
    only_a += c.signals[0].kept[0].count;
    EXPECT_EQ(only_a, 32u);
    EXPECT_EQ(c.signals[0].edges_a, static_cast<std::uint64_t>(n + 1));
    EXPECT_EQ(c.signals[1].kept[0].what, kind::only_b);
}

}  // namespace
