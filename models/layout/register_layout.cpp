#include "models/layout/register_layout.h"

#include <toml++/toml.h>

#include <algorithm>
#include <array>
#include <fstream>
#include <sstream>
#include <utility>

namespace models {

namespace {

constexpr std::array<access_kind, 5> all_access_kinds = {
    access_kind::read_write, access_kind::read_only, access_kind::write_one_to_clear,
    access_kind::clear_on_read, access_kind::write_only};

constexpr timer_field last_field = timer_field::comp_safe_level;

std::string hex(std::uint64_t v) {
    std::ostringstream s;
    s << "0x" << std::hex << v;
    return s.str();
}

std::string field_names() {
    std::string s;
    for (auto i = 0u; i <= static_cast<unsigned>(last_field); ++i)
        s += (i ? ", " : "") + std::string(to_string(static_cast<timer_field>(i)));
    return s;
}

std::string access_names() {
    std::string s;
    for (auto k : all_access_kinds) s += (s.empty() ? "" : ", ") + std::string(to_string(k));
    return s;
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

// Collects findings while one file is read; every check goes on after a mistake so a user sees
// them all at once.
class reader {
public:
    explicit reader(std::string file) : file_(std::move(file)) {}

    void fail(const toml::source_region& where, const std::string& key,
              const std::string& message) {
        findings_.push_back({file_, where.begin.line, where.begin.column, key, message});
    }
    void fail(const toml::node& where, const std::string& key, const std::string& message) {
        fail(where.source(), key, message);
    }
    bool failed() const { return !findings_.empty(); }
    [[noreturn]] void raise() {
        std::stable_sort(findings_.begin(), findings_.end(), [](const auto& a, const auto& b) {
            return std::pair(a.line, a.column) < std::pair(b.line, b.column);
        });
        throw sim::scenario_error(std::move(findings_));
    }
    const std::string& file() const { return file_; }

    // Reports keys of `t` not in `accepted`.
    void only_keys(const toml::table& t, const std::string& path,
                   std::initializer_list<std::string_view> accepted) {
        for (auto&& [k, v] : t) {
            if (std::find(accepted.begin(), accepted.end(), k.str()) != accepted.end()) continue;
            std::string list;
            for (auto a : accepted) list += (list.empty() ? "" : ", ") + std::string(a);
            fail(k.source(), join(path, k.str()), "unknown key; accepted: " + list);
        }
    }

    // A required or optional whole number within [lo, hi].
    std::optional<std::uint64_t> number(const toml::table& t, std::string_view key,
                                        const std::string& path, std::uint64_t lo, std::uint64_t hi,
                                        bool required, const std::string& range_text = "") {
        const auto* n = t.get(key);
        const auto full = join(path, key);
        const auto accepted = range_text.empty() ? "a whole number from " + std::to_string(lo) +
                                                       " to " + std::to_string(hi)
                                                 : range_text;
        if (n == nullptr) {
            if (required) fail(t, full, "missing; accepted: " + accepted);
            return std::nullopt;
        }
        const auto* i = n->as_integer();
        if (i == nullptr) {
            fail(*n, full,
                 "expected a whole number, got a " + type_name(*n) + "; accepted: " + accepted);
            return std::nullopt;
        }
        const auto v = i->get();
        if (v < 0 || static_cast<std::uint64_t>(v) < lo || static_cast<std::uint64_t>(v) > hi) {
            fail(*n, full, std::to_string(v) + " is out of range; accepted: " + accepted);
            return std::nullopt;
        }
        return static_cast<std::uint64_t>(v);
    }

    std::optional<std::string> text(const toml::table& t, std::string_view key,
                                    const std::string& path, bool required,
                                    const std::string& accepted) {
        const auto* n = t.get(key);
        if (n == nullptr) {
            if (required) fail(t, join(path, key), "missing; accepted: " + accepted);
            return std::nullopt;
        }
        if (const auto* s = n->as_string()) return s->get();
        fail(*n, join(path, key),
             "expected a string, got a " + type_name(*n) + "; accepted: " + accepted);
        return std::nullopt;
    }

    std::optional<bool> flag(const toml::table& t, std::string_view key, const std::string& path) {
        const auto* n = t.get(key);
        if (n == nullptr) return std::nullopt;
        if (const auto* b = n->as_boolean()) return b->get();
        fail(*n, join(path, key), "expected true or false, got a " + type_name(*n));
        return std::nullopt;
    }

    static std::string join(const std::string& path, std::string_view key) {
        return path.empty() ? std::string(key) : path + "." + std::string(key);
    }
    static std::string type_name(const toml::node& n) {
        switch (n.type()) {
            case toml::node_type::table:
                return "table";
            case toml::node_type::array:
                return "array";
            case toml::node_type::string:
                return "string";
            case toml::node_type::integer:
                return "whole number";
            case toml::node_type::floating_point:
                return "decimal number";
            case toml::node_type::boolean:
                return "boolean";
            default:
                return "date or time";
        }
    }

private:
    std::string file_;
    std::vector<sim::scenario_finding> findings_;
};

void read_instance(reader& r, const toml::table& root, timer_config& cfg) {
    const auto* node = root.get("instance");
    if (node == nullptr) {
        r.fail(root.source(), "instance",
               "missing table; accepted: [instance] with counter_bits, channels and the optional "
               "prescaler_bits, wrap_skip_bits, prescaler_shadowed, complementary, dead_time_max, "
               "compare_latency");
        return;
    }
    const auto* t = node->as_table();
    if (t == nullptr) {
        r.fail(*node, "instance", "expected a table, got a " + reader::type_name(*node));
        return;
    }
    const std::string p = "instance";
    r.only_keys(*t, p,
                {"counter_bits", "channels", "prescaler_bits", "wrap_skip_bits",
                 "prescaler_shadowed", "complementary", "dead_time_max", "compare_latency"});
    if (auto v = r.number(*t, "counter_bits", p, 8, 32, true)) cfg.counter_bits = unsigned(*v);
    if (auto v = r.number(*t, "channels", p, 1, 6, true)) cfg.channels = unsigned(*v);
    if (auto v = r.number(*t, "prescaler_bits", p, 1, 32, false)) cfg.prescaler_bits = unsigned(*v);
    if (auto v = r.number(*t, "wrap_skip_bits", p, 0, 16, false)) cfg.wrap_skip_bits = unsigned(*v);
    if (auto v = r.flag(*t, "prescaler_shadowed", p)) cfg.prescaler_shadowed = *v;
    if (auto v = r.flag(*t, "complementary", p)) cfg.complementary = *v;
    if (auto v = r.number(*t, "dead_time_max", p, 0, 0xffff'ffffu, false))
        cfg.dead_time_max = unsigned(*v);
    if (auto v = r.number(*t, "compare_latency", p, 0, 2, false))
        cfg.compare_latency = unsigned(*v);
}

// Reads `bits`: a bit number (3) or a range "lo..hi".
bool read_bits(reader& r, const toml::node& n, const std::string& key, unsigned& lo,
               unsigned& width) {
    const std::string accepted = "a bit number such as 3, or a range \"lo..hi\" such as \"0..15\"";
    if (const auto* i = n.as_integer()) {
        if (i->get() < 0 || i->get() > 31) {
            r.fail(n, key, std::to_string(i->get()) + " is not a bit number; accepted: 0 to 31");
            return false;
        }
        lo = unsigned(i->get());
        width = 1;
        return true;
    }
    const auto* s = n.as_string();
    if (s == nullptr) {
        r.fail(n, key,
               "expected a bit number or a string, got a " + reader::type_name(n) +
                   "; accepted: " + accepted);
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
        r.fail(n, key, "\"" + t + "\" is not a bit range; accepted: " + accepted);
        return false;
    }
    if (b < a) {
        r.fail(n, key,
               "\"" + t + "\" runs downwards; accepted: the low bit first, \"" + std::to_string(b) +
                   ".." + std::to_string(a) + "\"");
        return false;
    }
    if (b > 31) {
        r.fail(n, key, "\"" + t + "\" goes past bit 31; accepted: bits within 0..31");
        return false;
    }
    lo = a;
    width = b - a + 1;
    return true;
}

void read_field(reader& r, const toml::node& n, const std::string& path, const timer_config& cfg,
                const register_map& reg, std::vector<field_map>& out,
                std::vector<toml::source_region>& where) {
    const auto* t = n.as_table();
    if (t == nullptr) {
        r.fail(n, path,
               "expected a table such as { field = \"period\", bits = \"0..15\", access = "
               "\"read-write\" }, got a " +
                   reader::type_name(n));
        return;
    }
    r.only_keys(*t, path, {"field", "channel", "bits", "value_bit", "access"});
    bool ok = true;
    field_map f;

    const auto name = r.text(*t, "field", path, true, "one of " + field_names());
    if (!name) {
        ok = false;
    } else if (auto tf = timer_field_from_string(*name)) {
        f.field = *tf;
    } else {
        r.fail(*t->get("field"), path + ".field",
               "unknown functional field \"" + *name + "\"; accepted: " + field_names());
        ok = false;
    }

    const auto* ch = t->get("channel");
    if (ok && is_channel_field(f.field)) {
        const auto max_ch = cfg.channels - 1;
        if (ch == nullptr) {
            r.fail(*t, path + ".channel",
                   std::string("missing: \"") + to_string(f.field) +
                       "\" is a per-channel field; accepted: a channel from 0 to " +
                       std::to_string(max_ch));
            ok = false;
        } else if (const auto* i = ch->as_integer(); i == nullptr || i->get() < 0) {
            r.fail(*ch, path + ".channel",
                   "expected a channel number; accepted: 0 to " + std::to_string(max_ch));
            ok = false;
        } else if (std::uint64_t(i->get()) > max_ch) {
            r.fail(*ch, path + ".channel",
                   "channel " + std::to_string(i->get()) + " is beyond the instance's " +
                       std::to_string(cfg.channels) + " channels; accepted: 0 to " +
                       std::to_string(max_ch));
            ok = false;
        } else {
            f.channel = unsigned(i->get());
        }
    } else if (ok && ch != nullptr) {
        r.fail(*ch, path + ".channel",
               std::string("\"") + to_string(f.field) +
                   "\" is not a per-channel field; accepted: no channel key");
        ok = false;
    }

    if (const auto* b = t->get("bits"); b == nullptr) {
        r.fail(*t, path + ".bits",
               "missing; accepted: a bit number such as 3, or a range \"lo..hi\"");
        ok = false;
    } else if (!read_bits(r, *b, path + ".bits", f.bit, f.width)) {
        ok = false;
    } else if (f.bit + f.width > reg.width) {
        r.fail(*b, path + ".bits",
               "field " + bit_range(f.bit, f.width) + " overflows the " +
                   std::to_string(reg.width) + "-bit register; accepted: bits within 0.." +
                   std::to_string(reg.width - 1));
        ok = false;
    }

    if (auto v = r.number(*t, "value_bit", path, 0, 31, false)) f.value_bit = unsigned(*v);

    if (const auto kind = r.text(*t, "access", path, true, "one of " + access_names()); !kind) {
        ok = false;
    } else if (auto k = access_kind_from_string(*kind)) {
        f.access = *k;
        const bool clears =
            *k == access_kind::write_one_to_clear || *k == access_kind::clear_on_read;
        if (name && ok && clears && f.field != timer_field::flags) {
            r.fail(*t->get("access"), path + ".access",
                   "\"" + *kind +
                       "\" clears flags and only suits the flags field; accepted for \"" + *name +
                       "\": read-write, read-only, write-only");
            ok = false;
        } else if (name && ok && f.field == timer_field::flags &&
                   (*k == access_kind::read_write || *k == access_kind::write_only)) {
            r.fail(*t->get("access"), path + ".access",
                   "flags are not written as data; accepted for \"flags\": read-only, "
                   "write-one-to-clear, "
                   "clear-on-read");
            ok = false;
        }
    } else {
        r.fail(*t->get("access"), path + ".access",
               "unknown access kind \"" + *kind + "\"; accepted: " + access_names());
        ok = false;
    }

    if (!ok) return;
    if (!instance_has(cfg, f.field, f.channel)) {
        std::string why = f.field == timer_field::wrap_skip
                              ? "the instance has no wrap skip count (wrap_skip_bits = 0)"
                              : "the instance has no complementary outputs (complementary = false)";
        r.fail(*t->get("field"), path + ".field",
               std::string("\"") + to_string(f.field) + "\" does not exist here: " + why +
                   "; accepted: fields the instance has");
        return;
    }
    const unsigned vw = value_width(cfg, f.field);
    if (f.value_bit + f.width > vw) {
        const auto* at = t->get("value_bit") ? t->get("value_bit") : t->get("bits");
        r.fail(*at, path + (t->get("value_bit") ? ".value_bit" : ".bits"),
               "the field holds value bits " + bit_range(f.value_bit, f.width) + " but \"" +
                   to_string(f.field) + "\" has " + std::to_string(vw) +
                   " bits in this instance; accepted: value bits within 0.." +
                   std::to_string(vw - 1));
        return;
    }
    for (std::size_t i = 0; i < out.size(); ++i) {
        const auto& o = out[i];
        if ((o.register_mask() & f.register_mask()) != 0) {
            r.fail(*t->get("bits"), path + ".bits",
                   "field " + bit_range(f.bit, f.width) + " overlaps field " + std::to_string(i) +
                       " (\"" + to_string(o.field) + "\", bits " + bit_range(o.bit, o.width) +
                       ") at line " + std::to_string(where[i].begin.line) +
                       "; accepted: bits no other field of \"" + reg.name + "\" uses");
            return;
        }
    }
    out.push_back(f);
    where.push_back(n.source());
}

void read_register(reader& r, const toml::key& key, const toml::node& n, const timer_config& cfg,
                   std::uint32_t window, register_layout& layout) {
    const std::string path = "registers." + std::string(key.str());
    const auto* t = n.as_table();
    if (t == nullptr) {
        r.fail(
            n, path,
            "expected a table with offset, width, reset and fields, got a " + reader::type_name(n));
        return;
    }
    r.only_keys(*t, path, {"offset", "width", "reset", "fields"});
    register_map reg;
    reg.name = std::string(key.str());
    bool ok = true;
    for (char c : reg.name) {
        if (!((c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_')) {
            r.fail(key.source(), path,
                   "register name \"" + reg.name +
                       "\" has a character other than a-z, 0-9 and _; accepted: names like "
                       "\"match_a\"");
            ok = false;
            break;
        }
    }
    const auto width = r.number(*t, "width", path, 8, 32, true, "8, 16 or 32");
    if (width && *width != 8 && *width != 16 && *width != 32) {
        r.fail(*t->get("width"), path + ".width",
               std::to_string(*width) + " bits; accepted: 8, 16 or 32");
        ok = false;
    } else if (!width) {
        ok = false;
    } else {
        reg.width = unsigned(*width);
    }
    const auto offset = r.number(*t, "offset", path, 0, 0xffff'ffffu, true,
                                 "a byte offset within the window, 0x0 to " + hex(window - 1));
    if (!offset) ok = false;
    if (offset && ok) {
        reg.offset = std::uint32_t(*offset);
        if (reg.offset % reg.bytes() != 0) {
            r.fail(*t->get("offset"), path + ".offset",
                   "offset " + hex(reg.offset) + " is not aligned to the " +
                       std::to_string(reg.width) + "-bit register; accepted: a multiple of " +
                       std::to_string(reg.bytes()));
            ok = false;
        } else if (std::uint64_t(reg.offset) + reg.bytes() > window) {
            r.fail(*t->get("offset"), path + ".offset",
                   "register " + hex(reg.offset) + ".." + hex(reg.offset + reg.bytes() - 1) +
                       " lies beyond the " + hex(window) +
                       "-byte window; accepted: offsets from 0 to " +
                       hex(window >= reg.bytes() ? window - reg.bytes() : 0));
            ok = false;
        }
    }
    const std::uint64_t max_value =
        ok ? (reg.width == 32 ? 0xffff'ffffull : (1ull << reg.width) - 1) : 0xffff'ffffull;
    if (auto v = r.number(*t, "reset", path, 0, max_value, false,
                          "a whole number from 0 to " + hex(max_value) + " (fits the register)"))
        reg.reset = std::uint32_t(*v);

    const auto* fields = t->get("fields");
    if (fields == nullptr) {
        r.fail(*t, path + ".fields",
               "missing; accepted: an array of fields (an empty array for a spare register)");
        return;
    }
    const auto* arr = fields->as_array();
    if (arr == nullptr) {
        r.fail(*fields, path + ".fields",
               "expected an array of field tables, got a " + reader::type_name(*fields));
        return;
    }
    if (!ok) return;
    std::vector<toml::source_region> where;
    for (std::size_t i = 0; i < arr->size(); ++i)
        read_field(r, (*arr)[i], path + ".fields[" + std::to_string(i) + "]", cfg, reg, reg.fields,
                   where);
    std::sort(reg.fields.begin(), reg.fields.end(),
              [](const auto& a, const auto& b) { return a.bit < b.bit; });
    if (reg.reset & reg.reserved_mask())
        r.fail(t->get("reset") ? t->get("reset")->source() : t->source(), path + ".reset",
               "reset value " + hex(reg.reset) + " sets reserved bits " +
                   hex(reg.reset & reg.reserved_mask()) +
                   "; accepted: a value with bits only where fields are (mask " +
                   hex(~reg.reserved_mask() & std::uint32_t(max_value)) + ")");

    // Registers may not share bytes.
    for (const auto& o : layout.registers) {
        if (reg.offset < o.offset + o.bytes() && o.offset < reg.offset + reg.bytes()) {
            r.fail(*t->get("offset"), path + ".offset",
                   "register " + hex(reg.offset) + ".." + hex(reg.offset + reg.bytes() - 1) +
                       " overlaps register \"" + o.name + "\" at " + hex(o.offset) + ".." +
                       hex(o.offset + o.bytes() - 1) +
                       "; accepted: an offset no other register covers");
            return;
        }
    }
    layout.registers.push_back(std::move(reg));
}

register_layout read_layout(const toml::table& root, const std::string& file) {
    reader r(file);
    register_layout layout;
    layout.file = file;
    r.only_keys(root, "", {"kind", "name", "size", "instance", "registers"});
    if (auto k = r.text(root, "kind", "", true, "\"timer\"")) {
        if (*k != "timer")
            r.fail(*root.get("kind"), "kind",
                   "unknown peripheral kind \"" + *k + "\"; accepted: \"timer\"");
        layout.kind = *k;
    }
    if (auto n = r.text(root, "name", "", false, "a name such as \"timer16_quad\"")) {
        layout.name = *n;
    } else {
        auto stem = file.substr(
            file.find_last_of('/') == std::string::npos ? 0 : file.find_last_of('/') + 1);
        layout.name = stem.substr(0, stem.rfind(".toml"));
    }
    const auto size =
        r.number(root, "size", "", 1, 0xffff'ffffu, true, "a byte count from 1 to 0xffffffff");
    read_instance(r, root, layout.instance);
    if (!r.failed()) {
        try {
            layout.instance.validate();
        } catch (const std::exception& e) {
            r.fail(*root.get("instance"), "instance", e.what());
        }
    }
    const auto* regs = root.get("registers");
    if (regs == nullptr) {
        r.fail(root.source(), "registers",
               "missing; accepted: a [registers.<name>] table per register");
    } else if (const auto* t = regs->as_table(); t == nullptr) {
        r.fail(*regs, "registers",
               "expected a table of registers, got a " + reader::type_name(*regs));
    } else if (size && !r.failed()) {
        layout.size = std::uint32_t(*size);
        // Visit registers in file order so overlap messages name the earlier one.
        std::vector<std::pair<const toml::key*, const toml::node*>> order;
        for (auto&& [k, v] : *t) order.emplace_back(&k, &v);
        std::stable_sort(order.begin(), order.end(), [](const auto& a, const auto& b) {
            return std::pair(a.first->source().begin.line, a.first->source().begin.column) <
                   std::pair(b.first->source().begin.line, b.first->source().begin.column);
        });
        for (const auto& [k, v] : order)
            read_register(r, *k, *v, layout.instance, layout.size, layout);
    }
    if (r.failed()) r.raise();
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
    toml::table root;
    try {
        root = toml::parse(toml_text, file);
    } catch (const toml::parse_error& e) {
        throw sim::scenario_error(
            sim::scenario_finding{file, e.source().begin.line, e.source().begin.column, "",
                                  "TOML syntax: " + std::string(e.description())});
    }
    return read_layout(root, file);
}

register_layout load_register_layout_file(const std::string& path) {
    std::ifstream in(path, std::ios::binary);
    if (!in)
        throw sim::scenario_error(
            sim::scenario_finding{path, 0, 0, "", "cannot open the layout file"});
    std::ostringstream s;
    s << in.rdbuf();
    return load_register_layout_text(s.str(), path);
}

}  // namespace models
