#include "models/timer/timer_probe.h"

#include <stdexcept>

namespace models {

timer_probe::timer_probe(const std::string& timer_name, const timer_config& cfg,
                         sim::signal_sink& sink, sim::signal_id first_id, timer_observer* next,
                         const std::vector<shown_input>& inputs)
    : sink_(sink), next_(next), pin_ids_(2 * cfg.channels, none_), input_ids_(input_count, none_) {
    sim::signal_id id = first_id;
    for (unsigned c = 0; c < cfg.channels; ++c) {
        const std::string name = "channel" + std::to_string(c + 1);
        pin_ids_[main_pin(c)] = id;
        sink_.declare(id++, sim::signal_info{timer_name, name, false});
        if (cfg.complementary) {
            pin_ids_[comp_pin(c)] = id;
            sink_.declare(id++, sim::signal_info{timer_name, name + "_complement", false});
        }
    }
    irq_id_ = id;
    sink_.declare(id++, sim::signal_info{timer_name, "irq", false});
    for (const shown_input& in : inputs) {
        input_ids_.at(in.input) = id;
        sink_.declare(id++, sim::signal_info{timer_name, in.name, in.initial});
    }
    end_id_ = id;
}

sim::signal_id timer_probe::pin_signal(unsigned pin) const {
    if (pin >= pin_ids_.size() || pin_ids_[pin] == none_)
        throw std::out_of_range("timer_probe: the timer has no output pin " + std::to_string(pin));
    return pin_ids_[pin];
}

void timer_probe::on_pin(unsigned pin, bool level, time_ps at) {
    // A pin not declared (a complementary output of a timer without them) has nothing to show.
    if (pin < pin_ids_.size() && pin_ids_[pin] != none_) sink_.change(pin_ids_[pin], level, at);
    if (next_ != nullptr) next_->on_pin(pin, level, at);
}

void timer_probe::on_flags_set(std::uint32_t bits, time_ps at) {
    if (next_ != nullptr) next_->on_flags_set(bits, at);
}

void timer_probe::on_irq(bool level, time_ps at) {
    sink_.change(irq_id_, level, at);
    if (next_ != nullptr) next_->on_irq(level, at);
}

void timer_probe::on_input(unsigned input, bool level, time_ps at) {
    if (input < input_ids_.size() && input_ids_[input] != none_)
        sink_.change(input_ids_[input], level, at);
}

void timer_probe::on_trigger(time_ps at) {
    if (next_ != nullptr) next_->on_trigger(at);
}

}  // namespace models
