#include "models/layout/layout_table.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cstdio>

namespace models {

namespace {

std::string hex(std::uint32_t v, unsigned digits) {
    char buf[16];
    std::snprintf(buf, sizeof buf, "0x%0*x", static_cast<int>(digits), v);
    return buf;
}

std::string bit_range(unsigned lo, unsigned width) {
    if (width == 1) return std::to_string(lo);
    return std::to_string(lo) + ".." + std::to_string(lo + width - 1);
}

// "mode = center, slope = down"; "nothing" for an entry that sets no field.
std::string describe_sets(const code_entry& e) {
    std::string out;
    for (const auto& a : e.sets)
        out += (out.empty() ? "" : ", ") + std::string(to_string(a.field)) + " = " +
               value_name(a.field, a.value);
    return out.empty() ? "nothing" : out;
}

std::vector<std::uint32_t> sorted(std::vector<std::uint32_t> v) {
    std::sort(v.begin(), v.end());
    return v;
}

}  // namespace

std::string describe_fields(const register_map& reg, const register_layout& layout) {
    std::string out;
    for (const field_map& f : reg.fields) {
        if (!out.empty()) out += ", ";
        const code_table* table = layout.codes_of(f);
        out += field_bits(f) + " " + (table ? table->name : layout.field_name(f));
        if (layout.kind == "timer" &&
            (table ? table->sets_channel_field() : is_channel_field(f.field)))
            out += "[" + std::to_string(f.channel) + "]";
        if (const std::string node = layout.clock_node(f); !node.empty()) out += " of " + node;
        if (f.value_bit != 0)
            out +=
                (f.width == 1 ? " value bit " : " value bits ") + bit_range(f.value_bit, f.width);
        std::string notes = table ? "coded" : f.invert ? "inverted" : "";
        if (f.access != access_kind::read_write)
            notes += (notes.empty() ? "" : ", ") + std::string(to_string(f.access));
        if (!notes.empty()) out += " (" + notes + ")";
    }
    return out.empty() ? "(spare)" : out;
}

std::string layout_table_markdown(const register_layout& layout) {
    std::string out =
        "| offset | register | width | reset | fields (bits, field, access if not read-write) |\n"
        "|---|---|---|---|---|\n";
    for (const register_map& r : layout.registers) {
        out += "| " + hex(r.offset, 2) + " | `" + r.name + "` | " + std::to_string(r.width) +
               " | " + hex(r.reset, r.width / 4) + " | " + describe_fields(r, layout) + " |\n";
    }
    if (layout.codes.empty()) return out;
    out += "\n| value table | raw | sets |\n|---|---|---|\n";
    for (const code_table& t : layout.codes)
        for (const code_entry& e : t.entries)
            out += "| `" + t.name + "` | " + raw_value_list(sorted(e.raws)) + " | " +
                   describe_sets(e) + " |\n";
    return out;
}

std::string layout_json(const register_layout& layout) {
    using json = nlohmann::ordered_json;
    const timer_config& c = layout.instance;
    json doc = {{"name", layout.name}, {"kind", layout.kind}, {"size", layout.size}};
    if (layout.kind == "tick_timer")
        doc["instance"] = {{"counter_bits", layout.tick.counter_bits},
                           {"divider", layout.tick.divider}};
    else if (layout.kind == "watchdog")
        doc["instance"] = {{"counter_bits", layout.watchdog.counter_bits}};
    else if (layout.kind == "slow_counter")
        doc["instance"] = {{"counter_bits", layout.slow.counter_bits},
                           {"write_latency", layout.slow.write_latency},
                           {"read_window_ns", layout.slow.read_window / 1000}};
    else
        doc["instance"] = {{"counter_bits", c.counter_bits},
                           {"channels", c.channels},
                           {"prescaler_bits", c.prescaler_bits},
                           {"wrap_skip_bits", c.wrap_skip_bits},
                           {"prescaler_shadowed", c.prescaler_shadowed},
                           {"complementary", c.complementary},
                           {"dead_time_max", c.dead_time_max},
                           {"dead_time_scaled", c.dead_time_scaled},
                           {"compare_latency", c.compare_latency},
                           {"input_sync_ticks", c.input_sync_ticks},
                           {"filter_lengths", c.filter_lengths},
                           {"capture_read_clears_flag", c.capture_read_clears_flag},
                           {"chain_latency", c.chain_latency}};
    json registers = json::array();
    for (const register_map& r : layout.registers) {
        json fields = json::array();
        for (const field_map& f : r.fields) {
            json j;
            j["bits"] = field_bits(f);
            const code_table* table = layout.codes_of(f);
            if (table)
                j["codes"] = table->name;
            else
                j["field"] = layout.field_name(f);
            if (layout.kind == "timer" &&
                (table ? table->sets_channel_field() : is_channel_field(f.field)))
                j["channel"] = f.channel;
            if (const std::string node = layout.clock_node(f); !node.empty()) j["clock"] = node;
            if (!table) j["value_bit"] = f.value_bit;
            j["access"] = to_string(f.access);
            if (!table) j["invert"] = f.invert;
            fields.push_back(std::move(j));
        }
        registers.push_back({{"name", r.name},
                             {"offset", r.offset},
                             {"width", r.width},
                             {"reset", r.reset},
                             {"fields", std::move(fields)}});
    }
    doc["registers"] = std::move(registers);
    json codes = json::object();
    for (const code_table& t : layout.codes) {
        json entries = json::array();
        for (const code_entry& e : t.entries) {
            json sets = json::object();
            for (const auto& a : e.sets) {
                if (value_names(c, a.field).empty())
                    sets[to_string(a.field)] = a.value;
                else
                    sets[to_string(a.field)] = value_name(a.field, a.value);
            }
            entries.push_back({{"raw", e.raws}, {"sets", std::move(sets)}});
        }
        codes[t.name] = std::move(entries);
    }
    doc["codes"] = std::move(codes);
    return doc.dump(2);
}

}  // namespace models
