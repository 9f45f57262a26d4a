#pragma once
// The SystemC shell around the fast timer: it owns the output pin signals, the interrupt request
// signal, the trigger event and the one kernel event that wakes the timer at the next instant that
// matters. All behaviour is in timer_core; this module only forwards, schedules and drives signals.
//
// The module is itself a timer_core_if, with the timer's inputs in front of the core
// (timer_inputs.h): a bus target (models/bus/) calls it, each access lands in
// the core at its exact time, and the module reschedules its wake-up. Accesses may come ahead of
// the kernel's time (temporal decoupling); what the core reports for such times is queued and
// driven on the signals when the kernel reaches them.
//
// The kernel wakes the module only for what needs kernel time: signals somebody asked for (pin(),
// irq()) and the trigger event (trigger_event()). Otherwise the module costs the kernel nothing:
// observers still hear every change with its exact time whenever the core is advanced (by a
// register access, by the processor bringing its peripherals up to its time, or by advance_to()
// at the end of a run).

#include "models/timer/timer_core.h"
#include "models/timer/timer_inputs.h"
#include "sim/clock_tree.h"

#include <systemc>

#include <deque>
#include <memory>
#include <string>
#include <vector>

namespace models {

class timer_module : public sc_core::sc_module, public timer_core_if, private timer_observer {
public:
    // A timer counting the edges of clock-tree node `clock_node`. The kernel's time resolution must
    // be 1 ps (the default); the constructor throws std::logic_error otherwise.
    timer_module(const sc_core::sc_module_name& name, const timer_config& cfg,
                 sim::clock_tree& tree, const std::string& clock_node);

    // Optional fault input; when bound, its rising edges reach the core at their exact time.
    sc_core::sc_port<sc_core::sc_signal_in_if<bool>, 1, sc_core::SC_ZERO_OR_MORE_BOUND> fault_in;

    // Output pin p (see main_pin()/comp_pin()); named "<module>.channel<c>" and
    // "...<c>_complement". A pin's signal is driven from the moment it is first asked for here, so
    // ask during elaboration. Pins nobody asks for cost no kernel work: their changes reach
    // observers only, as plain edge reports (docs/architecture.md, "Counters are computed, not
    // ticked").
    sc_core::sc_signal<bool>& pin(unsigned p) {
        driven_.at(p) = true;
        return *pins_.at(p);
    }
    unsigned pin_count() const { return static_cast<unsigned>(pins_.size()); }
    // The interrupt request line as a signal (driven once asked for, like the pins).
    sc_core::sc_signal<bool>& irq() {
        irq_driven_ = true;
        return irq_;
    }
    // Notified at every trigger pulse (from the moment it is first asked for: ask during
    // elaboration).
    const sc_core::sc_event& trigger_event() {
        trigger_requested_ = true;
        return trigger_;
    }
    // True when the kernel must wake the module at the core's events (a signal or the trigger
    // event is in use).
    bool needs_kernel() const;
    std::uint64_t trigger_count() const { return triggers_; }
    // Extra observer (a checker, a recorder) told of everything the core reports, at report time.
    void add_observer(timer_observer* o) { observers_.push_back(o); }
    timer_core& core() { return core_; }
    // The timer's inputs: give them their sources (during elaboration, before any other call).
    // Every call on the module goes through them, so input edges reach the core in time.
    timer_inputs& inputs() { return inputs_; }

    // timer_core_if: forwards to the core and reschedules.
    void advance_to(time_ps t) override;
    void write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) override;
    std::uint32_t read(timer_field f, unsigned channel, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    void set_fault_input(bool level, time_ps t) override;
    void set_input(unsigned input, bool level, time_ps t) override;
    void set_initial_input(unsigned input, bool level) override;
    void chained_pulse(time_ps t) override;
    bool next_event(time_ps& at) const override;
    void clock_changed(time_ps t) override;

private:
    struct queued {
        time_ps at;
        int signal;  // pin index, or -1 for the irq line
        bool level;
    };
    void on_pin(unsigned pin, bool level, time_ps at) override;
    void on_flags_set(std::uint32_t bits, time_ps at) override;
    void on_irq(bool level, time_ps at) override;
    void on_trigger(time_ps at) override;
    void end_of_elaboration() override;
    void wake();
    void fault_changed();
    void reschedule();
    void drive(time_ps now);
    static time_ps now_ps();

    sim::clock_tree& tree_;
    std::string clock_node_;
    timer_core core_;
    timer_inputs inputs_{core_};
    std::vector<std::unique_ptr<sc_core::sc_signal<bool>>> pins_;
    std::vector<bool> driven_;
    bool irq_driven_ = false;
    bool trigger_requested_ = false;
    bool needs_kernel_ = true;  // settled at the end of elaboration
    sc_core::sc_signal<bool> irq_;
    sc_core::sc_event wake_;
    sc_core::sc_event trigger_;
    std::deque<queued> queue_;
    std::deque<time_ps> trigger_times_;
    std::vector<timer_observer*> observers_;
    std::uint64_t triggers_ = 0;
    time_ps scheduled_ = sim::max_time_ps;
    bool in_wake_ = false;  // inside wake(), the signals' only writer
    time_ps wake_now_ = 0;  // the kernel's time during wake()
};

}  // namespace models
