#include "models/layout/register_file.h"

#include <algorithm>
#include <stdexcept>

namespace models {

namespace {

std::uint32_t low_mask(unsigned width) { return width >= 32 ? 0xffff'ffffu : (1u << width) - 1; }

// Bits [first_byte * 8, end_byte * 8) of a register.
std::uint32_t byte_mask(unsigned first_byte, unsigned end_byte) {
    std::uint64_t m = 0;
    for (unsigned b = first_byte; b < end_byte; ++b) m |= 0xffull << (8 * b);
    return static_cast<std::uint32_t>(m);
}

void check_length(unsigned length) {
    if (length < 1 || length > 4)
        throw std::invalid_argument("register access of " + std::to_string(length) +
                                    " bytes; accepted: 1 to 4");
}

}  // namespace

register_file::register_file(const register_layout& layout, timer_core_if& core,
                             const timer_config& config, std::string peripheral,
                             unmapped_policy policy, std::uint64_t base)
    : layout_(layout),
      core_(core),
      config_(config),
      peripheral_(std::move(peripheral)),
      policy_(policy),
      base_(base) {
    registers_.reserve(layout_.registers.size());
    for (const auto& reg : layout_.registers) {
        register_entry e;
        e.reg = &reg;
        for (const auto& f : reg.fields) {
            if (!instance_has(config_, f.field, f.channel))
                throw std::invalid_argument("register file for " + peripheral_ + ": register \"" +
                                            reg.name + "\" maps \"" + to_string(f.field) +
                                            "\" (channel " + std::to_string(f.channel) +
                                            ") which the instance does not have");
            field_entry fe{f, false};
            for (const auto& other_reg : layout_.registers)
                for (const auto& o : other_reg.fields) {
                    if (o.field != f.field || o.channel != f.channel) continue;
                    const bool inside = o.value_bit >= f.value_bit &&
                                        o.value_bit + o.width <= f.value_bit + f.width;
                    if (!inside) fe.merge_value = true;
                }
            if (f.value_bit != 0) fe.merge_value = true;
            e.fields.push_back(fe);
        }
        registers_.push_back(std::move(e));
    }
}

sim::time_ps register_file::clamp(sim::time_ps t) {
    last_ = std::max(last_, t);
    return last_;
}

access_outcome register_file::reserved(bool is_write, std::uint32_t offset, unsigned length,
                                       sim::time_ps t) const {
    access_outcome out;
    out.reserved = true;
    const auto address = base_ + offset;
    out.message =
        unmapped_message(is_write, length, address, "a location reserved in " + peripheral_,
                         nearest_in(layout_, base_, peripheral_, address), t);
    out.failed = apply_unmapped_policy(policy_, out.message);
    return out;
}

void register_file::write_fields(const register_entry& r, std::uint32_t value,
                                 std::uint32_t covered, sim::time_ps t, bool reset_only) {
    for (const auto& fe : r.fields) {
        const auto& f = fe.map;
        const std::uint32_t fm = f.register_mask();
        if ((fm & covered) == 0) continue;
        const std::uint32_t full = low_mask(f.width);
        const std::uint32_t bits = (value & fm) >> f.bit;
        const std::uint32_t cov = (covered & fm) >> f.bit;
        switch (f.access) {
            case access_kind::read_only:
            case access_kind::clear_on_read:
                continue;
            case access_kind::write_one_to_clear: {
                if (reset_only) continue;
                const std::uint32_t clear = bits & cov;
                if (clear != 0) core_.clear_flags(clear << f.value_bit, t);
                continue;
            }
            case access_kind::write_only:
                if (reset_only) continue;
                break;
            case access_kind::read_write:
                break;
        }
        std::uint32_t v = bits;
        std::uint32_t whole = 0;
        const bool need_model = cov != full || fe.merge_value;
        if (need_model) whole = core_.read(f.field, f.channel, t);
        if (cov != full) v = (((whole >> f.value_bit) & full) & ~cov) | (bits & cov);
        std::uint32_t out = v << f.value_bit;
        if (fe.merge_value) out |= whole & ~(full << f.value_bit);
        core_.write(f.field, f.channel, out, t);
    }
}

template <typename Visit>
bool register_file::for_each_overlap(std::uint32_t offset, unsigned length, Visit visit) const {
    const std::uint64_t end = std::uint64_t(offset) + length;
    bool touched = false;
    for (const auto& r : registers_) {
        const auto& reg = *r.reg;
        const std::uint64_t rend = std::uint64_t(reg.offset) + reg.bytes();
        if (reg.offset >= end) break;
        if (rend <= offset) continue;
        touched = true;
        const auto lo = std::max<std::uint64_t>(offset, reg.offset);
        const auto hi = std::min<std::uint64_t>(end, rend);
        visit(r, byte_mask(unsigned(lo - reg.offset), unsigned(hi - reg.offset)));
    }
    return touched;
}

access_outcome register_file::write(std::uint32_t offset, unsigned length, std::uint32_t value,
                                    sim::time_ps t) {
    check_length(length);
    t = clamp(t);
    const std::uint64_t wide = value & low_mask(8 * length);
    const bool touched =
        for_each_overlap(offset, length, [&](const register_entry& r, std::uint32_t covered) {
            const std::uint32_t reg_offset = r.reg->offset;
            const std::uint64_t aligned = reg_offset >= offset
                                              ? wide >> (8 * (reg_offset - offset))
                                              : wide << (8 * (offset - reg_offset));
            write_fields(r, static_cast<std::uint32_t>(aligned) & covered, covered, t, false);
        });
    if (!touched) return reserved(true, offset, length, t);
    return {};
}

access_outcome register_file::read(std::uint32_t offset, unsigned length, std::uint32_t& value,
                                   sim::time_ps t) {
    check_length(length);
    t = clamp(t);
    value = 0;
    std::uint32_t clears = 0;
    std::uint64_t result = 0;
    const bool touched =
        for_each_overlap(offset, length, [&](const register_entry& r, std::uint32_t covered) {
            std::uint32_t regval = 0;
            for (const auto& fe : r.fields) {
                const auto& f = fe.map;
                const std::uint32_t fm = f.register_mask();
                if ((fm & covered) == 0 || f.access == access_kind::write_only) continue;
                const std::uint32_t full = low_mask(f.width);
                const std::uint32_t v = (core_.read(f.field, f.channel, t) >> f.value_bit) & full;
                regval |= v << f.bit;
                if (f.access == access_kind::clear_on_read)
                    clears |= (v & ((covered & fm) >> f.bit)) << f.value_bit;
            }
            const std::uint64_t part = regval & covered;
            const std::uint32_t reg_offset = r.reg->offset;
            result |= reg_offset >= offset ? part << (8 * (reg_offset - offset))
                                           : part >> (8 * (offset - reg_offset));
        });
    if (clears != 0) core_.clear_flags(clears, t);
    if (!touched) return reserved(false, offset, length, t);
    value = static_cast<std::uint32_t>(result & low_mask(8 * length));
    return {};
}

void register_file::apply_reset(sim::time_ps t) {
    t = clamp(t);
    for (const auto& r : registers_) write_fields(r, r.reg->reset, low_mask(r.reg->width), t, true);
}

}  // namespace models
