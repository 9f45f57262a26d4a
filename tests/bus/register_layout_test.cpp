// The layout loader on the two shipped demo layouts and on small layouts written in the test.

#include "models/layout/register_layout.h"

#include <gtest/gtest.h>

#include <fstream>
#include <sstream>
#include <string>

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
    EXPECT_EQ(l.registers.size(), 18u);
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

TEST(register_layout_test, finds_the_nearest_register) {
    const auto l = models::load_register_layout_file(layouts_dir + "timer16_quad.toml");
    auto n = l.nearest(0x07);  // just past "skip" (0x06), just below "match_a" (0x08)
    ASSERT_NE(n.reg, nullptr);
    EXPECT_EQ(n.reg->name, "skip");  // tie: the lower register
    EXPECT_EQ(n.distance, 1u);
    EXPECT_FALSE(n.below);
    n = l.nearest(0x30);
    EXPECT_EQ(n.reg->name, "status_clear");
    EXPECT_EQ(n.distance, 0x30u - 0x21u);
    n = l.nearest(0x0c);
    EXPECT_EQ(n.reg->name, "match_c");
    EXPECT_EQ(n.distance, 0u);
}

TEST(register_layout_test, spells_access_kinds_and_fields_both_ways) {
    for (auto k : {models::access_kind::read_write, models::access_kind::read_only,
                   models::access_kind::write_one_to_clear, models::access_kind::clear_on_read,
                   models::access_kind::write_only})
        EXPECT_EQ(models::access_kind_from_string(models::to_string(k)), k);
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
