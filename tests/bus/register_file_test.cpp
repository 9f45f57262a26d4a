// Register-file semantics on the shipped layouts and on the sample part's own layout, against a
// recording stand-in for the timer model: which field writes, reads and flag clears each bus access
// turns into, for every access kind, byte and halfword accesses, reserved bits and reserved
// locations, coded fields (value tables, reserved raw values, read-back) and inverted fields.

#include "models/layout/register_file.h"
#include "models/timer/timer_core.h"
#include "tests/support/recording_timer_core.h"

#include <gtest/gtest.h>

#include <spdlog/sinks/ostream_sink.h>
#include <spdlog/spdlog.h>

#include <sstream>
#include <string>

namespace {

using models::timer_field;
using tickbench_test::recording_timer_core;
using kind = recording_timer_core::call::kind;

const std::string layouts_dir = std::string(TICKBENCH_SOURCE_DIR) + "/models/layouts/";
const std::string sample_part =
    std::string(TICKBENCH_SOURCE_DIR) + "/tests/data/parts/saltmarsh_pulse_timer.toml";

// Registers the "bus" logger writing into `log` ("LEVEL message" lines) for one test.
std::shared_ptr<spdlog::logger> capture_bus_log(std::ostringstream& log) {
    auto logger = std::make_shared<spdlog::logger>(
        "bus", std::make_shared<spdlog::sinks::ostream_sink_st>(log));
    logger->set_pattern("%l %v");
    spdlog::drop("bus");
    spdlog::register_logger(logger);
    return logger;
}

struct quad_fixture : ::testing::Test {
    quad_fixture()
        : layout(models::load_register_layout_file(layouts_dir + "timer16_quad.toml")),
          regs(layout, core, layout.instance, "timer_a", models::unmapped_policy::ignore,
               0x5000'0000) {}
    std::uint32_t read(std::uint32_t offset, unsigned length, models::time_ps t = 10) {
        std::uint32_t v = 0xdead'beef;
        const auto o = regs.read(offset, length, v, t);
        EXPECT_FALSE(o.reserved) << o.message;
        return v;
    }
    models::register_layout layout;
    recording_timer_core core;
    models::register_file regs;
};

struct dual_fixture : ::testing::Test {
    dual_fixture()
        : layout(models::load_register_layout_file(layouts_dir + "timer32_dual.toml")),
          regs(layout, core, layout.instance, "timer_b") {}
    models::register_layout layout;
    recording_timer_core core;
    models::register_file regs;
};

TEST_F(quad_fixture, a_full_write_becomes_field_writes_in_bit_order) {
    // run: enable 0, mode 1..2, slope 3..4, one_pulse 5, direction 7 (read-only), reload_policy
    // 8..9, trigger_select 12..14.
    regs.write(0x10, 2, 0b0011'0001'1001'0101, 500);
    using c = recording_timer_core::call;
    const std::vector<c> expected = {
        {kind::write, timer_field::enable, 0, 1, 500},
        {kind::write, timer_field::mode, 0, 2, 500},
        {kind::write, timer_field::slope, 0, 2, 500},
        {kind::write, timer_field::one_pulse, 0, 0, 500},
        {kind::write, timer_field::reload_policy, 0, 1, 500},
        {kind::write, timer_field::trigger_select, 0, 3, 500},
    };
    EXPECT_EQ(core.calls, expected);
}

TEST_F(quad_fixture, a_byte_write_touches_only_the_fields_in_that_byte) {
    core.set(timer_field::enable, 0, 1);
    regs.write(0x11, 1, 0x21, 7);  // byte 1 of "run": reload_policy = 1, trigger_select = 2
    ASSERT_EQ(core.of(kind::read).size(), 0u);  // no read-modify-write of the other byte
    const auto w = core.of(kind::write);
    ASSERT_EQ(w.size(), 2u);
    EXPECT_EQ(w[0].field, timer_field::reload_policy);
    EXPECT_EQ(w[0].value, 1u);
    EXPECT_EQ(w[1].field, timer_field::trigger_select);
    EXPECT_EQ(w[1].value, 2u);
    EXPECT_EQ(core.value(timer_field::enable), 1u);

    core.calls.clear();
    regs.write(0x15, 1, 0x54, 8);  // byte 1 of "shape_ab": channel 1 only
    for (const auto& c : core.calls) EXPECT_EQ(c.channel, 1u);
    EXPECT_EQ(core.value(timer_field::action, 1), 4u);
    EXPECT_EQ(core.value(timer_field::main_enable, 1), 1u);
    EXPECT_EQ(core.value(timer_field::comp_enable, 1), 0u);
    EXPECT_EQ(core.value(timer_field::main_active_low, 1), 1u);
    EXPECT_EQ(core.calls.size(), 5u);
}

TEST_F(quad_fixture, a_field_covered_in_part_is_merged_with_the_model_value) {
    core.set(timer_field::counter, 0, 0x1234);
    regs.write(0x01, 1, 0xab, 3);  // high byte of "count"
    const std::vector<recording_timer_core::call> expected = {
        {kind::read, timer_field::counter, 0, 0x1234, 3},
        {kind::write, timer_field::counter, 0, 0xab34, 3},
    };
    EXPECT_EQ(core.calls, expected);
}

TEST_F(quad_fixture, a_word_write_spans_two_halfword_registers) {
    regs.write(0x08, 4, 0x0222'0111, 4);  // match_a then match_b
    EXPECT_EQ(core.value(timer_field::compare, 0), 0x111u);
    EXPECT_EQ(core.value(timer_field::compare, 1), 0x222u);
    EXPECT_EQ(core.calls.size(), 2u);
    EXPECT_EQ(read(0x08, 4), 0x0222'0111u);
}

TEST_F(quad_fixture, reads_compose_fields_and_leave_reserved_bits_zero) {
    core.set(timer_field::enable, 0, 1);
    core.set(timer_field::slope, 0, 2);
    core.set(timer_field::direction, 0, 1);
    core.set(timer_field::trigger_select, 0, 5);
    EXPECT_EQ(read(0x10, 2), 0x5091u);
    EXPECT_EQ(read(0x10, 1), 0x91u);
    EXPECT_EQ(read(0x11, 1), 0x50u);
    // Writing every bit sets no reserved bit (6, 10, 11, 15) and the read-only direction is not
    // written.
    core.calls.clear();
    regs.write(0x10, 2, 0xffff, 11);
    for (const auto& c : core.calls) EXPECT_NE(c.field, timer_field::direction);
    EXPECT_EQ(read(0x10, 2) & 0x8c40u, 0u);
    // The 8-bit "skip" register and its reserved neighbour byte, read as one halfword.
    core.set(timer_field::wrap_skip, 0, 0x42);
    EXPECT_EQ(read(0x06, 2), 0x42u);
    regs.write(0x06, 2, 0xff07, 12);
    EXPECT_EQ(core.value(timer_field::wrap_skip), 7u);
}

TEST_F(quad_fixture, write_only_fields_read_zero_and_act_on_write) {
    EXPECT_EQ(read(0x12, 1), 0u);
    for (const auto& c : core.calls) EXPECT_NE(c.what, kind::read);  // not even asked
    regs.write(0x12, 1, 0x01, 20);
    ASSERT_EQ(core.calls.size(), 2u);
    EXPECT_EQ(core.calls[0].field, timer_field::force_reload);
    EXPECT_EQ(core.calls[0].value, 1u);
    EXPECT_EQ(core.calls[1].field, timer_field::rearm);
    EXPECT_EQ(core.calls[1].value, 0u);
}

TEST_F(quad_fixture, flags_read_only_and_write_one_to_clear) {
    core.set(timer_field::flags, 0, 0x306);  // fault, reload, channels 1 and 2
    EXPECT_EQ(read(0x1e, 2), 0x0306u);
    EXPECT_EQ(read(0x20, 2), 0x0306u);  // the clear register reads the flags too
    core.calls.clear();
    regs.write(0x1e, 2, 0xffff, 30);  // read-only status: ignored
    EXPECT_TRUE(core.calls.empty());
    regs.write(0x20, 2, 0x0202, 31);
    const std::vector<recording_timer_core::call> expected = {
        {kind::clear, timer_field::flags, 0, 0x002, 31},
        {kind::clear, timer_field::flags, 0, 0x200, 31},
    };
    EXPECT_EQ(core.calls, expected);
    EXPECT_EQ(core.value(timer_field::flags), 0x104u);
    core.calls.clear();
    regs.write(0x20, 2, 0, 32);  // zeros clear nothing
    EXPECT_TRUE(core.calls.empty());
    regs.write(0x21, 1, 0x01, 33);  // the high byte alone reaches only the reload and fault flags
    ASSERT_EQ(core.calls.size(), 1u);
    EXPECT_EQ(core.calls[0].value, 0x100u);
}

TEST_F(quad_fixture, a_value_split_over_fields_is_merged) {
    core.set(timer_field::irq_enable, 0, 0x06);
    regs.write(0x1c, 2, 0x0201, 40);  // notify: bits 0..3, and bits 8..9 from value bit 8
    EXPECT_EQ(core.value(timer_field::irq_enable), 0x201u);
    EXPECT_EQ(read(0x1c, 2), 0x0201u);
}

TEST_F(quad_fixture, accesses_never_go_back_in_time) {
    regs.write(0x00, 2, 1, 100);
    regs.write(0x00, 2, 2, 50);
    EXPECT_EQ(core.calls.back().at, 100u);
}

TEST_F(quad_fixture, reserved_locations_follow_the_policy) {
    std::uint32_t v = 1;
    auto o = regs.read(0x2a, 4, v, 123);
    EXPECT_TRUE(o.reserved);
    EXPECT_FALSE(o.failed);  // ignore
    EXPECT_EQ(v, 0u);
    EXPECT_TRUE(core.calls.empty());
    EXPECT_EQ(
        o.message,
        "read of 4 bytes at 0x5000002a hits a location reserved in timer_a; nearest register: "
        "link of timer_a, 0x3 bytes above it; at 123 ps");

    std::ostringstream log;
    capture_bus_log(log);

    regs.set_policy(models::unmapped_policy::warn);
    o = regs.write(0x28, 2, 0xffff, 200);
    EXPECT_FALSE(o.failed);
    EXPECT_TRUE(core.calls.empty());
    EXPECT_NE(log.str().find(
                  "warning write of 2 bytes at 0x50000028 hits a location reserved in timer_a; "
                  "nearest register: link of timer_a, 0x1 byte above it; at 200 ps"),
              std::string::npos)
        << log.str();

    regs.set_policy(models::unmapped_policy::error);
    o = regs.write(0x3f, 1, 0, 300);
    EXPECT_TRUE(o.failed);
    EXPECT_NE(log.str().find("error write of 1 byte at 0x5000003f"), std::string::npos)
        << log.str();
    EXPECT_NE(log.str().find("link of timer_a, 0x18 bytes above it; at 300 ps"), std::string::npos);
    spdlog::drop("bus");
}

TEST_F(quad_fixture, reset_values_reach_only_read_write_fields) {
    regs.apply_reset(0);
    EXPECT_EQ(core.value(timer_field::period), 0xffffu);
    EXPECT_EQ(core.value(timer_field::slope), 2u);
    for (const auto& c : core.calls) {
        EXPECT_NE(c.what, kind::clear);
        EXPECT_NE(c.field, timer_field::force_reload);
        EXPECT_NE(c.field, timer_field::rearm);
    }
}

TEST_F(quad_fixture, refuses_missing_channels_and_bad_lengths) {
    models::timer_config small = layout.instance;
    small.channels = 2;
    EXPECT_THROW(models::register_file(layout, core, small), std::invalid_argument);
    std::uint32_t v = 0;
    EXPECT_THROW(regs.read(0, 5, v, 0), std::invalid_argument);
}

TEST_F(dual_fixture, clear_on_read_clears_exactly_what_it_returned) {
    core.set(timer_field::flags, 0, 0x101);  // reload, channel 0
    std::uint32_t v = 0;
    regs.read(0x24, 4, v, 1);  // "pending": no side effect
    EXPECT_EQ(v, 0x101u);
    EXPECT_EQ(core.value(timer_field::flags), 0x101u);
    regs.read(0x22, 1, v, 2);  // byte 2 of "take" holds no flag bits: nothing read, nothing cleared
    EXPECT_EQ(v, 0u);
    EXPECT_EQ(core.value(timer_field::flags), 0x101u);
    regs.read(0x20, 4, v, 3);
    EXPECT_EQ(v, 0x101u);
    EXPECT_EQ(core.calls.back().what, kind::clear);
    EXPECT_EQ(core.calls.back().value, 0x101u);
    EXPECT_EQ(core.value(timer_field::flags), 0u);
    regs.read(0x20, 4, v, 4);
    EXPECT_EQ(v, 0u);
    EXPECT_EQ(core.calls.back().what, kind::read);  // nothing set, nothing to clear
    core.calls.clear();
    regs.write(0x20, 4, 0xffff'ffff, 5);  // clear-on-read ignores writes
    EXPECT_TRUE(core.calls.empty());
}

TEST_F(dual_fixture, halfword_accesses_on_word_registers) {
    regs.write(0x06, 2, 0xbeef, 1);  // high half of "limit"
    EXPECT_EQ(core.value(timer_field::period), 0xbeef'0000u);
    regs.write(0x04, 2, 0x1234, 2);
    EXPECT_EQ(core.value(timer_field::period), 0xbeef'1234u);
    std::uint32_t v = 0;
    regs.read(0x06, 2, v, 3);
    EXPECT_EQ(v, 0xbeefu);
    regs.read(0x05, 1, v, 3);
    EXPECT_EQ(v, 0x12u);
}

// The sample part's pulse timer (tests/data/parts/saltmarsh_pulse_timer.toml): control 0x00 (0
// halt, inverted enable; coded count style [dir 3, style 1..2]; 8..9 reload rule and 12..14
// trigger, coded), 0x0c counter with the inverted direction at 16, 0x1c pin configuration (per
// channel byte: 0..2 function coded, 3 drive, 4 high-active inverted), 0x24 flags cleared by
// writing 0.
struct sample_fixture : ::testing::Test {
    sample_fixture()
        : layout(models::load_register_layout_file(sample_part)),
          regs(layout, core, layout.instance, "pulse", models::unmapped_policy::warn, 0x6100'0400) {
    }
    std::uint32_t read(std::uint32_t offset, unsigned length, models::time_ps t = 10) {
        std::uint32_t v = 0xdead'beef;
        const auto o = regs.read(offset, length, v, t);
        EXPECT_FALSE(o.reserved) << o.message;
        return v;
    }
    models::register_layout layout;
    recording_timer_core core;
    models::register_file regs;
};

constexpr std::uint32_t ctl_count_style(std::uint32_t raw) {  // raw = dir + 2 x style
    return ((raw & 1u) << 3) | ((raw >> 1) << 1);
}

TEST_F(sample_fixture, a_coded_write_sets_every_field_its_entry_names) {
    // halt 0 (enable 1); style 2, dir 1 (raw 5: center, matches on the rising slope); reload
    // rule 3 (quiet_forced); trigger 5 (channel 1's match).
    regs.write(0x00, 4, ctl_count_style(5) | (3u << 8) | (5u << 12), 50);
    using c = recording_timer_core::call;
    const std::vector<c> expected = {
        {kind::write, timer_field::enable, 0, 1, 50},
        {kind::write, timer_field::mode, 0, 2, 50},
        {kind::write, timer_field::slope, 0, 0, 50},
        {kind::write, timer_field::one_pulse, 0, 0, 50},
        {kind::write, timer_field::period_preload, 0, 0, 50},
        {kind::write, timer_field::reload_policy, 0, 1, 50},
        {kind::write, timer_field::trigger_select, 0, 2, 50},
    };
    EXPECT_EQ(core.calls, expected);

    // A per-channel value table writes the channel its field names.
    core.calls.clear();
    regs.write(0x1d, 1, 0x0e, 60);  // channel 1: function 6 (pwm_below), drive on, high bit 0
    const std::vector<c> shape = {
        {kind::write, timer_field::action, 1, 0x4, 60},
        {kind::write, timer_field::main_enable, 1, 1, 60},
        {kind::write, timer_field::main_active_low, 1, 1, 60},
        {kind::write, timer_field::compare_preload, 1, 0, 60},
    };
    EXPECT_EQ(core.calls, shape);
}

TEST_F(sample_fixture, a_coded_field_reads_the_raw_value_written_while_the_model_agrees) {
    regs.write(0x00, 4, ctl_count_style(3) | (1u << 8) | (7u << 12), 5);  // center, falling slope
    // Raw values 2 and 3 mean the same; the one written reads back (dir 1), and the halt bit
    // reads the inverse of enable.
    EXPECT_EQ(read(0x00, 4) & 0xf, ctl_count_style(3));
    // Changed behind the register's back (as one-pulse clears enable, or another register could):
    // the first entry that matches the model answers.
    core.set(timer_field::mode, 0, 0);
    EXPECT_EQ(read(0x00, 4) & 0xe, ctl_count_style(0));
    core.set(timer_field::mode, 0, 2);
    core.set(timer_field::slope, 0, 2);
    EXPECT_EQ(read(0x00, 4) & 0xe, ctl_count_style(6));
    // The reload rule: set behind its back to a policy the table lists, then to none it lists.
    core.set(timer_field::reload_policy, 0, 2);
    EXPECT_EQ((read(0x00, 4) >> 8) & 3, 0u);  // "held" is raw 0
    core.set(timer_field::reload_policy, 0, 7);
    EXPECT_EQ((read(0x00, 4) >> 8) & 3, 1u);  // nothing matches: raw 1, last accepted
}

TEST_F(sample_fixture, a_reserved_raw_value_changes_nothing_and_is_logged) {
    std::ostringstream log;
    capture_bus_log(log);
    regs.write(0x00, 4, (1u << 8) | (7u << 12), 5);  // running, up, reload every, no trigger
    core.calls.clear();
    // Reload rule 2 is reserved: the other fields of the write still happen.
    regs.write(0x00, 4, 1u | (2u << 8) | (7u << 12), 1'000'000);
    for (const auto& c : core.of(kind::write)) EXPECT_NE(c.field, timer_field::reload_policy);
    EXPECT_EQ(core.value(timer_field::enable), 0u);
    EXPECT_EQ(core.value(timer_field::reload_policy), 0u);
    EXPECT_EQ((read(0x00, 4) >> 8) & 3, 1u);  // still reads the raw value last accepted
    EXPECT_NE(log.str().find("warning write of reserved raw value 2 to the coded field at bits "
                             "8..9 (value table \"reload_rule\") of pulse.ctl at 1000000 ps "
                             "changes nothing; accepted: 0, 1, 3"),
              std::string::npos)
        << log.str();
    spdlog::drop("bus");
}

TEST_F(sample_fixture, inverted_fields_hold_the_inverse_both_ways) {
    regs.write(0x00, 1, 0x01, 1);  // halt
    EXPECT_EQ(core.value(timer_field::enable), 0u);
    regs.write(0x00, 1, 0x00, 2);
    EXPECT_EQ(core.value(timer_field::enable), 1u);
    EXPECT_EQ(read(0x00, 1) & 1, 0u);
    core.set(timer_field::direction, 0, 0);  // counting up: the "rising" bit reads 1
    core.set(timer_field::counter, 0, 0x1234);
    EXPECT_EQ(read(0x0c, 4), 0x0001'1234u);
    core.set(timer_field::direction, 0, 1);
    EXPECT_EQ(read(0x0c, 4), 0x0000'1234u);
    core.calls.clear();
    regs.write(0x0e, 1, 0x00, 3);  // read-only, inverted or not: ignored
    EXPECT_TRUE(core.calls.empty());
}

TEST_F(sample_fixture, write_zero_to_clear_clears_the_flags_written_zero) {
    core.set(timer_field::flags, 0, 0x105);  // reload, channels 0 and 2
    EXPECT_EQ(read(0x24, 4), 0b1011u);       // reload at bit 0, channel c at bit 1 + c
    core.calls.clear();
    regs.write(0x24, 4, ~1u, 20);  // 0 at the reload bit only
    const std::vector<recording_timer_core::call> expected = {
        {kind::clear, timer_field::flags, 0, 0x100, 20},
    };
    EXPECT_EQ(core.calls, expected);
    EXPECT_EQ(core.value(timer_field::flags), 0x005u);
    core.calls.clear();
    regs.write(0x25, 1, 0x00, 21);  // byte 1 holds no flag: zeros there clear nothing
    EXPECT_TRUE(core.calls.empty());
    regs.write(0x24, 4, 0xffff'ffff, 22);  // ones do nothing
    EXPECT_TRUE(core.calls.empty());
    regs.write(0x24, 1, 0x00, 23);  // zeros in every flag bit clear them all
    EXPECT_EQ(core.value(timer_field::flags), 0u);
}

TEST_F(sample_fixture, reset_values_decode_through_the_value_tables) {
    regs.apply_reset(0);
    EXPECT_EQ(core.value(timer_field::enable), 0u);          // halted
    EXPECT_EQ(core.value(timer_field::mode), 0u);            // up
    EXPECT_EQ(core.value(timer_field::reload_policy), 0u);   // every
    EXPECT_EQ(core.value(timer_field::trigger_select), 0u);  // none
    EXPECT_EQ(core.value(timer_field::period), 0xffffu);
    for (unsigned ch = 0; ch < 3; ++ch) {
        EXPECT_EQ(core.value(timer_field::action, ch), 0u);           // hold
        EXPECT_EQ(core.value(timer_field::main_active_low, ch), 0u);  // active high
    }
}

// A coded field covered in part by an access (here bits [15, 0..1] and a byte access) keeps the
// raw bits the access does not cover from its read-back value.
TEST(register_file_coded_test, an_access_covering_part_of_a_coded_field_merges_raw_bits) {
    const auto layout = models::load_register_layout_text(R"(kind = "timer"
size = 4
[instance]
counter_bits = 16
channels = 1
[codes]
style = [
  { raw = 0, mode = "up" },
  { raw = 1, mode = "down" },
  { raw = 4, mode = "center", slope = "up" },
  { raw = 5, mode = "center", slope = "down" },
]
[registers.setup]
offset = 0
width = 16
fields = [ { codes = "style", bits = [0, "14..15"], access = "read-write" } ]
)",
                                                          "split.toml");
    recording_timer_core core;
    models::register_file regs(layout, core, layout.instance, "split");
    regs.write(0, 2, 0x8001, 1);  // raw 0b101: center, falling slope
    EXPECT_EQ(core.value(timer_field::mode), 2u);
    EXPECT_EQ(core.value(timer_field::slope), 1u);
    regs.write(1, 1, 0x00, 2);  // high byte: raw bits 1..2 become 0, raw bit 0 stays 1: down
    EXPECT_EQ(core.value(timer_field::mode), 1u);
    std::uint32_t v = 0;
    regs.read(0, 2, v, 3);
    EXPECT_EQ(v, 0x0001u);
    regs.write(0, 1, 0x00, 4);  // low byte: raw 0, up
    EXPECT_EQ(core.value(timer_field::mode), 0u);
}

TEST(register_file_coded_test, refuses_a_coded_field_setting_a_channel_the_instance_lacks) {
    const auto layout = models::load_register_layout_text(R"(kind = "timer"
size = 2
[instance]
counter_bits = 16
channels = 2
[codes]
shape = [ { raw = 0, action = "hold" }, { raw = 1, action = "pwm_below" } ]
[registers.outputs]
offset = 0
width = 16
fields = [ { codes = "shape", channel = 1, bits = 0, access = "read-write" } ]
)",
                                                          "shape.toml");
    recording_timer_core core;
    models::timer_config one = layout.instance;
    one.channels = 1;
    EXPECT_THROW(models::register_file(layout, core, one), std::invalid_argument);
    models::register_file regs(layout, core, layout.instance);
    regs.write(0, 2, 1, 5);
    EXPECT_EQ(core.value(timer_field::action, 1), 0x4u);
}

// The shipped layouts' reset values, and the sample part's, are what the fast model reads after
// reset (docs/timer-model.md, "Reset values").
TEST(register_file_reset_test, shipped_reset_values_match_the_model) {
    for (const std::string& name :
         {layouts_dir + "timer16_quad.toml", layouts_dir + "timer32_dual.toml", sample_part}) {
        SCOPED_TRACE(name);
        const auto layout = models::load_register_layout_file(name);
        sim::clock_domain clock(sim::frequency::hz(48'000'000));
        models::timer_core core(layout.instance, clock, nullptr);
        models::register_file regs(layout, core, layout.instance);
        for (const auto& r : layout.registers) {
            std::uint32_t v = 0;
            regs.read(r.offset, r.bytes(), v, 0);
            EXPECT_EQ(v, r.reset) << r.name;
        }
    }
}

}  // namespace
