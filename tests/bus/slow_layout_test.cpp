// The slow-clock counter's layout (models/layouts/slow32.toml) loads with the kind's own
// vocabulary, the demo header names its offsets and bits, the documented table is the file, and the
// register file serves it with the semantics of docs/slow-counter.md: a stale read inside the
// synchroniser window, one register write travelling as one, a second write lost while busy.

#include "examples/parts/demo_timers.h"
#include "models/layout/layout_table.h"
#include "models/layout/register_file.h"
#include "models/slow/slow_counter_core.h"
#include "tests/support/layout_queries.h"

#include <gtest/gtest.h>

#include <string>

namespace {

using models::slow_field;

const std::string source_dir = TICKBENCH_SOURCE_DIR;
constexpr sim::time_ps ns = 1'000;
constexpr sim::time_ps us = 1'000'000;

models::register_layout slow32() {
    return models::load_register_layout_file(source_dir + "/models/layouts/slow32.toml");
}

// The register mask of the slow-clock counter field f in register `reg`; 0 if absent.
std::uint32_t slow_mask(const models::register_layout& l, const char* reg, slow_field f) {
    const models::register_map* r = l.find(std::string_view(reg));
    if (r == nullptr) return 0;
    for (const auto& fm : r->fields)
        if (fm.kind_field == static_cast<std::uint32_t>(f)) return fm.register_mask();
    return 0;
}

TEST(slow_layout_test, shipped_layout_loads_with_the_slow_counter_vocabulary) {
    const auto l = slow32();
    EXPECT_EQ(l.kind, "slow_counter");
    EXPECT_EQ(l.slow.counter_bits, 32u);
    EXPECT_EQ(l.slow.write_latency, SC_WRITE_LATENCY);
    EXPECT_EQ(l.slow.read_window, 40 * ns);
    EXPECT_TRUE(l.unmapped_field_names().empty());
    EXPECT_EQ(models::kind_field_names("slow_counter"),
              (std::vector<std::string>{"enable", "prescale", "count", "alarm", "irq_enable",
                                        "flags", "busy"}));
}

TEST(slow_layout_test, demo_header_names_the_layout_offsets_and_bits) {
    using tickbench::test_support::offset_of;
    const auto l = slow32();
    EXPECT_EQ(offset_of(l, "ticks"), SC_TICKS);
    EXPECT_EQ(offset_of(l, "wake_at"), SC_WAKE_AT);
    EXPECT_EQ(offset_of(l, "setup"), SC_SETUP);
    EXPECT_EQ(offset_of(l, "status"), SC_STATUS);
    EXPECT_EQ(slow_mask(l, "ticks", slow_field::count), 0xffff'ffffu);
    EXPECT_EQ(slow_mask(l, "wake_at", slow_field::alarm), 0xffff'ffffu);
    EXPECT_EQ(slow_mask(l, "setup", slow_field::enable), SC_SETUP_ENABLE);
    EXPECT_EQ(slow_mask(l, "setup", slow_field::irq_enable), SC_SETUP_NOTIFY);
    EXPECT_EQ(slow_mask(l, "setup", slow_field::prescale), SC_SETUP_PRESCALE(15));
    EXPECT_EQ(slow_mask(l, "status", slow_field::busy), SC_STATUS_BUSY);
    EXPECT_EQ(slow_mask(l, "status", slow_field::flags), SC_STATUS_ALARM);
}

TEST(slow_layout_test, documented_table_is_the_layout_file) {
    const std::string doc =
        tickbench::test_support::read_file(source_dir + "/docs/register-layouts.md");
    const std::string table = models::layout_table_markdown(slow32());
    const auto heading = doc.find("### `models/layouts/slow32.toml`");
    ASSERT_NE(heading, std::string::npos);
    const auto next = doc.find("\n## ", heading);
    EXPECT_NE(doc.substr(heading, next - heading).find("\n" + table), std::string::npos)
        << "expected table:\n"
        << table;
}

TEST(slow_layout_test, register_file_reads_stale_inside_the_window_and_loses_a_busy_write) {
    const auto l = slow32();
    // 31.25 kHz: edge k at k * 32 us, a whole number of picoseconds.
    sim::clock_domain clock(sim::frequency::hz(31'250));
    constexpr sim::time_ps period = 32 * us;
    models::slow_counter_core core(l.slow, clock);
    models::register_file regs(l, core, "slow");
    regs.apply_reset(0);
    core.settle(0);
    std::uint32_t v = 0;
    // One transfer: enable and prescale 0 travel together, in force at edge 3.
    regs.write(SC_SETUP, 4, SC_SETUP_ENABLE, us);
    regs.read(SC_STATUS, 4, v, us);
    EXPECT_EQ(v, SC_STATUS_BUSY);
    regs.write(SC_TICKS, 4, 500, 2 * us);  // lost: the setup write is pending
    regs.read(SC_STATUS, 4, v, 3 * period);
    EXPECT_EQ(v, 0u);
    regs.read(SC_TICKS, 4, v, 10 * period + 39 * ns);  // edges 4..9 counted; 10 not yet seen
    EXPECT_EQ(v, 6u);
    regs.read(SC_TICKS, 4, v, 10 * period + 40 * ns);
    EXPECT_EQ(v, 7u);
    // The count after edge k is k - 3; an alarm of 12 written after edge 10 is in force from edge
    // 13 and matches at edge 15. The flag clears by writing 1 to it.
    regs.write(SC_WAKE_AT, 4, 12, 10 * period + us);
    regs.read(SC_STATUS, 4, v, 15 * period - 1);
    EXPECT_EQ(v, 0u);
    regs.read(SC_STATUS, 4, v, 15 * period);
    EXPECT_EQ(v, SC_STATUS_ALARM);
    regs.write(SC_STATUS, 4, SC_STATUS_ALARM, 16 * period);
    regs.read(SC_STATUS, 4, v, 16 * period);
    EXPECT_EQ(v, 0u);
}

}  // namespace
