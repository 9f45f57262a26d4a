// Exact reading of frequencies, times and ratios with units (sim/quantity.h).

#include "sim/quantity.h"

#include <gtest/gtest.h>

#include <string>

namespace {

// The message of the quantity_error thrown by f(), or "" when none is thrown.
template <typename F>
std::string error_of(F f) {
    try {
        f();
    } catch (const sim::quantity_error& e) {
        return e.what();
    }
    return "";
}

TEST(quantity_test, frequencies_are_exact) {
    EXPECT_EQ(sim::parse_frequency("25 kHz"), sim::frequency::hz(25'000));
    EXPECT_EQ(sim::parse_frequency("8 MHz"), sim::frequency::hz(8'000'000));
    EXPECT_EQ(sim::parse_frequency("32.768 kHz"), sim::frequency::hz(32'768));
    EXPECT_EQ(sim::parse_frequency("1.5 GHz"), sim::frequency::hz(1'500'000'000));
    EXPECT_EQ(sim::parse_frequency("100 Hz"), sim::frequency::hz(100));
    EXPECT_EQ(sim::parse_frequency("12000000"), sim::frequency::hz(12'000'000));
    EXPECT_EQ(sim::parse_frequency("0 Hz"), sim::frequency());
    EXPECT_EQ(sim::parse_frequency("  8MHz "), sim::frequency::hz(8'000'000));
    EXPECT_EQ(sim::parse_frequency("+4 MHz"), sim::frequency::hz(4'000'000));
    // Fractions of a hertz stay exact fractions.
    EXPECT_EQ(sim::parse_frequency("0.5 Hz"), sim::frequency(1, 2));
    EXPECT_EQ(sim::parse_frequency("32.7680001 kHz"), sim::frequency(327'680'001, 10'000));
}

TEST(quantity_test, times_are_exact_picoseconds) {
    EXPECT_EQ(sim::parse_time("40 us"), 40'000'000u);
    EXPECT_EQ(sim::parse_time("1.25 ms"), 1'250'000'000u);
    EXPECT_EQ(sim::parse_time("200 ns"), 200'000u);
    EXPECT_EQ(sim::parse_time("3 s"), 3'000'000'000'000u);
    EXPECT_EQ(sim::parse_time("5 ps"), 5u);
    EXPECT_EQ(sim::parse_time("0.001 ns"), 1u);
    // UTF-8 of U+00B5 MICRO SIGN is C2 B5 and of U+03BC GREEK SMALL LETTER MU is CE BC: from
    // memory.
    EXPECT_EQ(sim::parse_time("40 \xC2\xB5s"), 40'000'000u);
    EXPECT_EQ(sim::parse_time("40 \xCE\xBCs"), 40'000'000u);
    EXPECT_EQ(sim::parse_time("18446744073709551615 ps"), sim::max_time_ps);
}

TEST(quantity_test, ratios_are_exact_ppb) {
    EXPECT_EQ(sim::parse_ppb("100 ppm"), 100'000);
    EXPECT_EQ(sim::parse_ppb("-20 ppm"), -20'000);
    EXPECT_EQ(sim::parse_ppb("1.5 %"), 15'000'000);
    EXPECT_EQ(sim::parse_ppb("250 ppb"), 250);
    EXPECT_EQ(sim::parse_ppb("-0.001 ppm"), -1);
    EXPECT_EQ(sim::parse_ppb("+2%"), 20'000'000);
    EXPECT_EQ(sim::parse_ppb_per_c2("-34 ppb/C2"), -34);
    EXPECT_EQ(sim::parse_ppb_per_c2("-0.034 ppm/C2"), -34);
}

TEST(quantity_test, unknown_units_list_the_accepted_ones) {
    EXPECT_EQ(error_of([] { sim::parse_frequency("8 MHzz"); }),
              "\"8 MHzz\": unknown unit \"MHzz\"; accepted: Hz, kHz, MHz, GHz");
    // SI prefixes are case-sensitive (m is milli, M is mega), so "mhz" is not guessed at: from
    // memory.
    EXPECT_EQ(error_of([] { sim::parse_frequency("8 mhz"); }),
              "\"8 mhz\": unknown unit \"mhz\"; accepted: Hz, kHz, MHz, GHz");
    EXPECT_EQ(error_of([] { sim::parse_time("40 sec"); }),
              "\"40 sec\": unknown unit \"sec\"; accepted: ps, ns, us, \xC2\xB5s, ms, s");
    EXPECT_EQ(error_of([] { sim::parse_ppb("3 ppt"); }),
              "\"3 ppt\": unknown unit \"ppt\"; accepted: ppb, ppm, %");
    EXPECT_EQ(error_of([] { sim::parse_ppb_per_c2("3 ppm"); }),
              "\"3 ppm\": unknown unit \"ppm\"; accepted: ppb/C2, ppm/C2");
}

TEST(quantity_test, missing_units_are_refused_where_a_bare_number_is_ambiguous) {
    EXPECT_EQ(error_of([] { sim::parse_time("40"); }),
              "\"40\": missing unit; accepted: ps, ns, us, \xC2\xB5s, ms, s");
    EXPECT_EQ(error_of([] { sim::parse_ppb("20"); }),
              "\"20\": missing unit; accepted: ppb, ppm, %");
}

TEST(quantity_test, values_finer_than_the_unit_are_refused_not_rounded) {
    EXPECT_EQ(error_of([] { sim::parse_time("0.1 ps"); }),
              "\"0.1 ps\": not a whole number of picoseconds; accepted: multiples of 1 ps");
    EXPECT_EQ(
        error_of([] { sim::parse_time("1.0000000000001 s"); }),
        "\"1.0000000000001 s\": not a whole number of picoseconds; accepted: multiples of 1 ps");
    EXPECT_EQ(
        error_of([] { sim::parse_ppb("0.0001 ppm"); }),
        "\"0.0001 ppm\": not a whole number of parts per billion; accepted: multiples of 1 ppb");
}

TEST(quantity_test, malformed_numbers_say_what_is_expected) {
    const std::string freq_hint =
        "expected a frequency as a decimal number and a unit, e.g. \"8 MHz\"; accepted "
        "units: Hz, kHz, MHz, GHz";
    EXPECT_EQ(error_of([] { sim::parse_frequency("nine"); }), "\"nine\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency("1/3 Hz"); }), "\"1/3 Hz\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency("1e6 Hz"); }), "\"1e6 Hz\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency("8. MHz"); }), "\"8. MHz\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency(".5 MHz"); }), "\".5 MHz\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency("8 M Hz"); }), "\"8 M Hz\": " + freq_hint);
    EXPECT_EQ(error_of([] { sim::parse_frequency(""); }),
              "\"\": empty; expected a frequency, e.g. \"8 MHz\"");
    EXPECT_EQ(error_of([] { sim::parse_time("1..2 ms"); }),
              "\"1..2 ms\": expected a time as a decimal number and a unit, e.g. \"40 us\"; "
              "accepted units: ps, "
              "ns, us, \xC2\xB5s, ms, s");
}

TEST(quantity_test, signs_and_ranges_are_checked) {
    EXPECT_EQ(error_of([] { sim::parse_frequency("-8 MHz"); }),
              "\"-8 MHz\": a frequency cannot be negative; accepted: 0 Hz or more");
    EXPECT_EQ(error_of([] { sim::parse_time("-1 us"); }),
              "\"-1 us\": a time cannot be negative; accepted: 0 ps or more");
    EXPECT_NE(error_of([] {
                  sim::parse_time("18446744073709551616 ps");
              }).find("too long; accepted: up to"),
              std::string::npos);
    EXPECT_NE(error_of([] {
                  sim::parse_ppb("9223372036854775808 ppb");
              }).find("too large; accepted: up to 9223372036854775807 ppb"),
              std::string::npos);
    EXPECT_NE(error_of([] { sim::parse_frequency("10000000000 GHz"); }).find("too large"),
              std::string::npos);
    EXPECT_NE(error_of([] {
                  sim::parse_frequency("1234567890123456789012345 Hz");
              }).find("too many digits"),
              std::string::npos);
}

}  // namespace
