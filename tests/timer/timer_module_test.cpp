// The SystemC shell of the fast timer, in a running kernel. SystemC elaborates once per process,
// so this binary holds a single test that builds one platform.

#include "models/timer/timer_module.h"
#include "sim/clock_tree.h"

#include <gtest/gtest.h>
#include <systemc>

#include <vector>

namespace {

using models::timer_field;

// Watches a pin signal and records the kernel time of each change, as a probe would.
struct pin_probe : sc_core::sc_module {
    SC_HAS_PROCESS(pin_probe);
    pin_probe(const sc_core::sc_module_name& n, sc_core::sc_signal<bool>& s)
        : sc_core::sc_module(n), sig(s) {
        SC_METHOD(sample);
        sensitive << sig.value_changed_event();
        dont_initialize();
    }
    void sample() { changes.push_back({sc_core::sc_time_stamp().value(), sig.read()}); }
    sc_core::sc_signal<bool>& sig;
    std::vector<std::pair<sim::time_ps, bool>> changes;
};

struct firmware_stub : sc_core::sc_module {
    SC_HAS_PROCESS(firmware_stub);
    firmware_stub(const sc_core::sc_module_name& n, models::timer_module& t)
        : sc_core::sc_module(n), timer(t) {
        SC_THREAD(run);
    }
    void run() {
        const auto now = [] { return sc_core::sc_time_stamp().value(); };
        timer.write(timer_field::period, 0, 1919, now());  // 48 MHz / 1920 = 25 kHz
        timer.write(timer_field::compare, 0, 480, now());
        timer.write(timer_field::action, 0,
                    static_cast<std::uint32_t>(models::output_action::pwm_below), now());
        timer.write(timer_field::main_enable, 0, 1, now());
        timer.write(timer_field::enable, 0, 1, now());
        wait(sc_core::sc_time(500, sc_core::SC_US));
        // A write ahead of the kernel's time (temporal decoupling): 7 us in the future.
        timer.write(timer_field::compare, 0, 960, now() + 7'000'000);
    }
    models::timer_module& timer;
};

TEST(timer_module_test, drives_pwm_signals_at_exact_clock_edge_times) {
    sim::clock_tree tree;
    sim::crystal_params x;
    x.nominal = sim::frequency::hz(48'000'000);
    tree.add_crystal("xtal", x);
    models::timer_config cfg;
    cfg.channels = 2;
    models::timer_module timer("fan_timer", cfg, tree, "xtal");
    pin_probe probe("probe", timer.pin(models::main_pin(0)));
    firmware_stub fw("firmware", timer);
    tree.start();
    sc_core::sc_start(sc_core::sc_time(1, sc_core::SC_MS));

    // 25 kHz: a rise every 40 us; duty 25 % (10 us) until the change, then 50 % (20 us). The
    // set-up written at 0 shows at the first clock edge after it (tick 1, 20833 ps), so the first
    // rise is there; the counter wraps at 40 us, 80 us...
    std::vector<sim::time_ps> rises, falls;
    for (const auto& [t, level] : probe.changes) (level ? rises : falls).push_back(t);
    ASSERT_EQ(rises.size(), 25u);
    EXPECT_EQ(rises[0], 20'833u);
    for (std::size_t i = 1; i < rises.size(); ++i) EXPECT_EQ(rises[i], i * 40'000'000) << i;
    EXPECT_EQ(falls[0], 10'000'000u);
    // The compare write landed at 507 us, inside the period starting at 480 us whose counter was
    // then past 960 - so that period's output is already low; 520 us onwards is 50 %.
    EXPECT_EQ(falls[12], 490'000'000u);
    EXPECT_EQ(falls[13], 540'000'000u);
    EXPECT_EQ(falls.back(), 980'000'000u);
}

}  // namespace
