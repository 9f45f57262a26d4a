#pragma once
// The processor that runs host-compiled firmware against the models (docs/architecture.md,
// "Firmware on the host").
//
// Firmware runs on a SystemC thread of its own and keeps a local time ahead of the kernel (TLM-2.0
// temporal decoupling). Its local time is a count of CPU clock cycles on the clock tree's CPU
// clock: every bus access costs `access_cycles`, tick_cycles() what it says. Before each access the
// cpu brings the peripheral models up to its local time (they compute what firmware would see, and
// when their interrupt lines rise), lets any deliverable interrupt enter first, then performs the
// access through its TLM-2.0 initiator socket with the local offset as annotated delay. It hands
// control to the kernel only when it must: every `quantum` of run-ahead, and when it waits for an
// interrupt with nothing left to compute locally. So a register read costs no context switch at
// all.
//
// A run has an end, and nothing happens after it: firmware whose local time would pass the end
// stops there for good (its thread stays parked at the end, the access or annotation that would
// have crossed it never reaches the models), and the models are never brought past it.

#include "harness/interrupt_controller.h"
#include "models/timer/timer_types.h"
#include "sim/clock_tree.h"

#include <tlm_utils/simple_initiator_socket.h>
#include <systemc>
#include <tlm>

#include <array>
#include <atomic>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

namespace harness {

struct cpu_config {
    std::string clock = "cpu";        // clock-tree node that clocks the CPU
    unsigned access_cycles = 2;       // cost of one bus access
    unsigned irq_entry_cycles = 14;   // arrival to the handler's first line; a demo value
    unsigned irq_exit_cycles = 8;     // handler's return to the interrupted code; a demo value
    time_ps quantum = 1'000'000'000;  // longest run-ahead of the kernel (1 ms)
    std::uint64_t start_offset_cycles = 0;     // firmware starts this many CPU cycles after time 0
    std::uint64_t hang_accesses = 50'000'000;  // accesses without simulated time moving = hang
};

// One bus access as the run report lists it.
struct access_record {
    time_ps at = 0;
    std::uint32_t address = 0;
    unsigned size = 0;
    bool write = false;
    std::uint32_t value = 0;
    bool failed = false;  // the bus answered with an error
};

// How firmware's run ended, as far as the cpu can tell.
enum class firmware_state { not_started, running, finished, failed };

class cpu : public sc_core::sc_module {
public:
    tlm_utils::simple_initiator_socket<cpu> socket;

    // A cpu clocked by `cfg.clock` of `tree`, taking interrupts from `irqs`, running `entry` (the
    // firmware's main) from the start offset. Needs a 1 ps kernel time resolution.
    cpu(const sc_core::sc_module_name& name, const cpu_config& cfg, sim::clock_tree& tree,
        interrupt_controller& irqs, std::function<void()> entry);

    // Peripherals whose state firmware can see: brought up to the cpu's local time before each
    // access, so that their interrupt requests are known in time.
    void watch(models::event_source& peripheral) { peripherals_.push_back({&peripheral, 0}); }
    // An input firmware may find by `name` ("fan.input1") and set: input `input` of `timer`.
    // `driven_by` names its source when one drives it ("stimulus \"tach\""; empty: none), in
    // which case firmware is refused it.
    void add_input(std::string name, models::timer_core_if& timer, unsigned input,
                   std::string driven_by) {
        inputs_.push_back({std::move(name), &timer, input, std::move(driven_by)});
    }
    // Called with an error text when firmware fails (a bus error with the error policy, an
    // unknown line...). The platform ends the run with a report.
    void on_failure(std::function<void(const std::string&)> f) { on_failure_ = std::move(f); }
    // Moves the firmware's start (before the run begins): sweeps use it to slide the firmware's
    // accesses across an instant such as a counter wrap.
    void set_start_offset(std::uint64_t cycles) { cfg_.start_offset_cycles = cycles; }
    // The run's end (set before the run begins; none by default): firmware local time is held
    // there, and nothing the firmware does after it reaches the models.
    void set_end(time_ps end) { end_ = end; }

    // --- firmware-facing, called from the firmware's thread only ---
    std::uint32_t read(std::uint32_t address, unsigned size);
    void write(std::uint32_t address, unsigned size, std::uint32_t value);
    void cycles(std::uint64_t n);
    void wait_for_interrupt();
    bool irq_disable();
    void irq_enable();
    void irq_line_enable(unsigned line, bool enable);
    void set_handler(unsigned line, void (*handler)());
    // The handle of the input named `name`, or -1 when there is none; an input a source drives
    // fails the run.
    int find_input(const std::string& name);
    // Sets input `handle` (from find_input) to `level` at the local time; an unknown handle fails
    // the run.
    void set_input(int handle, bool level);
    // Local simulated time of the firmware (never after the run's end).
    time_ps now() const { return local_; }
    // The cpu whose firmware is running (set while its thread runs).
    static cpu* current() { return current_; }

    // --- for the platform and reports ---
    firmware_state state() const { return state_; }
    // The last bus accesses, oldest first (at most 16).
    std::vector<access_record> last_accesses() const;
    std::uint64_t access_count() const { return accesses_; }
    // Bumped at every firmware call: a watchdog thread reads it to detect firmware stuck in a
    // loop that makes no calls at all.
    const std::atomic<std::uint64_t>& heartbeat() const { return heartbeat_; }
    // True while control is in firmware code (not waiting in the kernel).
    bool in_firmware() const { return in_firmware_.load(std::memory_order_relaxed); }
    interrupt_controller& interrupts() { return irqs_; }

private:
    // A watched peripheral and its next event (0: not known, ask it).
    struct watched {
        models::event_source* model;
        time_ps next;
    };

    void run();
    // Moves the local time to `t`, or, when `t` lies after the run's end, stops the firmware at
    // the end (never returns then).
    void move_to(time_ps t);
    // Holds the firmware at the run's end for good: the kernel finishes the run without it.
    [[noreturn]] void stop_at_end();
    // Local time after `n` more CPU cycles from `from`.
    time_ps after_cycles(time_ps from, std::uint64_t n);
    void bring_models_to(time_ps t);
    // Forgets every peripheral's next event: a write or the kernel may have moved it.
    void forget_horizons();
    // Takes in peripherals' next events that moved earlier (after a read with side effects).
    void lower_horizons();
    // The earliest time at which an interrupt may enter over the running code (max_time_ps: none),
    // recomputed only when the controller's state or the running priority changed.
    time_ps interrupt_ready_at();
    void take_interrupts();
    void sync_if_far_ahead();
    void sync();
    void beat() {
        heartbeat_.store(heartbeat_.load(std::memory_order_relaxed) + 1, std::memory_order_relaxed);
    }
    std::uint32_t transport(bool write, std::uint32_t address, unsigned size, std::uint32_t value);
    void fail(const std::string& why);

    cpu_config cfg_;
    sim::clock_tree& tree_;
    const sim::clock_domain& clock_;
    interrupt_controller& irqs_;
    std::function<void()> entry_;
    std::function<void(const std::string&)> on_failure_;
    std::vector<watched> peripherals_;
    struct named_input {
        std::string name;
        models::timer_core_if* timer;
        unsigned input;
        std::string driven_by;
    };
    std::vector<named_input> inputs_;
    std::array<void (*)(), 64> handlers_{};

    time_ps local_ = 0;
    time_ps end_ = sim::max_time_ps;
    time_ps horizon_ = 0;  // earliest next event of any watched peripheral
    // The kernel's time, which moves only while this thread waits in sync(): kept here so the hot
    // path asks the kernel nothing.
    time_ps kernel_now_ = 0;
    // The last CPU clock edge after_cycles() returned (its index and time): the next access starts
    // there, so its tick index need not be searched again. Forgotten at every sync (the kernel may
    // have changed the clock's future).
    std::uint64_t edge_tick_ = 0;
    time_ps edge_time_ = sim::max_time_ps;
    std::uint64_t irq_changes_seen_ = ~std::uint64_t{0};
    unsigned irq_priority_seen_ = 0;
    time_ps irq_ready_ = sim::max_time_ps;
    unsigned running_priority_ = idle_priority;
    std::uint64_t accesses_ = 0;
    std::uint64_t stalled_accesses_ = 0;
    time_ps last_progress_ = 0;
    std::array<access_record, 16> ring_{};
    firmware_state state_ = firmware_state::not_started;
    std::atomic<std::uint64_t> heartbeat_{0};
    std::atomic<bool> in_firmware_{false};
    tlm::tlm_generic_payload payload_;
    sc_core::sc_event irq_wakeup_;
    sc_core::sc_event never_;  // never notified: what a firmware stopped at the end waits for

    static cpu* current_;
};

}  // namespace harness
