#pragma once

// Driver-style volatile register code, compiled three times (volatile_forms_o0/o1/o2.cpp at -O0,
// -O1 and -O2) so that the tests see each instruction form the compiler picks at each level.
// The registers sit at fixed addresses in the fake peripheral, like a real part's.

#include <cstdint>

namespace trap_test {

// Register offsets in the fake peripheral.
constexpr std::uint64_t reg8_offset = 0x00;
constexpr std::uint64_t reg16_offset = 0x02;
constexpr std::uint64_t reg32_offset = 0x04;
constexpr std::uint64_t reg64_offset = 0x08;
constexpr std::uint64_t sreg8_offset = 0x10;
constexpr std::uint64_t sreg16_offset = 0x12;
constexpr std::uint64_t sreg32_offset = 0x14;
constexpr std::uint64_t status_offset = 0x18;
constexpr std::uint64_t array_offset = 0x20;  // 8 32-bit registers

// The functions of one optimisation level.
struct form_set {
    const char* level;
    std::uint8_t (*read8)();
    std::uint16_t (*read16)();
    std::uint32_t (*read32)();
    std::uint64_t (*read64)();
    void (*write8)(std::uint8_t);
    void (*write16)(std::uint16_t);
    void (*write32)(std::uint32_t);
    void (*write64)(std::uint64_t);
    void (*write_constants)();       // 0xa5, 0xbeef, 0x12345678, -2 into the four registers
    void (*write_wide_constant)();   // 0x1122334455667788 into the 64-bit register
    std::int32_t (*read_signed8)();  // sign-extending loads
    std::int32_t (*read_signed16)();
    std::int64_t (*read_signed32)();
    void (*set_bit0)();               // status |= 1
    void (*clear_bit4)();             // status &= ~0x10
    void (*toggle_low_bits)();        // status ^= 3
    void (*add_to32)(std::uint32_t);  // reg32 += x
    void (*subtract3_from8)();        // reg8 -= 3
    void (*increment16)();            // reg16++
    void (*decrement64)();            // reg64--
    void (*invert32)();               // reg32 = ~reg32
    void (*negate32)();               // reg32 = -reg32
    void (*or_into8)(std::uint8_t);   // reg8 |= x
    bool (*bit4_clear)();             // (status & 0x10) == 0
    bool (*status_equals)(std::uint32_t);
    bool (*status_below)(std::uint32_t);
    bool (*sreg32_negative)();                    // (signed) < 0
    bool (*status_bit_set)(unsigned);             // (status >> n) & 1
    void (*status_set_bit)(unsigned);             // status |= 1 << n
    std::uint32_t (*plus_status)(std::uint32_t);  // x + status
    std::uint32_t (*sum_array)(int);              // sum of the first n array registers, by index
    void (*wait_until_bit4_set)();                // polls status until bit 4 is set
};

const form_set& forms_o0();
const form_set& forms_o1();
const form_set& forms_o2();
// Compiled by Clang; linked only when TICKBENCH_TRAP_CLANG_FORMS is defined.
const form_set& forms_clang_o2();

}  // namespace trap_test
