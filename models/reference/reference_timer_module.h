#pragma once
// The SystemC shell around the tick-exact reference timer, the way timer models are commonly
// written in SystemC: one method activation per rising edge of a clock port.
//
// It exists for the benchmark that compares the fast model with the per-tick style
// (fast_vs_reference_speedup) and for test benches that want the reference on signals. Each
// activation processes every tick of the timer clock domain at or before the current time, so the
// reported times stay the domain's exact times even when the sc_clock driving the port is rounded
// to the time resolution. The timing behaviour lives in reference_timer; this module only forwards.

#include "models/reference/reference_timer.h"
#include "models/timer/timer_types.h"
#include "sim/clock_domain.h"

#include <systemc>

#include <cstdint>

namespace models::reference {

class reference_timer_module : public sc_core::sc_module {
public:
    // The timer clock, one activation per rising edge.
    sc_core::sc_in<bool> clock;
    // Output pins, index main_pin(c) / comp_pin(c).
    sc_core::sc_vector<sc_core::sc_signal<bool>> pins;
    // The interrupt request line.
    sc_core::sc_signal<bool> irq;
    // Notified at each trigger pulse.
    sc_core::sc_event trigger_event;

    SC_HAS_PROCESS(reference_timer_module);
    // A reference timer counting the edges of `timer_clock` (which must describe the clock driving
    // the `clock` port and outlive the module). `extra` (may be null) also receives every report.
    // Requires the SystemC time resolution to be 1 ps; throws std::logic_error otherwise.
    reference_timer_module(sc_core::sc_module_name name, const timer_config& cfg,
                           const sim::clock_domain& timer_clock, timer_observer* extra = nullptr);

    // Register access at the current simulation time, from a test-bench process.
    void write(timer_field f, unsigned channel, std::uint32_t value);
    // Register read at the current simulation time.
    std::uint32_t read(timer_field f, unsigned channel = 0);
    // Clear flag bits at the current simulation time.
    void clear_flags(std::uint32_t mask);
    // Fault input change at the current simulation time.
    void set_fault_input(bool level);
    // Input `input` (models::input_of_channel(c) or trigger_pin_input) changes at the current
    // simulation time.
    void set_input(unsigned input, bool level);
    // A pulse on the chained input at the current simulation time.
    void chained_pulse();
    // The plain model inside.
    reference_timer& core() { return core_; }

private:
    // Forwards the model's reports to the signals and to the extra observer.
    class signal_observer final : public timer_observer {
    public:
        signal_observer(reference_timer_module& owner, timer_observer* extra)
            : owner_(owner), extra_(extra) {}
        void on_pin(unsigned pin, bool level, time_ps at) override;
        void on_flags_set(std::uint32_t bits, time_ps at) override;
        void on_irq(bool level, time_ps at) override;
        void on_trigger(time_ps at) override;

    private:
        reference_timer_module& owner_;
        timer_observer* extra_;
    };

    void on_clock_rise();
    static time_ps now_ps();

    signal_observer observer_;
    reference_timer core_;
};

}  // namespace models::reference
