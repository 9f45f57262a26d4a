#include "harness/trap/detail/instruction_emulator.h"

#include <Zydis/Zydis.h>

#include <cinttypes>
#include <cstdio>

namespace harness::detail {
namespace {

constexpr ZydisMachineMode machine_mode = ZYDIS_MACHINE_MODE_LONG_64;

// Architectural flag bits of RFLAGS (Intel SDM vol. 1, section 3.4.3).
constexpr std::uint64_t flag_cf = 1u << 0;
constexpr std::uint64_t flag_pf = 1u << 2;
constexpr std::uint64_t flag_af = 1u << 4;
constexpr std::uint64_t flag_zf = 1u << 6;
constexpr std::uint64_t flag_sf = 1u << 7;
constexpr std::uint64_t flag_of = 1u << 11;
constexpr std::uint64_t arithmetic_flags =
    flag_cf | flag_pf | flag_af | flag_zf | flag_sf | flag_of;

// The decoder and formatter are set up once, before any fault, so that the handler only reads them.
struct zydis_tools {
    ZydisDecoder decoder{};
    ZydisFormatter formatter{};
    zydis_tools() {
        ZydisDecoderInit(&decoder, machine_mode, ZYDIS_STACK_WIDTH_64);
        ZydisFormatterInit(&formatter, ZYDIS_FORMATTER_STYLE_INTEL);
    }
};
const zydis_tools tools;

std::uint64_t mask_of(unsigned bits) {
    return bits >= 64 ? ~std::uint64_t{0} : (std::uint64_t{1} << bits) - 1;
}

std::uint64_t sign_extend(std::uint64_t v, unsigned bits) {
    if (bits >= 64) return v;
    const std::uint64_t sign = std::uint64_t{1} << (bits - 1);
    v &= mask_of(bits);
    return (v ^ sign) - sign;
}

std::string hex(std::uint64_t v) {
    char buf[24];
    std::snprintf(buf, sizeof buf, "0x%" PRIx64, v);
    return buf;
}

// Slot in mcontext_t::gregs of a 64-bit general-purpose register, or -1.
int greg_slot(ZydisRegister r64) {
    switch (r64) {
        case ZYDIS_REGISTER_RAX:
            return REG_RAX;
        case ZYDIS_REGISTER_RCX:
            return REG_RCX;
        case ZYDIS_REGISTER_RDX:
            return REG_RDX;
        case ZYDIS_REGISTER_RBX:
            return REG_RBX;
        case ZYDIS_REGISTER_RSP:
            return REG_RSP;
        case ZYDIS_REGISTER_RBP:
            return REG_RBP;
        case ZYDIS_REGISTER_RSI:
            return REG_RSI;
        case ZYDIS_REGISTER_RDI:
            return REG_RDI;
        case ZYDIS_REGISTER_R8:
            return REG_R8;
        case ZYDIS_REGISTER_R9:
            return REG_R9;
        case ZYDIS_REGISTER_R10:
            return REG_R10;
        case ZYDIS_REGISTER_R11:
            return REG_R11;
        case ZYDIS_REGISTER_R12:
            return REG_R12;
        case ZYDIS_REGISTER_R13:
            return REG_R13;
        case ZYDIS_REGISTER_R14:
            return REG_R14;
        case ZYDIS_REGISTER_R15:
            return REG_R15;
        default:
            return -1;
    }
}

// A general-purpose register as a bit field of one saved 64-bit register.
struct gpr_field {
    int slot = -1;
    unsigned bits = 0;
    unsigned shift = 0;  // 8 for AH, CH, DH and BH
};

bool resolve_gpr(ZydisRegister r, gpr_field& out) {
    switch (ZydisRegisterGetClass(r)) {
        case ZYDIS_REGCLASS_GPR8:
        case ZYDIS_REGCLASS_GPR16:
        case ZYDIS_REGCLASS_GPR32:
        case ZYDIS_REGCLASS_GPR64:
            break;
        default:
            return false;
    }
    out.slot = greg_slot(ZydisRegisterGetLargestEnclosing(machine_mode, r));
    out.bits = ZydisRegisterGetWidth(machine_mode, r);
    out.shift = (r == ZYDIS_REGISTER_AH || r == ZYDIS_REGISTER_CH || r == ZYDIS_REGISTER_DH ||
                 r == ZYDIS_REGISTER_BH)
                    ? 8
                    : 0;
    return out.slot >= 0;
}

std::uint64_t read_greg(const mcontext_t& c, int slot) {
    return static_cast<std::uint64_t>(c.gregs[slot]);
}

std::uint64_t read_gpr(const mcontext_t& c, const gpr_field& f) {
    return (read_greg(c, f.slot) >> f.shift) & mask_of(f.bits);
}

// Writes with the architecture's sub-register rules: a 32-bit write zero-extends to 64 bits,
// 8- and 16-bit writes keep the other bits (Intel SDM vol. 1, section 3.4.1.1).
void write_gpr(mcontext_t& c, const gpr_field& f, std::uint64_t value) {
    std::uint64_t g = read_greg(c, f.slot);
    if (f.bits == 64) {
        g = value;
    } else if (f.bits == 32) {
        g = value & 0xffffffffu;
    } else {
        const std::uint64_t m = mask_of(f.bits) << f.shift;
        g = (g & ~m) | ((value << f.shift) & m);
    }
    c.gregs[f.slot] = static_cast<greg_t>(g);
}

// Zero, sign and parity flags of a result (PF: even number of set bits in the low byte).
std::uint64_t result_flags(std::uint64_t r, unsigned bits) {
    std::uint64_t f = 0;
    if ((r & mask_of(bits)) == 0) f |= flag_zf;
    if ((r >> (bits - 1)) & 1) f |= flag_sf;
    if (!__builtin_parity(static_cast<unsigned>(r & 0xff))) f |= flag_pf;
    return f;
}

enum class alu_op { add, adc, sub, sbb, and_op, or_op, xor_op };

// Computes `a op b` at `bits` width and replaces the six arithmetic flags in `flags` with the
// result's (Intel SDM vol. 2 for each instruction; AF is cleared for the logic operations, for
// which it is undefined).
std::uint64_t alu(alu_op op, std::uint64_t a, std::uint64_t b, unsigned bits,
                  std::uint64_t& flags) {
    const std::uint64_t m = mask_of(bits);
    a &= m;
    b &= m;
    const unsigned carry_in = (flags & flag_cf) ? 1 : 0;
    std::uint64_t r = 0;
    std::uint64_t f = 0;
    switch (op) {
        case alu_op::add:
        case alu_op::adc: {
            const std::uint64_t c = op == alu_op::adc ? carry_in : 0;
            r = (a + b + c) & m;
            // Below 64 bits the sum cannot overflow the host word, so the carry is bit `bits`.
            const bool carry =
                bits < 64 ? (((a + b + c) >> bits) & 1) != 0 : (r < a || (c != 0 && r == a));
            if (carry) f |= flag_cf;
            if ((((a ^ r) & (b ^ r)) >> (bits - 1)) & 1) f |= flag_of;
            if ((a ^ b ^ r) & 0x10) f |= flag_af;
            break;
        }
        case alu_op::sub:
        case alu_op::sbb: {
            const std::uint64_t c = op == alu_op::sbb ? carry_in : 0;
            r = (a - b - c) & m;
            if (a < b || (c != 0 && a == b)) f |= flag_cf;  // borrow: a < b + c
            if ((((a ^ b) & (a ^ r)) >> (bits - 1)) & 1) f |= flag_of;
            if ((a ^ b ^ r) & 0x10) f |= flag_af;
            break;
        }
        case alu_op::and_op:
            r = a & b;
            break;
        case alu_op::or_op:
            r = a | b;
            break;
        case alu_op::xor_op:
            r = a ^ b;
            break;
    }
    f |= result_flags(r, bits);
    flags = (flags & ~arithmetic_flags) | f;
    return r;
}

// Decodes the instruction at `address`. Reads up to the end of its page first, so that an
// instruction at the end of the last code page does not make the decoder fault; only an
// instruction that really continues on the next page reads that page.
bool decode(std::uint64_t address, ZydisDecodedInstruction& in,
            ZydisDecodedOperand (&ops)[ZYDIS_MAX_OPERAND_COUNT]) {
    const std::uint64_t to_page_end = 4096 - (address & 4095);
    const auto* code = reinterpret_cast<const void*>(address);
    if (to_page_end < ZYDIS_MAX_INSTRUCTION_LENGTH &&
        ZYAN_SUCCESS(ZydisDecoderDecodeFull(&tools.decoder, code, to_page_end, &in, ops))) {
        return true;
    }
    return ZYAN_SUCCESS(
        ZydisDecoderDecodeFull(&tools.decoder, code, ZYDIS_MAX_INSTRUCTION_LENGTH, &in, ops));
}

// One emulation in progress: the decoded instruction and the state it reads and writes.
class emulation {
public:
    emulation(mcontext_t& c, std::uint64_t fault_address, access_port& port)
        : c_(c),
          fault_address_(fault_address),
          port_(port),
          rip_(read_greg(c, REG_RIP)),
          flags_(read_greg(c, REG_EFL)) {}

    emulation_result run() {
        if (!decode(rip_, in_, ops_)) return fail("cannot decode the instruction at " + hex(rip_));
        if (const char* why = find_memory_operand()) return unsupported(why);
        if (!compute_address()) return unsupported("unsupported addressing");
        if (!execute()) return result_;
        c_.gregs[REG_RIP] = static_cast<greg_t>(rip_ + in_.length);
        c_.gregs[REG_EFL] = static_cast<greg_t>(flags_);
        result_.completed = true;
        return result_;
    }

private:
    emulation_result fail(std::string why) {
        result_.completed = false;
        result_.error = std::move(why);
        return result_;
    }

    emulation_result unsupported(const char* detail) {
        return fail("unsupported instruction '" + format() + "' at " + hex(rip_) + " accessing " +
                    hex(fault_address_) + " (" + detail + ")");
    }

    std::string format() const {
        char text[256];
        if (!ZYAN_SUCCESS(ZydisFormatterFormatInstruction(&tools.formatter, &in_, ops_,
                                                          in_.operand_count_visible, text,
                                                          sizeof text, rip_, nullptr))) {
            return "(unformattable)";
        }
        return text;
    }

    // Finds the one memory operand; returns why the instruction cannot be emulated, or nullptr.
    const char* find_memory_operand() {
        int found = -1;
        for (int i = 0; i < in_.operand_count_visible; ++i) {
            if (ops_[i].type != ZYDIS_OPERAND_TYPE_MEMORY) continue;
            if (ops_[i].mem.type != ZYDIS_MEMOP_TYPE_MEM) return "not a plain memory operand";
            if (found >= 0) return "more than one memory operand";
            found = i;
        }
        if (found < 0) {
            // String instructions (movs, stos, cmps ...) address memory through hidden operands.
            return in_.operand_count_visible < in_.operand_count ? "implicit memory operands"
                                                                 : "no memory operand";
        }
        mem_index_ = found;
        width_ = ops_[found].size / 8u;
        if (width_ != 1 && width_ != 2 && width_ != 4 && width_ != 8) {
            return "only 1-, 2-, 4- and 8-byte accesses are emulated";
        }
        return nullptr;
    }

    bool register_value(ZydisRegister r, std::uint64_t& v) const {
        if (r == ZYDIS_REGISTER_RIP || r == ZYDIS_REGISTER_EIP) {
            v = rip_ + in_.length;
            return true;
        }
        gpr_field f;
        if (!resolve_gpr(r, f)) return false;
        v = read_gpr(c_, f);
        return true;
    }

    bool compute_address() {
        const auto& mem = ops_[mem_index_].mem;
        // fs and gs have bases outside the saved registers; peripheral code does not use them.
        if (mem.segment == ZYDIS_REGISTER_FS || mem.segment == ZYDIS_REGISTER_GS) return false;
        std::uint64_t a = 0;
        std::uint64_t v = 0;
        if (mem.base != ZYDIS_REGISTER_NONE) {
            if (!register_value(mem.base, v)) return false;
            a += v;
        }
        if (mem.index != ZYDIS_REGISTER_NONE) {
            if (!register_value(mem.index, v)) return false;
            a += v * mem.scale;
        }
        if (mem.disp.has_displacement) a += static_cast<std::uint64_t>(mem.disp.value);
        if (in_.address_width == 32) a &= 0xffffffffu;
        address_ = a;
        result_.data_address = a;
        return true;
    }

    // Value of a register or immediate source operand, masked to the access width.
    bool source_value(const ZydisDecodedOperand& op, std::uint64_t& v) const {
        if (op.type == ZYDIS_OPERAND_TYPE_IMMEDIATE) {
            v = op.imm.value.u & mask_of(width_ * 8);
            return true;
        }
        if (op.type != ZYDIS_OPERAND_TYPE_REGISTER) return false;
        gpr_field f;
        if (!resolve_gpr(op.reg.value, f)) return false;
        v = read_gpr(c_, f);
        return true;
    }

    bool perform(std::uint64_t address, bool is_write, std::uint64_t& value) {
        access a;
        a.address = address;
        a.width = width_;
        a.is_write = is_write;
        a.value = is_write ? (value & mask_of(width_ * 8)) : 0;
        a.instruction_address = rip_;
        if (!checked_fault_address_) {
            // The first access must be the one that faulted, or the decoding is not what ran.
            checked_fault_address_ = true;
            if (fault_address_ < address || fault_address_ - address >= width_) {
                fail("instruction '" + format() + "' at " + hex(rip_) +
                     " decodes to data address " + hex(address) + " but faulted on " +
                     hex(fault_address_));
                return false;
            }
        }
        std::string error = port_.perform(a);
        if (!error.empty()) {
            fail("'" + format() + "' at " + hex(rip_) + ": " + error);
            return false;
        }
        if (!is_write) value = a.value & mask_of(width_ * 8);
        return true;
    }

    bool read(std::uint64_t address, std::uint64_t& value) {
        return perform(address, false, value);
    }
    bool write(std::uint64_t address, std::uint64_t value) { return perform(address, true, value); }

    // A load into a general-purpose register, zero- or sign-extended from the access width to
    // the register's; the destination is checked before the peripheral sees the read.
    bool load_into(const ZydisDecodedOperand& dest, bool sign_extending) {
        gpr_field f;
        if (dest.type != ZYDIS_OPERAND_TYPE_REGISTER || !resolve_gpr(dest.reg.value, f)) {
            return unsupported_now();
        }
        std::uint64_t v = 0;
        if (!read(address_, v)) return false;
        write_gpr(c_, f, sign_extending ? sign_extend(v, width_ * 8) : v);
        return true;
    }

    bool execute() {
        const bool mem_first = mem_index_ == 0;
        const ZydisDecodedOperand& other = ops_[mem_first ? 1 : 0];
        const unsigned bits = width_ * 8;
        const bool two_operands = in_.operand_count_visible == 2;
        std::uint64_t v = 0;
        std::uint64_t s = 0;
        switch (in_.mnemonic) {
            case ZYDIS_MNEMONIC_MOV:
                if (!two_operands) break;
                if (mem_first) {
                    if (!source_value(other, s)) break;
                    return write(address_, s);
                }
                return load_into(other, false);
            case ZYDIS_MNEMONIC_MOVZX:
                if (!two_operands || mem_first) break;
                return load_into(other, false);
            case ZYDIS_MNEMONIC_MOVSX:
            case ZYDIS_MNEMONIC_MOVSXD:
                if (!two_operands || mem_first) break;
                return load_into(other, true);
            case ZYDIS_MNEMONIC_XCHG: {
                gpr_field f;
                if (!two_operands || other.type != ZYDIS_OPERAND_TYPE_REGISTER ||
                    !resolve_gpr(other.reg.value, f)) {
                    break;
                }
                s = read_gpr(c_, f);
                if (!read(address_, v) || !write(address_, s)) return false;
                write_gpr(c_, f, v);
                return true;
            }
            case ZYDIS_MNEMONIC_ADD:
                return binary(alu_op::add, true);
            case ZYDIS_MNEMONIC_ADC:
                return binary(alu_op::adc, true);
            case ZYDIS_MNEMONIC_SUB:
                return binary(alu_op::sub, true);
            case ZYDIS_MNEMONIC_SBB:
                return binary(alu_op::sbb, true);
            case ZYDIS_MNEMONIC_AND:
                return binary(alu_op::and_op, true);
            case ZYDIS_MNEMONIC_OR:
                return binary(alu_op::or_op, true);
            case ZYDIS_MNEMONIC_XOR:
                return binary(alu_op::xor_op, true);
            case ZYDIS_MNEMONIC_CMP:
                return binary(alu_op::sub, false);
            case ZYDIS_MNEMONIC_TEST:
                return binary(alu_op::and_op, false);
            case ZYDIS_MNEMONIC_INC:
            case ZYDIS_MNEMONIC_DEC: {
                if (!mem_first || in_.operand_count_visible != 1) break;
                if (!read(address_, v)) return false;
                const std::uint64_t carry = flags_ & flag_cf;  // inc and dec leave CF alone
                v = alu(in_.mnemonic == ZYDIS_MNEMONIC_INC ? alu_op::add : alu_op::sub, v, 1, bits,
                        flags_);
                flags_ = (flags_ & ~flag_cf) | carry;
                return write(address_, v);
            }
            case ZYDIS_MNEMONIC_NOT:
                if (!mem_first || in_.operand_count_visible != 1) break;
                return read(address_, v) && write(address_, ~v);  // not changes no flag
            case ZYDIS_MNEMONIC_NEG:
                if (!mem_first || in_.operand_count_visible != 1) break;
                // neg is 0 - x: CF is set unless x is 0, OF when x is the most negative value.
                return read(address_, v) && write(address_, alu(alu_op::sub, 0, v, bits, flags_));
            case ZYDIS_MNEMONIC_BT:
            case ZYDIS_MNEMONIC_BTS:
            case ZYDIS_MNEMONIC_BTR:
            case ZYDIS_MNEMONIC_BTC:
                if (!mem_first || !two_operands) break;
                return bit_test();
            default:
                break;
        }
        unsupported_now();
        return false;
    }

    bool unsupported_now() {
        unsupported("instruction form not emulated");
        return false;
    }

    // Two-operand arithmetic or logic with memory as either operand.
    bool binary(alu_op op, bool writes_result) {
        if (in_.operand_count_visible != 2) return unsupported_now();
        const unsigned bits = width_ * 8;
        std::uint64_t a = 0;
        std::uint64_t b = 0;
        if (mem_index_ == 0) {
            if (!source_value(ops_[1], b)) return unsupported_now();
            if (!read(address_, a)) return false;
            const std::uint64_t r = alu(op, a, b, bits, flags_);
            return !writes_result || write(address_, r);
        }
        gpr_field dest;
        if (ops_[0].type != ZYDIS_OPERAND_TYPE_REGISTER || !resolve_gpr(ops_[0].reg.value, dest) ||
            dest.bits != bits) {
            return unsupported_now();
        }
        a = read_gpr(c_, dest);
        if (!read(address_, b)) return false;
        const std::uint64_t r = alu(op, a, b, bits, flags_);
        if (writes_result) write_gpr(c_, dest, r);
        return true;
    }

    // bt, bts, btr, btc on memory. A register bit offset is signed and may select another
    // operand-sized word than the one addressed (Intel SDM vol. 2, BT: "bit string").
    bool bit_test() {
        const unsigned bits = width_ * 8;
        const ZydisDecodedOperand& offset_op = ops_[1];
        std::uint64_t address = address_;
        unsigned bit = 0;
        if (offset_op.type == ZYDIS_OPERAND_TYPE_IMMEDIATE) {
            bit = static_cast<unsigned>(offset_op.imm.value.u & (bits - 1));
        } else {
            gpr_field f;
            if (offset_op.type != ZYDIS_OPERAND_TYPE_REGISTER ||
                !resolve_gpr(offset_op.reg.value, f)) {
                return unsupported_now();
            }
            const auto offset = static_cast<std::int64_t>(sign_extend(read_gpr(c_, f), f.bits));
            const int shift = bits == 16 ? 4 : bits == 32 ? 5 : 6;
            address +=
                static_cast<std::uint64_t>((offset >> shift) * static_cast<std::int64_t>(width_));
            bit = static_cast<unsigned>(offset & (bits - 1));
        }
        std::uint64_t v = 0;
        if (!read(address, v)) return false;
        const std::uint64_t m = std::uint64_t{1} << bit;
        // CF takes the bit; the other arithmetic flags are left as they were.
        flags_ = (flags_ & ~flag_cf) | ((v & m) ? flag_cf : 0);
        switch (in_.mnemonic) {
            case ZYDIS_MNEMONIC_BTS:
                return write(address, v | m);
            case ZYDIS_MNEMONIC_BTR:
                return write(address, v & ~m);
            case ZYDIS_MNEMONIC_BTC:
                return write(address, v ^ m);
            default:
                return true;
        }
    }

    mcontext_t& c_;
    std::uint64_t fault_address_;
    access_port& port_;
    std::uint64_t rip_;
    std::uint64_t flags_;
    ZydisDecodedInstruction in_{};
    ZydisDecodedOperand ops_[ZYDIS_MAX_OPERAND_COUNT]{};
    int mem_index_ = -1;
    unsigned width_ = 0;
    std::uint64_t address_ = 0;
    bool checked_fault_address_ = false;
    emulation_result result_;
};

}  // namespace

emulation_result emulate_instruction(mcontext_t& context, std::uint64_t fault_address,
                                     access_port& port) {
    return emulation(context, fault_address, port).run();
}

std::string format_instruction(std::uint64_t address) {
    ZydisDecodedInstruction in;
    ZydisDecodedOperand ops[ZYDIS_MAX_OPERAND_COUNT];
    if (!decode(address, in, ops)) return "(undecodable)";
    char text[256];
    if (!ZYAN_SUCCESS(ZydisFormatterFormatInstruction(&tools.formatter, &in, ops,
                                                      in.operand_count_visible, text, sizeof text,
                                                      address, nullptr))) {
        return "(unformattable)";
    }
    return text;
}

}  // namespace harness::detail
