// Dynamic processes (sc_spawn) for the optional fault input.
#define SC_INCLUDE_DYNAMIC_PROCESSES
#include "models/timer/timer_module.h"

#include <stdexcept>

namespace models {

timer_module::timer_module(const sc_core::sc_module_name& name, const timer_config& cfg,
                           sim::clock_tree& tree, const std::string& clock_node)
    : sc_core::sc_module(name),
      fault_in("fault_in"),
      tree_(tree),
      clock_node_(clock_node),
      core_(cfg, tree.domain(clock_node), this, basename()),
      irq_("irq") {
    if (sc_core::sc_get_time_resolution() != sc_core::sc_time(1, sc_core::SC_PS))
        throw std::logic_error(std::string(basename()) +
                               ": the kernel time resolution must be 1 ps; it is " +
                               sc_core::sc_get_time_resolution().to_string());
    for (unsigned c = 0; c < cfg.channels; ++c) {
        const std::string n = "channel" + std::to_string(c + 1);
        pins_.push_back(std::make_unique<sc_core::sc_signal<bool>>(n.c_str()));
        pins_.push_back(std::make_unique<sc_core::sc_signal<bool>>((n + "_complement").c_str()));
    }
    driven_.assign(pins_.size(), false);
    tree_.subscribe(clock_node_, basename(), [this](sim::time_ps t) { clock_changed(t); });
    SC_HAS_PROCESS(timer_module);
    SC_METHOD(wake);
    sensitive << wake_;
}

void timer_module::end_of_elaboration() {
    needs_kernel_ = needs_kernel();
    if (fault_in.size() == 0) return;
    sc_core::sc_spawn_options o;
    o.spawn_method();
    o.dont_initialize();
    o.set_sensitivity(&fault_in->value_changed_event());
    sc_core::sc_spawn([this] { fault_changed(); }, (std::string(basename()) + "_fault").c_str(),
                      &o);
}

time_ps timer_module::now_ps() { return sc_core::sc_time_stamp().value(); }

void timer_module::wake() {
    const time_ps now = now_ps();
    scheduled_ = sim::max_time_ps;
    wake_now_ = now;
    in_wake_ = true;
    drive(now);
    inputs_.advance_to(now);
    in_wake_ = false;
    drive(now);
    reschedule();
}

void timer_module::fault_changed() { set_fault_input(fault_in->read(), now_ps()); }

void timer_module::drive(time_ps now) {
    if (queue_.empty() && trigger_times_.empty()) return;
    while (!queue_.empty() && queue_.front().at <= now) {
        const queued q = queue_.front();
        queue_.pop_front();
        if (q.signal < 0)
            irq_.write(q.level);
        else
            pins_[static_cast<unsigned>(q.signal)]->write(q.level);
    }
    while (!trigger_times_.empty() && trigger_times_.front() <= now) {
        trigger_times_.pop_front();
        trigger_.notify(sc_core::SC_ZERO_TIME);
    }
}

bool timer_module::needs_kernel() const {
    if (irq_driven_ || trigger_requested_) return true;
    for (bool d : driven_)
        if (d) return true;
    return false;
}

void timer_module::reschedule() {
    if (!needs_kernel_) return;  // nobody watches through the kernel: advance on demand only
    const time_ps now = now_ps();
    time_ps next = sim::max_time_ps;
    time_ps core_next;
    if (inputs_.next_event(core_next)) next = core_next;
    if (!queue_.empty()) next = std::min(next, queue_.front().at);
    if (!trigger_times_.empty()) next = std::min(next, trigger_times_.front());
    if (next == sim::max_time_ps || next == scheduled_) return;
    if (next < now) next = now;
    if (scheduled_ != sim::max_time_ps) wake_.cancel();  // only a pending wake-up needs cancelling
    wake_.notify(sc_core::sc_time::from_value(next - now));
    scheduled_ = next;
}

void timer_module::on_pin(unsigned pin, bool level, time_ps at) {
    for (timer_observer* o : observers_) o->on_pin(pin, level, at);
    if (!driven_[pin]) return;
    // Reported at the kernel's own time (the common case): drive the signal now; reported ahead
    // of it (an access from firmware running ahead): drive it when the kernel gets there.
    // Signals have one writer, the wake process: from anywhere else, queue.
    if (in_wake_ && queue_.empty() && wake_now_ == at)
        pins_[pin]->write(level);
    else
        queue_.push_back({at, static_cast<int>(pin), level});
}
void timer_module::on_flags_set(std::uint32_t bits, time_ps at) {
    for (timer_observer* o : observers_) o->on_flags_set(bits, at);
}
void timer_module::on_irq(bool level, time_ps at) {
    for (timer_observer* o : observers_) o->on_irq(level, at);
    if (!irq_driven_) return;
    if (in_wake_ && queue_.empty() && wake_now_ == at)
        irq_.write(level);
    else
        queue_.push_back({at, -1, level});
}
void timer_module::on_trigger(time_ps at) {
    ++triggers_;
    if (trigger_requested_) trigger_times_.push_back(at);
    for (timer_observer* o : observers_) o->on_trigger(at);
}

void timer_module::advance_to(time_ps t) {
    inputs_.advance_to(t);
    reschedule();
}
void timer_module::write(timer_field f, unsigned channel, std::uint32_t value, time_ps t) {
    inputs_.write(f, channel, value, t);
    reschedule();
}
std::uint32_t timer_module::read(timer_field f, unsigned channel, time_ps t) {
    const std::uint32_t v = inputs_.read(f, channel, t);
    reschedule();
    return v;
}
void timer_module::clear_flags(std::uint32_t mask, time_ps t) {
    inputs_.clear_flags(mask, t);
    reschedule();
}
void timer_module::set_input(unsigned input, bool level, time_ps t) {
    inputs_.set_input(input, level, t);
    reschedule();
}
void timer_module::set_initial_input(unsigned input, bool level) {
    inputs_.set_initial_input(input, level);
}
void timer_module::chained_pulse(time_ps t) {
    inputs_.chained_pulse(t);
    reschedule();
}
void timer_module::set_fault_input(bool level, time_ps t) {
    inputs_.set_fault_input(level, t);
    reschedule();
}
bool timer_module::next_event(time_ps& at) const { return inputs_.next_event(at); }
void timer_module::clock_changed(time_ps t) {
    inputs_.clock_changed(t);
    scheduled_ = sim::max_time_ps;  // the next event's time may have moved either way
    reschedule();
}

}  // namespace models
