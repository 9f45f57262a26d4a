#include "models/layout/register_layout.h"

#include "sim/toml_reader.h"

#include <algorithm>
#include <array>
#include <map>
#include <sstream>
#include <tuple>
#include <utility>

namespace models {

namespace {

using sim::table_reader;

constexpr std::array<access_kind, 6> all_access_kinds = {
    access_kind::read_write,          access_kind::read_only,     access_kind::write_one_to_clear,
    access_kind::write_zero_to_clear, access_kind::clear_on_read, access_kind::write_only};

constexpr timer_field last_field = timer_field::input_filter;

std::uint32_t low_mask(unsigned width) { return width >= 32 ? 0xffff'ffffu : (1u << width) - 1; }

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
                      "compare_latency, input_sync_ticks, filter_lengths, "
                      "capture_read_clears_flag, chain_latency");
    if (t == nullptr) return;
    table_reader r(top.findings(), *t, "instance");
    r.reject_unknown_keys(
        {"counter_bits", "channels", "prescaler_bits", "wrap_skip_bits", "prescaler_shadowed",
         "complementary", "dead_time_max", "dead_time_scaled", "compare_latency",
         "input_sync_ticks", "filter_lengths", "capture_read_clears_flag", "chain_latency"},
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
    if (auto v = r.integer("input_sync_ticks", 1, 3)) cfg.input_sync_ticks = unsigned(*v);
    if (const toml::node* n = r.get("filter_lengths", false, "")) {
        const toml::array* a = n->as_array();
        if (a == nullptr || a->empty() || a->size() > 16) {
            r.wrong(*n, "filter_lengths",
                    "a list of 1 to 16 filter lengths in samples, such as [1, 2, 4, 8]");
        } else {
            std::vector<unsigned> lengths;
            for (std::size_t i = 0; i < a->size(); ++i) {
                const toml::node& e = *a->get(i);
                if (e.is_integer() && e.as_integer()->get() >= 1 && e.as_integer()->get() <= 255)
                    lengths.push_back(unsigned(e.as_integer()->get()));
                else
                    r.wrong(e, "filter_lengths[" + std::to_string(i) + "]",
                            "a whole number of samples from 1 to 255");
            }
            if (lengths.size() == a->size()) cfg.filter_lengths = lengths;
        }
    }
    if (auto v = r.boolean("capture_read_clears_flag")) cfg.capture_read_clears_flag = *v;
    if (auto v = r.integer("chain_latency", 0, 3)) cfg.chain_latency = unsigned(*v);
}

// One functional field of a kind other than the timer.
struct own_field {
    std::string name;
    unsigned width = 1;  // bits of its value in this instance
    bool flags = false;  // the kind's flags field (the one the flag access kinds suit)
};

// The vocabulary of a kind other than "timer", indexed by field number (empty for "timer").
std::vector<own_field> own_fields(const register_layout& l) {
    std::vector<own_field> out;
    if (l.kind == "tick_timer") {
        for (std::uint32_t i = 0; i < tick_field_count; ++i) {
            const auto f = static_cast<tick_field>(i);
            const bool counter = f == tick_field::reload || f == tick_field::current;
            out.push_back(
                {to_string(f), counter ? l.tick.counter_bits : 1u, f == tick_field::flags});
        }
    }
    if (l.kind == "watchdog") {
        for (std::uint32_t i = 0; i < watchdog_field_count; ++i) {
            const auto f = static_cast<watchdog_field>(i);
            unsigned width = l.watchdog.counter_bits;
            if (f == watchdog_field::key) width = 16;
            if (f == watchdog_field::start) width = 1;
            if (f == watchdog_field::prescaler) width = 3;
            out.push_back({to_string(f), width, false});
        }
    }
    if (l.kind == "slow_counter") {
        for (std::uint32_t i = 0; i < slow_field_count; ++i) {
            const auto f = static_cast<slow_field>(i);
            unsigned width = 1;
            if (f == slow_field::count || f == slow_field::alarm) width = l.slow.counter_bits;
            if (f == slow_field::prescale) width = 4;
            out.push_back({to_string(f), width, f == slow_field::flags});
        }
    }
    if (l.kind == "clock_control") {
        for (std::uint32_t i = 0; i < clock_field_count; ++i) {
            const auto f = static_cast<clock_field>(i);
            out.push_back({to_string(f), value_width(f), f == clock_field::refused});
        }
    }
    return out;
}

// The index in own_fields() of a field number: a clock-control field's number carries its node's
// slot as well.
std::uint32_t own_index(const register_layout& l, std::uint32_t kind_field) {
    return l.kind == "clock_control" ? static_cast<std::uint32_t>(clock_field_of(kind_field))
                                     : kind_field;
}

void read_watchdog_instance(table_reader& top, watchdog_config& cfg) {
    const toml::table* t = top.sub_table("instance", true, "counter_bits of the watchdog instance");
    if (t == nullptr) return;
    table_reader r(top.findings(), *t, "instance");
    r.reject_unknown_keys({"counter_bits"}, "the watchdog instance");
    if (auto v = r.integer("counter_bits", 4, 16, true)) cfg.counter_bits = unsigned(*v);
}

void read_slow_instance(table_reader& top, slow_config& cfg) {
    const toml::table* t = top.sub_table(
        "instance", true,
        "counter_bits, write_latency and read_window_ns of the slow-clock counter instance");
    if (t == nullptr) return;
    table_reader r(top.findings(), *t, "instance");
    r.reject_unknown_keys({"counter_bits", "write_latency", "read_window_ns"},
                          "the slow-clock counter instance");
    if (auto v = r.integer("counter_bits", 1, 32, true)) cfg.counter_bits = unsigned(*v);
    if (auto v = r.integer("write_latency", 1, 16, true)) cfg.write_latency = unsigned(*v);
    if (auto v = r.integer("read_window_ns", 0, 1'000'000, true))
        cfg.read_window = sim::time_ps(*v) * 1000;
}

void read_tick_instance(table_reader& top, tick_config& cfg) {
    const toml::table* t =
        top.sub_table("instance", true, "counter_bits and divider of the tick timer instance");
    if (t == nullptr) return;
    table_reader r(top.findings(), *t, "instance");
    r.reject_unknown_keys({"counter_bits", "divider"}, "the tick timer instance");
    if (auto v = r.integer("counter_bits", 1, 32, true)) cfg.counter_bits = unsigned(*v);
    if (auto v = r.integer("divider", 2, 65536, true)) cfg.divider = unsigned(*v);
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

// What a value-table entry may not set, and why; empty when it may set f.
std::string unsettable(timer_field f) {
    if (f == timer_field::flags)
        return "flags are cleared through their clear rule, never set by a code";
    if (f == timer_field::direction) return "the counting direction is the model's, read-only";
    return "";
}

// Why the instance lacks field f (instance_has(cfg, f, 0) is false).
std::string lacks_why(const timer_config& cfg, timer_field f) {
    if (f == timer_field::wrap_skip)
        return "the instance has no wrap skip count (wrap_skip_bits = 0)";
    if (f == timer_field::dead_time_scale && cfg.complementary)
        return "the instance's dead time has no scale (dead_time_scaled = false)";
    return "the instance has no complementary outputs (complementary = false)";
}

// The names and model values an enumerated field's values go by in value tables.
std::vector<std::pair<std::string, std::uint32_t>> named_values(const timer_config& cfg,
                                                                timer_field f) {
    std::vector<std::pair<std::string, std::uint32_t>> v;
    auto add = [&v](const char* name, auto value) {
        v.emplace_back(name, static_cast<std::uint32_t>(value));
    };
    switch (f) {
        case timer_field::mode:
            add("up", count_mode::up);
            add("down", count_mode::down);
            add("center", count_mode::center);
            break;
        case timer_field::slope:
            add("up", match_slope::up);
            add("down", match_slope::down);
            add("both", match_slope::both);
            break;
        case timer_field::reload_policy:
            add("every", reload_policy::every);
            add("quiet_forced", reload_policy::quiet_forced);
            add("held", reload_policy::held);
            break;
        case timer_field::action:
            add("hold", output_action::hold);
            add("pwm_below", output_action::pwm_below);
            add("pwm_at_or_above", output_action::pwm_at_or_above);
            add("toggle_on_match", output_action::toggle_on_match);
            add("set_on_match", output_action::set_on_match);
            add("clear_on_match", output_action::clear_on_match);
            add("force_low", output_action::force_low);
            add("force_high", output_action::force_high);
            break;
        case timer_field::trigger_select:
            v.emplace_back("none", trigger_none);
            for (unsigned c = 0; c < cfg.channels; ++c)
                v.emplace_back("match_" + std::to_string(c), trigger_on_match(c));
            v.emplace_back("reload", trigger_on_reload);
            break;
        default:
            break;
    }
    return v;
}

// Orders the entries of a TOML table (key, value) as the file wrote them.
bool in_file_order(const std::pair<const toml::key*, const toml::node*>& a,
                   const std::pair<const toml::key*, const toml::node*>& b) {
    const auto& x = a.first->source().begin;
    const auto& y = b.first->source().begin;
    return std::tie(x.line, x.column) < std::tie(y.line, y.column);
}

// Where the loader found a value table and its raw values, for messages that point at them.
struct table_source {
    toml::source_region where;
    std::vector<std::pair<std::uint32_t, toml::source_region>> raws;  // value, place
    std::vector<std::string> raw_paths;                               // key path of each
    bool used = false;
};

// What reading registers needs besides the register itself.
struct layout_context {
    const timer_config& cfg;
    register_layout& layout;
    std::vector<table_source>& sources;
    bool unknown_table = false;  // a field named a value table that does not exist
};

// Reads the value of functional field f for a value table entry (node `n` under `key`).
std::optional<std::uint32_t> read_code_value(table_reader& r, const std::string& key,
                                             const toml::node& n, const timer_config& cfg,
                                             timer_field f) {
    const auto named = named_values(cfg, f);
    if (!named.empty()) {
        std::vector<std::string> names;
        for (const auto& [name, value] : named) names.push_back(name);
        const auto chosen = r.choice(key, names);
        if (!chosen) return std::nullopt;
        for (const auto& [name, value] : named)
            if (name == *chosen) return value;
        return std::nullopt;
    }
    const unsigned vw = value_width(cfg, f);
    if (vw == 1) {
        if (const auto* b = n.as_boolean()) return b->get() ? 1u : 0u;
        if (const auto* i = n.as_integer(); i != nullptr && (i->get() == 0 || i->get() == 1))
            return std::uint32_t(i->get());
        r.wrong(n, key, "true, false, 1 or 0");
        return std::nullopt;
    }
    const std::int64_t max = f == timer_field::dead_time ? std::int64_t(cfg.dead_time_max)
                             : vw >= 32                  ? 0xffff'ffffLL
                                                         : (1LL << vw) - 1;
    if (auto v = r.integer(key, 0, max)) return std::uint32_t(*v);
    return std::nullopt;
}

// Reads entry `index` of value table `t` (its array `arr`); `src` keeps where raw values were.
void read_code_entry(sim::findings_list& findings, const std::string& table_path,
                     const toml::array& arr, std::size_t index, const timer_config& cfg,
                     code_table& t, table_source& src) {
    const std::string path = table_path + "[" + std::to_string(index) + "]";
    const toml::node& n = *arr.get(index);
    const auto* et = n.as_table();
    if (et == nullptr) {
        findings.add(n.source(), path,
                     "expected a table such as { raw = 2, mode = \"center\", slope = \"down\" }, "
                     "got " +
                         std::string(n.is_array() ? "an array" : "a value"));
        return;
    }
    table_reader r(findings, *et, path);
    // Accepted: the fields a code may set here; a field it may not set, or the instance lacks, gets
    // its own message below rather than "unknown key".
    std::vector<std::string> keys = {"raw"};
    for (const auto& name : field_names()) {
        const auto f = *timer_field_from_string(name);
        if ((unsettable(f).empty() && instance_has(cfg, f, 0)) || et->get(name) != nullptr)
            keys.push_back(name);
    }
    r.reject_unknown_keys(keys, "a value table entry");

    code_entry e;
    const std::string raw_words = "a raw value such as 3, or a list of raw values such as [2, 3]";
    if (const auto* raw = r.get("raw", true, raw_words)) {
        std::vector<const toml::node*> items;
        if (const auto* list = raw->as_array()) {
            for (const auto& item : *list) items.push_back(&item);
            if (items.empty()) r.wrong(*raw, "raw", raw_words);
        } else {
            items.push_back(raw);
        }
        for (const toml::node* item : items) {
            const auto* i = item->as_integer();
            if (i == nullptr || i->get() < 0 || i->get() > 0xffff'ffffLL) {
                r.wrong(*item, "raw", "a whole number from 0 to 0xffffffff");
                continue;
            }
            const auto value = std::uint32_t(i->get());
            bool twice = false;
            for (std::size_t k = 0; k < src.raws.size() && !twice; ++k) {
                if (src.raws[k].first != value) continue;
                r.report(*item, "raw",
                         "raw value " + std::to_string(value) + " is listed twice: also at " +
                             src.raw_paths[k] + " (line " +
                             std::to_string(src.raws[k].second.begin.line) +
                             "); accepted: each raw value once in a value table");
                twice = true;
            }
            if (twice) continue;
            e.raws.push_back(value);
            src.raws.emplace_back(value, item->source());
            src.raw_paths.push_back(path + ".raw");
        }
    }

    // The fields it sets, in file order (a TOML table keeps its keys sorted by name).
    std::vector<std::pair<const toml::key*, const toml::node*>> sets;
    for (auto&& [k, v] : *et)
        if (k.str() != "raw") sets.emplace_back(&k, &v);
    std::sort(sets.begin(), sets.end(), in_file_order);
    for (const auto& [k, v] : sets) {
        const std::string key(k->str());
        const auto f = timer_field_from_string(key);
        if (!f) continue;  // reported as an unknown key
        if (const std::string why = unsettable(*f); !why.empty()) {
            r.report(key, "\"" + key + "\" cannot be set by a value table: " + why +
                              "; accepted: the instance's other functional fields");
            continue;
        }
        if (!instance_has(cfg, *f, 0)) {
            r.report(key, "\"" + key + "\" does not exist here: " + lacks_why(cfg, *f) +
                              "; accepted: fields the instance has");
            continue;
        }
        if (const auto value = read_code_value(r, key, *v, cfg, *f)) e.sets.push_back({*f, *value});
    }
    if (!e.raws.empty()) t.entries.push_back(std::move(e));
}

// Reads the optional [codes] table: NAME = [ { raw = ..., FIELD = VALUE, ... }, ... ].
void read_codes(table_reader& top, const timer_config& cfg, register_layout& layout,
                std::vector<table_source>& sources) {
    const toml::table* codes = top.sub_table(
        "codes", false,
        "value tables, NAME = [ { raw = 0, mode = \"up\" }, { raw = 1, mode = \"down\" } ]");
    if (codes == nullptr) return;
    table_reader r(top.findings(), *codes, "codes");
    const std::string accepted =
        "an array of entries such as [ { raw = 0, mode = \"up\" }, { raw = 1, mode = \"down\" } ]";
    // In file order (a TOML table keeps its keys sorted by name), so tables list as written.
    std::vector<std::pair<const toml::key*, const toml::node*>> tables;
    for (auto&& [k, v] : *codes) tables.emplace_back(&k, &v);
    std::sort(tables.begin(), tables.end(), in_file_order);
    for (const auto& [key, node] : tables) {
        const toml::key& k = *key;
        const toml::node& v = *node;
        const std::string name(k.str());
        if (!is_register_name(name)) {
            top.findings().add(k.source(), r.key_path(name),
                               "value table name \"" + name +
                                   "\"; accepted: lower-case letters, digits and \"_\", such as "
                                   "\"count_modes\"");
            continue;
        }
        const auto* arr = v.as_array();
        if (arr == nullptr || arr->empty()) {
            r.wrong(v, name, accepted);
            continue;
        }
        code_table t;
        t.name = name;
        table_source src;
        src.where = k.source();
        for (std::size_t i = 0; i < arr->size(); ++i)
            read_code_entry(top.findings(), r.key_path(name), *arr, i, cfg, t, src);
        layout.codes.push_back(std::move(t));
        sources.push_back(std::move(src));
    }
}

// Reads `bits` of a field: one bit or range, or (coded fields) an array of them; `spans` gets them.
bool read_spans(table_reader& r, const toml::node& n, bool coded, std::vector<bit_span>& spans) {
    if (const auto* list = n.as_array()) {
        if (!coded) {
            r.report(n, "bits",
                     "a list of bit ranges is for coded fields (codes = \"TABLE\"); accepted for a "
                     "plain field: one bit or one range such as \"0..15\" (split a value over "
                     "fields with value_bit)");
            return false;
        }
        if (list->empty()) {
            r.wrong(n, "bits", "a list of bits and ranges such as [4, \"1..2\"], low bits first");
            return false;
        }
        bool ok = true;
        for (const auto& item : *list) {
            bit_span s;
            if (read_bits(r, item, s.bit, s.width))
                spans.push_back(s);
            else
                ok = false;
        }
        return ok;
    }
    bit_span s;
    if (!read_bits(r, n, s.bit, s.width)) return false;
    spans.push_back(s);
    return true;
}

// What field f is, for messages: the functional field, or the value table of a coded field.
std::string field_label(const field_map& f, const register_layout& layout) {
    if (const code_table* t = layout.codes_of(f)) return "value table \"" + t->name + "\"";
    return "\"" + layout.field_name(f) + "\"";
}

// Reads the `channel` key of a field that needs one (`needs`), or refuses one it does not need;
// `why` says why ("\"compare\" is a per-channel field").
bool read_channel(table_reader& r, const toml::table& t, bool needs, const std::string& why,
                  const timer_config& cfg, unsigned& channel) {
    const auto* ch = t.get("channel");
    if (!needs) {
        if (ch == nullptr) return true;
        r.report("channel", why + "; accepted: no channel key");
        return false;
    }
    const auto max_ch = cfg.channels - 1;
    const std::string accepted = "a channel from 0 to " + std::to_string(max_ch);
    if (ch == nullptr) {
        r.report("channel", "missing key \"channel\": " + why + "; accepted: " + accepted);
        return false;
    }
    if (const auto* i = ch->as_integer(); i == nullptr || i->get() < 0) {
        r.wrong(*ch, "channel", accepted);
        return false;
    } else if (std::uint64_t(i->get()) > max_ch) {
        r.report("channel", "channel " + std::to_string(i->get()) + " is beyond the instance's " +
                                std::to_string(cfg.channels) + " channels; accepted: 0 to " +
                                std::to_string(max_ch));
        return false;
    } else {
        channel = unsigned(i->get());
    }
    return true;
}

// Reads `access` for field f (`name` its field or table name); false on a mistake.
bool read_access(table_reader& r, field_map& f, const std::optional<std::string>& name,
                 const register_layout& layout) {
    const auto kind = r.choice("access", access_names(), true);
    if (!kind) return false;
    const auto k = *access_kind_from_string(*kind);
    f.access = k;
    if (!name) return true;
    if (f.coded() && clears_flags(k)) {
        r.report("access", "\"" + *kind +
                               "\" clears flags and a coded field holds no flags; accepted for "
                               "a coded field: read-write, read-only, write-only");
        return false;
    }
    if (!f.coded() && clears_flags(k) && !layout.maps_flags(f)) {
        r.report("access", "\"" + *kind +
                               "\" clears flags and only suits the flags field; accepted for "
                               "\"" +
                               *name + "\": read-write, read-only, write-only");
        return false;
    }
    if (!f.coded() && layout.maps_flags(f) &&
        (k == access_kind::read_write || k == access_kind::write_only)) {
        r.report("access",
                 "flags are not written as data; accepted for \"flags\": read-only, "
                 "write-one-to-clear, write-zero-to-clear, clear-on-read");
        return false;
    }
    return true;
}

// Checks a coded field against its value table: every raw value it lists must fit the field's
// bits (reported at the raw value, which is where the table and the bits disagree).
void check_raw_values(table_reader& r, const field_map& f, const std::string& field_path,
                      const table_source& src) {
    const std::uint32_t max = f.width >= 32 ? 0xffff'ffffu : (1u << f.width) - 1;
    for (std::size_t k = 0; k < src.raws.size(); ++k) {
        if (src.raws[k].first <= max) continue;
        r.findings().add(src.raws[k].second, src.raw_paths[k],
                         "raw value " + std::to_string(src.raws[k].first) + " does not fit the " +
                             std::to_string(f.width) + " bits of " + field_path + " (bits " +
                             field_bits(f) + "); accepted: raw values 0 to " + std::to_string(max));
    }
}

// Reads the `clock` and `start-up` keys of a clock-control field whose functional field is already
// in f.kind_field (as a bare clock_field), and numbers the field with its node's slot.
bool read_clock_node(table_reader& r, const toml::table& t, layout_context& ctx,
                     const register_map& reg, field_map& f) {
    const clock_field cf = clock_field_of(f.kind_field);
    const auto kinds = node_kinds_of(cf);
    if (kinds.empty()) {
        if (t.get("clock") != nullptr) {
            r.report("clock",
                     std::string("\"") + to_string(cf) +
                         "\" belongs to the block, not to a clock; accepted: no clock key");
            return false;
        }
    }
    if (t.get("start-up") != nullptr && cf != clock_field::open) {
        r.report("start-up", std::string("only an \"open\" field starts a clock; accepted: no "
                                         "start-up key on a \"") +
                                 to_string(cf) + "\" field");
        return false;
    }
    if (kinds.empty()) return true;
    const toml::node* n = r.get("clock", true, "the name of a node of the scenario's clock tree");
    if (n == nullptr) return false;
    if (!n->is_string() || n->as_string()->get().empty()) {
        r.wrong(*n, "clock", "the name of a node of the scenario's clock tree");
        return false;
    }
    const std::string node = n->as_string()->get();
    std::optional<sim::time_ps> start_up;
    if (t.get("start-up") != nullptr) {
        start_up = r.time("start-up");
        if (!start_up) return false;
        // An oscillator starts in micro- to milliseconds; a second is surely a typo.
        if (*start_up > sim::ps_per_second) {
            r.report("start-up", "start-up " + sim::format_time(*start_up) +
                                     " is out of range; accepted: a time from 0 ps to 1 s");
            return false;
        }
    }
    auto& slots = ctx.layout.clock_slots;
    std::uint32_t slot = 0;
    for (std::size_t i = 0; i < slots.size(); ++i)
        if (slots[i].node == node) slot = std::uint32_t(i + 1);
    if (slot == 0) {
        slots.push_back({node, 0});
        slot = std::uint32_t(slots.size());
    }
    if (start_up) slots[slot - 1].start_up = *start_up;
    f.kind_field = clock_field_number(cf, slot);
    clock_use use;
    use.field = cf;
    use.slot = slot;
    use.register_name = reg.name;
    use.where.file = ctx.layout.file;
    use.where.line = n->source().begin.line;
    use.where.column = n->source().begin.column;
    use.where.key = r.key_path("clock");
    ctx.layout.clock_uses.push_back(use);
    return true;
}

// Reads entry `index` of the register's `fields` array (`fields` reads the register's table).
void read_field(table_reader& fields, std::size_t index, layout_context& ctx,
                const register_map& reg, std::vector<field_map>& out,
                std::vector<toml::source_region>& where) {
    const timer_config& cfg = ctx.cfg;
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
    const bool clock_kind = ctx.layout.kind == "clock_control";
    if (clock_kind)
        r.reject_unknown_keys(
            {"field", "clock", "start-up", "bits", "value_bit", "access", "invert"},
            "a clock-control register field");
    else
        r.reject_unknown_keys(
            {"field", "codes", "channel", "bits", "value_bit", "access", "invert"},
            "a register field");
    bool ok = true;
    field_map f;

    // A plain field names its functional field; a coded field names its value table instead.
    std::optional<std::string> name;
    const code_table* table = nullptr;
    const bool timer_kind = ctx.layout.kind == "timer";
    if (!timer_kind) {
        // Other kinds have no channels and no value tables: every field is plain.
        const auto own = own_fields(ctx.layout);
        std::vector<std::string> names;
        for (const auto& o : own) names.push_back(o.name);
        if (t->get("codes") != nullptr) {
            r.report(
                "codes", "value tables are for \"timer\" layouts; accepted in a \"" +
                             ctx.layout.kind + "\" layout: field = one of " + [&] {
                                 std::string l;
                                 for (const auto& x : names) l += (l.empty() ? "" : ", ") + x;
                                 return l;
                             }());
            ok = false;
        } else if (const auto chosen = r.choice("field", names, true)) {
            for (std::size_t i = 0; i < names.size(); ++i)
                if (names[i] == *chosen) f.kind_field = std::uint32_t(i);
            name = chosen;
        } else {
            ok = false;
        }
    } else if (t->get("codes") != nullptr) {
        std::vector<std::string> tables;
        for (const auto& c : ctx.layout.codes) tables.push_back(c.name);
        if (t->get("field") != nullptr) {
            r.report("codes",
                     "a field has either \"field\" (plain) or \"codes\" (coded), not both; "
                     "accepted: the functional fields a coded field sets are in its value table");
            ok = false;
        } else if (tables.empty()) {
            r.report("codes",
                     "the layout has no value tables; accepted: a table defined under "
                     "[codes], e.g. counting = [ { raw = 0, mode = \"up\" } ]");
            ok = false;
        } else if (const auto chosen = r.choice("codes", tables)) {
            for (std::size_t i = 0; i < tables.size(); ++i)
                if (tables[i] == *chosen) f.codes = i;
            table = &ctx.layout.codes[*f.codes];
            ctx.sources[*f.codes].used = true;
            name = *chosen;
        } else {
            ctx.unknown_table = true;
            ok = false;
        }
    } else if (const auto chosen = r.choice("field", field_names(), true)) {
        f.field = *timer_field_from_string(*chosen);
        name = chosen;
    } else {
        ok = false;
    }

    if (ok && clock_kind) ok = read_clock_node(r, *t, ctx, reg, f);
    if (ok && !timer_kind) {
        ok = read_channel(r, *t, false,
                          "a \"" + ctx.layout.kind + "\" layout has no per-channel fields", cfg,
                          f.channel);
    } else if (ok) {
        const bool per_channel = table ? table->sets_channel_field() : is_channel_field(f.field);
        const std::string is = table
                                   ? "value table \"" + table->name + "\" sets a per-channel field"
                                   : "\"" + *name + "\" is a per-channel field";
        const std::string is_not =
            table ? "value table \"" + table->name + "\" sets no per-channel field"
                  : "\"" + *name + "\" is not a per-channel field";
        ok = read_channel(r, *t, per_channel, per_channel ? is : is_not, cfg, f.channel);
    }

    if (const auto* b = r.get("bits", true, "a bit number such as 3, or a range \"lo..hi\"");
        b == nullptr || !read_spans(r, *b, f.coded(), f.spans)) {
        ok = false;
    } else {
        f.bit = f.spans.front().bit;
        f.width = 0;
        for (std::size_t i = 0; i < f.spans.size(); ++i) {
            const auto& s = f.spans[i];
            f.bit = std::min(f.bit, s.bit);
            f.width += s.width;
            if (s.bit + s.width > reg.width) {
                r.report("bits", "field " + bit_range(s.bit, s.width) + " overflows the " +
                                     std::to_string(reg.width) +
                                     "-bit register; accepted: bits within 0.." +
                                     std::to_string(reg.width - 1));
                ok = false;
            }
            for (std::size_t j = 0; j < i; ++j) {
                const auto& o = f.spans[j];
                if (s.bit < o.bit + o.width && o.bit < s.bit + s.width) {
                    r.report("bits", "range " + bit_range(s.bit, s.width) + " overlaps range " +
                                         bit_range(o.bit, o.width) +
                                         " of the same field; accepted: ranges that share no bit");
                    ok = false;
                }
            }
        }
        if (!f.coded()) f.spans.clear();
    }

    if (f.coded() && t->get("value_bit") != nullptr) {
        r.report("value_bit",
                 "a coded field's raw value is looked up whole in its value table; accepted: no "
                 "value_bit key on a coded field");
        ok = false;
    } else if (auto v = r.integer("value_bit", 0, 31)) {
        f.value_bit = unsigned(*v);
    }

    if (auto inv = r.boolean("invert")) {
        f.invert = *inv;
        if (f.invert && f.coded()) {
            r.report("invert",
                     "a coded field's value table says what each raw value means; accepted: no "
                     "invert key on a coded field (list the inverted raw values instead)");
            ok = false;
        } else if (f.invert && name && ctx.layout.maps_flags(f)) {
            r.report("invert",
                     "flags keep the model's polarity (1: set); accepted: invert = false, and "
                     "access = \"write-zero-to-clear\" for flags cleared by writing 0");
            ok = false;
        }
    }

    if (!read_access(r, f, name, ctx.layout)) ok = false;

    if (!ok) return;
    if (!timer_kind) {
        const own_field o = own_fields(
            ctx.layout)[own_index(ctx.layout, f.kind_field)];  // a copy: the list is a temporary
        if (f.value_bit + f.width > o.width) {
            r.report(t->get("value_bit") ? "value_bit" : "bits",
                     "the field holds value bits " + bit_range(f.value_bit, f.width) + " but \"" +
                         o.name + "\" has " + std::to_string(o.width) +
                         " bits in this instance; accepted: value bits within 0.." +
                         std::to_string(o.width - 1));
            return;
        }
    } else if (f.coded()) {
        check_raw_values(r, f, r.path(), ctx.sources[*f.codes]);
    } else {
        if (!instance_has(cfg, f.field, f.channel)) {
            r.report("field", std::string("\"") + to_string(f.field) + "\" does not exist here: " +
                                  lacks_why(cfg, f.field) + "; accepted: fields the instance has");
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
    }
    for (std::size_t i = 0; i < out.size(); ++i) {
        const auto& o = out[i];
        if ((o.register_mask() & f.register_mask()) != 0) {
            r.report("bits", "field " + field_bits(f) + " overlaps field " + std::to_string(i) +
                                 " (" + field_label(o, ctx.layout) + ", bits " + field_bits(o) +
                                 ") at line " + std::to_string(where[i].begin.line) +
                                 "; accepted: bits no other field of \"" + reg.name + "\" uses");
            return;
        }
    }
    if (clock_kind && clock_slot_of(f.kind_field) != 0)
        ctx.layout.clock_uses.back().width = f.width;
    out.push_back(f);
    where.push_back(n.source());
}

void read_register(sim::findings_list& out, const sim::named_table& entry, layout_context& ctx,
                   std::uint32_t window) {
    register_layout& layout = ctx.layout;
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
    if (layout.kind == "clock_control" && reg.reset != 0) {
        r.report("reset",
                 "a clock-control register reads the clock tree, whose reset state is "
                 "the scenario's [clocks]; accepted: no reset key (or reset = 0)");
        ok = false;
    }

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
    for (std::size_t i = 0; i < arr->size(); ++i) read_field(r, i, ctx, reg, reg.fields, where);
    std::sort(reg.fields.begin(), reg.fields.end(),
              [](const auto& a, const auto& b) { return a.bit < b.bit; });
    if (reg.reset & reg.reserved_mask())
        r.report("reset", "reset value " + hex(reg.reset) + " sets reserved bits " +
                              hex(reg.reset & reg.reserved_mask()) +
                              "; accepted: a value with bits only where fields are (mask " +
                              hex(~reg.reserved_mask() & std::uint32_t(max_value)) + ")");
    for (const auto& f : reg.fields) {
        const code_table* t = layout.codes_of(f);
        if (t == nullptr || t->find(f.raw_of(reg.reset)) != nullptr) continue;
        r.report("reset", "reset value " + hex(reg.reset) + " gives the coded field at bits " +
                              field_bits(f) + " the raw value " +
                              std::to_string(f.raw_of(reg.reset)) + ", which value table \"" +
                              t->name +
                              "\" does not list; accepted: a reset value whose raw value there is "
                              "one of " +
                              raw_value_list(t->accepted()));
    }

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
    top.reject_unknown_keys({"kind", "name", "size", "instance", "codes", "registers"},
                            "a register layout");
    const auto kind = top.choice("kind", peripheral_kinds(), true);
    if (kind) layout.kind = *kind;
    if (auto n = top.string("name", false, "a name such as \"timer16_quad\"")) {
        layout.name = *n;
    } else {
        auto stem = file.substr(
            file.find_last_of('/') == std::string::npos ? 0 : file.find_last_of('/') + 1);
        layout.name = stem.substr(0, stem.rfind(".toml"));
    }
    const auto size =
        top.integer("size", 1, 0xffff'ffffLL, true, "a byte count from 1 to 0xffffffff");
    if (layout.kind == "watchdog") {
        read_watchdog_instance(top, layout.watchdog);
    } else if (layout.kind == "slow_counter") {
        read_slow_instance(top, layout.slow);
    } else if (layout.kind == "tick_timer") {
        read_tick_instance(top, layout.tick);
        if (out.empty()) {
            try {
                layout.tick.validate();
            } catch (const std::exception& e) {
                top.report("instance", e.what());
            }
        }
    } else if (layout.kind == "clock_control") {
        // The block's instance is the scenario's clock tree; its fields name the nodes.
        if (root.get("instance") != nullptr)
            top.report("instance",
                       "a clock-control layout has no [instance]: its fields name the clock nodes "
                       "they act on; accepted: no [instance] table");
    } else if (kind) {
        read_instance(top, layout.instance);
        if (out.empty()) {
            try {
                layout.instance.validate();
            } catch (const std::exception& e) {
                top.report("instance", e.what());
            }
        }
    }
    // Value tables and registers are read only on a sound header: their checks need the instance
    // (and the window).
    const bool sound = size && out.empty();
    std::vector<table_source> sources;
    if (sound && layout.kind == "timer") {
        read_codes(top, layout.instance, layout, sources);
    } else if (sound && root.get("codes") != nullptr) {
        top.report("codes", "value tables are for \"timer\" layouts; accepted in a \"" +
                                layout.kind + "\" layout: plain fields only (no [codes])");
    }
    if (const auto* t = top.sub_table("registers", true, "a table [registers.NAME] per register")) {
        // In file order, so overlap messages name the earlier register.
        const auto entries = table_reader(out, *t, "registers")
                                 .named_tables("register", is_register_name,
                                               "lower-case letters, digits and \"_\", such as "
                                               "\"match_a\"");
        if (sound) {
            layout.size = std::uint32_t(*size);
            layout_context ctx{layout.instance, layout, sources};
            for (const auto& e : entries)
                if (e.table) read_register(out, e, ctx, layout.size);
            // A misspelt table name leaves its table unused: one message is enough.
            for (std::size_t i = 0; i < sources.size() && !ctx.unknown_table; ++i)
                if (!sources[i].used)
                    out.add(sources[i].where, "codes." + layout.codes[i].name,
                            "value table \"" + layout.codes[i].name +
                                "\" is used by no field; accepted: a table some field names with "
                                "codes = \"" +
                                layout.codes[i].name + "\" (or remove it)");
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
        case access_kind::write_zero_to_clear:
            return "write-zero-to-clear";
    }
    return "?";
}

bool clears_flags(access_kind k) {
    return k == access_kind::write_one_to_clear || k == access_kind::write_zero_to_clear ||
           k == access_kind::clear_on_read;
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
    if (spans.empty()) return low_mask(width) << bit;
    std::uint32_t m = 0;
    for (const auto& s : spans) m |= low_mask(s.width) << s.bit;
    return m;
}

std::uint32_t field_map::raw_of(std::uint32_t reg) const {
    if (spans.empty()) return (reg >> bit) & low_mask(width);
    std::uint32_t raw = 0;
    unsigned at = 0;
    for (const auto& s : spans) {
        raw |= ((reg >> s.bit) & low_mask(s.width)) << at;
        at += s.width;
    }
    return raw;
}

std::uint32_t field_map::place(std::uint32_t raw) const {
    if (spans.empty()) return (raw & low_mask(width)) << bit;
    std::uint32_t reg = 0;
    unsigned at = 0;
    for (const auto& s : spans) {
        reg |= ((raw >> at) & low_mask(s.width)) << s.bit;
        at += s.width;
    }
    return reg;
}

const code_entry* code_table::find(std::uint32_t raw) const {
    for (const auto& e : entries)
        if (std::find(e.raws.begin(), e.raws.end(), raw) != e.raws.end()) return &e;
    return nullptr;
}

std::vector<std::uint32_t> code_table::accepted() const {
    std::vector<std::uint32_t> all;
    for (const auto& e : entries) all.insert(all.end(), e.raws.begin(), e.raws.end());
    std::sort(all.begin(), all.end());
    return all;
}

bool code_table::sets_channel_field() const {
    for (const auto& e : entries)
        for (const auto& a : e.sets)
            if (is_channel_field(a.field)) return true;
    return false;
}

std::string raw_value_list(const std::vector<std::uint32_t>& raws) {
    std::string out;
    for (std::size_t i = 0; i < raws.size();) {
        std::size_t j = i;
        while (j + 1 < raws.size() && raws[j + 1] == raws[j] + 1) ++j;
        if (!out.empty()) out += ", ";
        if (j - i >= 2) {
            out += std::to_string(raws[i]) + ".." + std::to_string(raws[j]);
            i = j + 1;
        } else {
            out += std::to_string(raws[i]);
            ++i;
        }
    }
    return out;
}

std::string value_name(timer_field f, std::uint32_t value) {
    timer_config all;
    all.channels = 6;
    for (const auto& [name, v] : named_values(all, f))
        if (v == value) return name;
    return std::to_string(value);
}

std::vector<std::string> value_names(const timer_config& instance, timer_field f) {
    std::vector<std::string> names;
    for (const auto& [name, v] : named_values(instance, f)) names.push_back(name);
    return names;
}

std::string field_bits(const field_map& f) {
    if (f.spans.empty()) return bit_range(f.bit, f.width);
    std::string out;
    for (const auto& s : f.spans) out += (out.empty() ? "" : "+") + bit_range(s.bit, s.width);
    return out;
}

const code_table* register_layout::codes_of(const field_map& f) const {
    return f.codes && *f.codes < codes.size() ? &codes[*f.codes] : nullptr;
}

std::uint32_t register_map::reserved_mask() const {
    std::uint32_t used = 0;
    for (const auto& f : fields) used |= f.register_mask();
    return low_mask(width) & ~used;
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

std::string register_layout::field_name(const field_map& f) const {
    if (kind == "timer") return to_string(f.field);
    const auto own = own_fields(*this);
    const std::uint32_t i = own_index(*this, f.kind_field);
    return i < own.size() ? own[i].name : "?";
}

std::string register_layout::clock_node(const field_map& f) const {
    if (kind != "clock_control") return {};
    const std::uint32_t slot = clock_slot_of(f.kind_field);
    return slot == 0 || slot > clock_slots.size() ? std::string() : clock_slots[slot - 1].node;
}

bool register_layout::maps_flags(const field_map& f) const {
    if (f.coded()) return false;
    if (kind == "timer") return f.field == timer_field::flags;
    const auto own = own_fields(*this);
    const std::uint32_t i = own_index(*this, f.kind_field);
    return i < own.size() && own[i].flags;
}

std::vector<std::string> register_layout::unmapped_field_names() const {
    std::vector<std::string> out;
    if (kind == "timer") {
        for (const auto& [field, channel] : unmapped_fields())
            out.push_back(std::string(to_string(field)) +
                          (is_channel_field(field) ? "[" + std::to_string(channel) + "]" : ""));
        return out;
    }
    const auto own = own_fields(*this);
    for (std::uint32_t i = 0; i < own.size(); ++i) {
        bool found = false;
        for (const auto& r : registers)
            for (const auto& m : r.fields) found = found || own_index(*this, m.kind_field) == i;
        if (!found) out.push_back(own[i].name);
    }
    return out;
}

const std::vector<std::string>& peripheral_kinds() {
    static const std::vector<std::string> kinds = {"timer", "tick_timer", "watchdog",
                                                   "slow_counter", "clock_control"};
    return kinds;
}

std::vector<std::string> kind_field_names(std::string_view kind) {
    if (kind == "timer") return field_names();
    register_layout l;
    l.kind = std::string(kind);
    std::vector<std::string> out;
    for (const auto& o : own_fields(l)) out.push_back(o.name);
    return out;
}

std::vector<std::pair<timer_field, unsigned>> register_layout::unmapped_fields() const {
    std::vector<std::pair<timer_field, unsigned>> missing;
    if (kind != "timer") return missing;
    for (auto i = 0u; i <= static_cast<unsigned>(last_field); ++i) {
        const auto f = static_cast<timer_field>(i);
        const unsigned n = is_channel_field(f) ? instance.channels : 1;
        for (unsigned c = 0; c < n; ++c) {
            if (!instance_has(instance, f, c)) continue;
            bool found = false;
            for (const auto& r : registers)
                for (const auto& m : r.fields) {
                    if (const code_table* t = codes_of(m)) {
                        const unsigned ch = is_channel_field(f) ? m.channel : 0;
                        for (const auto& e : t->entries)
                            for (const auto& a : e.sets) found = found || (a.field == f && ch == c);
                    } else {
                        found = found || (m.field == f && m.channel == c);
                    }
                }
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
        case timer_field::filter_divider:
        case timer_field::count_source:
        case timer_field::trigger_action:
        case timer_field::trigger_source:
        case timer_field::channel_role:
        case timer_field::capture_edge:
        case timer_field::capture_prescaler:
            return 2;
        case timer_field::trigger_filter:
        case timer_field::input_filter:
            return bits_for(static_cast<std::uint32_t>(instance.filter_lengths.size() - 1));
        case timer_field::action:
            return 4;
        case timer_field::trigger_select:
            return 3;
        case timer_field::flags:
        case timer_field::irq_enable:
            return 16 + instance.channels;
        default:
            return 1;
    }
}

register_layout load_register_layout_text(std::string_view toml_text, const std::string& file) {
    return read_layout(sim::read_toml_text(toml_text, file), file);
}

register_layout load_register_layout_file(const std::string& path) {
    // A sweep loads the same layouts once per point: the last layout read from each path is
    // handed out again while the file's text is the same.
    static std::map<std::string, std::pair<std::string, register_layout>> loaded;
    std::string text = sim::read_text_file(path);
    const auto it = loaded.find(path);
    if (it != loaded.end() && it->second.first == text) return it->second.second;
    register_layout layout = read_layout(sim::read_toml_text(text, path), path);
    loaded[path] = {std::move(text), layout};
    return layout;
}

}  // namespace models
