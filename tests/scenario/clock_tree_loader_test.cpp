// Loading clock trees from TOML (sim/clock_tree_loader.h): the demo part, the schema's defaults and
// the location and wording of findings.

#include "sim/clock_tree_loader.h"
#include "sim/clock_plan.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <map>
#include <string>

namespace {

const std::string demo_part = std::string(TICKBENCH_SOURCE_DIR) + "/examples/parts/demo_part.toml";

std::map<std::string, sim::frequency> frequencies(const sim::clock_tree& tree) {
    std::map<std::string, sim::frequency> m;
    for (const auto& row : tree.plan(0)) m[row.name] = row.freq;
    return m;
}

// The scenario_error message of loading `text`, or "" when it loads.
std::string error_of(const std::string& text) {
    sim::clock_tree tree;
    try {
        sim::load_clock_tree_text(text, "t.toml", tree);
    } catch (const sim::scenario_error& e) {
        return e.what();
    }
    return "";
}

TEST(clock_tree_loader_test, demo_part_gives_exact_frequencies) {
    sim::clock_tree tree;
    sim::load_clock_tree_file(demo_part, tree);
    const auto f = frequencies(tree);
    ASSERT_EQ(f.size(), 11u);
    EXPECT_EQ(f.at("xtal"), sim::frequency::hz(12'000'000));
    // 12 MHz / 3 x 48 / 2.
    EXPECT_EQ(f.at("pll"), sim::frequency::hz(96'000'000));
    EXPECT_EQ(f.at("sys"), sim::frequency::hz(96'000'000));
    // sys / 6, and the timers' boost doubles it while the bus divider is above 1.
    EXPECT_EQ(f.at("bus"), sim::frequency::hz(16'000'000));
    EXPECT_EQ(f.at("timers"), sim::frequency::hz(32'000'000));
    EXPECT_EQ(f.at("timer_a_clk"), sim::frequency::hz(32'000'000));
    EXPECT_EQ(f.at("timer_b_clk"), sim::frequency::hz(32'000'000));
    // +0.6 % deviation, trim -6 x 0.1 %: back to nominal.
    EXPECT_EQ(f.at("rc_fast"), sim::frequency::hz(16'000'000));
    // -6 % deviation, trim +2 x 2 %: 2 % below 30 kHz.
    EXPECT_EQ(f.at("rc_slow"), sim::frequency::hz(29'400));
    EXPECT_EQ(f.at("watchdog_clk"), sim::frequency::hz(29'400));
    // +10 ppm, and -34 ppb/C2 x (40 - 25)^2 = -7650 ppb: 32768 x (1 + 2350e-9) Hz, exactly.
    EXPECT_EQ(f.at("watch_xtal"), sim::frequency(32'768ULL * 1'000'002'350ULL, 1'000'000'000ULL));
    EXPECT_EQ(tree.kind("sys"), sim::clock_kind::mux);
    EXPECT_NO_THROW(tree.start());
    // The PLL output starts once it has locked, 250 us in.
    EXPECT_TRUE(tree.domain("pll").freq_at(0).is_zero());
    EXPECT_TRUE(tree.domain("pll").freq_at(249'999'999).is_zero());
    EXPECT_EQ(tree.domain("pll").freq_at(250'000'000), sim::frequency::hz(96'000'000));
}

TEST(clock_tree_loader_test, demo_part_plan_is_valid_json) {
    sim::clock_tree tree;
    sim::load_clock_tree_file(demo_part, tree);
    const nlohmann::json plan = nlohmann::json::parse(sim::clock_plan_json(tree.plan(0)));
    ASSERT_TRUE(plan.at("clocks").is_array());
    ASSERT_EQ(plan.at("clocks").size(), 11u);
    bool found = false;
    for (const auto& c : plan.at("clocks"))
        if (c.at("name") == "pll") {
            EXPECT_EQ(c.at("hz_exact"), "96000000");
            EXPECT_EQ(c.at("kind"), "pll");
            found = true;
        }
    EXPECT_TRUE(found);
}

TEST(clock_tree_loader_test, crystal_offset_carries_through_the_pll) {
    sim::clock_tree tree;
    sim::load_clock_tree_text(R"(
[clocks.xtal]
kind = "crystal"
frequency = "12 MHz"
offset = "20 ppm"
[clocks.pll]
kind = "pll"
input = "xtal"
multiplier = 8
)",
                              "t.toml", tree);
    // 96 MHz x (1 + 20e-6) = 96 001 920 Hz.
    EXPECT_EQ(frequencies(tree).at("pll"), sim::frequency::hz(96'001'920));
}

TEST(clock_tree_loader_test, defaults_and_other_kinds) {
    sim::clock_tree tree;
    sim::load_clock_tree_text(R"(
other-section = 1   # not the clock loader's business
[clocks.pin]
kind = "external"
frequency = 10000000
[clocks.idle]
kind = "external"
[clocks.half]
kind = "divider"
input = "pin"
factor = 2
[clocks.choose]
kind = "mux"
inputs = ["half", "pin"]
[clocks.off]
kind = "gate"
input = "choose"
enabled = false
[clocks.slow_pll]
kind = "pll"
input = "pin"
multiplier = 3
output-divider = 2
enabled = false
)",
                              "t.toml", tree);
    const auto f = frequencies(tree);
    EXPECT_EQ(f.at("pin"), sim::frequency::hz(10'000'000));
    EXPECT_TRUE(f.at("idle").is_zero());
    // Without `select`, a mux takes its first input.
    EXPECT_EQ(f.at("choose"), sim::frequency::hz(5'000'000));
    EXPECT_TRUE(f.at("off").is_zero());
    EXPECT_TRUE(f.at("slow_pll").is_zero());
}

TEST(clock_tree_loader_test, findings_name_file_line_column_and_key) {
    sim::clock_tree tree;
    try {
        sim::load_clock_tree_text(
            "[clocks.pll]\nkind = \"pll\"\ninput = \"xtal\"\nmultiplier = \"nine\"\n"
            "[clocks.xtal]\nkind = \"crystal\"\nfrequency = \"8 MHz\"\n",
            "demo.toml", tree);
        FAIL() << "no error";
    } catch (const sim::scenario_error& e) {
        EXPECT_STREQ(
            e.what(),
            "demo.toml:4:14: clocks.pll.multiplier: expected a whole number from 1 to 1000000, "
            "got \"nine\"");
        EXPECT_EQ(e.file(), "demo.toml");
        EXPECT_EQ(e.line(), 4u);
        EXPECT_EQ(e.column(), 14u);
        EXPECT_EQ(e.key(), "clocks.pll.multiplier");
    }
    // The tables were wrong, so nothing was added.
    EXPECT_TRUE(tree.node_names().empty());
}

TEST(clock_tree_loader_test, all_findings_come_out_at_once_in_file_order) {
    const std::string e = error_of(
        "[clocks.a]\nkind = \"crystal\"\nfrequncy = \"8 MHz\"\n"
        "[clocks.b]\nkind = \"divider\"\ninput = \"a\"\nfactor = 0\n");
    EXPECT_EQ(
        e,
        "t.toml:1:1: clocks.a: missing key \"frequency\"; accepted: a frequency such as \"8 MHz\" "
        "(units Hz, "
        "kHz, MHz, GHz) or a whole number of hertz\n"
        "t.toml:3:1: clocks.a.frequncy: unknown key \"frequncy\" for a crystal clock (did you mean "
        "\"frequency\"?); accepted: kind, frequency, offset, temperature-coefficient, turnover, "
        "temperature, "
        "jitter, seed\n"
        "t.toml:7:10: clocks.b.factor: expected a whole number from 1 to 1000000000, got 0");
}

TEST(clock_tree_loader_test, clock_rules_point_at_the_node_table) {
    const std::string e = error_of(
        "[clocks.xtal]\nkind = \"crystal\"\nfrequency = \"8 MHz\"\n\n"
        "[clocks.pll]\nkind = \"pll\"\ninput = \"xtal\"\nmultiplier = 100\n"
        "vco-range = [\"150 MHz\", \"330 MHz\"]\n");
    EXPECT_EQ(e.rfind("t.toml:5:1: clocks.pll: VCO", 0), 0u) << e;
}

TEST(clock_tree_loader_test, unreadable_files_and_syntax_errors) {
    sim::clock_tree tree;
    try {
        sim::load_clock_tree_file("/nonexistent/x.toml", tree);
        FAIL();
    } catch (const sim::scenario_error& e) {
        EXPECT_STREQ(e.what(),
                     "/nonexistent/x.toml: cannot read the file: No such file or directory");
        EXPECT_EQ(e.line(), 0u);
    }
    EXPECT_EQ(error_of("[clocks.a]\nkind = \n").rfind("t.toml:2:8: TOML syntax: ", 0), 0u)
        << error_of("[clocks.a]\nkind = \n");
}

}  // namespace
