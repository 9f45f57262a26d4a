// The TOML reader every loader builds on (sim/toml_reader.h): where findings land, their order
// and the one wording scheme of its getters.

#include "sim/toml_reader.h"
#include "sim/quantity.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace {

// The findings of reading `text` with `read`, one per line ("" when there are none).
template <typename Read>
std::string findings_of(const std::string& text, Read&& read) {
    const toml::table root = sim::read_toml_text(text, "t.toml");
    sim::findings_list out("t.toml");
    sim::table_reader r(out, root, "");
    read(r);
    try {
        out.raise_if_any();
    } catch (const sim::scenario_error& e) {
        return e.what();
    }
    return "";
}

TEST(toml_reader_test, a_missing_key_of_the_top_level_has_no_key_path) {
    EXPECT_EQ(findings_of("", [](sim::table_reader& r) { r.integer("size", 1, 64, true); }),
              "t.toml:1:1: missing key \"size\"; accepted: a whole number from 1 to 64");
}

TEST(toml_reader_test, a_wrong_value_is_reported_at_the_value_with_what_is_accepted) {
    EXPECT_EQ(findings_of("[a]\nsize = \"big\"\n",
                          [](sim::table_reader& r) {
                              const toml::table* a = r.sub_table("a", true, "size");
                              ASSERT_NE(a, nullptr);
                              sim::table_reader(r.findings(), *a, "a").integer("size", 1, 64);
                          }),
              "t.toml:2:8: a.size: expected a whole number from 1 to 64, got \"big\"");
}

TEST(toml_reader_test, findings_come_in_file_order_then_those_of_other_files) {
    const std::string text = "b = 1\nc = 2\n";
    EXPECT_EQ(findings_of(text,
                          [](sim::table_reader& r) {
                              r.findings().add_foreign({{"other.toml", 9, 1, "x", "first added"}});
                              r.report("c", "second line");
                              r.report("b", "first line");
                          }),
              "t.toml:1:5: b: first line\nt.toml:2:5: c: second line\nother.toml:9:1: x: first "
              "added");
}

TEST(toml_reader_test, unknown_keys_get_a_hint_and_the_accepted_keys) {
    EXPECT_EQ(findings_of("sise = 3\n",
                          [](sim::table_reader& r) {
                              r.reject_unknown_keys({"size", "name"}, "a register layout");
                          }),
              "t.toml:1:1: sise: unknown key \"sise\" for a register layout (did you mean "
              "\"size\"?); accepted: size, name");
}

TEST(toml_reader_test, a_choice_names_every_choice_and_hints_after_the_wrong_word) {
    EXPECT_EQ(findings_of("kind = \"timre\"\n",
                          [](sim::table_reader& r) { r.choice("kind", {"timer"}, true); }),
              "t.toml:1:8: kind: expected \"timer\", got \"timre\" (did you mean \"timer\"?)");
    EXPECT_EQ(findings_of("edge = 3\n",
                          [](sim::table_reader& r) {
                              r.choice("edge", {"rising", "falling"});
                          }),
              "t.toml:1:8: edge: expected one of \"rising\", \"falling\", got 3");
}

TEST(toml_reader_test, a_positive_time_refuses_zero_as_written) {
    EXPECT_EQ(findings_of("quantum = \"0 us\"\n",
                          [](sim::table_reader& r) { r.positive_time("quantum"); }),
              "t.toml:1:11: quantum: expected a time above 0 ps, got \"0 us\"");
}

TEST(toml_reader_test, quantities_report_the_parsers_message_or_the_range) {
    EXPECT_EQ(findings_of("f = \"8 MHzz\"\n", [](sim::table_reader& r) { r.frequency_at("f"); }),
              "t.toml:1:5: f: \"8 MHzz\": unknown unit \"MHzz\"; accepted: Hz, kHz, MHz, GHz");
    EXPECT_EQ(findings_of("r = \"200 %\"\n",
                          [](sim::table_reader& r) {
                              r.signed_quantity("r", sim::parse_ppb, 0, 1'000'000'000,
                                                "a ratio from 0 to 100 %");
                          }),
              "t.toml:1:5: r: expected a ratio from 0 to 100 %, got \"200 %\"");
}

TEST(toml_reader_test, named_tables_come_in_file_order_and_bad_entries_are_reported) {
    const std::string text = "[t.zeta]\n[t.alpha]\n[t.\"9 lives\"]\n[t]\nplain = 5\n";
    std::vector<std::string> names;
    const std::string what = findings_of(text, [&](sim::table_reader& r) {
        const toml::table* t = r.sub_table("t", true, "one table per thing");
        ASSERT_NE(t, nullptr);
        for (const sim::named_table& e :
             sim::table_reader(r.findings(), *t, "t")
                 .named_tables("thing", sim::is_plain_name, sim::plain_name_words))
            if (e.name_ok && e.table) names.push_back(e.name);
    });
    EXPECT_EQ(names, (std::vector<std::string>{"zeta", "alpha"}));
    EXPECT_EQ(what,
              "t.toml:3:4: t.\"9 lives\": thing name \"9 lives\" is not accepted; accepted: a "
              "letter followed by letters, digits, \"_\" or \"-\"\n"
              "t.toml:5:9: t.plain: expected a table [t.plain] describing a thing, got 5");
}

TEST(toml_reader_test, an_unknown_name_lists_the_known_ones_or_says_there_are_none) {
    EXPECT_EQ(sim::unknown_name("clock", "xtl", {"pll", "xtal"}),
              "unknown clock \"xtl\" (did you mean \"xtal\"?); accepted: one of pll, xtal");
    EXPECT_EQ(sim::unknown_name("signal", "a.b", {}, "none (no timers)"),
              "unknown signal \"a.b\"; accepted: none (no timers)");
}

}  // namespace
