// Driver-style volatile code at -O0, -O1 and -O2 against the fake peripheral on a trapped page:
// each value read and written, the order and width of the accesses, and the flags the compiled
// code branches on after a trapped cmp, test or bt.

#include "volatile_forms.h"
#include "fake_peripheral.h"

#include <gtest/gtest.h>

#include <vector>

namespace trap_test {
namespace {

access_record rd(std::uint64_t offset, unsigned width, std::uint64_t value) {
    return {offset, width, false, value};
}
access_record wr(std::uint64_t offset, unsigned width, std::uint64_t value) {
    return {offset, width, true, value};
}

class volatile_forms_test : public ::testing::TestWithParam<const form_set*> {
protected:
    void SetUp() override { peripheral.map(); }
    const form_set& f() const { return *GetParam(); }
    // The accesses made since the last call.
    std::vector<access_record> take_log() {
        std::vector<access_record> out;
        out.swap(peripheral.log);
        return out;
    }
    fake_peripheral peripheral;
};

using records = std::vector<access_record>;

TEST_P(volatile_forms_test, plain_loads_of_each_width) {
    peripheral.set<std::uint8_t>(reg8_offset, 0x9c);
    peripheral.set<std::uint16_t>(reg16_offset, 0xa55a);
    peripheral.set<std::uint32_t>(reg32_offset, 0xdeadbeef);
    peripheral.set<std::uint64_t>(reg64_offset, 0x0123456789abcdefu);
    EXPECT_EQ(f().read8(), 0x9c);
    EXPECT_EQ(f().read16(), 0xa55a);
    EXPECT_EQ(f().read32(), 0xdeadbeefu);
    EXPECT_EQ(f().read64(), 0x0123456789abcdefu);
    EXPECT_EQ(take_log(),
              (records{rd(reg8_offset, 1, 0x9c), rd(reg16_offset, 2, 0xa55a),
                       rd(reg32_offset, 4, 0xdeadbeef), rd(reg64_offset, 8, 0x0123456789abcdefu)}));
}

TEST_P(volatile_forms_test, stores_of_each_width_leave_neighbours_alone) {
    peripheral.fill(0xee);
    f().write8(0x12);
    f().write16(0x3456);
    f().write32(0x789abcde);
    f().write64(0xfedcba9876543210u);
    EXPECT_EQ(peripheral.get<std::uint8_t>(reg8_offset), 0x12);
    EXPECT_EQ(peripheral.get<std::uint8_t>(reg8_offset + 1), 0xee);
    EXPECT_EQ(peripheral.get<std::uint16_t>(reg16_offset), 0x3456);
    EXPECT_EQ(peripheral.get<std::uint32_t>(reg32_offset), 0x789abcdeu);
    EXPECT_EQ(peripheral.get<std::uint64_t>(reg64_offset), 0xfedcba9876543210u);
    EXPECT_EQ(peripheral.get<std::uint8_t>(sreg8_offset), 0xee);
    EXPECT_EQ(take_log(),
              (records{wr(reg8_offset, 1, 0x12), wr(reg16_offset, 2, 0x3456),
                       wr(reg32_offset, 4, 0x789abcde), wr(reg64_offset, 8, 0xfedcba9876543210u)}));
}

TEST_P(volatile_forms_test, immediate_stores) {
    f().write_constants();
    EXPECT_EQ(take_log(),
              (records{wr(reg8_offset, 1, 0xa5), wr(reg16_offset, 2, 0xbeef),
                       wr(reg32_offset, 4, 0x12345678), wr(reg64_offset, 8, 0xfffffffffffffffeu)}));
    f().write_wide_constant();
    EXPECT_EQ(peripheral.get<std::uint64_t>(reg64_offset), 0x1122334455667788u);
}

TEST_P(volatile_forms_test, sign_extending_loads) {
    peripheral.set<std::int8_t>(sreg8_offset, -5);
    peripheral.set<std::int16_t>(sreg16_offset, -30000);
    peripheral.set<std::int32_t>(sreg32_offset, -2000000000);
    EXPECT_EQ(f().read_signed8(), -5);
    EXPECT_EQ(f().read_signed16(), -30000);
    EXPECT_EQ(f().read_signed32(), -2000000000);
    peripheral.set<std::int8_t>(sreg8_offset, 100);
    peripheral.set<std::int32_t>(sreg32_offset, 0x7fffffff);
    EXPECT_EQ(f().read_signed8(), 100);
    EXPECT_EQ(f().read_signed32(), 0x7fffffff);
}

TEST_P(volatile_forms_test, read_modify_write_is_a_read_then_a_write) {
    peripheral.set<std::uint32_t>(status_offset, 0xf0);
    f().set_bit0();
    f().clear_bit4();
    f().toggle_low_bits();
    EXPECT_EQ(peripheral.get<std::uint32_t>(status_offset), 0xe2u);
    EXPECT_EQ(take_log(), (records{rd(status_offset, 4, 0xf0), wr(status_offset, 4, 0xf1),
                                   rd(status_offset, 4, 0xf1), wr(status_offset, 4, 0xe1),
                                   rd(status_offset, 4, 0xe1), wr(status_offset, 4, 0xe2)}));
}

TEST_P(volatile_forms_test, arithmetic_on_registers) {
    peripheral.set<std::uint32_t>(reg32_offset, 0xfffffff0);
    f().add_to32(0x20);
    EXPECT_EQ(peripheral.get<std::uint32_t>(reg32_offset), 0x10u);
    peripheral.set<std::uint8_t>(reg8_offset, 1);
    f().subtract3_from8();
    EXPECT_EQ(peripheral.get<std::uint8_t>(reg8_offset), 0xfe);
    peripheral.set<std::uint16_t>(reg16_offset, 0xffff);
    f().increment16();
    EXPECT_EQ(peripheral.get<std::uint16_t>(reg16_offset), 0);
    peripheral.set<std::uint64_t>(reg64_offset, 0);
    f().decrement64();
    EXPECT_EQ(peripheral.get<std::uint64_t>(reg64_offset), ~std::uint64_t{0});
    peripheral.set<std::uint32_t>(reg32_offset, 0x0f0f0000);
    f().invert32();
    EXPECT_EQ(peripheral.get<std::uint32_t>(reg32_offset), 0xf0f0ffffu);
    peripheral.set<std::uint32_t>(reg32_offset, 5);
    f().negate32();
    EXPECT_EQ(peripheral.get<std::uint32_t>(reg32_offset), 0xfffffffbu);
    peripheral.set<std::uint8_t>(reg8_offset, 0x01);
    f().or_into8(0x80);
    EXPECT_EQ(peripheral.get<std::uint8_t>(reg8_offset), 0x81);
    take_log();
    peripheral.set<std::uint32_t>(reg32_offset, 7);
    f().add_to32(1);
    EXPECT_EQ(take_log(), (records{rd(reg32_offset, 4, 7), wr(reg32_offset, 4, 8)}));
}

TEST_P(volatile_forms_test, branches_on_flags_of_trapped_compares_and_tests) {
    peripheral.set<std::uint32_t>(status_offset, 0x10);
    EXPECT_FALSE(f().bit4_clear());
    peripheral.set<std::uint32_t>(status_offset, 0xef);
    EXPECT_TRUE(f().bit4_clear());
    EXPECT_TRUE(f().status_equals(0xef));
    EXPECT_FALSE(f().status_equals(0xee));
    EXPECT_TRUE(f().status_below(0xf0));
    EXPECT_FALSE(f().status_below(0xef));
    peripheral.set<std::uint32_t>(status_offset, 0x80000000u);
    EXPECT_FALSE(f().status_below(0x7fffffff));  // unsigned: CF, not SF/OF
    EXPECT_TRUE(f().status_bit_set(31));
    EXPECT_FALSE(f().status_bit_set(30));
    peripheral.set<std::int32_t>(sreg32_offset, -1);
    EXPECT_TRUE(f().sreg32_negative());
    peripheral.set<std::int32_t>(sreg32_offset, 0x7fffffff);
    EXPECT_FALSE(f().sreg32_negative());
}

TEST_P(volatile_forms_test, bit_set_by_variable_position) {
    peripheral.set<std::uint32_t>(status_offset, 0);
    f().status_set_bit(0);
    f().status_set_bit(17);
    f().status_set_bit(31);
    EXPECT_EQ(peripheral.get<std::uint32_t>(status_offset), 0x80020001u);
}

TEST_P(volatile_forms_test, register_as_source_operand_and_indexed_addressing) {
    peripheral.set<std::uint32_t>(status_offset, 0x100);
    EXPECT_EQ(f().plus_status(0x23), 0x123u);
    for (unsigned i = 0; i < 8; ++i) peripheral.set<std::uint32_t>(array_offset + 4 * i, 1u << i);
    take_log();
    EXPECT_EQ(f().sum_array(8), 0xffu);
    const records log = take_log();
    ASSERT_EQ(log.size(), 8u);
    for (unsigned i = 0; i < 8; ++i) EXPECT_EQ(log[i], rd(array_offset + 4 * i, 4, 1u << i));
}

TEST_P(volatile_forms_test, polling_loop_sees_the_register_change) {
    peripheral.set<std::uint32_t>(status_offset, 0);
    int reads = 0;
    peripheral.after_access = [&reads](fake_peripheral& p, const access_record& r) {
        if (!r.is_write && r.offset == status_offset && ++reads == 5)
            p.set<std::uint32_t>(status_offset, 0x10);
    };
    f().wait_until_bit4_set();
    EXPECT_EQ(reads, 6);
}

std::vector<const form_set*> all_levels() {
    std::vector<const form_set*> levels{&forms_o0(), &forms_o1(), &forms_o2()};
#ifdef TICKBENCH_TRAP_CLANG_FORMS
    levels.push_back(&forms_clang_o2());
#endif
    return levels;
}

INSTANTIATE_TEST_SUITE_P(levels, volatile_forms_test, ::testing::ValuesIn(all_levels()),
                         [](const ::testing::TestParamInfo<const form_set*>& param_info) {
                             return std::string(param_info.param->level);
                         });

}  // namespace
}  // namespace trap_test
