// Axis parsing (every VALUES form and every error), point enumeration and shards
// (harness/run/sweep_plan.h; the forms are specified in docs/cli.md, "sweep").

#include "harness/run/sweep_plan.h"

#include <gtest/gtest.h>

using harness::run::parse_axis;
using harness::run::parse_shard;
using harness::run::parse_values;
using harness::run::sweep_axis;
using harness::run::sweep_error;
using harness::run::sweep_plan;
using strings = std::vector<std::string>;

namespace {

// The message of the sweep_error `f` throws, or "" when it throws none.
template <typename F>
std::string error_of(F f) {
    try {
        f();
    } catch (const sweep_error& e) {
        return e.what();
    }
    return "";
}

}  // namespace

TEST(sweep_plan_test, reads_a_list) {
    EXPECT_EQ(parse_values("param.variant", "naive,careful"), (strings{"naive", "careful"}));
    EXPECT_EQ(parse_values("param.variant", " a , b "), (strings{"a", "b"}));
    EXPECT_EQ(parse_values("seed", "7"), (strings{"7"}));
}

TEST(sweep_plan_test, reads_an_integer_range_with_both_ends_included) {
    EXPECT_EQ(parse_values("start-offset", "0..3"), (strings{"0", "1", "2", "3"}));
    EXPECT_EQ(parse_values("start-offset", "5..5"), (strings{"5"}));
    EXPECT_EQ(parse_values("x.y", "-2..1"), (strings{"-2", "-1", "0", "1"}));
    EXPECT_EQ(parse_values("start-offset", "0..65535").size(), 65536u);
}

TEST(sweep_plan_test, an_integer_step_stops_at_the_last_value_not_above_the_end) {
    EXPECT_EQ(parse_values("start-offset", "0..100/25"), (strings{"0", "25", "50", "75", "100"}));
    EXPECT_EQ(parse_values("start-offset", "0..10/3"), (strings{"0", "3", "6", "9"}));
}

TEST(sweep_plan_test, a_quantity_range_is_exact) {
    // 5 points from 7.9 to 8.1: a step of 0.05, exact (0.1 + 0.2 style float drift would show).
    EXPECT_EQ(parse_values("clocks.xtal.frequency", "7.9 MHz..8.1 MHz/5"),
              (strings{"7.9 MHz", "7.95 MHz", "8 MHz", "8.05 MHz", "8.1 MHz"}));
    EXPECT_EQ(parse_values("run.duration", "1 ms..2 ms/3"), (strings{"1 ms", "1.5 ms", "2 ms"}));
    EXPECT_EQ(parse_values("x.y", "0.1us..0.3us/3"), (strings{"0.1 us", "0.2 us", "0.3 us"}));
    EXPECT_EQ(parse_values("x.y", "-1 %..1 %/3"), (strings{"-1 %", "0 %", "1 %"}));
}

TEST(sweep_plan_test, reports_each_bad_values_text) {
    EXPECT_EQ(error_of([] { parse_values("seed", ""); }),
              "--vary seed=: no values; give a list \"a,b,c\", an integer range \"0..63\" or "
              "\"0..100/5\", or a quantity range \"7.9 MHz..8.1 MHz/5\"");
    EXPECT_EQ(error_of([] { parse_values("p", "a,,b"); }),
              "--vary p=a,,b: an empty value in the list; separate values by single commas, e.g. "
              "naive,careful");
    EXPECT_EQ(error_of([] { parse_values("p", "a,b,a"); }),
              "--vary p=a,b,a: 'a' is listed twice; list each value once");
    EXPECT_EQ(error_of([] { parse_values("p", "0..3,7"); }),
              "--vary p=0..3,7: a range and a list cannot be mixed; give either \"a,b,c\" or "
              "\"A..B\"");
    EXPECT_EQ(error_of([] { parse_values("p", "5..1"); }),
              "--vary p=5..1: the range starts above its end; write the smaller end first");
    EXPECT_EQ(error_of([] { parse_values("p", "0..10/0"); }),
              "--vary p=0..10/0: the step '0' must be a whole number above 0, as in \"0..100/5\"");
    EXPECT_EQ(error_of([] { parse_values("p", "0..10/x"); }),
              "--vary p=0..10/x: the step 'x' must be a whole number above 0, as in \"0..100/5\"");
    EXPECT_EQ(error_of([] { parse_values("p", "..5"); }),
              "--vary p=..5: a range needs both ends, as in \"0..63\" or \"7.9 MHz..8.1 MHz/5\"");
    EXPECT_EQ(error_of([] { parse_values("p", "1 MHz..2 MHz"); }),
              "--vary p=1 MHz..2 MHz: a quantity range needs its number of points, e.g. \"7.9 "
              "MHz..8.1 MHz/5\" (5 points, both ends included)");
    EXPECT_EQ(error_of([] { parse_values("p", "fast..2 MHz/3"); }),
              "--vary p=fast..2 MHz/3: 'fast' is not an integer or a quantity; expected a decimal "
              "number and a unit such as \"7.9 MHz\"");
    EXPECT_EQ(error_of([] { parse_values("p", "1 MHz..slow/3"); }),
              "--vary p=1 MHz..slow/3: 'slow' is not an integer or a quantity; expected a decimal "
              "number and a unit such as \"8.1 MHz\"");
    EXPECT_EQ(error_of([] { parse_values("p", "1 MHz..2 kHz/3"); }),
              "--vary p=1 MHz..2 kHz/3: the ends have different units ('MHz' and 'kHz'); give "
              "both ends in the same unit");
    EXPECT_EQ(error_of([] { parse_values("p", "1 MHz..2 MHz/1"); }),
              "--vary p=1 MHz..2 MHz/1: the number of points '1' must be a whole number of at "
              "least 2 (both ends are points)");
    EXPECT_EQ(error_of([] { parse_values("p", "2 MHz..1 MHz/3"); }),
              "--vary p=2 MHz..1 MHz/3: the range starts above its end; write the smaller end "
              "first");
    // 1/3 MHz steps are no finite decimal.
    EXPECT_EQ(error_of([] { parse_values("p", "1 MHz..2 MHz/4"); }),
              "--vary p=1 MHz..2 MHz/4: point 2 of 4 is not a finite decimal number of MHz; "
              "choose a number of points that divides the range evenly (the step is (end - "
              "start) / (points - 1))");
    EXPECT_EQ(error_of([] { parse_values("p", "0..16777216"); }),
              "--vary p=0..16777216: 16777217 values, more than the 16777216 an axis may take");
}

TEST(sweep_plan_test, reads_each_axis_kind) {
    const sweep_axis a = parse_axis("start-offset=0..2");
    EXPECT_EQ(a.what, sweep_axis::kind::start_offset);
    EXPECT_EQ(a.spec, "0..2");
    EXPECT_EQ(parse_axis("seed=1,2").what, sweep_axis::kind::seed);
    const sweep_axis p = parse_axis("param.variant=naive");
    EXPECT_EQ(p.what, sweep_axis::kind::param);
    EXPECT_EQ(p.target, "variant");
    const sweep_axis k = parse_axis("clocks.xtal.frequency=7.9 MHz..8.1 MHz/5");
    EXPECT_EQ(k.what, sweep_axis::kind::key);
    EXPECT_EQ(k.target, "clocks.xtal.frequency");
    EXPECT_EQ(k.values.size(), 5u);
}

TEST(sweep_plan_test, reports_each_bad_axis) {
    EXPECT_EQ(error_of([] { parse_axis("start-offset"); }),
              "--vary 'start-offset': expected AXIS=VALUES, e.g. --vary start-offset=0..63 or "
              "--vary param.variant=naive,careful");
    EXPECT_EQ(error_of([] { parse_axis("=1"); }),
              "--vary '=1': expected AXIS=VALUES, e.g. --vary start-offset=0..63 or --vary "
              "param.variant=naive,careful");
    EXPECT_EQ(error_of([] { parse_axis("offset=1"); }),
              "--vary offset: not an axis; axes are start-offset, seed, param.NAME or a scenario "
              "key path with its table, such as clocks.xtal.frequency or run.duration");
    EXPECT_EQ(error_of([] { parse_axis("clocks..x=1"); }),
              "--vary clocks..x: not an axis; axes are start-offset, seed, param.NAME or a "
              "scenario key path with its table, such as clocks.xtal.frequency or run.duration");
    EXPECT_EQ(error_of([] { parse_axis("a b.c=1"); }),
              "--vary a b.c: ' ' cannot be in an axis name; axes are start-offset, seed, "
              "param.NAME or a scenario key path such as clocks.xtal.frequency");
    EXPECT_EQ(error_of([] { parse_axis("param.=1"); }),
              "--vary param.: name the firmware parameter, e.g. param.variant");
    EXPECT_EQ(error_of([] { parse_axis("start-offset=-1..2"); }),
              "--vary start-offset: '-1' is not a whole number of at least 0; start-offset takes "
              "values such as 0..63 or 1,2,3");
    EXPECT_EQ(error_of([] { parse_axis("seed=x"); }),
              "--vary seed: 'x' is not a whole number of at least 0; seed takes values such as "
              "0..63 or 1,2,3");
}

TEST(sweep_plan_test, numbers_points_with_the_first_axis_outermost) {
    const sweep_plan plan(
        {parse_axis("param.variant=naive,careful"), parse_axis("start-offset=0..2")});
    ASSERT_EQ(plan.points(), 6u);
    EXPECT_EQ(plan.values(0), (strings{"naive", "0"}));
    EXPECT_EQ(plan.values(2), (strings{"naive", "2"}));
    EXPECT_EQ(plan.values(3), (strings{"careful", "0"}));
    EXPECT_EQ(plan.values(5), (strings{"careful", "2"}));
    EXPECT_EQ(plan.point_name(4), "param.variant=careful start-offset=1");
    for (std::uint64_t i = 0; i < plan.points(); ++i)
        EXPECT_EQ(plan.index_of(plan.positions(i)), i);
}

TEST(sweep_plan_test, turns_a_point_into_overrides) {
    const sweep_plan plan({parse_axis("start-offset=4"), parse_axis("seed=9"),
                           parse_axis("param.variant=naive"),
                           parse_axis("clocks.xtal.frequency=8 MHz")});
    harness::run::scenario_overrides base;
    base.firmware = "lib.so";
    const auto o = plan.overrides(0, base);
    EXPECT_EQ(o.firmware, "lib.so");
    EXPECT_EQ(o.start_offset_cycles, 4u);
    EXPECT_EQ(o.seed, 9u);
    EXPECT_EQ(o.parameters.at("variant"), "naive");
    ASSERT_EQ(o.keys.size(), 1u);
    EXPECT_EQ(o.keys[0].first, "clocks.xtal.frequency");
    EXPECT_EQ(o.keys[0].second, "8 MHz");
}

TEST(sweep_plan_test, refuses_no_axis_and_a_repeated_axis) {
    EXPECT_EQ(error_of([] { sweep_plan p({}); }),
              "no --vary given; a sweep needs at least one axis, e.g. --vary start-offset=0..63");
    EXPECT_EQ(error_of([] {
                  sweep_plan p({parse_axis("seed=1"), parse_axis("seed=2")});
              }),
              "--vary seed is given twice; give each axis once");
    EXPECT_EQ(error_of([] {
                  sweep_plan p({parse_axis("a.b=0..65535"), parse_axis("c.d=0..65535"),
                                parse_axis("e.f=0,1")});
              }),
              "the axes span more than 4294967296 points; split the sweep");
}

TEST(sweep_plan_test, a_shard_takes_the_points_of_its_residue) {
    const auto s = parse_shard("2/3");
    EXPECT_EQ(s.number, 2u);
    EXPECT_EQ(s.count, 3u);
    EXPECT_FALSE(s.includes(0));
    EXPECT_TRUE(s.includes(1));
    EXPECT_TRUE(s.includes(4));
    EXPECT_EQ(s.text(), "2/3");
    for (const char* bad : {"0/3", "4/3", "3", "a/b", "1/0"})
        EXPECT_EQ(error_of([bad] { parse_shard(bad); }),
                  std::string("--shard '") + bad +
                      "': expected K/N with 1 <= K <= N, e.g. --shard 2/4 (the second of four "
                      "shards)");
}
