// The layout loader on the two shipped demo layouts, on the sample part's own layout (value tables,
// coded and inverted fields) and on small layouts written in the test.

#include "models/layout/register_layout.h"

#include <gtest/gtest.h>

#include <fstream>
#include <set>
#include <sstream>
#include <string>
#include <vector>

namespace {

const std::string layouts_dir = std::string(TICKBENCH_SOURCE_DIR) + "/models/layouts/";

std::string missing_text(const models::register_layout& l) {
    std::string s;
    for (const auto& [f, c] : l.unmapped_fields())
        s += std::string(models::to_string(f)) + "/" + std::to_string(c) + " ";
    return s;
}

TEST(register_layout_test, loads_timer16_quad) {
    const auto l = models::load_register_layout_file(layouts_dir + "timer16_quad.toml");
    EXPECT_EQ(l.name, "timer16_quad");
    EXPECT_EQ(l.kind, "timer");
    EXPECT_EQ(l.size, 0x40u);
    EXPECT_EQ(l.instance.counter_bits, 16u);
    EXPECT_EQ(l.instance.channels, 4u);
    EXPECT_TRUE(l.instance.complementary);
    EXPECT_EQ(l.registers.size(), 21u);
    // Every functional field the instance has sits somewhere.
    EXPECT_TRUE(l.unmapped_fields().empty()) << missing_text(l);
    // Registers come in offset order and are found by name and by any of their bytes.
    for (std::size_t i = 1; i < l.registers.size(); ++i)
        EXPECT_LT(l.registers[i - 1].offset, l.registers[i].offset);
    ASSERT_NE(l.find("limit"), nullptr);
    EXPECT_EQ(l.find("limit")->reset, 0xffffu);
    EXPECT_EQ(l.find(std::uint32_t{0x0b}), l.find("match_b"));
    EXPECT_EQ(l.find(std::uint32_t{0x07}), nullptr);  // reserved byte after the 8-bit "skip"
    // Fields are in bit order.
    const auto* run = l.find("run");
    ASSERT_NE(run, nullptr);
    for (std::size_t i = 1; i < run->fields.size(); ++i)
        EXPECT_LT(run->fields[i - 1].bit, run->fields[i].bit);
    EXPECT_EQ(run->reserved_mask(), 0x8c40u);  // bits 6, 10, 11, 15
}

TEST(register_layout_test, loads_timer32_dual) {
    const auto l = models::load_register_layout_file(layouts_dir + "timer32_dual.toml");
    EXPECT_EQ(l.name, "timer32_dual");
    EXPECT_EQ(l.instance.counter_bits, 32u);
    EXPECT_EQ(l.instance.channels, 2u);
    EXPECT_FALSE(l.instance.complementary);
    EXPECT_EQ(l.instance.wrap_skip_bits, 0u);
    EXPECT_TRUE(l.unmapped_fields().empty()) << missing_text(l);
    for (const auto& r : l.registers) EXPECT_EQ(r.width, 32u) << r.name;
    ASSERT_NE(l.find("take"), nullptr);
    EXPECT_EQ(l.find("take")->fields.at(0).access, models::access_kind::clear_on_read);
}

TEST(register_layout_test, reads_the_input_side_of_the_instance) {
    const auto defaults = models::load_register_layout_file(layouts_dir + "timer16_quad.toml");
    EXPECT_EQ(defaults.instance.input_sync_ticks, 2u);
    EXPECT_EQ(defaults.instance.filter_lengths, (std::vector<unsigned>{1, 2, 4, 8}));
    EXPECT_TRUE(defaults.instance.capture_read_clears_flag);
    EXPECT_EQ(defaults.instance.chain_latency, 0u);
    const auto l = models::load_register_layout_text(R"(
kind = "timer"
size = 4
[instance]
counter_bits = 16
channels = 1
input_sync_ticks = 3
filter_lengths = [1, 3, 255]
capture_read_clears_flag = false
chain_latency = 2
[registers.count]
offset = 0
width = 16
fields = [ { field = "counter", bits = "0..15", access = "read-write" } ]
)",
                                                     "inputs.toml");
    EXPECT_EQ(l.instance.input_sync_ticks, 3u);
    EXPECT_EQ(l.instance.filter_lengths, (std::vector<unsigned>{1, 3, 255}));
    EXPECT_FALSE(l.instance.capture_read_clears_flag);
    EXPECT_EQ(l.instance.chain_latency, 2u);
}

TEST(register_layout_test, reports_unmapped_fields_of_an_incomplete_layout) {
    const auto l = models::load_register_layout_text(R"(
kind = "timer"
size = 4
[instance]
counter_bits = 16
channels = 1
wrap_skip_bits = 0
[registers.count]
offset = 0
width = 16
fields = [ { field = "counter", bits = "0..15", access = "read-write" } ]
)",
                                                     "tiny.toml");
    const auto missing = l.unmapped_fields();
    EXPECT_EQ(l.name, "tiny");  // no `name`: the file name's stem
    bool period_missing = false, compare0_missing = false, counter_missing = false;
    for (const auto& [f, c] : missing) {
        period_missing |= f == models::timer_field::period;
        compare0_missing |= f == models::timer_field::compare && c == 0;
        counter_missing |= f == models::timer_field::counter;
    }
    EXPECT_TRUE(period_missing);
    EXPECT_TRUE(compare0_missing);
    EXPECT_FALSE(counter_missing);
}

TEST(register_layout_test, loads_the_sample_parts_value_tables_and_coded_fields) {
    const auto l = models::load_register_layout_file(
        std::string(TICKBENCH_SOURCE_DIR) + "/tests/data/parts/saltmarsh_pulse_timer.toml");
    // The sample part's pulse timer has no input side (its datasheet shows no capture, trigger or
    // encoder registers): every field it leaves out is one of those.
    using models::timer_field;
    const std::set<timer_field> input_side = {
        timer_field::filter_divider, timer_field::count_source, timer_field::trigger_action,
        timer_field::trigger_source, timer_field::trigger_edge, timer_field::trigger_filter,
        timer_field::channel_role,   timer_field::capture_edge, timer_field::capture_prescaler,
        timer_field::input_filter};
    for (const auto& [f, c] : l.unmapped_fields())
        EXPECT_EQ(input_side.count(f), 1u) << models::to_string(f) << "/" << c;
    // Value tables in file order, entries and raw values as written.
    ASSERT_EQ(l.codes.size(), 4u);
    EXPECT_EQ(l.codes[0].name, "count_style");
    EXPECT_EQ(l.codes[1].name, "reload_rule");
    EXPECT_EQ(l.codes[3].name, "pin_function");
    const models::code_table& style = l.codes[0];
    ASSERT_EQ(style.entries.size(), 5u);
    EXPECT_EQ(style.entries[2].raws, (std::vector<std::uint32_t>{2, 3}));
    ASSERT_EQ(style.entries[2].sets.size(), 2u);
    EXPECT_EQ(style.entries[2].sets[0].field, models::timer_field::mode);
    EXPECT_EQ(style.entries[2].sets[0].value, 2u);  // center
    EXPECT_EQ(style.entries[2].sets[1].field, models::timer_field::slope);
    EXPECT_EQ(style.entries[2].sets[1].value, 1u);  // down
    EXPECT_EQ(style.find(7), &style.entries[4]);
    EXPECT_EQ(l.codes[1].find(2), nullptr);  // reserved
    EXPECT_EQ(models::raw_value_list(l.codes[1].accepted()), "0, 1, 3");
    EXPECT_FALSE(style.sets_channel_field());
    EXPECT_TRUE(l.codes[3].sets_channel_field());

    // The coded count style over [dir 3, style 1..2]: dir is the raw value's low bit.
    const auto* ctl = l.find("ctl");
    ASSERT_NE(ctl, nullptr);
    ASSERT_EQ(ctl->fields.size(), 6u);
    const models::field_map& f = ctl->fields[1];
    ASSERT_TRUE(f.coded());
    EXPECT_EQ(l.codes_of(f), &style);
    EXPECT_EQ(f.width, 3u);
    EXPECT_EQ(f.bit, 1u);
    EXPECT_EQ(f.register_mask(), 0b1110u);
    EXPECT_EQ(models::field_bits(f), "3+1..2");
    EXPECT_EQ(f.raw_of(0b1000), 1u);
    EXPECT_EQ(f.raw_of(0b0110), 6u);
    EXPECT_EQ(f.place(5), 0b1100u);
    EXPECT_TRUE(ctl->fields[0].invert);
    EXPECT_EQ(ctl->fields[0].field, models::timer_field::enable);
    // Per-channel value tables take their channel from the field.
    const auto* pins = l.find("pin_cfg");
    ASSERT_NE(pins, nullptr);
    EXPECT_EQ(pins->fields[4].channel, 1u);
    EXPECT_TRUE(pins->fields[4].coded());
}

TEST(register_layout_test, names_values_as_the_model_does) {
    EXPECT_EQ(models::value_name(models::timer_field::action, 0x5), "pwm_at_or_above");
    EXPECT_EQ(models::value_name(models::timer_field::trigger_select, 3), "match_2");
    EXPECT_EQ(models::value_name(models::timer_field::trigger_select, 7), "reload");
    EXPECT_EQ(models::value_name(models::timer_field::reload_policy, 1), "quiet_forced");
    EXPECT_EQ(models::value_name(models::timer_field::prescaler, 71), "71");
    models::timer_config two;
    two.channels = 2;
    EXPECT_EQ(models::value_names(two, models::timer_field::trigger_select),
              (std::vector<std::string>{"none", "match_0", "match_1", "reload"}));
    EXPECT_TRUE(models::value_names(two, models::timer_field::period).empty());
    EXPECT_EQ(models::raw_value_list({0, 2, 3, 4, 5, 7, 9, 10}), "0, 2..5, 7, 9, 10");
}

TEST(register_layout_test, value_tables_take_numbers_and_switches) {
    const auto l = models::load_register_layout_text(R"(kind = "timer"
size = 4
[instance]
counter_bits = 16
channels = 1
[codes]
divide = [
  { raw = 0, prescaler = 0 },
  { raw = 1, prescaler = 7, one_pulse = true },
  { raw = 2, prescaler = 63, one_pulse = 0 },
  { raw = 3 },
]
[registers.setup]
offset = 0
width = 16
fields = [
  { codes = "divide", bits = "0..1", access = "read-write" },
  { field = "enable", bits = 4, invert = true, access = "write-only" },
]
)",
                                                     "numbers.toml");
    ASSERT_EQ(l.codes.size(), 1u);
    const auto& e = l.codes[0].entries;
    ASSERT_EQ(e.size(), 4u);
    EXPECT_EQ(e[1].sets[0].value, 7u);
    EXPECT_EQ(e[1].sets[1].field, models::timer_field::one_pulse);
    EXPECT_EQ(e[1].sets[1].value, 1u);
    EXPECT_EQ(e[2].sets[1].value, 0u);
    EXPECT_TRUE(e[3].sets.empty());  // accepted, changes nothing
}

TEST(register_layout_test, coded_and_inverted_fields_keep_their_own_rules) {
    try {
        models::load_register_layout_text(R"(kind = "timer"
size = 8
[instance]
counter_bits = 16
channels = 2
[codes]
counting = [ { raw = 0, mode = "up" }, { raw = 1, mode = "down", one_pulse = "yes" } ]
empty = []
[registers.a]
offset = 0
width = 16
fields = [
  { field = "mode", codes = "counting", bits = 0, access = "read-write" },
  { codes = "counting", bits = 1, value_bit = 1, access = "read-write" },
  { codes = "counting", bits = 2, invert = true, access = "read-write" },
  { codes = "counting", channel = 1, bits = 3, access = "read-write" },
]
)",
                                          "rules.toml");
        FAIL() << "no error";
    } catch (const sim::scenario_error& e) {
        const std::string what = e.what();
        for (const char* expected : {
                 "rules.toml:7:78: codes.counting[1].one_pulse: expected true, false, 1 or 0, got "
                 "\"yes\"",
                 "rules.toml:8:9: codes.empty: expected an array of entries",
                 "rules.toml:13:29: registers.a.fields[0].codes: a field has either \"field\" "
                 "(plain) or \"codes\" (coded), not both",
                 "registers.a.fields[1].value_bit: a coded field's raw value is looked up whole",
                 "registers.a.fields[2].invert: a coded field's value table says what each raw "
                 "value means",
                 "registers.a.fields[3].channel: value table \"counting\" sets no per-channel "
                 "field; accepted: no channel key",
             })
            EXPECT_NE(what.find(expected), std::string::npos) << expected << "\n" << what;
    }
    // A coded field needs a table to name.
    try {
        models::load_register_layout_text(R"(kind = "timer"
size = 2
[instance]
counter_bits = 16
channels = 1
[registers.a]
offset = 0
width = 16
fields = [ { codes = "counting", bits = 0, access = "read-write" } ]
)",
                                          "none.toml");
        FAIL() << "no error";
    } catch (const sim::scenario_error& e) {
        EXPECT_NE(std::string(e.what()).find("registers.a.fields[0].codes: the layout has no value "
                                             "tables; accepted: a table defined under [codes]"),
                  std::string::npos)
            << e.what();
    }
}

TEST(register_layout_test, finds_the_nearest_register) {
    const auto l = models::load_register_layout_file(layouts_dir + "timer16_quad.toml");
    auto n = l.nearest(0x07);  // just past "skip" (0x06), just below "match_a" (0x08)
    ASSERT_NE(n.reg, nullptr);
    EXPECT_EQ(n.reg->name, "skip");  // tie: the lower register
    EXPECT_EQ(n.distance, 1u);
    EXPECT_FALSE(n.below);
    n = l.nearest(0x30);
    EXPECT_EQ(n.reg->name, "link");
    EXPECT_EQ(n.distance, 0x30u - 0x27u);
    n = l.nearest(0x0c);
    EXPECT_EQ(n.reg->name, "match_c");
    EXPECT_EQ(n.distance, 0u);
}

TEST(register_layout_test, spells_access_kinds_and_fields_both_ways) {
    for (auto k : {models::access_kind::read_write, models::access_kind::read_only,
                   models::access_kind::write_one_to_clear, models::access_kind::clear_on_read,
                   models::access_kind::write_only, models::access_kind::write_zero_to_clear})
        EXPECT_EQ(models::access_kind_from_string(models::to_string(k)), k);
    EXPECT_STREQ(models::to_string(models::access_kind::write_zero_to_clear),
                 "write-zero-to-clear");
    EXPECT_TRUE(models::clears_flags(models::access_kind::write_zero_to_clear));
    EXPECT_FALSE(models::clears_flags(models::access_kind::write_only));
    EXPECT_FALSE(models::access_kind_from_string("rw").has_value());
    EXPECT_EQ(models::timer_field_from_string("dead_time"), models::timer_field::dead_time);
    EXPECT_FALSE(models::timer_field_from_string("deadtime").has_value());
}

TEST(register_layout_test, collects_every_finding_of_a_file) {
    try {
        models::load_register_layout_text(R"(kind = "timer"
size = 8
[instance]
counter_bits = 16
channels = 2
[registers.a]
offset = 0
width = 16
fields = [ { field = "counter", bits = "0..16", access = "read-write" } ]
[registers.b]
offset = 8
width = 16
fields = [ { field = "period", bits = "0..15", access = "read-only" } ]
)",
                                          "two.toml");
        FAIL() << "no error";
    } catch (const sim::scenario_error& e) {
        ASSERT_EQ(e.findings().size(), 2u) << e.what();
        EXPECT_EQ(e.findings()[0].line, 9u);
        EXPECT_EQ(e.findings()[0].key, "registers.a.fields[0].bits");
        EXPECT_EQ(e.findings()[1].line, 11u);
        EXPECT_EQ(e.findings()[1].key, "registers.b.offset");
    }
}

TEST(register_layout_test, the_example_in_the_docs_loads) {
    std::ifstream in(std::string(TICKBENCH_SOURCE_DIR) + "/docs/register-layouts.md");
    std::stringstream all;
    all << in.rdbuf();
    const std::string text = all.str();
    const auto start = text.find("```toml\n");
    ASSERT_NE(start, std::string::npos);
    const auto end = text.find("```", start + 8);
    const auto l =
        models::load_register_layout_text(text.substr(start + 8, end - start - 8), "example.toml");
    EXPECT_EQ(l.name, "tiny_timer");
    EXPECT_EQ(l.registers.size(), 2u);
}

}  // namespace
