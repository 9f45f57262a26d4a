// Bring your own part: a driver written for a part whose encodings are not the model's runs
// unmodified. The Saltmarsh sample part (a fictional part of our own, docs/register-layouts.md,
// "Bring your own part") describes its pulse timer in tests/data/parts/saltmarsh_pulse_timer.toml:
// value tables for its count styles, reload rules, trigger sources and pin functions, an inverted
// halt bit, flags cleared by writing 0. Its driver (own_part/saltmarsh_pwm_driver.c, compiled at
// -O2) reaches the registers through volatile pointers at the part's own address; the trap engine
// services every access. The test checks the PWM it programs and its wrap interrupts, then runs the
// same driver logic written for the demo part (own_part/demo_pwm_driver.c, layout timer16_quad) and
// requires the same waveform.

#include "harness/testing/firmware_fixture.h"
#include "models/timer/timer_types.h"
#include "tests/harness/own_part/demo_pwm_driver.h"
#include "tests/harness/own_part/saltmarsh_pulse_timer.h"
#include "tickbench/firmware.h"

#include <gtest/gtest.h>

#include <cinttypes>
#include <cstdio>
#include <ostream>
#include <string>
#include <vector>

namespace {

// 72 MHz (8 MHz crystal, PLL x9) clocks the cpu and both timers. The counter steps every 9 clocks
// (8 MHz, 125 ns per count) through 0..399: a 50 us period (20 kHz); pin 0 is active for 100 counts
// (12.5 us, 25 %), pin 1 for 300 (37.5 us, 75 %).
constexpr std::uint16_t divider = 8;
constexpr std::uint16_t top = 399;
constexpr std::uint16_t duty0 = 100;
constexpr std::uint16_t duty1 = 300;
constexpr harness::time_ps count_ps = 125'000;
constexpr harness::time_ps period_ps = (top + 1) * count_ps;
constexpr harness::time_ps run_ps = 1'200'000'000;  // 1.2 ms

// One change of an output pin or of the interrupt line, as a timer reported it.
struct signal_edge {
    unsigned pin = 0;  // main_pin(c) for channel c's output; irq_line for the interrupt line
    bool level = false;
    harness::time_ps at = 0;
    bool operator==(const signal_edge& o) const {
        return pin == o.pin && level == o.level && at == o.at;
    }
};
constexpr unsigned irq_line = 100;

void PrintTo(const signal_edge& e, std::ostream* out) {
    *out << (e.pin == irq_line ? "irq" : "pin " + std::to_string(e.pin)) << " -> " << e.level
         << " at " << e.at << " ps";
}

// Records, in the run's child, what one timer's outputs and interrupt line did; after the run the
// records travel to the test process as log lines "edge PIN LEVEL PS".
class signal_recorder : public models::timer_observer {
public:
    void on_pin(unsigned pin, bool level, harness::time_ps at) override {
        edges_.push_back({pin, level, at});
    }
    void on_flags_set(std::uint32_t, harness::time_ps) override {}
    void on_irq(bool level, harness::time_ps at) override {
        edges_.push_back({irq_line, level, at});
    }
    void on_trigger(harness::time_ps) override {}
    void send() const {
        for (const signal_edge& e : edges_)
            tick_log("edge %u %d %" PRIu64, e.pin, e.level ? 1 : 0, e.at);
    }

private:
    std::vector<signal_edge> edges_;
};

signal_recorder pulse_signals;      // the Saltmarsh pulse timer
signal_recorder stopwatch_signals;  // the demo part's timer16_quad

// The edges a run sent back, in order.
std::vector<signal_edge> edges_of(const harness::firmware_run& r) {
    std::vector<signal_edge> out;
    for (const harness::firmware_log_line& l : r.log) {
        unsigned pin = 0;
        int level = 0;
        std::uint64_t at = 0;
        if (std::sscanf(l.text.c_str(), "edge %u %d %" SCNu64, &pin, &level, &at) == 3)
            out.push_back({pin, level != 0, at});
    }
    return out;
}

std::vector<harness::time_ps> times_of(const std::vector<signal_edge>& edges, unsigned pin,
                                       bool level) {
    std::vector<harness::time_ps> out;
    for (const signal_edge& e : edges)
        if (e.pin == pin && e.level == level) out.push_back(e.at);
    return out;
}

// Times of the handler entries a run logged.
std::vector<harness::time_ps> handler_entries(const harness::firmware_run& r) {
    std::vector<harness::time_ps> out;
    for (const harness::firmware_log_line& l : r.log)
        if (l.text == "wrap interrupt") out.push_back(l.at);
    return out;
}

// The board code of each part: its vector table entry (a handler per line, here logging each
// entry) and a main that calls the driver, then sleeps, waking for each interrupt.
void saltmarsh_main() {
    const int line = tick_irq_line("pulse");
    tick_irq_set_handler(static_cast<unsigned>(line), [] {
        tick_log("wrap interrupt");
        salt_pulse_timer_isr();
    });
    salt_pwm_init(SALT_PT0, divider, top, duty0, duty1);
    salt_wrap_irq_enable(SALT_PT0);
    tick_irq_line_enable(static_cast<unsigned>(line));
    salt_pwm_start(SALT_PT0);
    for (;;) tick_wait_for_interrupt();
}

void demo_main() {
    const int line = tick_irq_line("stopwatch");
    tick_irq_set_handler(static_cast<unsigned>(line), [] {
        tick_log("wrap interrupt");
        demo_pwm_timer_isr();
    });
    demo_pwm_init(divider, top, duty0, duty1);
    demo_reload_irq_enable();
    tick_irq_line_enable(static_cast<unsigned>(line));
    demo_pwm_start();
    for (;;) tick_wait_for_interrupt();
}

// Both parts' timers on one bus, mapped at their real addresses for unmodified drivers.
class own_part_test : public harness::firmware_fixture {
protected:
    void SetUp() override {
        add_pll_clock("sys", 8'000'000, 9);
        harness::timer_spec& pulse = add_timer(
            "pulse",
            std::string(TICKBENCH_SOURCE_DIR) + "/tests/data/parts/saltmarsh_pulse_timer.toml",
            "sys", SALT_PT0_ADDRESS);
        pulse.observers.push_back(&pulse_signals);
        harness::timer_spec& stopwatch =
            add_timer("stopwatch", "timer16_quad", "sys", DEMO_PWM_TIMER_ADDRESS);
        stopwatch.observers.push_back(&stopwatch_signals);
        map_peripherals();
    }
};

// The channel outputs' edges (main pins of channels 0 and 1) and the interrupt line's, up to
// `until`.
std::vector<signal_edge> outputs_until(const std::vector<signal_edge>& edges,
                                       harness::time_ps until) {
    std::vector<signal_edge> out;
    for (const signal_edge& e : edges)
        if ((e.pin == models::main_pin(0) || e.pin == models::main_pin(1) || e.pin == irq_line) &&
            e.at <= until)
            out.push_back(e);
    return out;
}

// The wraps the driver's handler counted, as the child's last log line "wraps counted: N".
unsigned wraps_counted(const harness::firmware_run& r) {
    unsigned n = 0;
    for (const harness::firmware_log_line& l : r.log)
        std::sscanf(l.text.c_str(), "wraps counted: %u", &n);
    return n;
}

TEST_F(own_part_test, an_unmodified_driver_for_the_sample_part_makes_its_pwm_and_interrupts) {
    after_run([](harness::platform&) {
        pulse_signals.send();
        tick_log("wraps counted: %u", static_cast<unsigned>(salt_wraps));
    });
    const harness::firmware_run& r = run_firmware(saltmarsh_main, run_ps);
    ASSERT_TRUE(r.passed());
    // The firmware may run ahead of the run's end up to a quantum; the checks look at the run.
    std::vector<signal_edge> edges;
    for (const signal_edge& e : edges_of(r))
        if (e.at <= run_ps) edges.push_back(e);

    // Pins 0 and 1 go active together when the driver drives them (the counter stands at 0,
    // below both compares); the counter starts with the driver's next write. From then on every
    // wrap raises both pins, exactly one period apart, and each falls exactly its compare's counts
    // later.
    const auto rise0 = times_of(edges, models::main_pin(0), true);
    const auto fall0 = times_of(edges, models::main_pin(0), false);
    const auto rise1 = times_of(edges, models::main_pin(1), true);
    const auto fall1 = times_of(edges, models::main_pin(1), false);
    ASSERT_GE(rise0.size(), 2u);
    EXPECT_EQ(rise1, rise0);
    ASSERT_EQ(fall0.size(), rise0.size());
    ASSERT_EQ(fall1.size(), rise0.size());
    // The counter's first count: its first fall is the compare's counts after it.
    const harness::time_ps start = fall0[0] - duty0 * count_ps;
    EXPECT_GT(start, rise0[0]);
    EXPECT_LT(start, rise0[0] + harness::us(1));
    EXPECT_EQ(fall1[0], start + duty1 * count_ps);
    for (std::size_t k = 1; k < rise0.size(); ++k) {
        SCOPED_TRACE(k);
        EXPECT_EQ(rise0[k], start + k * period_ps);
        EXPECT_EQ(fall0[k], rise0[k] + duty0 * count_ps);
        EXPECT_EQ(fall1[k], rise0[k] + duty1 * count_ps);
    }

    // The wrap interrupt: the line rises at every wrap of the run (the pins' rising edges from the
    // second on); the handler, entered shortly after, clears it through the part's
    // write-zero-to-clear rule, so it falls well before the next wrap.
    const auto irq_up = times_of(edges, irq_line, true);
    const auto irq_down = times_of(edges, irq_line, false);
    const std::vector<harness::time_ps> wraps(rise0.begin() + 1, rise0.end());
    EXPECT_EQ(irq_up, wraps);
    EXPECT_EQ(wraps.size(), (run_ps - start) / period_ps);
    const auto entries = handler_entries(r);
    ASSERT_GE(entries.size(), irq_up.size());
    ASSERT_EQ(irq_down.size(), irq_up.size());
    for (std::size_t k = 0; k < irq_up.size(); ++k) {
        SCOPED_TRACE(k);
        EXPECT_GT(entries[k], irq_up[k]);
        EXPECT_LT(entries[k], irq_up[k] + harness::us(1));
        EXPECT_GT(irq_down[k], entries[k]);
        EXPECT_LT(irq_down[k], irq_up[k] + harness::us(1));
    }
    // The driver's handler counted each interrupt once (those of the run-ahead too), and every
    // register access went over the bus: 15 in the set-up (three read-modify-writes of ctl and
    // one of irq_on among them), then per interrupt a read of pend and a write to it.
    EXPECT_EQ(wraps_counted(r), entries.size());
    EXPECT_EQ(r.accesses, 15 + 2 * entries.size());
}

TEST_F(own_part_test, the_same_driver_on_the_demo_part_makes_the_same_waveform) {
    after_run([](harness::platform&) { pulse_signals.send(); });
    const auto own = outputs_until(edges_of(run_firmware(saltmarsh_main, run_ps)), run_ps);
    ASSERT_TRUE(last_run().passed());
    after_run([](harness::platform&) {
        stopwatch_signals.send();
        tick_log("wraps counted: %u", static_cast<unsigned>(demo_reloads));
    });
    const auto demo = outputs_until(edges_of(run_firmware(demo_main, run_ps)), run_ps);
    ASSERT_TRUE(last_run().passed());
    EXPECT_EQ(wraps_counted(last_run()), handler_entries(last_run()).size()) << last_run();
    // Per period two pins rising and falling and the interrupt line up and down: six edges, in
    // the 23 periods of the run. Both drivers take the same steps with the same number of
    // accesses (12 before the pins are driven, 2 per interrupt), so the waveforms are the same to
    // the picosecond from time 0.
    ASSERT_GE(own.size(), 6u * 23);
    EXPECT_EQ(own, demo);
}

}  // namespace
