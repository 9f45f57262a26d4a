#include "models/layout/unmapped_access.h"

#include <spdlog/sinks/stdout_color_sinks.h>
#include <spdlog/spdlog.h>

#include <sstream>

namespace models {

const char* to_string(unmapped_policy p) {
    switch (p) {
        case unmapped_policy::ignore:
            return "ignore";
        case unmapped_policy::warn:
            return "warn";
        case unmapped_policy::error:
            return "error";
    }
    return "?";
}

std::optional<unmapped_policy> unmapped_policy_from_string(std::string_view text) {
    for (auto p : {unmapped_policy::ignore, unmapped_policy::warn, unmapped_policy::error})
        if (text == to_string(p)) return p;
    return std::nullopt;
}

std::string hex_address(std::uint64_t v) {
    std::ostringstream s;
    s << "0x" << std::hex << v;
    return s.str();
}

nearest_location nearest_in(const register_layout& layout, std::uint64_t base,
                            const std::string& peripheral, std::uint64_t address) {
    nearest_location out;
    out.peripheral = peripheral;
    const std::uint64_t end = base + layout.size;
    // Distances from outside the window are measured to the window and then to the register in it.
    std::uint64_t offset = 0;
    std::uint64_t extra = 0;
    if (address < base) {
        extra = base - address;
        offset = 0;
    } else if (address >= end) {
        extra = address - (end - 1);
        offset = layout.size - 1;
    } else {
        offset = address - base;
    }
    const auto n = layout.nearest(offset);
    if (n.reg == nullptr) return out;
    out.register_name = n.reg->name;
    out.below = address < base + n.reg->offset;
    out.distance = n.distance + extra;
    return out;
}

std::string unmapped_message(bool is_write, unsigned length, std::uint64_t address,
                             std::string_view what, const nearest_location& nearest,
                             sim::time_ps at) {
    std::string s = is_write ? "write of " : "read of ";
    s += std::to_string(length) + (length == 1 ? " byte at " : " bytes at ") +
         hex_address(address) + " hits " + std::string(what) + "; nearest register: ";
    if (nearest.register_name.empty()) {
        s += nearest.peripheral.empty() ? "none"
                                        : "none known, nearest peripheral " + nearest.peripheral;
    } else {
        s += nearest.register_name + " of " + nearest.peripheral + ", " +
             hex_address(nearest.distance) + (nearest.distance == 1 ? " byte " : " bytes ") +
             (nearest.below ? "below it" : "above it");
    }
    return s + "; at " + std::to_string(at) + " ps";
}

std::shared_ptr<spdlog::logger> bus_logger() {
    if (auto l = spdlog::get("bus")) return l;
    try {
        return spdlog::stderr_color_mt("bus");
    } catch (const spdlog::spdlog_ex&) {
        return spdlog::get("bus");  // registered meanwhile by someone else
    }
}

bool apply_unmapped_policy(unmapped_policy policy, const std::string& message) {
    switch (policy) {
        case unmapped_policy::ignore:
            return false;
        case unmapped_policy::warn:
            bus_logger()->warn(message);
            return false;
        case unmapped_policy::error:
            bus_logger()->error(message);
            return true;
    }
    return false;
}

}  // namespace models
