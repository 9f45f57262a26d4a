#include "models/layout/register_layout.h"

#include "sim/toml_reader.h"

#include <algorithm>
#include <array>
#include <sstream>
#include <utility>

namespace models {

namespace {

using sim::table_reader;

constexpr std::array<access_kind, 5> all_access_kinds = {
    access_kind::read_write, access_kind::read_only, access_kind::write_one_to_clear,
    access_kind::clear_on_read, access_kind::write_only};

constexpr timer_field last_field = timer_field::comp_safe_level;

std::string hex(std::uint64_t v) {
    std::ostringstream s;
    s << "0x" << std::hex << v;
    return s.str();
}

std::vector<std::string> field_names() {
    std::vector<std::string> names;
    for (auto i = 0u; i <= static_cast<unsigned>(last_field); ++i)
        names.emplace_back(to_string(static_cast<timer_field>(i)));
    return names;
}

std::vector<std::string> access_names() {
    std::vector<std::string> names;
    for (auto k : all_access_kinds) names.emplace_back(to_string(k));
    return names;
}

std::string bit_range(unsigned lo, unsigned width) {
    if (width <= 1) return std::to_string(lo);
    return std::to_string(lo) + ".." + std::to_string(lo + width - 1);
}

unsigned bits_for(std::uint64_t max_value) {
    unsigned n = 1;
    while (n < 32 && (max_value >> n) != 0) ++n;
    return n;
}

// Register names: lower-case letters, digits and "_".
bool is_register_name(const std::string& name) {
    return std::all_of(name.begin(), name.end(), [](char c) {
        return (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_';
    });
}

void read_instance(table_reader& top, timer_config& cfg) {
    const toml::table* t =
        top.sub_table("instance", true,
                      "counter_bits, channels and the optional prescaler_bits, wrap_skip_bits, "
                      "prescaler_shadowed, complementary, dead_time_max, dead_time_scaled, "
                      "compare_latency");
    if (t == nullptr) return;
    table_reader r(top.findings(), *t, "instance");
    r.reject_unknown_keys(
        {"counter_bits", "channels", "prescaler_bits", "wrap_skip_bits", "prescaler_shadowed",
         "complementary", "dead_time_max", "dead_time_scaled", "compare_latency"},
        "the timer instance");
    if (auto v = r.integer("counter_bits", 8, 32, true)) cfg.counter_bits = unsigned(*v);
    if (auto v = r.integer("channels", 1, 6, true)) cfg.channels = unsigned(*v);
    if (auto v = r.integer("prescaler_bits", 1, 32)) cfg.prescaler_bits = unsigned(*v);
    if (auto v = r.integer("wrap_skip_bits", 0, 16)) cfg.wrap_skip_bits = unsigned(*v);
    if (auto v = r.boolean("prescaler_shadowed")) cfg.prescaler_shadowed = *v;
    if (auto v = r.boolean("complementary")) cfg.complementary = *v;
    if (auto v = r.integer("dead_time_max", 0, 0xffff'ffffLL)) cfg.dead_time_max = unsigned(*v);
    if (auto v = r.boolean("dead_time_scaled")) cfg.dead_time_scaled = *v;
    if (auto v = r.integer("compare_latency", 0, 2)) cfg.compare_latency = unsigned(*v);
}

// Reads `bits`, the node `n` of the field table `r`: a bit number (3) or a range "lo..hi".
bool read_bits(table_reader& r, const toml::node& n, unsigned& lo, unsigned& width) {
    const std::string accepted =
        "a bit number from 0 to 31, or a range \"lo..hi\" such as \"0..15\"";
    if (const auto* i = n.as_integer()) {
        if (i->get() < 0 || i->get() > 31) {
            r.wrong(n, "bits", accepted);
            return false;
        }
        lo = unsigned(i->get());
        width = 1;
        return true;
    }
    const auto* s = n.as_string();
    if (s == nullptr) {
        r.wrong(n, "bits", accepted);
        return false;
    }
    const std::string& t = s->get();
    const auto dots = t.find("..");
    auto whole = [](std::string_view x, unsigned& out) {
        if (x.empty() || x.size() > 2) return false;
        out = 0;
        for (char c : x) {
            if (c < '0' || c > '9') return false;
            out = out * 10 + unsigned(c - '0');
        }
        return true;
    };
    unsigned a = 0, b = 0;
    if (dots == std::string::npos || !whole(std::string_view(t).substr(0, dots), a) ||
        !whole(std::string_view(t).substr(dots + 2), b)) {
        r.wrong(n, "bits", accepted);
        return false;
    }
    if (b < a) {
        r.report(n, "bits",
                 "\"" + t + "\" runs downwards; accepted: the low bit first, \"" +
                     std::to_string(b) + ".." + std::to_string(a) + "\"");
        return false;
    }
    if (b > 31) {
        r.report(n, "bits", "\"" + t + "\" goes past bit 31; accepted: bits within 0..31");
        return false;
    }
    lo = a;
    width = b - a + 1;
    return true;
}

// Reads entry `index` of the register's `fields` array (`fields` reads the register's table).
void read_field(table_reader& fields, std::size_t index, const timer_config& cfg,
                const register_map& reg, std::vector<field_map>& out,
                std::vector<toml::source_region>& where) {
    const std::string item = "fields[" + std::to_string(index) + "]";
    const toml::node& n = *fields.table().get("fields")->as_array()->get(index);
    const auto* t = n.as_table();
    if (t == nullptr) {
        fields.wrong(n, item,
                     "a table such as { field = \"period\", bits = \"0..15\", access = "
                     "\"read-write\" }");
        return;
    }
    table_reader r(fields.findings(), *t, fields.key_path(item));
    r.reject_unknown_keys({"field", "channel", "bits", "value_bit", "access"}, "a register field");
    bool ok = true;
    field_map f;

    const auto name = r.choice("field", field_names(), true);
    if (name)
        f.field = *timer_field_from_string(*name);
    else
        ok = false;

    const auto* ch = t->get("channel");
    if (ok && is_channel_field(f.field)) {
        const auto max_ch = cfg.channels - 1;
        const std::string accepted = "a channel from 0 to " + std::to_string(max_ch);
        if (ch == nullptr) {
            r.report("channel", "missing key \"channel\": \"" + std::string(to_string(f.field)) +
                                    "\" is a per-channel field; accepted: " + accepted);
            ok = false;
        } else if (const auto* i = ch->as_integer(); i == nullptr || i->get() < 0) {
            r.wrong(*ch, "channel", accepted);
            ok = false;
        } else if (std::uint64_t(i->get()) > max_ch) {
            r.report("channel", "channel " + std::to_string(i->get()) +
                                    " is beyond the instance's " + std::to_string(cfg.channels) +
                                    " channels; accepted: 0 to " + std::to_string(max_ch));
            ok = false;
        } else {
            f.channel = unsigned(i->get());
        }
    } else if (ok && ch != nullptr) {
        r.report("channel", std::string("\"") + to_string(f.field) +
                                "\" is not a per-channel field; accepted: no channel key");
        ok = false;
    }

    if (const auto* b = r.get("bits", true, "a bit number such as 3, or a range \"lo..hi\"");
        b == nullptr || !read_bits(r, *b, f.bit, f.width)) {
        ok = false;
    } else if (f.bit + f.width > reg.width) {
        r.report("bits", "field " + bit_range(f.bit, f.width) + " overflows the " +
                             std::to_string(reg.width) +
                             "-bit register; accepted: bits within 0.." +
                             std::to_string(reg.width - 1));
        ok = false;
    }

    if (auto v = r.integer("value_bit", 0, 31)) f.value_bit = unsigned(*v);

    if (const auto kind = r.choice("access", access_names(), true); !kind) {
        ok = false;
    } else {
        const auto k = *access_kind_from_string(*kind);
        f.access = k;
        const bool clears = k == access_kind::write_one_to_clear || k == access_kind::clear_on_read;
        if (name && ok && clears && f.field != timer_field::flags) {
            r.report("access", "\"" + *kind +
                                   "\" clears flags and only suits the flags field; accepted for "
                                   "\"" +
                                   *name + "\": read-write, read-only, write-only");
            ok = false;
        } else if (name && ok && f.field == timer_field::flags &&
                   (k == access_kind::read_write || k == access_kind::write_only)) {
            r.report("access",
                     "flags are not written as data; accepted for \"flags\": read-only, "
                     "write-one-to-clear, clear-on-read");
            ok = false;
        }
    }

    if (!ok) return;
    if (!instance_has(cfg, f.field, f.channel)) {
        std::string why = f.field == timer_field::wrap_skip
                              ? "the instance has no wrap skip count (wrap_skip_bits = 0)"
                          : f.field == timer_field::dead_time_scale && cfg.complementary
                              ? "the instance's dead time has no scale (dead_time_scaled = false)"
                              : "the instance has no complementary outputs (complementary = false)";
        r.report("field", std::string("\"") + to_string(f.field) + "\" does not exist here: " +
                              why + "; accepted: fields the instance has");
        return;
    }
    const unsigned vw = value_width(cfg, f.field);
    if (f.value_bit + f.width > vw) {
        r.report(t->get("value_bit") ? "value_bit" : "bits",
                 "the field holds value bits " + bit_range(f.value_bit, f.width) + " but \"" +
                     to_string(f.field) + "\" has " + std::to_string(vw) +
                     " bits in this instance; accepted: value bits within 0.." +
                     std::to_string(vw - 1));
        return;
    }
    for (std::size_t i = 0; i < out.size(); ++i) {
        const auto& o = out[i];
        if ((o.register_mask() & f.register_mask()) != 0) {
            r.report("bits", "field " + bit_range(f.bit, f.width) + " overlaps field " +
                                 std::to_string(i) + " (\"" + to_string(o.field) + "\", bits " +
                                 bit_range(o.bit, o.width) + ") at line " +
                                 std::to_string(where[i].begin.line) +
                                 "; accepted: bits no other field of \"" + reg.name + "\" uses");
            return;
        }
    }
    out.push_back(f);
    where.push_back(n.source());
}

void read_register(sim::findings_list& out, const sim::named_table& entry, const timer_config& cfg,
                   std::uint32_t window, register_layout& layout) {
    table_reader r(out, *entry.table, "registers." + entry.name);
    r.reject_unknown_keys({"offset", "width", "reset", "fields"}, "a register");
    register_map reg;
    reg.name = entry.name;
    bool ok = entry.name_ok;
    const auto width = r.integer("width", 8, 32, true, "8, 16 or 32");
    if (width && *width != 8 && *width != 16 && *width != 32) {
        r.wrong(*r.table().get("width"), "width", "8, 16 or 32");
        ok = false;
    } else if (!width) {
        ok = false;
    } else {
        reg.width = unsigned(*width);
    }
    const auto offset = r.integer("offset", 0, 0xffff'ffffLL, true,
                                  "a byte offset within the window, 0x0 to " + hex(window - 1));
    if (!offset) ok = false;
    if (offset && ok) {
        reg.offset = std::uint32_t(*offset);
        if (reg.offset % reg.bytes() != 0) {
            r.report("offset", "offset " + hex(reg.offset) + " is not aligned to the " +
                                   std::to_string(reg.width) +
                                   "-bit register; accepted: a multiple of " +
                                   std::to_string(reg.bytes()));
            ok = false;
        } else if (std::uint64_t(reg.offset) + reg.bytes() > window) {
            r.report("offset", "register " + hex(reg.offset) + ".." +
                                   hex(reg.offset + reg.bytes() - 1) + " lies beyond the " +
                                   hex(window) + "-byte window; accepted: offsets from 0 to " +
                                   hex(window >= reg.bytes() ? window - reg.bytes() : 0));
            ok = false;
        }
    }
    const std::int64_t max_value =
        ok ? (reg.width == 32 ? 0xffff'ffffLL : (1LL << reg.width) - 1) : 0xffff'ffffLL;
    if (auto v = r.integer(
            "reset", 0, max_value, false,
            "a whole number from 0 to " + hex(std::uint64_t(max_value)) + " (fits the register)"))
        reg.reset = std::uint32_t(*v);

    const auto* fields =
        r.get("fields", true, "an array of fields (an empty array for a spare register)");
    if (fields == nullptr) return;
    const auto* arr = fields->as_array();
    if (arr == nullptr) {
        r.wrong(*fields, "fields", "an array of field tables");
        return;
    }
    if (!ok) return;
    std::vector<toml::source_region> where;
    for (std::size_t i = 0; i < arr->size(); ++i) read_field(r, i, cfg, reg, reg.fields, where);
    std::sort(reg.fields.begin(), reg.fields.end(),
              [](const auto& a, const auto& b) { return a.bit < b.bit; });
    if (reg.reset & reg.reserved_mask())
        r.report("reset", "reset value " + hex(reg.reset) + " sets reserved bits " +
                              hex(reg.reset & reg.reserved_mask()) +
                              "; accepted: a value with bits only where fields are (mask " +
                              hex(~reg.reserved_mask() & std::uint32_t(max_value)) + ")");

    // Registers may not share bytes.
    for (const auto& o : layout.registers) {
        if (reg.offset < o.offset + o.bytes() && o.offset < reg.offset + reg.bytes()) {
            r.report("offset", "register " + hex(reg.offset) + ".." +
                                   hex(reg.offset + reg.bytes() - 1) + " overlaps register \"" +
                                   o.name + "\" at " + hex(o.offset) + ".." +
                                   hex(o.offset + o.bytes() - 1) +
                                   "; accepted: an offset no other register covers");
            return;
        }
    }
    layout.registers.push_back(std::move(reg));
}

register_layout read_layout(const toml::table& root, const std::string& file) {
    sim::findings_list out(file);
    table_reader top(out, root, "");
    register_layout layout;
    layout.file = file;
    top.reject_unknown_keys({"kind", "name", "size", "instance", "registers"}, "a register layout");
    if (auto k = top.choice("kind", {"timer"}, true)) layout.kind = *k;
    if (auto n = top.string("name", false, "a name such as \"timer16_quad\"")) {
        layout.name = *n;
    } else {
        auto stem = file.substr(
            file.find_last_of('/') == std::string::npos ? 0 : file.find_last_of('/') + 1);
        layout.name = stem.substr(0, stem.rfind(".toml"));
    }
    const auto size =
        top.integer("size", 1, 0xffff'ffffLL, true, "a byte count from 1 to 0xffffffff");
    read_instance(top, layout.instance);
    if (out.empty()) {
        try {
            layout.instance.validate();
        } catch (const std::exception& e) {
            top.report("instance", e.what());
        }
    }
    // Registers are read only on a sound header: their checks need the window and the instance.
    const bool sound = size && out.empty();
    if (const auto* t = top.sub_table("registers", true, "a table [registers.NAME] per register")) {
        // In file order, so overlap messages name the earlier register.
        const auto entries = table_reader(out, *t, "registers")
                                 .named_tables("register", is_register_name,
                                               "lower-case letters, digits and \"_\", such as "
                                               "\"match_a\"");
        if (sound) {
            layout.size = std::uint32_t(*size);
            for (const auto& e : entries)
                if (e.table) read_register(out, e, layout.instance, layout.size, layout);
        }
    }
    out.raise_if_any();
    std::sort(layout.registers.begin(), layout.registers.end(),
              [](const auto& a, const auto& b) { return a.offset < b.offset; });
    return layout;
}

}  // namespace

const char* to_string(access_kind k) {
    switch (k) {
        case access_kind::read_write:
            return "read-write";
        case access_kind::read_only:
            return "read-only";
        case access_kind::write_one_to_clear:
            return "write-one-to-clear";
        case access_kind::clear_on_read:
            return "clear-on-read";
        case access_kind::write_only:
            return "write-only";
    }
    return "?";
}

std::optional<access_kind> access_kind_from_string(std::string_view text) {
    for (auto k : all_access_kinds)
        if (text == to_string(k)) return k;
    return std::nullopt;
}

std::optional<timer_field> timer_field_from_string(std::string_view text) {
    for (auto i = 0u; i <= static_cast<unsigned>(last_field); ++i)
        if (text == to_string(static_cast<timer_field>(i))) return static_cast<timer_field>(i);
    return std::nullopt;
}

std::uint32_t field_map::register_mask() const {
    const std::uint32_t m = width >= 32 ? 0xffff'ffffu : (1u << width) - 1;
    return m << bit;
}

std::uint32_t register_map::reserved_mask() const {
    std::uint32_t used = 0;
    for (const auto& f : fields) used |= f.register_mask();
    const std::uint32_t all = width >= 32 ? 0xffff'ffffu : (1u << width) - 1;
    return all & ~used;
}

const register_map* register_layout::find(std::uint32_t offset) const {
    for (const auto& r : registers)
        if (offset >= r.offset && offset < r.offset + r.bytes()) return &r;
    return nullptr;
}

const register_map* register_layout::find(std::string_view name_) const {
    for (const auto& r : registers)
        if (r.name == name_) return &r;
    return nullptr;
}

nearest_register register_layout::nearest(std::uint64_t offset) const {
    nearest_register best;
    for (const auto& r : registers) {
        nearest_register n{&r, 0, false};
        if (offset < r.offset) {
            n.distance = r.offset - offset;
            n.below = true;
        } else if (offset >= std::uint64_t(r.offset) + r.bytes()) {
            n.distance = offset - (std::uint64_t(r.offset) + r.bytes() - 1);
        }
        if (best.reg == nullptr || n.distance < best.distance) best = n;
    }
    return best;
}

std::vector<std::pair<timer_field, unsigned>> register_layout::unmapped_fields() const {
    std::vector<std::pair<timer_field, unsigned>> missing;
    for (auto i = 0u; i <= static_cast<unsigned>(last_field); ++i) {
        const auto f = static_cast<timer_field>(i);
        const unsigned n = is_channel_field(f) ? instance.channels : 1;
        for (unsigned c = 0; c < n; ++c) {
            if (!instance_has(instance, f, c)) continue;
            bool found = false;
            for (const auto& r : registers)
                for (const auto& m : r.fields) found = found || (m.field == f && m.channel == c);
            if (!found) missing.emplace_back(f, c);
        }
    }
    return missing;
}

bool instance_has(const timer_config& instance, timer_field f, unsigned channel) {
    if (is_channel_field(f) && channel >= instance.channels) return false;
    switch (f) {
        case timer_field::wrap_skip:
            return instance.wrap_skip_bits > 0;
        case timer_field::dead_time_scale:
            return instance.complementary && instance.dead_time_scaled;
        case timer_field::dead_time:
        case timer_field::fault_enable:
        case timer_field::fault_latency:
        case timer_field::rearm:
        case timer_field::comp_enable:
        case timer_field::comp_active_low:
        case timer_field::main_safe_level:
        case timer_field::comp_safe_level:
            return instance.complementary;
        default:
            return true;
    }
}

unsigned value_width(const timer_config& instance, timer_field f) {
    switch (f) {
        case timer_field::period:
        case timer_field::counter:
        case timer_field::compare:
            return instance.counter_bits;
        case timer_field::prescaler:
            return instance.prescaler_bits;
        case timer_field::wrap_skip:
            return instance.wrap_skip_bits;
        case timer_field::dead_time:
            return bits_for(instance.dead_time_max);
        case timer_field::fault_latency:
            return 16;
        case timer_field::mode:
        case timer_field::slope:
        case timer_field::reload_policy:
        case timer_field::dead_time_scale:
            return 2;
        case timer_field::action:
            return 4;
        case timer_field::trigger_select:
            return 3;
        case timer_field::flags:
        case timer_field::irq_enable:
            return 10;
        default:
            return 1;
    }
}

register_layout load_register_layout_text(std::string_view toml_text, const std::string& file) {
    return read_layout(sim::read_toml_text(toml_text, file), file);
}

register_layout load_register_layout_file(const std::string& path) {
    return read_layout(sim::read_toml_file(path), path);
}

}  // namespace models
