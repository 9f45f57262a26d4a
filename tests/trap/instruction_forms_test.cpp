// Each supported instruction form, written out in inline assembly, run twice with the same
// register, memory and flags: once on ordinary memory, where the CPU executes it, and once on the
// trapped fake peripheral, where the engine emulates it. Registers, memory and every flag the
// instruction defines must come out the same: the host CPU is the reference.

#include "fake_peripheral.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <cstring>
#include <string>
#include <vector>

namespace trap_test {
namespace {

// RFLAGS bits (Intel SDM vol. 1, section 3.4.3).
constexpr std::uint64_t cf = 1u << 0, pf = 1u << 2, af = 1u << 4, zf = 1u << 6, sf = 1u << 7,
                        of = 1u << 11;
constexpr std::uint64_t all_six = cf | pf | af | zf | sf | of;
// Flags each group of instructions defines (Intel SDM vol. 2, "Flags Affected" of each):
// logic ops leave AF undefined; bt family defines only CF; others define or preserve all six.
constexpr std::uint64_t arith_flags = all_six;
constexpr std::uint64_t logic_flags = cf | pf | zf | sf | of;
constexpr std::uint64_t bit_flags = cf;

struct outcome {
    std::uint64_t reg;
    std::uint64_t flags;
};

using form_fn = outcome (*)(void* mem, std::uint64_t reg, std::uint64_t flags);

// Runs `text` with %[r] holding `reg`, %[m] pointing at memory and the flags set to `flags`.
// The red zone below the stack pointer is stepped over before pushing.
#define TB_FORM(fn, text)                                                    \
    outcome fn(void* mem, std::uint64_t reg, std::uint64_t flags) {          \
        asm volatile("lea -128(%%rsp), %%rsp\n\tpush %[f]\n\tpopfq\n\t" text \
                     "\n\tpushfq\n\tpop %[f]\n\tlea 128(%%rsp), %%rsp"       \
                     : [f] "+r"(flags), [r] "+r"(reg)                        \
                     : [m] "r"(mem)                                          \
                     : "memory", "cc");                                      \
        return {reg, flags};                                                 \
    }

// Memory destination, register source, in the four widths.
#define TB_MEM_REG(name, op)                 \
    TB_FORM(name##_8, op "b %b[r], (%[m])")  \
    TB_FORM(name##_16, op "w %w[r], (%[m])") \
    TB_FORM(name##_32, op "l %k[r], (%[m])") \
    TB_FORM(name##_64, op "q %q[r], (%[m])")
// Register destination, memory source.
#define TB_REG_MEM(name, op)                 \
    TB_FORM(name##_8, op "b (%[m]), %b[r]")  \
    TB_FORM(name##_16, op "w (%[m]), %w[r]") \
    TB_FORM(name##_32, op "l (%[m]), %k[r]") \
    TB_FORM(name##_64, op "q (%[m]), %q[r]")
// Memory only.
#define TB_MEM(name, op)              \
    TB_FORM(name##_8, op "b (%[m])")  \
    TB_FORM(name##_16, op "w (%[m])") \
    TB_FORM(name##_32, op "l (%[m])") \
    TB_FORM(name##_64, op "q (%[m])")
// Bit tests with a register bit offset (no 8-bit form exists).
#define TB_BIT_REG(name, op)                 \
    TB_FORM(name##_16, op "w %w[r], (%[m])") \
    TB_FORM(name##_32, op "l %k[r], (%[m])") \
    TB_FORM(name##_64, op "q %q[r], (%[m])")

TB_MEM_REG(store, "mov")
TB_MEM_REG(add_to_mem, "add")
TB_MEM_REG(adc_to_mem, "adc")
TB_MEM_REG(sub_from_mem, "sub")
TB_MEM_REG(sbb_from_mem, "sbb")
TB_MEM_REG(and_to_mem, "and")
TB_MEM_REG(or_to_mem, "or")
TB_MEM_REG(xor_to_mem, "xor")
TB_MEM_REG(cmp_mem_reg, "cmp")
TB_MEM_REG(test_mem_reg, "test")
TB_MEM_REG(xchg_mem, "xchg")
TB_MEM_REG(lock_add_to_mem, "lock add")
TB_REG_MEM(load, "mov")
TB_REG_MEM(add_from_mem, "add")
TB_REG_MEM(adc_from_mem, "adc")
TB_REG_MEM(sub_mem_from_reg, "sub")
TB_REG_MEM(sbb_mem_from_reg, "sbb")
TB_REG_MEM(and_from_mem, "and")
TB_REG_MEM(or_from_mem, "or")
TB_REG_MEM(xor_from_mem, "xor")
TB_REG_MEM(cmp_reg_mem, "cmp")
TB_MEM(inc_mem, "inc")
TB_MEM(dec_mem, "dec")
TB_MEM(not_mem, "not")
TB_MEM(neg_mem, "neg")
TB_BIT_REG(bt_reg, "bt")
TB_BIT_REG(bts_reg, "bts")
TB_BIT_REG(btr_reg, "btr")
TB_BIT_REG(btc_reg, "btc")

// Zero- and sign-extending loads.
TB_FORM(movzx_8_to_16, "movzbw (%[m]), %w[r]")
TB_FORM(movzx_8_to_32, "movzbl (%[m]), %k[r]")
TB_FORM(movzx_8_to_64, "movzbq (%[m]), %q[r]")
TB_FORM(movzx_16_to_32, "movzwl (%[m]), %k[r]")
TB_FORM(movzx_16_to_64, "movzwq (%[m]), %q[r]")
TB_FORM(movsx_8_to_16, "movsbw (%[m]), %w[r]")
TB_FORM(movsx_8_to_32, "movsbl (%[m]), %k[r]")
TB_FORM(movsx_8_to_64, "movsbq (%[m]), %q[r]")
TB_FORM(movsx_16_to_32, "movswl (%[m]), %k[r]")
TB_FORM(movsx_16_to_64, "movswq (%[m]), %q[r]")
TB_FORM(movsxd_32_to_64, "movslq (%[m]), %q[r]")

// Immediate sources, including sign-extended imm8 and imm32 and a 16-bit immediate.
TB_FORM(store_imm8, "movb $0xa5, (%[m])")
TB_FORM(store_imm16, "movw $0xbeef, (%[m])")
TB_FORM(store_imm32, "movl $0x87654321, (%[m])")
TB_FORM(store_imm32_sx64, "movq $-2, (%[m])")
TB_FORM(add_imm8_sx32, "addl $-1, (%[m])")
TB_FORM(add_imm32, "addl $0x7fffffff, (%[m])")
TB_FORM(or_imm_sx64, "orq $-16, (%[m])")
TB_FORM(and_imm8, "andb $0x0f, (%[m])")
TB_FORM(sub_imm16, "subw $0x8000, (%[m])")
TB_FORM(cmp_imm8_sx32, "cmpl $-5, (%[m])")
TB_FORM(cmp_imm64, "cmpq $0x7f, (%[m])")
TB_FORM(test_imm8, "testb $0x80, (%[m])")
TB_FORM(test_imm32, "testl $0x10, (%[m])")
TB_FORM(xor_imm16, "xorw $0x5a5a, (%[m])")
TB_FORM(adc_imm8, "adcb $0x7f, (%[m])")
TB_FORM(sbb_imm32, "sbbl $1, (%[m])")
TB_FORM(bt_imm_16, "btw $3, (%[m])")
TB_FORM(bt_imm_32, "btl $31, (%[m])")
TB_FORM(bt_imm_masked, "btl $37, (%[m])")
TB_FORM(bts_imm_64, "btsq $63, (%[m])")
TB_FORM(btr_imm_32, "btrl $4, (%[m])")
TB_FORM(btc_imm_16, "btcw $15, (%[m])")

// Addressing: base plus displacement, base plus scaled index.
TB_FORM(load_disp, "movl 8(%[m]), %k[r]")
TB_FORM(load_index, "movl -8(%[m],%[r],4), %k[r]")

struct form_case {
    const char* name;
    form_fn fn;
    std::uint64_t flags_defined;
    bool bit_offset;  // the register holds a bit offset: keep it small
};

#define TB_CASES4(name, flags)                                                    \
    {#name "_8", name##_8, flags, false}, {#name "_16", name##_16, flags, false}, \
        {#name "_32", name##_32, flags, false}, {                                 \
#name "_64", name##_64, flags, false                                      \
    }
#define TB_BIT_CASES(name)                                                                  \
    {#name "_16", name##_16, bit_flags, true}, {#name "_32", name##_32, bit_flags, true}, { \
#name "_64", name##_64, bit_flags, true                                             \
    }

const std::vector<form_case>& cases() {
    static const std::vector<form_case> all = {
        TB_CASES4(store, all_six),
        TB_CASES4(add_to_mem, arith_flags),
        TB_CASES4(adc_to_mem, arith_flags),
        TB_CASES4(sub_from_mem, arith_flags),
        TB_CASES4(sbb_from_mem, arith_flags),
        TB_CASES4(and_to_mem, logic_flags),
        TB_CASES4(or_to_mem, logic_flags),
        TB_CASES4(xor_to_mem, logic_flags),
        TB_CASES4(cmp_mem_reg, arith_flags),
        TB_CASES4(test_mem_reg, logic_flags),
        TB_CASES4(xchg_mem, all_six),
        TB_CASES4(lock_add_to_mem, arith_flags),
        TB_CASES4(load, all_six),
        TB_CASES4(add_from_mem, arith_flags),
        TB_CASES4(adc_from_mem, arith_flags),
        TB_CASES4(sub_mem_from_reg, arith_flags),
        TB_CASES4(sbb_mem_from_reg, arith_flags),
        TB_CASES4(and_from_mem, logic_flags),
        TB_CASES4(or_from_mem, logic_flags),
        TB_CASES4(xor_from_mem, logic_flags),
        TB_CASES4(cmp_reg_mem, arith_flags),
        TB_CASES4(inc_mem, arith_flags),
        TB_CASES4(dec_mem, arith_flags),
        TB_CASES4(not_mem, all_six),
        TB_CASES4(neg_mem, arith_flags),
        TB_BIT_CASES(bt_reg),
        TB_BIT_CASES(bts_reg),
        TB_BIT_CASES(btr_reg),
        TB_BIT_CASES(btc_reg),
        {"movzx_8_to_16", movzx_8_to_16, all_six, false},
        {"movzx_8_to_32", movzx_8_to_32, all_six, false},
        {"movzx_8_to_64", movzx_8_to_64, all_six, false},
        {"movzx_16_to_32", movzx_16_to_32, all_six, false},
        {"movzx_16_to_64", movzx_16_to_64, all_six, false},
        {"movsx_8_to_16", movsx_8_to_16, all_six, false},
        {"movsx_8_to_32", movsx_8_to_32, all_six, false},
        {"movsx_8_to_64", movsx_8_to_64, all_six, false},
        {"movsx_16_to_32", movsx_16_to_32, all_six, false},
        {"movsx_16_to_64", movsx_16_to_64, all_six, false},
        {"movsxd_32_to_64", movsxd_32_to_64, all_six, false},
        {"store_imm8", store_imm8, all_six, false},
        {"store_imm16", store_imm16, all_six, false},
        {"store_imm32", store_imm32, all_six, false},
        {"store_imm32_sx64", store_imm32_sx64, all_six, false},
        {"add_imm8_sx32", add_imm8_sx32, arith_flags, false},
        {"add_imm32", add_imm32, arith_flags, false},
        {"or_imm_sx64", or_imm_sx64, logic_flags, false},
        {"and_imm8", and_imm8, logic_flags, false},
        {"sub_imm16", sub_imm16, arith_flags, false},
        {"cmp_imm8_sx32", cmp_imm8_sx32, arith_flags, false},
        {"cmp_imm64", cmp_imm64, arith_flags, false},
        {"test_imm8", test_imm8, logic_flags, false},
        {"test_imm32", test_imm32, logic_flags, false},
        {"xor_imm16", xor_imm16, logic_flags, false},
        {"adc_imm8", adc_imm8, arith_flags, false},
        {"sbb_imm32", sbb_imm32, arith_flags, false},
        {"bt_imm_16", bt_imm_16, bit_flags, false},
        {"bt_imm_32", bt_imm_32, bit_flags, false},
        {"bt_imm_masked", bt_imm_masked, bit_flags, false},
        {"bts_imm_64", bts_imm_64, bit_flags, false},
        {"btr_imm_32", btr_imm_32, bit_flags, false},
        {"btc_imm_16", btc_imm_16, bit_flags, false},
        {"load_disp", load_disp, all_six, false},
        {"load_index", load_index, all_six, true},
    };
    return all;
}

// Operand patterns around every width's sign and carry boundaries, plus mixed bits.
const std::uint64_t values[] = {
    0x0,
    0x1,
    0x2,
    0x7f,
    0x80,
    0xff,
    0x100,
    0x7fff,
    0x8000,
    0xffff,
    0x7fffffff,
    0x80000000,
    0xffffffff,
    0x7fffffffffffffff,
    0x8000000000000000,
    0xffffffffffffffff,
    0x0123456789abcdef,
    0xfedcba9876543210,
    0x0f0f0f0f0f0f0f0f,
    0x00000000000000f0,
};
// Bit offsets, including ones that select the word before or after the addressed one.
const std::int64_t bit_offsets[] = {0,  3,  7,   15, 16,  31,  32,  63,
                                    64, 70, 100, -1, -16, -33, -64, -65};
const std::uint64_t initial_flags[] = {0, all_six, cf, zf | sf};

constexpr std::uint64_t window_offset = 0x40;  // %[m] points here: room on both sides
constexpr std::size_t window_bytes = peripheral_size;

struct run_result {
    outcome out;
    std::uint8_t memory[window_bytes];
};

std::string hex(std::uint64_t v) {
    char buf[24];
    std::snprintf(buf, sizeof buf, "0x%llx", static_cast<unsigned long long>(v));
    return buf;
}

class instruction_forms_test : public ::testing::TestWithParam<form_case> {
protected:
    void SetUp() override { peripheral.map(); }
    fake_peripheral peripheral;
};

// Fills a window of memory with a pattern derived from `seed`, so untouched bytes are checked too.
void fill_window(std::uint8_t* bytes, std::uint64_t seed) {
    for (std::size_t i = 0; i < window_bytes; ++i) {
        bytes[i] = static_cast<std::uint8_t>((seed >> ((i % 8) * 8)) ^ (i * 0x9d));
    }
}

TEST_P(instruction_forms_test, matches_the_cpu_on_ordinary_memory) {
    const form_case& c = GetParam();
    std::vector<std::uint64_t> regs;
    if (c.bit_offset) {
        for (std::int64_t o : bit_offsets) regs.push_back(static_cast<std::uint64_t>(o));
    } else {
        regs.assign(std::begin(values), std::end(values));
    }
    if (std::string(c.name) == "load_index") regs = {0, 2, 5, 10, 12};  // index into the window
    auto* trapped = reinterpret_cast<std::uint8_t*>(peripheral_base);
    alignas(16) std::uint8_t plain[window_bytes];
    int compared = 0;
    for (std::uint64_t mem_seed : values) {
        for (std::uint64_t reg : regs) {
            for (std::uint64_t flags : initial_flags) {
                fill_window(plain, mem_seed);
                std::uint8_t expected_bytes[window_bytes];
                const outcome expected = c.fn(plain + window_offset, reg, flags | 2);
                std::memcpy(expected_bytes, plain, window_bytes);

                fill_window(plain, mem_seed);
                for (std::size_t i = 0; i < window_bytes; ++i)
                    peripheral.set<std::uint8_t>(i, plain[i]);
                const outcome got = c.fn(trapped + window_offset, reg, flags | 2);

                const std::string where = std::string(c.name) + " memory " + hex(mem_seed) +
                                          " reg " + hex(reg) + " flags " + hex(flags);
                ASSERT_EQ(hex(got.reg), hex(expected.reg)) << where;
                ASSERT_EQ(hex(got.flags & c.flags_defined), hex(expected.flags & c.flags_defined))
                    << where;
                for (std::size_t i = 0; i < window_bytes; ++i) {
                    ASSERT_EQ(peripheral.get<std::uint8_t>(i), expected_bytes[i])
                        << where << " byte " << i;
                }
                ++compared;
            }
        }
    }
    peripheral.log.clear();
    EXPECT_GT(compared, 0);
}

INSTANTIATE_TEST_SUITE_P(forms, instruction_forms_test, ::testing::ValuesIn(cases()),
                         [](const ::testing::TestParamInfo<form_case>& param_info) {
                             return std::string(param_info.param.name);
                         });

// A load into AH, BH, CH or DH changes bits 8 to 15 only; a load into AL or AX keeps the upper
// bits; a 32-bit load clears bits 32 to 63 (Intel SDM vol. 1, section 3.4.1.1).
TEST(sub_register_test, loads_follow_the_partial_register_rules) {
    fake_peripheral peripheral;
    peripheral.map();
    peripheral.set<std::uint64_t>(0, 0x8877665544332211u);
    auto* m = reinterpret_cast<void*>(peripheral_base);
    std::uint64_t a = 0xaaaaaaaaaaaaaaaau;
    std::uint64_t b = 0xbbbbbbbbbbbbbbbbu;
    asm volatile("movb (%[m]), %%ah\n\tmovb 1(%[m]), %%bh"
                 : "+a"(a), "+b"(b)
                 : [m] "r"(m)
                 : "memory");
    EXPECT_EQ(a, 0xaaaaaaaaaaaa11aau);
    EXPECT_EQ(b, 0xbbbbbbbbbbbb22bbu);
    std::uint64_t c = 0xccccccccccccccccu;
    std::uint64_t d = 0xddddddddddddddddu;
    asm volatile("movb (%[m]), %%cl\n\tmovw 2(%[m]), %%dx"
                 : "+c"(c), "+d"(d)
                 : [m] "r"(m)
                 : "memory");
    EXPECT_EQ(c, 0xcccccccccccccc11u);
    EXPECT_EQ(d, 0xdddddddddddd4433u);
    asm volatile("movl 4(%[m]), %%eax" : "+a"(a) : [m] "r"(m) : "memory");
    EXPECT_EQ(a, 0x88776655u);
    // A store from a high-byte register writes bits 8 to 15.
    a = 0x1234;
    asm volatile("movb %%ah, 8(%[m])\n\taddb %%ah, 9(%[m])"
                 :
                 : "a"(a), [m] "r"(m)
                 : "memory", "cc");
    EXPECT_EQ(peripheral.get<std::uint8_t>(8), 0x12);
    EXPECT_EQ(peripheral.get<std::uint8_t>(9), 0x12);
}

// A constant absolute address, as a driver's register macros produce (32-bit displacement, no
// base register).
TEST(absolute_address_test, loads_and_stores_at_a_constant_address) {
    fake_peripheral peripheral;
    peripheral.map();
    std::uint32_t v = 0;
    asm volatile("movl $0x600d, 0x50000010\n\tmovl 0x50000010, %k[v]" : [v] "=r"(v) : : "memory");
    EXPECT_EQ(v, 0x600du);
    EXPECT_EQ(peripheral.get<std::uint32_t>(0x10), 0x600du);
}

}  // namespace
}  // namespace trap_test
