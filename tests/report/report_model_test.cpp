// The failure report's content (sim/report/report_model.h): the marks placed for each kind of
// failed check, and report.json written and read back unchanged, with clear errors for a file that
// is not one.

#include "sim/report/report_model.h"

#include <gtest/gtest.h>

namespace {

using sim::report_check;
using sim::report_model;
using sim::time_ps;

sim::check_result failed_at(time_ps from, time_ps at) {
    sim::check_result r;
    r.name = "c";
    r.passed = false;
    r.at = at;
    r.fail_from = from;
    r.unit = "s";
    r.count = 3;
    r.mean = 40e-6;
    return r;
}

report_model sample_model() {
    report_model m;
    m.scenario = "sample <&> \"quoted\"";
    m.end = 3'000'000'000ULL;
    m.clocks.push_back({"xtal", "crystal", "8000000", "8000000", "nominal 8 MHz", "sys"});
    m.clocks.push_back({"slow", "divider", "2666666.666667", "8000000/3", "divide by 3", "-"});
    report_check c;
    c.name = "duty";
    c.kind = "duty_cycle";
    c.signal = "pwm.channel1";
    c.expected = "30 % +/- 0.01 %";
    c.tolerance = "0.01 %";
    c.measured = "mean 25 % over 71";
    c.passed = false;
    c.at = 160'375'000;
    c.from = 120'375'000;
    c.detail = "duty cycle 25 % falls short";
    c.span_label = "period 40 us";
    c.marks.push_back({132'375'000, "expected fall at 30 %"});
    sim::wave_trace t;
    t.name = "pwm.channel1";
    t.before = true;
    t.edges = {10, 20, 20, 35};
    t.known_from = 10;
    t.known_to = 99;
    c.traces.push_back(t);
    m.checks.push_back(c);
    report_check p;
    p.name = "fw";
    p.kind = "firmware";
    p.passed = true;
    p.at = m.end;
    m.checks.push_back(p);
    return m;
}

TEST(report_model_test, report_json_reads_back_to_the_same_model) {
    const report_model m = sample_model();
    const std::string text = sim::report_json_text(m);
    EXPECT_EQ(text.back(), '\n');
    const report_model back = sim::parse_report_json(text, "report.json");
    EXPECT_TRUE(back == m);
    EXPECT_EQ(sim::report_json_text(back), text);
}

TEST(report_model_test, a_failed_period_is_marked_with_its_expected_length_from_its_start) {
    sim::check_spec spec;
    spec.kind = sim::check_kind::period;
    spec.expected = 40'000'000;
    const report_check c = sim::make_report_check(&spec, failed_at(1'000'000, 42'000'000), {});
    EXPECT_EQ(c.span_label, "measured 41 us");
    ASSERT_EQ(c.marks.size(), 1u);
    EXPECT_EQ(c.marks[0].at, 41'000'000u);
    EXPECT_EQ(c.marks[0].label, "expected 40 us");
}

TEST(report_model_test, a_failed_pulse_with_bounds_gets_both_bounds) {
    sim::check_spec spec;
    spec.kind = sim::check_kind::pulse_width;
    spec.minimum = 19'900'000;
    spec.maximum = 20'100'000;
    const report_check c = sim::make_report_check(&spec, failed_at(100, 25'000'100), {});
    ASSERT_EQ(c.marks.size(), 2u);
    EXPECT_EQ(c.marks[0].at, 19'900'100u);
    EXPECT_EQ(c.marks[0].label, "min 19.9 us");
    EXPECT_EQ(c.marks[1].at, 20'100'100u);
    EXPECT_EQ(c.marks[1].label, "max 20.1 us");
}

TEST(report_model_test, a_failed_duty_cycle_marks_where_the_expected_fall_lies) {
    sim::check_spec spec;
    spec.kind = sim::check_kind::duty_cycle;
    spec.expected = 300'000'000;  // 30 %
    const report_check c = sim::make_report_check(&spec, failed_at(0, 40'000'000), {});
    EXPECT_EQ(c.span_label, "period 40 us");
    ASSERT_EQ(c.marks.size(), 1u);
    EXPECT_EQ(c.marks[0].at, 12'000'000u);
    EXPECT_EQ(c.marks[0].label, "expected fall at 30 %");
}

TEST(report_model_test, a_failed_frequency_marks_the_expected_period) {
    sim::check_spec spec;
    spec.kind = sim::check_kind::frequency;
    spec.expected_frequency = sim::frequency(25'000, 1);
    const report_check c = sim::make_report_check(&spec, failed_at(5, 41'000'005), {});
    ASSERT_EQ(c.marks.size(), 1u);
    EXPECT_EQ(c.marks[0].at, 40'000'005u);
    EXPECT_EQ(c.marks[0].label, "expected period 40 us");
}

TEST(report_model_test, a_passed_check_or_an_instant_failure_has_no_marks) {
    sim::check_spec spec;
    spec.kind = sim::check_kind::period;
    spec.expected = 40;
    sim::check_result r = failed_at(0, 50);
    r.passed = true;
    EXPECT_TRUE(sim::make_report_check(&spec, r, {}).marks.empty());
    r = failed_at(0, 50);
    r.fail_from.reset();
    EXPECT_TRUE(sim::make_report_check(&spec, r, {}).marks.empty());
    EXPECT_EQ(sim::make_report_check(nullptr, failed_at(0, 50), {}).marks.size(), 0u);
}

TEST(report_model_test, the_measured_text_is_the_summary_s) {
    const report_check c = sim::make_report_check(nullptr, failed_at(0, 1), {});
    EXPECT_EQ(c.measured, "mean 40 us over 3");
}

TEST(report_model_test, bad_report_json_names_the_place_and_what_is_expected) {
    try {
        sim::parse_report_json("{\n  \"format\": \"tickbench-report\",\n  oops\n}",
                               "d/report.json");
        FAIL() << "no error";
    } catch (const sim::report_format_error& e) {
        EXPECT_NE(std::string(e.what()).find("d/report.json:3:"), std::string::npos) << e.what();
    }
    try {
        sim::parse_report_json("{\"format\": \"something\"}", "r.json");
        FAIL() << "no error";
    } catch (const sim::report_format_error& e) {
        EXPECT_NE(std::string(e.what()).find("r.json: format: expected \"tickbench-report\""),
                  std::string::npos)
            << e.what();
    }
    std::string text = sim::report_json_text(sample_model());
    const std::string key = "\"at_ps\":160375000";
    ASSERT_NE(text.find(key), std::string::npos);
    text.replace(text.find(key), key.size(), "\"at_ps\":\"soon\"");
    try {
        sim::parse_report_json(text, "r.json");
        FAIL() << "no error";
    } catch (const sim::report_format_error& e) {
        EXPECT_NE(std::string(e.what()).find("r.json: checks[0].at_ps: expected a whole number"),
                  std::string::npos)
            << e.what();
    }
}

}  // namespace
