// The layouts of the other peripheral kinds: the shipped tick timer and watchdog layouts
// (models/layouts/tick24.toml, watchdog12.toml) load with their kinds' own vocabularies, the demo
// header names their offsets and bits, the documented tables are the files, and the register file
// serves them with the semantics of docs/tick-timer.md (the flag clears when the control register
// is read; any write of the current value clears it) and docs/watchdog.md.

#include "examples/parts/demo_timers.h"
#include "models/layout/layout_table.h"
#include "models/layout/register_file.h"
#include "models/tick/tick_timer_core.h"
#include "tests/support/layout_queries.h"

#include <gtest/gtest.h>

#include <string>

namespace {

using models::tick_field;

const std::string source_dir = TICKBENCH_SOURCE_DIR;

models::register_layout tick24() {
    return models::load_register_layout_file(source_dir + "/models/layouts/tick24.toml");
}

// The register mask of the tick timer field f in register `reg`; 0 if absent.
std::uint32_t tick_mask(const models::register_layout& l, const char* reg, tick_field f) {
    const models::register_map* r = l.find(std::string_view(reg));
    if (r == nullptr) return 0;
    for (const auto& fm : r->fields)
        if (fm.kind_field == static_cast<std::uint32_t>(f)) return fm.register_mask();
    return 0;
}

TEST(tick_layout_test, shipped_layout_loads_with_the_tick_timer_vocabulary) {
    const auto l = tick24();
    EXPECT_EQ(l.kind, "tick_timer");
    EXPECT_EQ(l.tick.counter_bits, 24u);
    EXPECT_EQ(l.tick.divider, 8u);
    EXPECT_TRUE(l.unmapped_field_names().empty());
    EXPECT_EQ(models::kind_field_names("tick_timer"),
              (std::vector<std::string>{"enable", "irq_enable", "clock_choice", "flags", "reload",
                                        "current"}));
}

TEST(tick_layout_test, demo_header_names_the_layout_offsets_and_bits) {
    using tickbench::test_support::offset_of;
    const auto l = tick24();
    EXPECT_EQ(offset_of(l, "start_value"), TK_START_VALUE);
    EXPECT_EQ(offset_of(l, "count_now"), TK_COUNT_NOW);
    EXPECT_EQ(offset_of(l, "control"), TK_CONTROL);
    EXPECT_EQ(tick_mask(l, "start_value", tick_field::reload), TK_COUNTER_MAX);
    EXPECT_EQ(tick_mask(l, "control", tick_field::enable), TK_CONTROL_ENABLE);
    EXPECT_EQ(tick_mask(l, "control", tick_field::clock_choice), TK_CONTROL_DIVIDED);
    EXPECT_EQ(tick_mask(l, "control", tick_field::irq_enable), TK_CONTROL_NOTIFY);
    EXPECT_EQ(tick_mask(l, "control", tick_field::flags), TK_CONTROL_REACHED_ZERO);
}

TEST(tick_layout_test, documented_table_is_the_layout_file) {
    const std::string doc =
        tickbench::test_support::read_file(source_dir + "/docs/register-layouts.md");
    const std::string table = models::layout_table_markdown(tick24());
    const auto heading = doc.find("### `models/layouts/tick24.toml`");
    ASSERT_NE(heading, std::string::npos);
    const auto next = doc.find("\n## ", heading);
    EXPECT_NE(doc.substr(heading, next - heading).find("\n" + table), std::string::npos)
        << "expected table:\n"
        << table;
}

TEST(tick_layout_test, reading_control_clears_the_flag_and_writing_count_now_clears_it) {
    const auto l = tick24();
    sim::clock_domain clock(sim::frequency::hz(1'000'000));  // edge k at k us
    models::tick_timer_core core(l.tick, clock);
    models::register_file regs(l, core, "tick");
    constexpr sim::time_ps us = 1'000'000;
    regs.apply_reset(0);
    regs.write(TK_START_VALUE, 4, 2, 0);
    regs.write(TK_COUNT_NOW, 4, 0xabc, 0);
    regs.write(TK_CONTROL, 4, TK_CONTROL_ENABLE, 0);
    std::uint32_t v = 0;
    regs.read(TK_COUNT_NOW, 4, v, 3 * us);  // edge 1 loads 2, edges 2 and 3 count to 0
    EXPECT_EQ(v, 0u);
    regs.read(TK_CONTROL, 4, v, 3 * us);
    EXPECT_EQ(v, TK_CONTROL_ENABLE | TK_CONTROL_REACHED_ZERO);
    regs.read(TK_CONTROL, 4, v, 3 * us);  // the read before cleared it
    EXPECT_EQ(v, TK_CONTROL_ENABLE);
    regs.read(TK_COUNT_NOW, 4, v, 5 * us);
    EXPECT_EQ(v, 1u);
    regs.write(TK_COUNT_NOW, 4, 0x55, 5 * us);
    regs.read(TK_COUNT_NOW, 4, v, 5 * us);
    EXPECT_EQ(v, 0u);
    regs.read(TK_CONTROL, 4, v, 5 * us);
    EXPECT_EQ(v, TK_CONTROL_ENABLE);  // clearing the counter set no flag
}

TEST(tick_layout_test, a_timer_layout_needs_a_timer_model) {
    const auto l =
        models::load_register_layout_file(source_dir + "/models/layouts/timer32_dual.toml");
    sim::clock_domain clock(sim::frequency::hz(1000));
    models::tick_timer_core core(models::tick_config{}, clock);
    EXPECT_THROW(models::register_file(l, core, "x"), std::invalid_argument);
}

// The register mask of the watchdog field f in register `reg`; 0 if absent.
std::uint32_t watchdog_mask(const models::register_layout& l, const char* reg,
                            models::watchdog_field f) {
    const models::register_map* r = l.find(std::string_view(reg));
    if (r == nullptr) return 0;
    for (const auto& fm : r->fields)
        if (fm.kind_field == static_cast<std::uint32_t>(f)) return fm.register_mask();
    return 0;
}

TEST(tick_layout_test, watchdog_layout_header_and_documented_table_agree) {
    using models::watchdog_field;
    using tickbench::test_support::offset_of;
    const auto l =
        models::load_register_layout_file(source_dir + "/models/layouts/watchdog12.toml");
    EXPECT_EQ(l.kind, "watchdog");
    EXPECT_EQ(l.watchdog.counter_bits, 12u);
    EXPECT_TRUE(l.unmapped_field_names().empty());
    EXPECT_EQ(offset_of(l, "feed"), WD_FEED);
    EXPECT_EQ(offset_of(l, "arm"), WD_ARM);
    EXPECT_EQ(offset_of(l, "divide"), WD_DIVIDE);
    EXPECT_EQ(offset_of(l, "limit"), WD_LIMIT);
    EXPECT_EQ(offset_of(l, "window"), WD_WINDOW);
    EXPECT_EQ(offset_of(l, "level"), WD_LEVEL);
    EXPECT_EQ(watchdog_mask(l, "limit", watchdog_field::reload), WD_COUNTER_MAX);
    EXPECT_EQ(WD_KEY_FIRST, models::watchdog_key_first);
    EXPECT_EQ(WD_KEY_SECOND, models::watchdog_key_second);
    const std::string doc =
        tickbench::test_support::read_file(source_dir + "/docs/register-layouts.md");
    const auto heading = doc.find("### `models/layouts/watchdog12.toml`");
    ASSERT_NE(heading, std::string::npos);
    const auto next = doc.find("\n## ", heading);
    EXPECT_NE(doc.substr(heading, next - heading).find("\n" + models::layout_table_markdown(l)),
              std::string::npos);
}

TEST(tick_layout_test, watchdog_refresh_through_the_register_file) {
    const auto l =
        models::load_register_layout_file(source_dir + "/models/layouts/watchdog12.toml");
    sim::clock_domain clock(sim::frequency::hz(1'000'000));  // edge k at k us
    models::watchdog_core dog(l.watchdog, clock);
    models::register_file regs(l, dog, "dog");
    constexpr sim::time_ps us = 1'000'000;
    regs.apply_reset(0);
    std::uint32_t v = 0;
    regs.read(WD_LIMIT, 4, v, 0);
    EXPECT_EQ(v, WD_COUNTER_MAX);  // the reset value reached the model
    regs.write(WD_LIMIT, 4, 10, 0);
    regs.write(WD_ARM, 4, 1, 0);
    regs.write(WD_FEED, 4, WD_KEY_FIRST, 30 * us);
    regs.write(WD_FEED, 4, WD_KEY_SECOND, 30 * us);
    regs.read(WD_LEVEL, 4, v, 30 * us);
    EXPECT_EQ(v, 10u);
    regs.read(WD_FEED, 4, v, 30 * us);
    EXPECT_EQ(v, 0u);  // write-only
    EXPECT_FALSE(dog.fault().has_value());
    dog.advance_to(70 * us);
    EXPECT_EQ(dog.fault(), std::optional<models::watchdog_fault>(models::watchdog_fault::timeout));
}

}  // namespace
