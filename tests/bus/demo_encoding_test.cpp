// The demo part's documented encodings, the shipped layout files, the firmware header and the
// timer model agree:
// - the register tables of docs/register-layouts.md are the layout files, row for row;
// - examples/parts/demo_timers.h (what example firmware writes) names the same offsets and bits;
// - every action code in the table of docs/timer-model.md, written through each shipped layout's
//   registers, makes the model's output do what the table says; the documented flag bits are
//   the bits the model sets.

#include "examples/parts/demo_timers.h"
#include "models/layout/layout_table.h"
#include "models/layout/register_file.h"
#include "models/timer/timer_core.h"
#include "tests/support/layout_queries.h"
#include "tests/support/timer_event_log.h"

#include <gtest/gtest.h>

#include <sstream>
#include <string>
#include <vector>

namespace {

using models::timer_field;
using tickbench::test_support::mask_of;
using tickbench::test_support::offset_of;
using tickbench::test_support::read_file;

const std::string source_dir = TICKBENCH_SOURCE_DIR;

models::register_layout shipped(const std::string& name) {
    return models::load_register_layout_file(source_dir + "/models/layouts/" + name + ".toml");
}

// The Markdown table (its lines starting with '|') that follows `heading` in `doc`.
std::string table_after(const std::string& doc, const std::string& heading) {
    const auto at = doc.find(heading);
    if (at == std::string::npos) return "(heading " + heading + " not found)";
    std::istringstream lines(doc.substr(at));
    std::string line, table;
    bool in_table = false;
    while (std::getline(lines, line)) {
        if (!line.empty() && line[0] == '|') {
            table += line + "\n";
            in_table = true;
        } else if (in_table) {
            break;
        }
    }
    return table;
}

TEST(demo_encoding_test, register_tables_in_the_docs_are_the_layout_files) {
    const std::string doc = read_file(source_dir + "/docs/register-layouts.md");
    for (const char* name : {"timer16_quad", "timer32_dual"}) {
        SCOPED_TRACE(name);
        const std::string expected = models::layout_table_markdown(shipped(name));
        const std::string documented =
            table_after(doc, std::string("### `models/layouts/") + name + ".toml`");
        EXPECT_EQ(documented, expected)
            << "docs/register-layouts.md should show this table for " << name << ":\n"
            << expected;
    }
}

TEST(demo_encoding_test, the_firmware_header_names_the_layout_of_timer16_quad) {
    const auto l = shipped("timer16_quad");
    EXPECT_EQ(Q16_COUNT, offset_of(l, "count"));
    EXPECT_EQ(Q16_LIMIT, offset_of(l, "limit"));
    EXPECT_EQ(Q16_SCALE, offset_of(l, "scale"));
    EXPECT_EQ(Q16_SKIP, offset_of(l, "skip"));
    EXPECT_EQ(Q16_MATCH(0), offset_of(l, "match_a"));
    EXPECT_EQ(Q16_MATCH(3), offset_of(l, "match_d"));
    EXPECT_EQ(Q16_RUN, offset_of(l, "run"));
    EXPECT_EQ(Q16_KICK, offset_of(l, "kick"));
    EXPECT_EQ(Q16_PRELOAD, offset_of(l, "preload"));
    EXPECT_EQ(Q16_SHAPE_AB, offset_of(l, "shape_ab"));
    EXPECT_EQ(Q16_SHAPE_CD, offset_of(l, "shape_cd"));
    EXPECT_EQ(Q16_DEAD, offset_of(l, "dead"));
    EXPECT_EQ(Q16_GUARD, offset_of(l, "guard"));
    EXPECT_EQ(Q16_NOTIFY, offset_of(l, "notify"));
    EXPECT_EQ(Q16_STATUS, offset_of(l, "status"));
    EXPECT_EQ(Q16_STATUS_CLEAR, offset_of(l, "status_clear"));

    EXPECT_EQ(Q16_RUN_ENABLE, mask_of(l, "run", timer_field::enable));
    EXPECT_EQ(Q16_RUN_MODE(3), mask_of(l, "run", timer_field::mode));
    EXPECT_EQ(Q16_RUN_SLOPE(3), mask_of(l, "run", timer_field::slope));
    EXPECT_EQ(Q16_RUN_ONE_PULSE, mask_of(l, "run", timer_field::one_pulse));
    EXPECT_EQ(Q16_RUN_DIRECTION_DOWN, mask_of(l, "run", timer_field::direction));
    EXPECT_EQ(Q16_RUN_RELOAD_POLICY(3), mask_of(l, "run", timer_field::reload_policy));
    EXPECT_EQ(Q16_RUN_TRIGGER(7), mask_of(l, "run", timer_field::trigger_select));
    EXPECT_EQ(Q16_KICK_FORCE_RELOAD, mask_of(l, "kick", timer_field::force_reload));
    EXPECT_EQ(Q16_KICK_REARM, mask_of(l, "kick", timer_field::rearm));
    EXPECT_EQ(Q16_PRELOAD_PERIOD, mask_of(l, "preload", timer_field::period_preload));
    for (unsigned c = 0; c < 4; ++c) {
        SCOPED_TRACE(c);
        const char* shape = c < 2 ? "shape_ab" : "shape_cd";
        EXPECT_EQ(Q16_SHAPE_REG(c), offset_of(l, shape));
        EXPECT_EQ(Q16_PRELOAD_COMPARE(c), mask_of(l, "preload", timer_field::compare_preload, c));
        EXPECT_EQ(Q16_SHAPE_BYTE(c, Q16_SHAPE_ACTION(0xf)),
                  mask_of(l, shape, timer_field::action, c));
        EXPECT_EQ(Q16_SHAPE_BYTE(c, Q16_SHAPE_MAIN_ENABLE),
                  mask_of(l, shape, timer_field::main_enable, c));
        EXPECT_EQ(Q16_SHAPE_BYTE(c, Q16_SHAPE_COMP_ENABLE),
                  mask_of(l, shape, timer_field::comp_enable, c));
        EXPECT_EQ(Q16_SHAPE_BYTE(c, Q16_SHAPE_MAIN_ACTIVE_LOW),
                  mask_of(l, shape, timer_field::main_active_low, c));
        EXPECT_EQ(Q16_SHAPE_BYTE(c, Q16_SHAPE_COMP_ACTIVE_LOW),
                  mask_of(l, shape, timer_field::comp_active_low, c));
        EXPECT_EQ(Q16_GUARD_MAIN_SAFE_HIGH(c),
                  mask_of(l, "guard", timer_field::main_safe_level, c));
        EXPECT_EQ(Q16_GUARD_COMP_SAFE_HIGH(c),
                  mask_of(l, "guard", timer_field::comp_safe_level, c));
    }
    EXPECT_EQ(Q16_DEAD_TIME(0x3ff), mask_of(l, "dead", timer_field::dead_time));
    EXPECT_EQ(Q16_DEAD_SCALE(3), mask_of(l, "dead", timer_field::dead_time_scale));
    EXPECT_EQ(Q16_GUARD_LATENCY(0xf), mask_of(l, "guard", timer_field::fault_latency));
    EXPECT_EQ(Q16_SENSE, offset_of(l, "sense"));
    EXPECT_EQ(Q16_SENSE_TUNE, offset_of(l, "sense_tune"));
    EXPECT_EQ(Q16_LINK, offset_of(l, "link"));
    for (unsigned c = 0; c < 4; ++c) {
        SCOPED_TRACE(c);
        EXPECT_EQ(Q16_SENSE_ROLE(c, 3), mask_of(l, "sense", timer_field::channel_role, c));
        EXPECT_EQ(Q16_SENSE_EDGE(c, 3), mask_of(l, "sense", timer_field::capture_edge, c));
        EXPECT_EQ(Q16_TUNE_FILTER(c, 3), mask_of(l, "sense_tune", timer_field::input_filter, c));
        EXPECT_EQ(Q16_TUNE_PRESCALER(c, 3),
                  mask_of(l, "sense_tune", timer_field::capture_prescaler, c));
    }
    EXPECT_EQ(Q16_LINK_COUNT(3), mask_of(l, "link", timer_field::count_source));
    EXPECT_EQ(Q16_LINK_ACTION(3), mask_of(l, "link", timer_field::trigger_action));
    EXPECT_EQ(Q16_LINK_TRIGGER_FROM(3), mask_of(l, "link", timer_field::trigger_source));
    EXPECT_EQ(Q16_LINK_TRIGGER_FALLING, mask_of(l, "link", timer_field::trigger_edge));
    EXPECT_EQ(Q16_LINK_TRIGGER_FILTER(3), mask_of(l, "link", timer_field::trigger_filter));
    EXPECT_EQ(Q16_LINK_FILTER_DIVIDER(3), mask_of(l, "link", timer_field::filter_divider));
    EXPECT_EQ(Q16_GUARD_FAULT_ENABLE, mask_of(l, "guard", timer_field::fault_enable));
}

TEST(demo_encoding_test, the_firmware_header_names_the_layout_of_timer32_dual) {
    const auto l = shipped("timer32_dual");
    EXPECT_EQ(D32_COUNT, offset_of(l, "count"));
    EXPECT_EQ(D32_LIMIT, offset_of(l, "limit"));
    EXPECT_EQ(D32_SCALE, offset_of(l, "scale"));
    EXPECT_EQ(D32_MATCH(0), offset_of(l, "match_a"));
    EXPECT_EQ(D32_MATCH(1), offset_of(l, "match_b"));
    EXPECT_EQ(D32_SETUP, offset_of(l, "setup"));
    EXPECT_EQ(D32_COMMAND, offset_of(l, "command"));
    EXPECT_EQ(D32_OUTPUTS, offset_of(l, "outputs"));
    EXPECT_EQ(D32_TAKE, offset_of(l, "take"));
    EXPECT_EQ(D32_PENDING, offset_of(l, "pending"));
    EXPECT_EQ(D32_ALERTS, offset_of(l, "alerts"));
    EXPECT_EQ(D32_SETUP_ENABLE, mask_of(l, "setup", timer_field::enable));
    EXPECT_EQ(D32_SETUP_ONE_PULSE, mask_of(l, "setup", timer_field::one_pulse));
    EXPECT_EQ(D32_SETUP_PERIOD_PRELOAD, mask_of(l, "setup", timer_field::period_preload));
    EXPECT_EQ(D32_SETUP_MODE(3), mask_of(l, "setup", timer_field::mode));
    EXPECT_EQ(D32_SETUP_SLOPE(3), mask_of(l, "setup", timer_field::slope));
    EXPECT_EQ(D32_SETUP_RELOAD_POLICY(3), mask_of(l, "setup", timer_field::reload_policy));
    EXPECT_EQ(D32_SETUP_TRIGGER(7), mask_of(l, "setup", timer_field::trigger_select));
    EXPECT_EQ(D32_SETUP_DIRECTION_DOWN, mask_of(l, "setup", timer_field::direction));
    EXPECT_EQ(D32_COMMAND_FORCE_RELOAD, mask_of(l, "command", timer_field::force_reload));
    EXPECT_EQ(D32_INPUTS, offset_of(l, "inputs"));
    for (unsigned c = 0; c < 2; ++c) {
        SCOPED_TRACE(c);
        EXPECT_EQ(D32_INPUT_ROLE(c, 3), mask_of(l, "inputs", timer_field::channel_role, c));
        EXPECT_EQ(D32_INPUT_EDGE(c, 3), mask_of(l, "inputs", timer_field::capture_edge, c));
        EXPECT_EQ(D32_INPUT_PRESCALER(c, 3),
                  mask_of(l, "inputs", timer_field::capture_prescaler, c));
        EXPECT_EQ(D32_INPUT_FILTER(c, 3), mask_of(l, "inputs", timer_field::input_filter, c));
    }
    EXPECT_EQ(D32_INPUT_COUNT(3), mask_of(l, "inputs", timer_field::count_source));
    EXPECT_EQ(D32_INPUT_ACTION(3), mask_of(l, "inputs", timer_field::trigger_action));
    EXPECT_EQ(D32_INPUT_TRIGGER_FROM(3), mask_of(l, "inputs", timer_field::trigger_source));
    EXPECT_EQ(D32_INPUT_TRIGGER_FALLING, mask_of(l, "inputs", timer_field::trigger_edge));
    EXPECT_EQ(D32_INPUT_TRIGGER_FILTER(3), mask_of(l, "inputs", timer_field::trigger_filter));
    EXPECT_EQ(D32_INPUT_FILTER_DIVIDER(3), mask_of(l, "inputs", timer_field::filter_divider));
    for (unsigned c = 0; c < 2; ++c) {
        SCOPED_TRACE(c);
        EXPECT_EQ(D32_OUTPUT_BYTE(c, D32_OUTPUT_ACTION(0xf)),
                  mask_of(l, "outputs", timer_field::action, c));
        EXPECT_EQ(D32_OUTPUT_BYTE(c, D32_OUTPUT_MAIN_ENABLE),
                  mask_of(l, "outputs", timer_field::main_enable, c));
        EXPECT_EQ(D32_OUTPUT_BYTE(c, D32_OUTPUT_MAIN_ACTIVE_LOW),
                  mask_of(l, "outputs", timer_field::main_active_low, c));
        EXPECT_EQ(D32_OUTPUT_BYTE(c, D32_OUTPUT_COMPARE_PRELOAD),
                  mask_of(l, "outputs", timer_field::compare_preload, c));
    }
}

TEST(demo_encoding_test, the_firmware_header_names_the_model_values) {
    EXPECT_EQ(DEMO_FLAG_CHANNEL(0), models::flag_channel(0));
    EXPECT_EQ(DEMO_FLAG_CHANNEL(3), models::flag_channel(3));
    EXPECT_EQ(DEMO_FLAG_RELOAD, models::flag_reload);
    EXPECT_EQ(DEMO_FLAG_FAULT, models::flag_fault);
    EXPECT_EQ(DEMO_FLAG_TRIGGER, models::flag_trigger);
    EXPECT_EQ(D32_FLAG_OVERCAPTURE(1), models::flag_overcapture(1));
    EXPECT_EQ(DEMO_ROLE_CAPTURE_NEIGHBOUR,
              static_cast<unsigned>(models::channel_role::capture_neighbour));
    EXPECT_EQ(DEMO_EDGE_BOTH, static_cast<unsigned>(models::capture_edge::both));
    EXPECT_EQ(DEMO_COUNT_ENCODER_X4, static_cast<unsigned>(models::count_source::encoder_x4));
    EXPECT_EQ(DEMO_TRIGGER_ACTION_START, static_cast<unsigned>(models::trigger_action::start));
    EXPECT_EQ(DEMO_TRIGGER_FROM_CHAIN, static_cast<unsigned>(models::trigger_source::chained));
    EXPECT_EQ(DEMO_TRIGGER_NONE, models::trigger_none);
    EXPECT_EQ(DEMO_TRIGGER_ON_MATCH(2), models::trigger_on_match(2));
    EXPECT_EQ(DEMO_TRIGGER_ON_RELOAD, models::trigger_on_reload);
    EXPECT_EQ(DEMO_MODE_CENTER, static_cast<unsigned>(models::count_mode::center));
    EXPECT_EQ(DEMO_SLOPE_BOTH, static_cast<unsigned>(models::match_slope::both));
    EXPECT_EQ(DEMO_RELOAD_HELD, static_cast<unsigned>(models::reload_policy::held));
    EXPECT_EQ(DEMO_ACTION_PWM_BELOW, static_cast<unsigned>(models::output_action::pwm_below));
    EXPECT_EQ(DEMO_ACTION_FORCE_HIGH, static_cast<unsigned>(models::output_action::force_high));
}

// One row of the action table of docs/timer-model.md.
struct documented_action {
    std::uint32_t code;
    std::string name;
};

std::vector<documented_action> documented_actions() {
    const std::string table =
        table_after(read_file(source_dir + "/docs/timer-model.md"), "Output actions (`action`");
    // Rows look like "| `0x4` | `pwm_below` | ... |".
    std::vector<documented_action> out;
    std::istringstream rows(table);
    for (std::string line; std::getline(rows, line);) {
        const auto code_at = line.find("| `0x");
        if (code_at != 0) continue;
        const auto code_end = line.find('`', code_at + 3);
        const auto name_at = line.find("| `", code_end);
        const auto name_end = line.find('`', name_at + 3);
        if (code_end == std::string::npos || name_at == std::string::npos ||
            name_end == std::string::npos)
            continue;
        out.push_back({static_cast<std::uint32_t>(std::stoul(
                           line.substr(code_at + 5, code_end - code_at - 5), nullptr, 16)),
                       line.substr(name_at + 3, name_end - name_at - 3)});
    }
    return out;
}

// A timer of a shipped layout at 1 MHz (one tick per microsecond) behind its register file.
struct layout_rig {
    explicit layout_rig(const std::string& name)
        : layout(shipped(name)),
          clock(sim::frequency::hz(1'000'000)),
          timer(layout.instance, clock, &log),
          regs(layout, timer, layout.instance, name) {
        regs.apply_reset(0);
    }
    // Writes functional field f (channel c) through the register that holds it, as firmware would.
    void set(timer_field f, std::uint32_t v, sim::time_ps at, unsigned c = 0) {
        for (const auto& r : layout.registers)
            for (const auto& fm : r.fields)
                if (fm.field == f && fm.channel == c &&
                    fm.access != models::access_kind::read_only) {
                    std::uint32_t old = 0;
                    regs.read(r.offset, r.bytes(), old, at);
                    const std::uint32_t m = fm.register_mask();
                    regs.write(r.offset, r.bytes(), (old & ~m) | ((v << fm.bit) & m), at);
                    return;
                }
        ADD_FAILURE() << to_string(f) << " is not writable in " << layout.name;
    }
    // Main output level of channel 0 after tick n (1 us per tick).
    bool pin_after(std::uint64_t tick) {
        timer.advance_to(tick * 1'000'000);
        return timer.pin(models::main_pin(0));
    }
    models::register_layout layout;
    sim::clock_domain clock;
    tickbench::test_support::timer_event_log log;
    models::timer_core timer;
    models::register_file regs;
};

TEST(demo_encoding_test, a_partial_write_of_a_capture_register_clears_its_flag_by_its_read) {
    // docs/register-layouts.md, "Fields covered in part": the merge read is a read.
    layout_rig rig("timer16_quad");
    rig.set(timer_field::channel_role, DEMO_ROLE_CAPTURE_OWN, 0);
    rig.set(timer_field::enable, 1, 0);
    rig.timer.set_input(models::input_of_channel(0), true, 10'500'000);
    rig.timer.advance_to(20'000'000);
    ASSERT_NE(rig.timer.read(timer_field::flags, 0, 20'000'000) & models::flag_channel(0), 0u);
    std::uint32_t captured = 0;
    rig.regs.read(Q16_MATCH(0), 2, captured, 20'000'000);
    rig.timer.set_input(models::input_of_channel(0), false, 21'500'000);
    rig.timer.set_input(models::input_of_channel(0), true, 22'500'000);
    rig.timer.advance_to(30'000'000);
    ASSERT_NE(rig.timer.read(timer_field::flags, 0, 30'000'000) & models::flag_channel(0), 0u);
    rig.regs.write(Q16_MATCH(0) + 1, 1, 0xff, 30'000'000);  // ignored, but merged through a read
    EXPECT_EQ(rig.timer.read(timer_field::flags, 0, 30'000'000) & models::flag_channel(0), 0u);
    EXPECT_GT(rig.timer.read(timer_field::compare, 0, 30'000'000), captured);
}

TEST(demo_encoding_test, every_documented_action_code_does_what_the_table_says) {
    const auto actions = documented_actions();
    ASSERT_EQ(actions.size(), 8u) << "the action table of docs/timer-model.md was not found whole";
    for (const char* layout : {"timer16_quad", "timer32_dual"}) {
        for (const documented_action& a : actions) {
            SCOPED_TRACE(std::string(layout) + " action " + a.name);
            layout_rig rig(layout);
            // Period 9 (ten counts), compare 4, main output on, counting from tick 1.
            rig.set(timer_field::period, 9, 0);
            rig.set(timer_field::compare, 4, 0);
            rig.set(timer_field::main_enable, 1, 0);
            // Match actions start from a known level: high for clear (forced high, shown at tick
            // 1, then the action written between ticks 1 and 2), low otherwise.
            sim::time_ps action_at = 0;
            if (a.name == "clear_on_match") {
                rig.set(timer_field::action, DEMO_ACTION_FORCE_HIGH, 0);
                action_at = 1'500'000;
            }
            rig.set(timer_field::enable, 1, 0);
            rig.set(timer_field::action, a.code, action_at);
            EXPECT_EQ(rig.timer.read(timer_field::action, 0, action_at), a.code);
            // The counter holds t at tick t (0..9), then wraps; it reaches 4 at tick 4 and 14.
            // Levels are compared from tick 3 on, when every write has shown (timer32_dual's
            // compare writes act two ticks after them).
            std::vector<bool> levels;
            for (std::uint64_t t = 1; t <= 16; ++t) levels.push_back(rig.pin_after(t));
            auto level_at = [&](std::uint64_t t) { return levels[t - 1]; };
            if (a.name == "hold" || a.name == "force_low") {
                for (std::uint64_t t = 3; t <= 16; ++t) EXPECT_FALSE(level_at(t)) << t;
            } else if (a.name == "force_high") {
                for (std::uint64_t t = 3; t <= 16; ++t) EXPECT_TRUE(level_at(t)) << t;
            } else if (a.name == "pwm_below" || a.name == "pwm_at_or_above") {
                const bool below = a.name == "pwm_below";
                for (std::uint64_t t = 3; t <= 16; ++t)
                    EXPECT_EQ(level_at(t), (t % 10 < 4) == below) << t;
            } else if (a.name == "toggle_on_match") {
                EXPECT_FALSE(level_at(3));
                EXPECT_TRUE(level_at(4));
                EXPECT_TRUE(level_at(13));
                EXPECT_FALSE(level_at(14));
            } else if (a.name == "set_on_match") {
                EXPECT_FALSE(level_at(3));
                EXPECT_TRUE(level_at(4));
                EXPECT_TRUE(level_at(16));
            } else if (a.name == "clear_on_match") {
                EXPECT_TRUE(level_at(3));
                EXPECT_FALSE(level_at(4));
                EXPECT_FALSE(level_at(16));
            } else {
                ADD_FAILURE() << "an action the test does not know: " << a.name;
            }
        }
    }
}

TEST(demo_encoding_test, a_reserved_action_code_is_ignored) {
    layout_rig rig("timer16_quad");
    rig.set(timer_field::action, DEMO_ACTION_PWM_BELOW, 0);
    rig.set(timer_field::action, 0x3, 10);  // reserved
    EXPECT_EQ(rig.timer.read(timer_field::action, 0, 10), DEMO_ACTION_PWM_BELOW);
}

TEST(demo_encoding_test, the_documented_flag_bits_are_what_the_status_registers_show) {
    for (const char* layout : {"timer16_quad", "timer32_dual"}) {
        SCOPED_TRACE(layout);
        layout_rig rig(layout);
        rig.set(timer_field::period, 9, 0);
        rig.set(timer_field::compare, 4, 0);
        rig.set(timer_field::enable, 1, 0);
        const auto* status = rig.layout.find(
            std::string_view(std::string(layout) == "timer16_quad" ? "status" : "pending"));
        ASSERT_NE(status, nullptr);
        std::uint32_t v = 0;
        // Tick 4: channel 0 matched. Tick 10: the counter wrapped, a reload event, and the other
        // channels (compare 0) matched at the step to 0.
        rig.regs.read(status->offset, status->bytes(), v, 4'500'000);
        EXPECT_EQ(v, DEMO_FLAG_CHANNEL(0));
        std::uint32_t others = 0;
        for (unsigned c = 1; c < rig.layout.instance.channels; ++c) others |= DEMO_FLAG_CHANNEL(c);
        rig.regs.read(status->offset, status->bytes(), v, 10'500'000);
        EXPECT_EQ(v, DEMO_FLAG_CHANNEL(0) | DEMO_FLAG_RELOAD | others);
    }
}

}  // namespace
