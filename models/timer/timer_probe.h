#pragma once
// The bridge from a timer model to the signal sinks (waveform writer, checks).
//
// sim/ knows nothing of the models, so the adapter lives here: a timer_observer that declares one
// timer's outputs in a sim::signal_sink and forwards every pin and interrupt-request change to it
// with the model's exact time. It may pass all reports on to another observer, so a timer can feed
// a waveform and, say, the bus shell's interrupt wiring at once.

#include "models/timer/timer_inputs.h"
#include "models/timer/timer_types.h"
#include "sim/signal_sink.h"

#include <string>
#include <vector>

namespace models {

// One input a probe shows: which, its name ("input1", "trigger", "fault") and its level at time 0.
struct shown_input {
    unsigned input = 0;
    std::string name;
    bool initial = false;
};

class timer_probe final : public timer_observer, public input_observer {
public:
    // Declares in `sink`, with ids first_id, first_id + 1, ... in this order: for each channel c
    // (1-based) "<timer_name>.channel<c>" and, when the timer has complementary outputs,
    // "<timer_name>.channel<c>_complement"; then "<timer_name>.irq"; then each of `inputs` as
    // "<timer_name>.<name>". Outputs start low, as a timer's do at reset, inputs at their initial
    // level, so the probe must be attached before the timer runs. Reports go on to `next` (may be
    // null) after the sink has them. The sink and `next` must outlive the probe.
    timer_probe(const std::string& timer_name, const timer_config& cfg, sim::signal_sink& sink,
                sim::signal_id first_id, timer_observer* next = nullptr,
                const std::vector<shown_input>& inputs = {});

    void on_pin(unsigned pin, bool level, time_ps at) override;
    void on_flags_set(std::uint32_t bits, time_ps at) override;
    void on_irq(bool level, time_ps at) override;
    void on_trigger(time_ps at) override;
    // A shown input's level reaches the sink; others are not shown.
    void on_input(unsigned input, bool level, time_ps at) override;

    // The first id after the ones this probe declared (where the next probe's ids begin).
    sim::signal_id end_id() const { return end_id_; }
    // The signal id of output pin `pin` (main_pin(c) or comp_pin(c)); throws std::out_of_range
    // for a pin the timer lacks.
    sim::signal_id pin_signal(unsigned pin) const;
    // The signal id of the interrupt request line.
    sim::signal_id irq_signal() const { return irq_id_; }

private:
    static constexpr sim::signal_id none_ = ~sim::signal_id{0};

    sim::signal_sink& sink_;
    timer_observer* next_;
    std::vector<sim::signal_id> pin_ids_;    // by pin number; none_ for pins not declared
    std::vector<sim::signal_id> input_ids_;  // by input number; none_ for inputs not shown
    sim::signal_id irq_id_ = 0;
    sim::signal_id end_id_ = 0;
};

}  // namespace models
