// Check descriptions: validation messages and the scenario spellings of tolerances and angles.

#include "sim/checks/check_spec.h"
#include "sim/checks/check_engine.h"
#include "sim/checks/check_spec_text.h"
#include "sim/checks/condition.h"
#include "sim/quantity.h"

#include <gtest/gtest.h>

namespace {

using sim::check_kind;
using sim::check_spec;
using sim::tolerance_kind;

std::string problems(const check_spec& s) {
    std::string out;
    for (const auto& p : sim::validate(s)) out += p.field + ": " + p.message + "\n";
    return out;
}

TEST(check_spec_test, a_complete_spec_is_valid) {
    check_spec s;
    s.name = "pwm_period";
    s.kind = check_kind::period;
    s.signals = {"pwm.channel1"};
    s.expected = 40'000'000;
    s.tol = sim::tolerance::relative_ppb(100'000);
    EXPECT_EQ(problems(s), "");
}

TEST(check_spec_test, problems_name_the_field_and_what_is_accepted) {
    check_spec s;
    s.kind = check_kind::phase;
    s.signals = {"a"};
    s.minimum = 5;
    s.maximum = 4;
    s.tol = sim::tolerance::relative_ppb(1);
    s.until = 0;
    EXPECT_EQ(problems(s),
              "name: a check needs a name\n"
              "signals: a phase check needs exactly two signals (A, then B), got 1\n"
              "tolerance: a tolerance applies to an expected value, not to bounds\n"
              "minimum: minimum is above maximum\n"
              "until: the window must end after it starts (until > from)\n");

    check_spec f;
    f.name = "f";
    f.kind = check_kind::frequency;
    f.signals = {"a"};
    f.edge = sim::edge_select::both;
    EXPECT_EQ(problems(f),
              "expected: a frequency check needs an expected frequency above 0 Hz\n"
              "edge: a period runs from one edge to the next edge of the same direction: choose "
              "rising or falling\n");

    check_spec n;
    n.name = "n";
    n.kind = check_kind::never;
    n.condition = "a and (b or";
    EXPECT_EQ(problems(n),
              "condition: column 12: expected a signal name, \"not\" or \"(\" at the end\n");

    check_spec d;
    d.name = "d";
    d.kind = check_kind::duty_cycle;
    d.signals = {"a"};
    d.expected = 1'500'000'000;
    d.tol = sim::tolerance::ticks_of(2, "timer_clock", sim::time_ps{0});
    EXPECT_EQ(problems(d),
              "expected: a duty cycle lies between 0 % and 100 %\n"
              "tolerance: a tick tolerance needs the clock's period (name a running clock)\n");
}

TEST(check_spec_test, the_engine_refuses_invalid_specs_listing_every_problem) {
    check_spec s;
    s.name = "p";
    s.kind = check_kind::period;
    s.signals = {"a"};
    try {
        sim::check_engine e({s});
        FAIL() << "no error";
    } catch (const std::invalid_argument& e) {
        EXPECT_STREQ(e.what(),
                     "invalid checks:\ncheck 'p': expected: a period check needs an expected value "
                     "or bounds (minimum, maximum)");
    }
}

TEST(check_spec_test, tolerances_read_per_kind) {
    check_spec period;
    period.kind = check_kind::period;
    auto t = sim::parse_tolerance("100 ppm", period);
    EXPECT_EQ(t.kind, tolerance_kind::relative);
    EXPECT_EQ(t.amount, 100'000u);
    t = sim::parse_tolerance("20 ns", period);
    EXPECT_EQ(t.kind, tolerance_kind::absolute);
    EXPECT_EQ(t.amount, 20'000u);
    t = sim::parse_tolerance(" 3 ticks", period);
    EXPECT_EQ(t.kind, tolerance_kind::ticks);
    EXPECT_EQ(t.amount, 3u);

    check_spec duty;
    duty.kind = check_kind::duty_cycle;
    t = sim::parse_tolerance("0.5 %", duty);  // absolute points of the whole
    EXPECT_EQ(t.kind, tolerance_kind::absolute);
    EXPECT_EQ(t.amount, 5'000'000u);

    check_spec angle;
    angle.kind = check_kind::phase;
    angle.phase_as_angle = true;
    EXPECT_EQ(sim::parse_tolerance("1 %", angle).amount, 3'600'000u);  // 1 % of a turn is 3.6 deg
    EXPECT_EQ(sim::parse_tolerance("0.5 deg", angle).amount, 500'000u);

    check_spec freq;
    freq.kind = check_kind::frequency;
    EXPECT_EQ(sim::parse_tolerance("2 Hz", freq).absolute_frequency, sim::frequency::hz(2));

    check_spec count;
    count.kind = check_kind::edge_count;
    EXPECT_EQ(sim::parse_tolerance("2", count).amount, 2u);

    EXPECT_THROW(sim::parse_tolerance("2 Hz", period), sim::quantity_error);
    EXPECT_THROW(sim::parse_tolerance("-5 ppm", period), sim::quantity_error);
    EXPECT_THROW(sim::parse_tolerance("5", period), sim::quantity_error);
    EXPECT_THROW(sim::parse_tolerance("1 %", count), sim::quantity_error);
}

TEST(check_spec_test, angles_and_duty_cycles_read_exactly) {
    EXPECT_EQ(sim::parse_angle("120 deg"), 120'000'000u);
    EXPECT_EQ(sim::parse_angle("22.5deg"), 22'500'000u);
    EXPECT_EQ(sim::parse_angle("25 %"), 90'000'000u);
    EXPECT_THROW(sim::parse_angle("120"), sim::quantity_error);
    EXPECT_THROW(sim::parse_angle("0.0000001 deg"), sim::quantity_error);
    EXPECT_EQ(sim::parse_duty("25 %"), 250'000'000u);
    EXPECT_THROW(sim::parse_duty("101 %"), sim::quantity_error);
}

TEST(check_spec_test, tick_tolerance_of_a_clock_keeps_the_exact_period) {
    const auto t = sim::tolerance::ticks_of(2, "timer_clock", sim::frequency::hz(48'000'000));
    EXPECT_EQ(t.tick_num, 62'500u);  // 1e12 / 48e6 = 62500 / 3 ps
    EXPECT_EQ(t.tick_den, 3u);
}

TEST(check_spec_test, conditions_parse_with_precedence) {
    const auto c = sim::condition::parse("not a or b and (c or not a)");
    ASSERT_EQ(c.signals(), (std::vector<std::string>{"a", "b", "c"}));
    for (unsigned bits = 0; bits < 8; ++bits) {
        const bool a = bits & 1, b = bits & 2, cc = bits & 4;
        const bool want = !a || (b && (cc || !a));
        EXPECT_EQ(c.eval([&](std::uint32_t slot) { return slot == 0   ? a
                                                          : slot == 1 ? b
                                                                      : cc; }),
                  want)
            << bits;
    }
    EXPECT_THROW(sim::condition::parse(""), sim::condition_error);
    EXPECT_THROW(sim::condition::parse("a and"), sim::condition_error);
    EXPECT_THROW(sim::condition::parse("a b"), sim::condition_error);
    EXPECT_THROW(sim::condition::parse("(a"), sim::condition_error);
    EXPECT_THROW(sim::condition::parse("and"), sim::condition_error);
    EXPECT_THROW(sim::condition::parse("a & b"), sim::condition_error);
}

}  // namespace
