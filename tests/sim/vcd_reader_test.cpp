// The streaming VCD reader: the header, every kind of value change, left extension of vectors,
// exact picosecond times, files written by our own writer, and errors at file:line.

#include "sim/vcd_reader.h"

#include "sim/signal_sink.h"
#include "sim/vcd_writer.h"
#include "tests/support/temp_files.h"

#include <gtest/gtest.h>

#include <sstream>
#include <string>
#include <vector>

namespace {

using tickbench::test_support::temp_path;

std::vector<sim::vcd_change> all_changes(sim::vcd_reader& r) {
    std::vector<sim::vcd_change> out;
    for (sim::vcd_change c; r.next(c);) out.push_back(c);
    return out;
}

// The error message reading `text` gives, or "" when it reads.
std::string error_of(const std::string& text) {
    std::istringstream in(text);
    try {
        sim::vcd_reader r(in, "t.vcd");
        all_changes(r);
    } catch (const sim::vcd_error& e) {
        return e.what();
    }
    return "";
}

const char* const header =
    "$timescale 1 ns $end\n"
    "$scope module pwm $end\n"
    "$var wire 1 ! channel1 $end\n"
    "$upscope $end\n"
    "$enddefinitions $end\n";

// IEEE Std 1364-2005 clause 18 (recalled from memory): header sections, nested scopes, a $var with
// a bit range, two variables sharing one identifier code.
TEST(vcd_reader_test, reads_the_header_scopes_variables_and_timescale) {
    std::istringstream in(
        "$date today $end\n$version some tool $end\n$comment a\nnote $end\n"
        "$timescale\n  10ns\n$end\n"
        "$scope module top $end\n$scope module fan $end\n"
        "$var wire 1 ! tach $end\n$var reg 4 \"# bus [3:0] $end\n"
        "$upscope $end\n$var wire 1 ! tach_copy $end\n$var real 64 $ level $end\n"
        "$upscope $end\n$enddefinitions $end\n");
    sim::vcd_reader r(in, "t.vcd");
    EXPECT_EQ(r.unit_ps(), 10'000u);
    ASSERT_EQ(r.variables().size(), 4u);
    EXPECT_EQ(r.variables()[0].name, "top.fan.tach");
    EXPECT_EQ(r.variables()[0].code, "!");
    EXPECT_EQ(r.variables()[1].name, "top.fan.bus[3:0]");
    EXPECT_EQ(r.variables()[1].width, 4u);
    EXPECT_EQ(r.variables()[1].type, "reg");
    EXPECT_EQ(r.variables()[2].name, "top.tach_copy");
    EXPECT_EQ(r.variables()[3].type, "real");
    sim::vcd_change c;
    EXPECT_FALSE(r.next(c));
    EXPECT_TRUE(r.finished());
}

// IEEE Std 1364-2005 clause 18 (recalled from memory): $dumpvars values are changes at the time
// before them; a shared code changes each variable; times are in timescale units.
TEST(vcd_reader_test, hands_out_scalar_vector_and_real_changes_in_file_order_at_exact_times) {
    std::istringstream in(
        "$timescale 100 ps $end\n$scope module m $end\n$var wire 1 ! a $end\n"
        "$var wire 1 ! b $end\n$var wire 4 % v $end\n$var real 64 & r $end\n$upscope $end\n"
        "$enddefinitions $end\n#0\n$dumpvars\n0!\nbx %\nr0 &\n$end\n"
        "#25\n1!\nb101 %\n#30\nX!\nr2.5 &\nB1z %\n");
    sim::vcd_reader r(in, "t.vcd");
    const std::vector<sim::vcd_change> c = all_changes(r);
    ASSERT_EQ(c.size(), 11u);
    EXPECT_EQ(c[0].at, 0u);
    EXPECT_EQ(c[0].value, "0");
    EXPECT_EQ(c[0].variable, 0u);
    EXPECT_EQ(c[1].variable, 1u);  // b shares a's code
    EXPECT_EQ(c[2].value, "xxxx");
    EXPECT_EQ(c[3].value, "0");
    EXPECT_EQ(c[4].at, 2'500u);
    EXPECT_EQ(c[4].value, "1");
    EXPECT_EQ(c[6].value, "0101");
    EXPECT_EQ(c[7].at, 3'000u);
    EXPECT_EQ(c[7].value, "x");
    EXPECT_EQ(c[9].value, "2.5");
    EXPECT_EQ(c[10].value, "001z");
    EXPECT_EQ(r.time(), 3'000u);
}

// IEEE Std 1364-2005 clause 18 (recalled from memory): a vector value shorter than its variable is
// extended on the left with 0 when its leftmost digit is 0 or 1, with x or z when it is x or z.
TEST(vcd_reader_test, extends_short_vector_values_on_the_left_as_the_clause_says) {
    EXPECT_EQ(sim::vcd_reader::extend("1", 4), "0001");
    EXPECT_EQ(sim::vcd_reader::extend("0", 3), "000");
    EXPECT_EQ(sim::vcd_reader::extend("x1", 4), "xxx1");
    EXPECT_EQ(sim::vcd_reader::extend("z", 2), "zz");
    EXPECT_EQ(sim::vcd_reader::extend("1010", 4), "1010");
}

TEST(vcd_reader_test, reads_back_what_the_writer_wrote_edge_for_edge) {
    const std::string path = temp_path("vcd_reader_test", "round_trip.vcd");
    {
        sim::vcd_options o;
        o.unit_ps = 10;
        o.date = "fixed";
        sim::vcd_writer w(path, o);
        w.declare(0, {"pwm", "channel1", false});
        w.declare(1, {"pwm", "irq", true});
        w.begin();
        w.change(0, true, 20);
        w.change(1, false, 20);
        w.change(0, false, 1'000'000);
        w.end(2'000'000);
    }
    sim::vcd_reader r(path);
    EXPECT_EQ(r.unit_ps(), 10u);
    ASSERT_EQ(r.variables().size(), 2u);
    EXPECT_EQ(r.variables()[0].name, "pwm.channel1");
    EXPECT_EQ(r.variables()[1].name, "pwm.irq");
    const std::vector<sim::vcd_change> c = all_changes(r);
    ASSERT_EQ(c.size(), 5u);  // two initial values, three changes
    EXPECT_EQ(c[0].value, "0");
    EXPECT_EQ(c[1].value, "1");
    EXPECT_EQ(c[2].at, 20u);
    EXPECT_EQ(c[2].value, "1");
    EXPECT_EQ(c[4].at, 1'000'000u);
    EXPECT_EQ(c[4].value, "0");
    EXPECT_EQ(r.time(), 2'000'000u);
}

// A file many times the reader's buffer is read piece by piece, line numbers still right.
TEST(vcd_reader_test, streams_a_long_file_and_counts_lines_across_buffers) {
    std::ostringstream text;
    text << header;
    const int steps = 100'000;
    for (int i = 1; i <= steps; ++i) text << '#' << i * 10 << '\n' << (i % 2) << "!\n";
    text << "#" << (steps + 1) * 10 << "\n1?\n";
    std::istringstream in(text.str());
    sim::vcd_reader r(in, "long.vcd");
    sim::vcd_change c;
    int n = 0;
    try {
        while (r.next(c)) ++n;
        FAIL() << "the undeclared code at the end was read";
    } catch (const sim::vcd_error& e) {
        // 5 header lines, two lines per step, then the time line.
        EXPECT_EQ(std::string(e.what()).substr(0, 16), "long.vcd:200007:") << e.what();
    }
    EXPECT_EQ(n, steps);
    EXPECT_EQ(c.at, static_cast<sim::time_ps>(steps) * 10'000);
}

TEST(vcd_reader_test, names_file_line_and_what_was_expected_for_malformed_text) {
    const std::string h = header;
    EXPECT_EQ(error_of(h + "#0\n1?\n"),
              "t.vcd:7: a value change of identifier code \"?\", which no $var declares");
    EXPECT_EQ(error_of(h + "#10\n#5\n"),
              "t.vcd:7: time \"#5\" goes back from 10 ns; expected times in non-decreasing order");
    EXPECT_NE(error_of(h + "#1x\n").find("t.vcd:6: \"#1x\": expected a time"), std::string::npos);
    EXPECT_NE(
        error_of(h + "#0\nq!\n").find("t.vcd:7: \"q!\": expected a time (#N), a value change"),
        std::string::npos);
    EXPECT_NE(error_of(h + "#0\nb102 !\n").find("t.vcd:7: vector value \"b102\""),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 3 ns $end\n$enddefinitions $end\n")
                  .find("t.vcd:1: timescale \"3ns\": expected 1, 10 or 100 and a unit"),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 1 fs $end\n$enddefinitions $end\n").find("finer than 1 ps"),
              std::string::npos);
    EXPECT_NE(error_of("$scope module m $end\n$var wire 1 ! a $end\n$enddefinitions $end\n")
                  .find("the header has no $timescale"),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 1 ps $end\n$var wire 1 ! a $end\n")
                  .find("t.vcd:2: the file ends before $enddefinitions"),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 1 ps $end\n$comment never closed\n")
                  .find("t.vcd:2: $comment has no $end"),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 1 ps $end\n$var wire 4 ! v $end\n$enddefinitions $end\n"
                       "b10101 !\n")
                  .find("t.vcd:4: a value of 5 bits for \"v\", declared with 4"),
              std::string::npos);
    EXPECT_NE(error_of("$timescale 1 ps $end\nmodule\n").find("t.vcd:2: \"module\" in the header"),
              std::string::npos);
}

TEST(vcd_reader_test, refuses_a_file_that_cannot_be_read) {
    try {
        sim::vcd_reader r("no/such/waves.vcd");
        FAIL() << "a missing file was read";
    } catch (const sim::vcd_error& e) {
        EXPECT_NE(std::string(e.what()).find("no/such/waves.vcd: cannot read the file: "),
                  std::string::npos);
    }
}

}  // namespace
