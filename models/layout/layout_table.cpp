#include "models/layout/layout_table.h"

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

}  // namespace

std::string describe_fields(const register_map& reg) {
    std::string out;
    for (const field_map& f : reg.fields) {
        if (!out.empty()) out += ", ";
        out += bit_range(f.bit, f.width) + " " + to_string(f.field);
        if (is_channel_field(f.field)) out += "[" + std::to_string(f.channel) + "]";
        if (f.value_bit != 0)
            out +=
                (f.width == 1 ? " value bit " : " value bits ") + bit_range(f.value_bit, f.width);
        if (f.access != access_kind::read_write)
            out += std::string(" (") + to_string(f.access) + ")";
    }
    return out.empty() ? "(spare)" : out;
}

std::string layout_table_markdown(const register_layout& layout) {
    std::string out =
        "| offset | register | width | reset | fields (bits, field, access if not read-write) |\n"
        "|---|---|---|---|---|\n";
    for (const register_map& r : layout.registers) {
        out += "| " + hex(r.offset, 2) + " | `" + r.name + "` | " + std::to_string(r.width) +
               " | " + hex(r.reset, r.width / 4) + " | " + describe_fields(r) + " |\n";
    }
    return out;
}

}  // namespace models
