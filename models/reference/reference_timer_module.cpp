#include "models/reference/reference_timer_module.h"

#include <stdexcept>

namespace models::reference {

reference_timer_module::reference_timer_module(sc_core::sc_module_name name,
                                               const timer_config& cfg,
                                               const sim::clock_domain& timer_clock,
                                               timer_observer* extra)
    : sc_core::sc_module(name),
      clock("clock"),
      pins("pin", 2 * cfg.channels),
      irq("irq"),
      trigger_event("trigger_event"),
      observer_(*this, extra),
      core_(cfg, timer_clock, &observer_) {
    if (sc_core::sc_get_time_resolution() != sc_core::sc_time(1, sc_core::SC_PS))
        throw std::logic_error("reference_timer_module: needs a 1 ps time resolution, found " +
                               sc_core::sc_get_time_resolution().to_string());
    SC_METHOD(on_clock_rise);
    sensitive << clock.pos();
    dont_initialize();
}

time_ps reference_timer_module::now_ps() {
    return static_cast<time_ps>(sc_core::sc_time_stamp().value());
}

void reference_timer_module::on_clock_rise() { core_.advance_to(now_ps()); }

void reference_timer_module::write(timer_field f, unsigned channel, std::uint32_t value) {
    core_.write(f, channel, value, now_ps());
}

std::uint32_t reference_timer_module::read(timer_field f, unsigned channel) {
    return core_.read(f, channel, now_ps());
}

void reference_timer_module::clear_flags(std::uint32_t mask) { core_.clear_flags(mask, now_ps()); }

void reference_timer_module::set_fault_input(bool level) { core_.set_fault_input(level, now_ps()); }

void reference_timer_module::set_input(unsigned input, bool level) {
    core_.set_input(input, level, now_ps());
}

void reference_timer_module::chained_pulse() { core_.chained_pulse(now_ps()); }

void reference_timer_module::signal_observer::on_pin(unsigned pin, bool level, time_ps at) {
    owner_.pins[pin].write(level);
    if (extra_) extra_->on_pin(pin, level, at);
}

void reference_timer_module::signal_observer::on_flags_set(std::uint32_t bits, time_ps at) {
    if (extra_) extra_->on_flags_set(bits, at);
}

void reference_timer_module::signal_observer::on_irq(bool level, time_ps at) {
    owner_.irq.write(level);
    if (extra_) extra_->on_irq(level, at);
}

void reference_timer_module::signal_observer::on_trigger(time_ps at) {
    owner_.trigger_event.notify(sc_core::SC_ZERO_TIME);
    if (extra_) extra_->on_trigger(at);
}

}  // namespace models::reference
