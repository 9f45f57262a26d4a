// The clock-control block (docs/clock-control.md): the shipped layout and its header, binding a
// layout to a scenario's tree, ready flags that rise only after the modelled start-up or lock
// time, refusals that set a status bit and keep the old setting, and a counter that follows a
// switch made through the registers exactly at the edge it takes effect.

#include "examples/parts/demo_timers.h"
#include "models/clock/clock_bindings.h"
#include "models/clock/clock_control_core.h"
#include "models/layout/layout_table.h"
#include "models/layout/register_file.h"
#include "models/tick/tick_timer_core.h"
#include "sim/clock_tree_loader.h"
#include "tests/support/layout_queries.h"

#include <gtest/gtest.h>

#include <memory>
#include <string>

namespace {

using models::clock_field;
using sim::frequency;
using sim::time_ps;

constexpr time_ps ns = 1'000;
constexpr time_ps us = 1'000'000;
const std::string source_dir = TICKBENCH_SOURCE_DIR;

models::register_layout shipped() {
    return models::load_register_layout_file(source_dir + "/models/layouts/clock_control.toml");
}

// A part of the tests' own: the system clock on an 8 MHz RC oscillator at reset, a stopped PLL
// (12 MHz / 3 x 50 / 2 = 100 MHz once started, 50 us to lock), the bus undivided and the timers'
// boost on it. Every number is a test value.
const char* const test_tree = R"(
[clocks.rc_fast]
kind = "rc-oscillator"
frequency = "8 MHz"
tolerance = "1 %"

[clocks.xtal]
kind = "crystal"
frequency = "12 MHz"

[clocks.pll]
kind = "pll"
input = "xtal"
input-divider = 3
multiplier = 50
output-divider = 2
lock-time = "50 us"
enabled = false
input-range = ["2 MHz", "8 MHz"]
vco-range = ["140 MHz", "280 MHz"]

[clocks.sys]
kind = "mux"
inputs = ["rc_fast", "pll"]

[clocks.bus]
kind = "divider"
input = "sys"
factor = 1

[clocks.timers]
kind = "boost"
input = "bus"

[clocks.timer_a_clk]
kind = "gate"
input = "timers"

[clocks.timer_b_clk]
kind = "gate"
input = "timers"
enabled = false
)";

// The test part with the shipped block on it, accessed through its registers.
struct bench {
    sim::clock_tree tree;
    models::register_layout layout = shipped();
    std::unique_ptr<models::clock_control_core> core;
    std::unique_ptr<models::register_file> regs;

    explicit bench(const std::string& clocks = test_tree) {
        sim::load_clock_tree_text(clocks, "test.toml", tree);
    }
    void start() {
        tree.start();
        EXPECT_TRUE(models::check_clock_bindings(layout, tree).empty());
        core = std::make_unique<models::clock_control_core>(tree, layout.clock_slots);
        regs = std::make_unique<models::register_file>(layout, *core, "clocks",
                                                       models::unmapped_policy::error, 0x5000'2C00);
    }
    std::uint32_t read(std::uint32_t offset, time_ps t) {
        std::uint32_t v = 0;
        EXPECT_FALSE(regs->read(offset, 4, v, t).failed);
        return v;
    }
    void write(std::uint32_t offset, std::uint32_t v, time_ps t) {
        EXPECT_FALSE(regs->write(offset, 4, v, t).failed);
    }
    // Programs and starts the PLL at t, the way a driver does.
    void start_pll(std::uint32_t multiplier, time_ps t) {
        write(CK_PLL_FACTORS,
              CK_PLL_MULTIPLIER(multiplier) | CK_PLL_INPUT_DIVIDER(3) | CK_PLL_OUTPUT_DIVIDER(2),
              t);
        write(CK_PLL_RUN, CK_PLL_RUN_ENABLE, t);
    }
};

TEST(clock_control_test, shipped_layout_names_its_nodes_and_matches_the_demo_header) {
    using tickbench::test_support::offset_of;
    const auto l = shipped();
    EXPECT_EQ(l.kind, "clock_control");
    EXPECT_EQ(offset_of(l, "system_source"), CK_SYSTEM_SOURCE);
    EXPECT_EQ(offset_of(l, "bus_divide"), CK_BUS_DIVIDE);
    EXPECT_EQ(offset_of(l, "pll_factors"), CK_PLL_FACTORS);
    EXPECT_EQ(offset_of(l, "pll_run"), CK_PLL_RUN);
    EXPECT_EQ(offset_of(l, "timer_gates"), CK_TIMER_GATES);
    EXPECT_EQ(offset_of(l, "refusals"), CK_REFUSALS);
    EXPECT_EQ(offset_of(l, "oscillators"), CK_OSCILLATORS);
    std::vector<std::string> nodes;
    for (const auto& s : l.clock_slots) nodes.push_back(s.node);
    EXPECT_EQ(nodes, (std::vector<std::string>{"sys", "bus", "pll", "timer_a_clk", "timer_b_clk",
                                               "rc_fast", "xtal"}));
    EXPECT_EQ(models::kind_field_names("clock_control").back(), "refused");
}

TEST(clock_control_test, documented_table_is_the_layout_file) {
    const std::string doc =
        tickbench::test_support::read_file(source_dir + "/docs/register-layouts.md");
    const std::string table = models::layout_table_markdown(shipped());
    const auto heading = doc.find("### `models/layouts/clock_control.toml`");
    ASSERT_NE(heading, std::string::npos);
    const auto next = doc.find("\n## ", heading);
    EXPECT_NE(doc.substr(heading, next - heading).find("\n" + table), std::string::npos)
        << "expected table:\n"
        << table;
}

TEST(clock_control_test, shipped_layout_binds_to_the_demo_part) {
    sim::clock_tree tree;
    sim::load_clock_tree_file(source_dir + "/examples/parts/demo_part.toml", tree);
    EXPECT_TRUE(models::check_clock_bindings(shipped(), tree).empty());
}

TEST(clock_control_test, binding_names_a_missing_node_and_a_node_of_the_wrong_kind) {
    sim::clock_tree tree;
    sim::load_clock_tree_text(R"(
[clocks.rc_fast]
kind = "rc-oscillator"
frequency = "8 MHz"
[clocks.xtal]
kind = "crystal"
frequency = "12 MHz"
[clocks.pll]
kind = "pll"
input = "xtal"
multiplier = 8
[clocks.sys]
kind = "mux"
inputs = ["rc_fast", "pll"]
[clocks.bus]
kind = "gate"
input = "sys"
[clocks.timer_a_clk]
kind = "gate"
input = "bus"
)",
                              "t.toml", tree);
    const auto bad = models::check_clock_bindings(shipped(), tree);
    ASSERT_EQ(bad.size(), 2u);
    EXPECT_NE(bad[0].text().find("clock_control.toml:23:"), std::string::npos) << bad[0].text();
    EXPECT_NE(bad[0].text().find("registers.bus_divide.fields[0].clock: \"divide\" acts on a "
                                 "divider, and clock \"bus\" is a gate; accepted: the name of a "
                                 "divider"),
              std::string::npos)
        << bad[0].text();
    EXPECT_NE(bad[1].text().find("registers.timer_gates.fields[1].clock: \"open\" names clock "
                                 "\"timer_b_clk\", which the scenario's clock tree does not have; "
                                 "accepted: one of \"rc_fast\", \"xtal\", \"pll\", \"sys\", "
                                 "\"bus\", \"timer_a_clk\""),
              std::string::npos)
        << bad[1].text();
}

TEST(clock_control_test, binding_refuses_a_source_field_too_narrow_for_the_mux) {
    bench b(std::string(test_tree) + R"(
[clocks.ext]
kind = "external"
frequency = "1 MHz"
[clocks.ext2]
kind = "external"
[clocks.wide]
kind = "mux"
inputs = ["rc_fast", "xtal", "ext", "ext2", "pll"]
)");
    auto l = models::load_register_layout_text(R"(kind = "clock_control"
size = 4
[registers.pick]
offset = 0
width = 32
fields = [ { field = "source", clock = "wide", bits = "0..1", access = "read-write" } ]
)",
                                               "narrow.toml");
    const auto bad = models::check_clock_bindings(l, b.tree);
    ASSERT_EQ(bad.size(), 1u);
    EXPECT_EQ(bad[0].text(),
              "narrow.toml:6:40: registers.pick.fields[0].clock: \"source\" holds 2 bits, values "
              "0..3, but mux \"wide\" has 5 inputs (0..4); accepted: a field of 3 bits or more");
}

TEST(clock_control_test, pll_ready_rises_exactly_one_lock_time_after_the_enable) {
    bench b;
    b.start();
    EXPECT_EQ(b.read(CK_PLL_RUN, 0), 0u);
    b.start_pll(50, 10 * us);
    EXPECT_EQ(b.read(CK_PLL_RUN, 10 * us), CK_PLL_RUN_ENABLE);
    EXPECT_EQ(b.read(CK_PLL_RUN, 60 * us - 1), CK_PLL_RUN_ENABLE);
    EXPECT_EQ(b.read(CK_PLL_RUN, 60 * us), CK_PLL_RUN_ENABLE | CK_PLL_RUN_READY);
    EXPECT_EQ(b.tree.domain("pll").freq_at(60 * us), frequency::hz(100'000'000));
    // The oscillators run from reset.
    EXPECT_EQ(b.read(CK_OSCILLATORS, 0), CK_OSC_RC_FAST_READY | CK_OSC_XTAL_READY);
}

TEST(clock_control_test, switching_to_an_unlocked_or_stopped_pll_is_refused_and_keeps_the_rc) {
    bench b;
    b.start();
    // Stopped.
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 1 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 1 * us), CK_REFUSED_NOT_READY);
    EXPECT_EQ(b.read(CK_SYSTEM_SOURCE, 1 * us), CK_SOURCE_RC_FAST);
    EXPECT_NE(b.core->last_refusal().find("input 'pll' is not running"), std::string::npos);
    b.write(CK_REFUSALS, CK_REFUSED_NOT_READY, 2 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 2 * us), 0u);
    // Started but not locked yet.
    b.start_pll(50, 10 * us);
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 59 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 59 * us), CK_REFUSED_NOT_READY);
    EXPECT_EQ(b.read(CK_SYSTEM_SOURCE, 59 * us), CK_SOURCE_RC_FAST);
    EXPECT_EQ(b.tree.domain("sys").freq_at(70 * us), frequency::hz(8'000'000));
}

TEST(clock_control_test, a_vco_out_of_range_is_refused_and_the_pll_stays_stopped) {
    bench b;
    b.start();
    // 12 MHz / 3 x 80 = 320 MHz, above the test part's 280 MHz VCO limit: the tree's own rule.
    b.start_pll(80, 10 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 10 * us), CK_REFUSED_OUT_OF_RANGE);
    EXPECT_NE(b.core->last_refusal().find("VCO frequency"), std::string::npos)
        << b.core->last_refusal();
    EXPECT_EQ(b.read(CK_PLL_RUN, 100 * us), 0u);
    EXPECT_TRUE(b.tree.domain("pll").freq_at(100 * us).is_zero());
    // The factors as written stay readable, so a driver can see what it asked for.
    EXPECT_EQ(b.read(CK_PLL_FACTORS, 100 * us) & 0xffu, 80u);
}

TEST(clock_control_test, pll_factors_are_refused_while_it_runs_and_a_pll_in_use_stays_on) {
    bench b;
    b.start();
    b.start_pll(50, 10 * us);
    b.write(CK_PLL_FACTORS,
            CK_PLL_MULTIPLIER(60) | CK_PLL_INPUT_DIVIDER(3) | CK_PLL_OUTPUT_DIVIDER(2), 70 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 70 * us), CK_REFUSED_WHILE_RUNNING);
    EXPECT_EQ(b.read(CK_PLL_FACTORS, 70 * us) & 0xffu, 50u);
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 80 * us);
    b.write(CK_PLL_RUN, 0, 90 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 90 * us), CK_REFUSED_WHILE_RUNNING | CK_REFUSED_IN_USE);
    EXPECT_EQ(b.read(CK_PLL_RUN, 90 * us), CK_PLL_RUN_ENABLE | CK_PLL_RUN_READY);
    EXPECT_EQ(b.tree.domain("sys").freq_at(95 * us), frequency::hz(100'000'000));
    // A divide factor of 0 is refused too, and the bus keeps its factor.
    b.write(CK_BUS_DIVIDE, 0, 100 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 100 * us) & CK_REFUSED_OUT_OF_RANGE, CK_REFUSED_OUT_OF_RANGE);
    EXPECT_EQ(b.read(CK_BUS_DIVIDE, 100 * us), 1u);
}

TEST(clock_control_test, source_now_reads_the_old_input_until_the_switch_takes_effect) {
    bench b;
    b.start();
    b.start_pll(50, 10 * us);
    const time_ps t = 100 * us + 3 * ns;
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, t);
    EXPECT_EQ(b.read(CK_REFUSALS, t), 0u);
    // The RC's next edge (at 100.125 us) passes, then the PLL's next one (100.13 us) is the first.
    EXPECT_EQ(CK_SOURCE_NOW(b.read(CK_SYSTEM_SOURCE, t)), CK_SOURCE_RC_FAST);
    EXPECT_EQ(CK_SOURCE_NOW(b.read(CK_SYSTEM_SOURCE, 100'130'000 - 1)), CK_SOURCE_RC_FAST);
    EXPECT_EQ(CK_SOURCE_NOW(b.read(CK_SYSTEM_SOURCE, 100'130'000)), CK_SOURCE_PLL);
    EXPECT_EQ(b.read(CK_SYSTEM_SOURCE, t) & 3u, CK_SOURCE_PLL);
}

TEST(clock_control_test, a_gate_opened_through_its_field_starts_after_its_start_up) {
    bench b;
    auto l = models::load_register_layout_text(R"(kind = "clock_control"
size = 4
[registers.gates]
offset = 0
width = 32
fields = [
  { field = "open", clock = "timer_b_clk", start-up = "20 us", bits = 0, access = "read-write" },
  { field = "ready", clock = "timer_b_clk", bits = 1, access = "read-only" },
]
)",
                                               "gates.toml");
    b.tree.start();
    ASSERT_TRUE(models::check_clock_bindings(l, b.tree).empty());
    models::clock_control_core core(b.tree, l.clock_slots);
    models::register_file regs(l, core, "gates", models::unmapped_policy::error, 0);
    std::uint32_t v = 0;
    regs.write(0, 4, 1, 5 * us);
    regs.read(0, 4, v, 5 * us);
    EXPECT_EQ(v, 1u);  // open requested, not running yet
    regs.read(0, 4, v, 25 * us - 1);
    EXPECT_EQ(v, 1u);
    regs.read(0, 4, v, 25 * us + 125 * ns);
    EXPECT_EQ(v, 3u);
    EXPECT_EQ(b.tree.domain("timer_b_clk").tick_at(25 * us + 1),
              b.tree.domain("timer_b_clk").tick_at(0));
}

// A tick timer on the timer clock counting down from the top, read at exact instants.
struct counter {
    models::tick_config cfg;
    std::unique_ptr<models::tick_timer_core> core;
    explicit counter(sim::clock_tree& tree) {
        cfg.counter_bits = 32;
        core = std::make_unique<models::tick_timer_core>(cfg, tree.domain("timer_a_clk"));
        models::tick_timer_core* c = core.get();
        tree.subscribe("timer_a_clk", "counter", [c](time_ps t) { c->clock_changed(t); });
    }
    void start(time_ps t) {
        core->write(models::tick_field::reload, 0xffff'ffffu, t);
        core->write(models::tick_field::enable, 1, t);
    }
    // Edges counted from the start up to t (reads go forward in time, as bus accesses do).
    std::uint32_t at(time_ps t) {
        return 0xffff'ffffu - core->read(models::tick_field::current, t);
    }
};

TEST(clock_control_test, a_counter_follows_the_rc_to_pll_switch_at_the_exact_edge) {
    bench b;
    counter c(b.tree);
    b.start();
    c.start(0);
    b.start_pll(50, 10 * us);  // locks at 60 us: its edges lie on every 10 ns from there
    // Before the switch: the RC's 8 MHz, one edge every 125 ns.
    const std::uint32_t n1 = c.at(1 * us);
    const std::uint32_t n100 = c.at(100 * us);
    EXPECT_EQ(n100 - n1, 792u);
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 100 * us + 3 * ns);
    // The RC's edge at 100.125 us is the last at 8 MHz; the PLL's edge at 100.13 us is the first
    // at 100 MHz, and every 10 ns after it.
    EXPECT_EQ(c.at(100'125'000 - 1), n100);
    EXPECT_EQ(c.at(100'125'000), n100 + 1);
    EXPECT_EQ(c.at(100'130'000 - 1), n100 + 1);
    EXPECT_EQ(c.at(100'130'000), n100 + 2);
    EXPECT_EQ(c.at(101'130'000 - 1), n100 + 2 + 99);
    EXPECT_EQ(c.at(101'130'000), n100 + 2 + 100);
}

TEST(clock_control_test, a_counter_follows_a_bus_divider_change_through_the_boost) {
    bench b;
    counter c(b.tree);
    b.start();
    c.start(0);
    b.start_pll(50, 10 * us);
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 100 * us);
    const std::uint32_t n110 = c.at(110 * us);
    EXPECT_EQ(c.at(120 * us) - n110, 1000u);
    // Bus / 2 with the boost's x2: the timers keep 100 MHz.
    b.write(CK_BUS_DIVIDE, 2, 120 * us + 1 * ns);
    const std::uint32_t n130 = c.at(130 * us);
    EXPECT_EQ(c.at(140 * us) - n130, 1000u);
    // Bus / 4: since 120.01 us the bus has divided by 2, its edges on odd multiples of 10 ns. Its
    // next edge, at 150.01 us, still comes with factor 2; from it the bus divides by 4 and the
    // timers, at twice that, count every 20 ns.
    const std::uint32_t n150 = c.at(150 * us);
    b.write(CK_BUS_DIVIDE, 4, 150 * us + 1 * ns);
    EXPECT_EQ(c.at(150'010'000), n150 + 1);
    EXPECT_EQ(c.at(150'030'000 - 1), n150 + 1);
    EXPECT_EQ(c.at(150'030'000), n150 + 2);
    EXPECT_EQ(c.at(150'050'000 - 1), n150 + 2);
    EXPECT_EQ(c.at(150'050'000), n150 + 3);
    const std::uint32_t n160 = c.at(160 * us);
    EXPECT_EQ(c.at(170 * us) - n160, 500u);
    // Back to 1: x1 of the full 100 MHz.
    b.write(CK_BUS_DIVIDE, 1, 200 * us + 1 * ns);
    const std::uint32_t n210 = c.at(210 * us);
    EXPECT_EQ(c.at(220 * us) - n210, 1000u);
}

}  // namespace

TEST(clock_control_test, a_pll_that_a_mux_selects_through_a_divider_is_in_use_too) {
    // The test part with a divider between the PLL and the system mux: the mux selects the divider,
    // so stopping the PLL would stop the system clock just the same.
    std::string clocks = test_tree;
    const std::string direct = "inputs = [\"rc_fast\", \"pll\"]";
    clocks.replace(clocks.find(direct), direct.size(), "inputs = [\"rc_fast\", \"pll_half\"]");
    clocks += "\n[clocks.pll_half]\nkind = \"divider\"\ninput = \"pll\"\nfactor = 2\n";
    bench b(clocks);
    b.start();
    b.start_pll(50, 10 * us);
    // Stopping it while the mux still selects the RC is allowed, and so is starting it again.
    b.write(CK_PLL_RUN, 0, 70 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 70 * us), 0u);
    b.write(CK_PLL_RUN, CK_PLL_RUN_ENABLE, 80 * us);
    b.write(CK_SYSTEM_SOURCE, CK_SOURCE_PLL, 200 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 200 * us), 0u);
    b.write(CK_PLL_RUN, 0, 210 * us);
    EXPECT_EQ(b.read(CK_REFUSALS, 210 * us), CK_REFUSED_IN_USE) << b.core->last_refusal();
    EXPECT_EQ(b.read(CK_PLL_RUN, 210 * us), CK_PLL_RUN_ENABLE | CK_PLL_RUN_READY);
    EXPECT_EQ(b.tree.domain("sys").freq_at(220 * us), frequency::hz(50'000'000));
}
