#include "harness/cpu.h"

#include <algorithm>
#include <cstdio>
#include <stdexcept>

namespace harness {

cpu* cpu::current_ = nullptr;

cpu::cpu(const sc_core::sc_module_name& name, const cpu_config& cfg, sim::clock_tree& tree,
         interrupt_controller& irqs, std::function<void()> entry)
    : sc_core::sc_module(name),
      socket("socket"),
      cfg_(cfg),
      tree_(tree),
      clock_(tree.domain(cfg.clock)),
      irqs_(irqs),
      entry_(std::move(entry)) {
    if (sc_core::sc_get_time_resolution() != sc_core::sc_time(1, sc_core::SC_PS))
        throw std::logic_error(std::string(basename()) +
                               ": the kernel time resolution must be 1 ps");
    SC_HAS_PROCESS(cpu);
    SC_THREAD(run);
    // Firmware stacks: drivers and their interrupt handlers nest; 1 MiB is ample for host code.
    set_stack_size(1 << 20);
}

void cpu::run() {
    current_ = this;
    state_ = firmware_state::running;
    kernel_now_ = sc_core::sc_time_stamp().value();
    move_to(after_cycles(0, cfg_.start_offset_cycles));
    sync_if_far_ahead();
    in_firmware_ = true;
    entry_();
    in_firmware_ = false;
    state_ = firmware_state::finished;
    sync();
}

time_ps cpu::after_cycles(time_ps from, std::uint64_t n) {
    try {
        // Accesses follow one another from the edge the last one ended on: reuse its index.
        const std::uint64_t k = from == edge_time_ ? edge_tick_ : clock_.tick_at(from);
        const time_ps t = clock_.time_of(k + n);
        edge_tick_ = k + n;
        edge_time_ = t;
        return t;
    } catch (const std::out_of_range&) {
        fail("the CPU clock '" + cfg_.clock + "' stopped at " + sim::format_time(from) +
             ": firmware cannot go on");
        throw;
    }
}

void cpu::move_to(time_ps t) {
    if (t <= end_) {
        local_ = t;
        return;
    }
    stop_at_end();
}

void cpu::stop_at_end() {
    local_ = end_;
    in_firmware_ = false;
    // The models reach the end with the kernel (the platform brings every one there when the run
    // ends); the firmware's thread waits here until the process ends, on an event nobody notifies.
    for (;;) sc_core::wait(never_);
}

void cpu::bring_models_to(time_ps t) {
    if (t < horizon_) return;
    // Only the peripherals with something due by t need advancing; the others' next events stand.
    // The earliest-due one goes first, one instant at a time, so that what the peripherals report
    // reaches shared observers (waveforms, checks) in time order across peripherals.
    for (;;) {
        watched* first = nullptr;
        for (watched& w : peripherals_)
            if (w.next <= t && (!first || w.next < first->next)) first = &w;
        if (!first) break;
        first->model->advance_to(first->next);
        time_ps e;
        first->next = first->model->next_event(e) ? std::max(e, first->next + 1) : sim::max_time_ps;
    }
    time_ps next = sim::max_time_ps;
    for (const watched& w : peripherals_) next = std::min(next, w.next);
    horizon_ = next;
}

void cpu::lower_horizons() {
    for (watched& w : peripherals_) {
        time_ps e;
        if (w.next != 0 && w.model->next_event(e) && e < w.next) {
            w.next = e;
            horizon_ = std::min(horizon_, e);
        }
    }
}

void cpu::forget_horizons() {
    horizon_ = 0;
    for (watched& w : peripherals_) w.next = 0;
}

time_ps cpu::interrupt_ready_at() {
    // The earliest ready time over the lines that may preempt the running code decides both
    // "may one enter now?" and "when could one?", and it changes only with the controller's state.
    if (irqs_.changes() != irq_changes_seen_ || running_priority_ != irq_priority_seen_) {
        const auto r = irqs_.next_ready(0, running_priority_);
        irq_ready_ = r ? *r : sim::max_time_ps;
        irq_changes_seen_ = irqs_.changes();
        irq_priority_seen_ = running_priority_;
    }
    return irq_ready_;
}

void cpu::take_interrupts() {
    while (interrupt_ready_at() <= local_) {
        const auto d = irqs_.deliverable(local_, running_priority_);
        if (!d) return;
        void (*handler)() = d->line < handlers_.size() ? handlers_[d->line] : nullptr;
        if (!handler) {
            fail("interrupt line " + std::to_string(d->line) + " (" + irqs_.line(d->line).name +
                 ") was taken but firmware set no handler for it");
            return;
        }
        const unsigned saved = running_priority_;
        running_priority_ = irqs_.line(d->line).priority;
        move_to(after_cycles(local_, cfg_.irq_entry_cycles));
        handler();
        move_to(after_cycles(local_, cfg_.irq_exit_cycles));
        running_priority_ = saved;
        bring_models_to(local_);
    }
}

void cpu::sync() {
    // Peripherals first reach the time the kernel is asked to run to, in order (see
    // bring_models_to), so kernel-side watchers never see them behind.
    bring_models_to(local_);
    const bool was = in_firmware_;
    in_firmware_ = false;
    if (local_ > kernel_now_) sc_core::wait(sc_core::sc_time::from_value(local_ - kernel_now_));
    kernel_now_ = sc_core::sc_time_stamp().value();
    in_firmware_ = was;
    current_ = this;
    // The kernel has run: stimulus and clock changes may have moved the peripherals' next events
    // and the CPU clock's future edges.
    forget_horizons();
    edge_time_ = sim::max_time_ps;
}

void cpu::sync_if_far_ahead() {
    if (local_ - kernel_now_ >= cfg_.quantum) sync();
}

void cpu::fail(const std::string& why) {
    state_ = firmware_state::failed;
    in_firmware_ = false;
    if (on_failure_) on_failure_(why);
    throw std::runtime_error(why);
}

std::uint32_t cpu::transport(bool is_write, std::uint32_t address, unsigned size,
                             std::uint32_t value) {
    ++accesses_;
    if (local_ == last_progress_) {
        if (++stalled_accesses_ > cfg_.hang_accesses)
            fail("firmware hang: " + std::to_string(stalled_accesses_) +
                 " bus accesses without simulated time moving");
    } else {
        stalled_accesses_ = 0;
        last_progress_ = local_;
    }
    unsigned char data[4];
    for (unsigned i = 0; i < size; ++i) data[i] = static_cast<unsigned char>(value >> (8 * i));
    payload_.set_command(is_write ? tlm::TLM_WRITE_COMMAND : tlm::TLM_READ_COMMAND);
    payload_.set_address(address);
    payload_.set_data_ptr(data);
    payload_.set_data_length(size);
    payload_.set_streaming_width(size);
    payload_.set_byte_enable_ptr(nullptr);
    payload_.set_dmi_allowed(false);
    payload_.set_response_status(tlm::TLM_INCOMPLETE_RESPONSE);
    const time_ps now = kernel_now_;
    sc_core::sc_time delay = sc_core::sc_time::from_value(local_ - now);
    socket->b_transport(payload_, delay);
    // An access latency may carry the access's end past the run's end: it is listed at the end.
    const time_ps done = std::max<time_ps>(local_, now + delay.value());
    local_ = std::min(done, end_);
    std::uint32_t result = 0;
    if (!is_write)
        for (unsigned i = 0; i < size; ++i) result |= std::uint32_t{data[i]} << (8 * i);
    access_record& r = ring_[accesses_ % ring_.size()];
    r = {local_, address, size, is_write, is_write ? value : result, !payload_.is_response_ok()};
    if (!payload_.is_response_ok()) {
        char a[16];
        std::snprintf(a, sizeof a, "0x%08x", address);
        fail(std::string("bus error on a ") + std::to_string(size * 8) + "-bit " +
             (is_write ? "write to " : "read of ") + a + ": " + payload_.get_response_string());
    }
    if (done > end_) stop_at_end();
    return result;
}

// Models are only ever brought up to the firmware's current local time: an interrupt handler may
// then write to them at that time, and a model never sees time go backwards.

std::uint32_t cpu::read(std::uint32_t address, unsigned size) {
    beat();
    bring_models_to(local_);
    take_interrupts();
    move_to(after_cycles(local_, cfg_.access_cycles));
    sync_if_far_ahead();
    // Every peripheral up to the access's time first, so the one accessed reports nothing ahead
    // of the others.
    bring_models_to(local_);
    const std::uint32_t value = transport(false, address, size, 0);
    // A read may clear flags (clear-on-read): the interrupt line then falls at the peripheral's
    // next clock edge, which may come before its next event known so far.
    lower_horizons();
    return value;
}

void cpu::write(std::uint32_t address, unsigned size, std::uint32_t value) {
    beat();
    bring_models_to(local_);
    take_interrupts();
    move_to(after_cycles(local_, cfg_.access_cycles));
    sync_if_far_ahead();
    bring_models_to(local_);
    transport(true, address, size, value);
    // A write can bring a peripheral's next event closer: look again before the next access.
    forget_horizons();
}

void cpu::cycles(std::uint64_t n) {
    beat();
    // Interrupts may enter during the stretch: walk it from one instant that matters to the next.
    std::uint64_t remaining = n;
    for (;;) {
        bring_models_to(local_);
        if (interrupt_ready_at() <= local_) take_interrupts();
        const time_ps end = after_cycles(local_, remaining);
        time_ps next = horizon_;
        if (const time_ps r = interrupt_ready_at(); r != sim::max_time_ps)
            next = std::min(next, std::max(r, local_));
        if (next >= end || remaining == 0) {
            move_to(end);
            break;
        }
        const std::uint64_t k0 = clock_.tick_at(local_);
        const std::uint64_t used = std::min(remaining, clock_.tick_at(std::max(next, local_)) - k0);
        move_to(clock_.time_of(k0 + used));
        remaining -= used;
        if (used == 0 && interrupt_ready_at() > local_) {
            // The instant that matters is now: let the models process it.
            horizon_ = std::min(horizon_, local_);
            bring_models_to(local_);
        }
    }
    sync_if_far_ahead();
}

void cpu::wait_for_interrupt() {
    beat();
    for (;;) {
        bring_models_to(local_);
        if (interrupt_ready_at() <= local_) {
            take_interrupts();
            return;
        }
        time_ps next = horizon_;
        if (const time_ps r = interrupt_ready_at(); r != sim::max_time_ps)
            next = std::min(next, std::max(r, local_));
        if (next == sim::max_time_ps) {
            // Nothing is scheduled anywhere the cpu can see: let the kernel run a quantum (stimulus
            // from outside may arrive), but not past the run's end, and look again.
            if (local_ >= end_) stop_at_end();
            const time_ps wake = kernel_now_ + cfg_.quantum;
            move_to(wake >= end_ ? end_ : after_cycles(wake, 0));
            sync();
            continue;
        }
        // Sleep to the first CPU clock edge at or after that instant (none is needed after the
        // end).
        if (next > end_) stop_at_end();
        move_to(after_cycles(std::max(local_, next), 0));
        sync_if_far_ahead();
    }
}

bool cpu::irq_disable() {
    beat();
    return irqs_.set_global_enable(false);
}

void cpu::irq_enable() {
    beat();
    irqs_.set_global_enable(true);
    take_interrupts();
}

void cpu::irq_line_enable(unsigned line, bool enable) {
    beat();
    if (line >= irqs_.line_count()) {
        fail("firmware enabled interrupt line " + std::to_string(line) + ", but the part has " +
             std::to_string(irqs_.line_count()) + " lines");
        return;
    }
    irqs_.set_enabled(line, enable, local_);
    if (enable) take_interrupts();
}

void cpu::set_handler(unsigned line, void (*handler)()) {
    if (line >= handlers_.size() || line >= irqs_.line_count()) {
        fail("firmware set a handler for interrupt line " + std::to_string(line) +
             ", but the part has " + std::to_string(irqs_.line_count()) + " lines");
        return;
    }
    handlers_[line] = handler;
}

int cpu::find_input(const std::string& name) {
    for (std::size_t i = 0; i < inputs_.size(); ++i) {
        if (inputs_[i].name != name) continue;
        if (!inputs_[i].driven_by.empty())
            fail("firmware asked to drive input '" + name + "', which [inputs] connects to " +
                 inputs_[i].driven_by +
                 "; firmware may drive only inputs that no stimulus, loopback or timer drives");
        return static_cast<int>(i);
    }
    return -1;
}

void cpu::set_input(int handle, bool level) {
    beat();
    if (handle < 0 || static_cast<std::size_t>(handle) >= inputs_.size()) {
        fail("firmware set input handle " + std::to_string(handle) +
             ", which tick_input() did not give (the part has " + std::to_string(inputs_.size()) +
             " inputs)");
        return;
    }
    // The input changes at the firmware's time: every peripheral first gets there, so that the
    // change reaches waveforms and checks in order.
    bring_models_to(local_);
    const named_input& in = inputs_[static_cast<std::size_t>(handle)];
    in.timer->set_input(in.input, level, local_);
    forget_horizons();
}

std::vector<access_record> cpu::last_accesses() const {
    std::vector<access_record> v;
    const std::uint64_t n = std::min<std::uint64_t>(accesses_, ring_.size());
    for (std::uint64_t i = accesses_ - n + 1; i <= accesses_; ++i)
        v.push_back(ring_[i % ring_.size()]);
    return v;
}

}  // namespace harness
