#include "models/layout/register_file.h"

#include <spdlog/spdlog.h>

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

// The channel a coded field's entry sets functional field f on: the field's, for per-channel f.
unsigned channel_of(const field_map& coded, timer_field f) {
    return is_channel_field(f) ? coded.channel : 0;
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
      core_(&core),
      config_(config),
      peripheral_(std::move(peripheral)),
      policy_(policy),
      base_(base) {
    index_registers();
}

register_file::register_file(const register_layout& layout, field_port& port,
                             std::string peripheral, unmapped_policy policy, std::uint64_t base)
    : layout_(layout),
      port_(&port),
      peripheral_(std::move(peripheral)),
      policy_(policy),
      base_(base) {
    if (layout_.kind == "timer")
        throw std::invalid_argument("register file for " + peripheral_ +
                                    ": a \"timer\" layout needs a timer model");
    index_registers();
}

std::uint32_t register_file::read_model(const field_map& f, sim::time_ps t) {
    return core_ ? core_->read(f.field, f.channel, t) : port_->read_field(f.kind_field, t);
}

void register_file::write_model(const field_map& f, std::uint32_t value, sim::time_ps t) {
    if (core_)
        core_->write(f.field, f.channel, value, t);
    else
        port_->write_field(f.kind_field, value, t);
}

void register_file::clear_model(std::uint32_t mask, sim::time_ps t) {
    if (core_)
        core_->clear_flags(mask, t);
    else
        port_->clear_flag_bits(mask, t);
}

void register_file::index_registers() {
    registers_.reserve(layout_.registers.size());
    for (const auto& reg : layout_.registers) {
        register_entry e;
        e.reg = &reg;
        for (const auto& f : reg.fields) {
            // A coded field maps every field its table sets.
            std::vector<timer_field> mapped;
            if (const code_table* t = layout_.codes_of(f)) {
                for (const auto& entry : t->entries)
                    for (const auto& a : entry.sets) mapped.push_back(a.field);
            } else {
                mapped.push_back(f.field);
            }
            for (const timer_field m : mapped)
                if (core_ && !instance_has(config_, m, channel_of(f, m)))
                    throw std::invalid_argument(
                        "register file for " + peripheral_ + ": register \"" + reg.name +
                        "\" maps \"" + to_string(m) + "\" (channel " +
                        std::to_string(channel_of(f, m)) + ") which the instance does not have");
            field_entry fe{f, false, layout_.codes_of(f), f.raw_of(reg.reset)};
            for (const auto& other_reg : layout_.registers)
                for (const auto& o : other_reg.fields) {
                    if (f.coded() || o.coded() || o.field != f.field || o.channel != f.channel ||
                        o.kind_field != f.kind_field)
                        continue;
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

bool register_file::matches(const field_entry& fe, const code_entry& e, sim::time_ps t) {
    for (const auto& a : e.sets)
        if (core_->read(a.field, channel_of(fe.map, a.field), t) != a.value) return false;
    return true;
}

std::uint32_t register_file::coded_raw(const field_entry& fe, sim::time_ps t) {
    if (const code_entry* last = fe.table->find(fe.raw); last != nullptr && matches(fe, *last, t))
        return fe.raw;
    for (const auto& e : fe.table->entries)
        if (matches(fe, e, t)) return e.raws.front();
    return fe.raw;
}

void register_file::write_coded(const register_entry& r, field_entry& fe, std::uint32_t value,
                                std::uint32_t covered, sim::time_ps t) {
    const field_map& f = fe.map;
    const std::uint32_t full = low_mask(f.width);
    const std::uint32_t cov = f.raw_of(covered);
    std::uint32_t raw = f.raw_of(value);
    if (cov != full) raw = (coded_raw(fe, t) & ~cov) | (raw & cov);
    const code_entry* e = fe.table->find(raw);
    if (e == nullptr) {
        bus_logger()->warn(
            "write of reserved raw value {} to the coded field at bits {} (value table \"{}\") of "
            "{}.{} at {} ps changes nothing; accepted: {}",
            raw, field_bits(f), fe.table->name, peripheral_, r.reg->name, t,
            raw_value_list(fe.table->accepted()));
        return;
    }
    for (const auto& a : e->sets) core_->write(a.field, channel_of(f, a.field), a.value, t);
    fe.raw = raw;
}

void register_file::write_fields(register_entry& r, std::uint32_t value, std::uint32_t covered,
                                 sim::time_ps t, bool reset_only) {
    for (auto& fe : r.fields) {
        const auto& f = fe.map;
        const std::uint32_t fm = f.register_mask();
        if ((fm & covered) == 0) continue;
        switch (f.access) {
            case access_kind::read_only:
            case access_kind::clear_on_read:
                continue;
            case access_kind::write_one_to_clear:
            case access_kind::write_zero_to_clear: {
                if (reset_only) continue;
                const std::uint32_t full = low_mask(f.width);
                const std::uint32_t bits = f.raw_of(value);
                const std::uint32_t cov = f.raw_of(covered);
                const std::uint32_t ones =
                    f.access == access_kind::write_one_to_clear ? bits : ~bits;
                const std::uint32_t clear = ones & cov & full;
                if (clear != 0) clear_model(clear << f.value_bit, t);
                continue;
            }
            case access_kind::write_only:
                if (reset_only) continue;
                break;
            case access_kind::read_write:
                break;
        }
        if (fe.table != nullptr) {
            write_coded(r, fe, value, covered, t);
            continue;
        }
        const std::uint32_t full = low_mask(f.width);
        const std::uint32_t bits = f.raw_of(value) ^ (f.invert ? full : 0);
        const std::uint32_t cov = f.raw_of(covered);
        std::uint32_t v = bits;
        std::uint32_t whole = 0;
        const bool need_model = cov != full || fe.merge_value;
        if (need_model) whole = read_model(f, t);
        if (cov != full) v = (((whole >> f.value_bit) & full) & ~cov) | (bits & cov);
        std::uint32_t out = v << f.value_bit;
        if (fe.merge_value) out |= whole & ~(full << f.value_bit);
        write_model(f, out, t);
    }
}

template <typename Visit>
bool register_file::for_each_overlap(std::uint32_t offset, unsigned length, Visit visit) {
    const std::uint64_t end = std::uint64_t(offset) + length;
    bool touched = false;
    for (auto& r : registers_) {
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
        for_each_overlap(offset, length, [&](register_entry& r, std::uint32_t covered) {
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
                if (fe.table != nullptr) {
                    regval |= f.place(coded_raw(fe, t));
                    continue;
                }
                const std::uint32_t v = (read_model(f, t) >> f.value_bit) & full;
                regval |= (v ^ (f.invert ? full : 0)) << f.bit;
                if (f.access == access_kind::clear_on_read)
                    clears |= (v & ((covered & fm) >> f.bit)) << f.value_bit;
            }
            const std::uint64_t part = regval & covered;
            const std::uint32_t reg_offset = r.reg->offset;
            result |= reg_offset >= offset ? part << (8 * (reg_offset - offset))
                                           : part >> (8 * (offset - reg_offset));
        });
    if (clears != 0) clear_model(clears, t);
    if (!touched) return reserved(false, offset, length, t);
    value = static_cast<std::uint32_t>(result & low_mask(8 * length));
    return {};
}

void register_file::apply_reset(sim::time_ps t) {
    t = clamp(t);
    for (auto& r : registers_) write_fields(r, r.reg->reset, low_mask(r.reg->width), t, true);
}

}  // namespace models
