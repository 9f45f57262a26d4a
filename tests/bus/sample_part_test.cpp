// The Saltmarsh sample part (docs/register-layouts.md, "Bring your own part") is described three
// times: by its layout file, by the C header its driver includes, and by the walk-through. They
// agree:
// - the walk-through shows the layout file as it is, and the table `tickbench layout` prints;
// - the header's struct offsets and bits are the layout's registers and fields, and the header's
//   raw values mean, through the layout's value tables, what the header's comments say.

#include "models/layout/layout_table.h"
#include "models/layout/register_layout.h"
#include "tests/harness/own_part/saltmarsh_pulse_timer.h"
#include "tests/support/layout_queries.h"

#include <gtest/gtest.h>

#include <cstddef>
#include <string>

namespace {

using models::timer_field;
using tickbench::test_support::mask_of;
using tickbench::test_support::offset_of;
using tickbench::test_support::read_file;

const std::string source_dir = TICKBENCH_SOURCE_DIR;
const std::string layout_file = "tests/data/parts/saltmarsh_pulse_timer.toml";

models::register_layout sample_layout() {
    return models::load_register_layout_file(source_dir + "/" + layout_file);
}

// The text of the first fenced block (``` ... ```) after `marker` in `doc`, without its fences.
std::string block_after(const std::string& doc, const std::string& marker) {
    const auto at = doc.find(marker);
    if (at == std::string::npos) return "(" + marker + " not found)";
    const auto open = doc.find("```", at);
    const auto body = doc.find('\n', open) + 1;
    const auto close = doc.find("\n```", body);
    if (open == std::string::npos || close == std::string::npos) return "(no block)";
    return doc.substr(body, close + 1 - body);
}

TEST(sample_part_test, the_walkthrough_shows_the_layout_file_and_its_table) {
    const std::string doc = read_file(source_dir + "/docs/register-layouts.md");
    EXPECT_EQ(block_after(doc, "### The layout"), read_file(source_dir + "/" + layout_file));
    const std::string shown = block_after(doc, "### Checking it");
    EXPECT_EQ(shown.rfind("$ build/tickbench layout " + layout_file, 0), 0u) << shown;
    const std::string table = models::layout_table_markdown(sample_layout());
    EXPECT_NE(shown.find(table), std::string::npos) << "the walk-through should show this table:\n"
                                                    << table << "\nit shows:\n"
                                                    << shown;
}

// The coded field of `reg` using value table `table` (channel c).
const models::field_map* coded(const models::register_layout& l, const char* reg, const char* table,
                               unsigned c = 0) {
    const models::register_map* r = l.find(std::string_view(reg));
    if (r == nullptr) return nullptr;
    for (const auto& fm : r->fields)
        if (fm.coded() && l.codes_of(fm)->name == table && fm.channel == c) return &fm;
    return nullptr;
}

// What the raw value found in register value `reg_value` of coded field `f` sets, as text.
std::string meaning(const models::register_layout& l, const models::field_map* f,
                    std::uint32_t reg_value) {
    if (f == nullptr) return "(no such field)";
    const models::code_entry* e = l.codes_of(*f)->find(f->raw_of(reg_value));
    if (e == nullptr) return "(reserved)";
    std::string out;
    for (const auto& a : e->sets)
        out += (out.empty() ? "" : ", ") + std::string(models::to_string(a.field)) + " " +
               models::value_name(a.field, a.value);
    return out;
}

TEST(sample_part_test, the_c_header_names_the_layouts_registers_and_bits) {
    const auto l = sample_layout();
    auto offset = [&](const char* name) { return offset_of(l, name); };
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, ctl), offset("ctl"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, div), offset("div"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, top), offset("top"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, now), offset("now"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, cmp[0]), offset("cmp0"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, cmp[2]), offset("cmp2"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, pin_cfg), offset("pin_cfg"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, irq_on), offset("irq_on"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, pend), offset("pend"));
    EXPECT_EQ(offsetof(saltmarsh_pulse_timer, cmd), offset("cmd"));
    EXPECT_LE(sizeof(saltmarsh_pulse_timer), l.size);

    EXPECT_EQ(SALT_CTL_HALT, mask_of(l, "ctl", timer_field::enable));
    EXPECT_EQ(SALT_CTL_SINGLE, mask_of(l, "ctl", timer_field::one_pulse));
    EXPECT_EQ(SALT_CTL_TOP_BUFFERED, mask_of(l, "ctl", timer_field::period_preload));
    EXPECT_EQ(SALT_NOW_RISING, mask_of(l, "now", timer_field::direction));
    ASSERT_NE(coded(l, "ctl", "count_style"), nullptr);
    EXPECT_EQ(SALT_CTL_STYLE_MASK, coded(l, "ctl", "count_style")->register_mask());
    ASSERT_NE(coded(l, "ctl", "reload_rule"), nullptr);
    EXPECT_EQ(SALT_CTL_RELOAD_MASK, coded(l, "ctl", "reload_rule")->register_mask());
    ASSERT_NE(coded(l, "ctl", "trigger_out"), nullptr);
    EXPECT_EQ(SALT_CTL_TRIGGER_MASK, coded(l, "ctl", "trigger_out")->register_mask());
    for (unsigned p = 0; p < 3; ++p) {
        SCOPED_TRACE(p);
        ASSERT_NE(coded(l, "pin_cfg", "pin_function", p), nullptr);
        EXPECT_EQ(SALT_PIN_BYTE(p, SALT_PIN_FUNCTION(7)),
                  coded(l, "pin_cfg", "pin_function", p)->register_mask());
        EXPECT_EQ(SALT_PIN_BYTE(p, SALT_PIN_DRIVE),
                  mask_of(l, "pin_cfg", timer_field::main_enable, p));
        EXPECT_EQ(SALT_PIN_BYTE(p, SALT_PIN_HIGH),
                  mask_of(l, "pin_cfg", timer_field::main_active_low, p));
        EXPECT_EQ(SALT_PIN_BYTE(p, SALT_PIN_BUFFERED),
                  mask_of(l, "pin_cfg", timer_field::compare_preload, p));
    }
}

TEST(sample_part_test, the_c_headers_raw_values_mean_what_its_comments_say) {
    const auto l = sample_layout();
    const auto* style = coded(l, "ctl", "count_style");
    EXPECT_EQ(meaning(l, style, SALT_CTL_STYLE(SALT_STYLE_EDGE)), "mode up");
    EXPECT_EQ(meaning(l, style, SALT_CTL_STYLE(SALT_STYLE_EDGE) | SALT_CTL_DIR_DOWN), "mode down");
    EXPECT_EQ(meaning(l, style, SALT_CTL_STYLE(SALT_STYLE_CENTER_FALLING)),
              "mode center, slope down");
    EXPECT_EQ(meaning(l, style, SALT_CTL_STYLE(SALT_STYLE_CENTER_RISING) | SALT_CTL_DIR_DOWN),
              "mode center, slope up");
    EXPECT_EQ(meaning(l, style, SALT_CTL_STYLE(SALT_STYLE_CENTER_BOTH)), "mode center, slope both");
    const auto* reload = coded(l, "ctl", "reload_rule");
    EXPECT_EQ(meaning(l, reload, SALT_CTL_RELOAD(SALT_RELOAD_NEVER)), "reload_policy held");
    EXPECT_EQ(meaning(l, reload, SALT_CTL_RELOAD(SALT_RELOAD_ALWAYS)), "reload_policy every");
    EXPECT_EQ(meaning(l, reload, SALT_CTL_RELOAD(SALT_RELOAD_QUIET_COMMAND)),
              "reload_policy quiet_forced");
    EXPECT_EQ(meaning(l, reload, SALT_CTL_RELOAD(2)), "(reserved)");
    const auto* trigger = coded(l, "ctl", "trigger_out");
    EXPECT_EQ(meaning(l, trigger, SALT_CTL_TRIGGER(SALT_TRIGGER_WRAP)), "trigger_select reload");
    EXPECT_EQ(meaning(l, trigger, SALT_CTL_TRIGGER(SALT_TRIGGER_MATCH(2))),
              "trigger_select match_2");
    EXPECT_EQ(meaning(l, trigger, SALT_CTL_TRIGGER(SALT_TRIGGER_OFF)), "trigger_select none");
    EXPECT_EQ(meaning(l, trigger, SALT_CTL_TRIGGER(1)), "(reserved)");
    const auto* pin1 = coded(l, "pin_cfg", "pin_function", 1);
    auto fn = [&](unsigned f) { return meaning(l, pin1, SALT_PIN_BYTE(1, SALT_PIN_FUNCTION(f))); };
    EXPECT_EQ(fn(SALT_FN_LOW), "action force_low");
    EXPECT_EQ(fn(SALT_FN_HIGH), "action force_high");
    EXPECT_EQ(fn(SALT_FN_SET), "action set_on_match");
    EXPECT_EQ(fn(SALT_FN_CLEAR), "action clear_on_match");
    EXPECT_EQ(fn(SALT_FN_TOGGLE), "action toggle_on_match");
    EXPECT_EQ(fn(SALT_FN_FROZEN), "action hold");
    EXPECT_EQ(fn(SALT_FN_PULSE_BELOW), "action pwm_below");
    EXPECT_EQ(fn(SALT_FN_PULSE_FROM), "action pwm_at_or_above");

    // Events: WRAP is the model's reload flag, MATCH p channel p's, at the same bits in IRQ_ON.
    for (const char* reg : {"pend", "irq_on"}) {
        SCOPED_TRACE(reg);
        const timer_field f =
            std::string(reg) == "pend" ? timer_field::flags : timer_field::irq_enable;
        const models::register_map* r = l.find(std::string_view(reg));
        ASSERT_NE(r, nullptr);
        ASSERT_EQ(r->fields.size(), 2u);
        EXPECT_EQ(r->fields[0].field, f);
        EXPECT_EQ(r->fields[0].register_mask(), SALT_EVENT_WRAP);
        EXPECT_EQ(r->fields[0].value_bit, 8u);  // flag_reload
        EXPECT_EQ(r->fields[1].register_mask(),
                  SALT_EVENT_MATCH(0) | SALT_EVENT_MATCH(1) | SALT_EVENT_MATCH(2));
        EXPECT_EQ(r->fields[1].value_bit, 0u);  // flag_channel(0)
    }
    EXPECT_EQ(l.find(std::string_view("pend"))->fields[0].access,
              models::access_kind::write_zero_to_clear);
    EXPECT_EQ(mask_of(l, "cmd", timer_field::force_reload), SALT_CMD_RELOAD_NOW);
}

}  // namespace
