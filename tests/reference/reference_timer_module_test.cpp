// The SystemC shell of the reference timer: one activation per clock edge drives the pin signals.
// This is the only test in the binary that starts the SystemC kernel (it can elaborate only once
// per process; CTest runs each test in its own process).

#include "models/reference/reference_timer_module.h"
#include "tests/support/timer_event_log.h"

#include <gtest/gtest.h>
#include <systemc>

namespace tickbench::test_reference {
namespace {

using models::main_pin;
using models::timer_field;

TEST(reference_timer_module_test, drives_pins_from_clock_edges) {
    // 1 GHz: the sc_clock's 1 ns period is exact, so clock edges and domain ticks coincide.
    sim::clock_domain domain(sim::frequency::hz(1'000'000'000));
    sc_core::sc_clock clk("clk", sc_core::sc_time(1, sc_core::SC_NS));
    models::timer_config cfg;
    cfg.channels = 2;
    test_support::timer_event_log log;
    models::reference::reference_timer_module timer("timer", cfg, domain, &log);
    timer.clock(clk);

    timer.write(timer_field::period, 0, 9);
    timer.write(timer_field::compare, 0, 4);
    timer.write(timer_field::main_enable, 0, 1);
    timer.write(timer_field::action, 0,
                static_cast<std::uint32_t>(models::output_action::pwm_below));
    timer.write(timer_field::irq_enable, 0, models::flag_reload);
    timer.write(timer_field::enable, 0, 1);
    sc_core::sc_start(sc_core::sc_time(1000, sc_core::SC_NS) +
                      sc_core::sc_time(500, sc_core::SC_PS));

    const auto rises = log.pin_edges(main_pin(0), true);
    ASSERT_EQ(rises.size(), 101u);  // at 0 ns, then every 10 ns
    EXPECT_EQ(rises[1], 10'000u);
    EXPECT_EQ(rises[100], 1'000'000u);
    EXPECT_EQ(log.pin_edges(main_pin(0), false).front(), 4'000u);
    EXPECT_TRUE(timer.pins[main_pin(0)].read());  // counter 0 after the wrap at 1000 ns
    EXPECT_TRUE(timer.irq.read());
    EXPECT_EQ(timer.read(timer_field::counter), 0u);
}

TEST(reference_timer_module_test, forwards_input_edges_and_chained_pulses) {
    sim::clock_domain domain(sim::frequency::hz(1'000'000'000));
    sc_core::sc_clock clk("clk", sc_core::sc_time(1, sc_core::SC_NS));
    models::timer_config cfg;
    cfg.channels = 2;
    models::reference::reference_timer_module timer("timer", cfg, domain);
    timer.clock(clk);
    timer.write(timer_field::period, 0, 0xffff);
    timer.write(timer_field::channel_role, 1,
                static_cast<std::uint32_t>(models::channel_role::capture_own));
    timer.write(timer_field::trigger_source, 0,
                static_cast<std::uint32_t>(models::trigger_source::chained));
    timer.write(timer_field::enable, 0, 1);

    // An input edge between two ticks: the capture comes 2 ticks later (synchroniser depth 2,
    // filter length 1), with the counter as it stands after that tick.
    sc_core::sc_start(sc_core::sc_time(250'500, sc_core::SC_PS));
    timer.set_input(models::input_of_channel(1), true);
    sc_core::sc_start(sc_core::sc_time(2, sc_core::SC_NS));
    const std::uint32_t at_capture = timer.read(timer_field::counter);
    sc_core::sc_start(sc_core::sc_time(10, sc_core::SC_NS));
    EXPECT_NE(timer.read(timer_field::flags) & models::flag_channel(1), 0u);
    EXPECT_GT(at_capture, 200u);
    EXPECT_EQ(timer.read(timer_field::compare, 1), at_capture);  // (the read clears the flag)

    EXPECT_EQ(timer.read(timer_field::flags) & models::flag_trigger, 0u);
    timer.chained_pulse();
    sc_core::sc_start(sc_core::sc_time(2, sc_core::SC_NS));
    EXPECT_NE(timer.read(timer_field::flags) & models::flag_trigger, 0u);
}

}  // namespace
}  // namespace tickbench::test_reference
