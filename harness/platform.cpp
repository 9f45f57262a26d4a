#include "harness/platform.h"

#include "harness/firmware_context.h"
#include "harness/trap/trap_engine.h"
#include "models/clock/clock_bindings.h"

#include <spdlog/spdlog.h>
#include <systemc>

#include <unistd.h>
#include <algorithm>
#include <atomic>
#include <chrono>
#include <condition_variable>
#include <cstdio>
#include <iostream>
#include <mutex>
#include <sstream>
#include <stdexcept>
#include <thread>

namespace harness {

const char* to_string(run_outcome o) {
    switch (o) {
        case run_outcome::completed:
            return "completed";
        case run_outcome::crashed:
            return "crashed";
        case run_outcome::aborted:
            return "aborted";
        case run_outcome::check_failed:
            return "firmware-check-failed";
        case run_outcome::hung:
            return "hung";
        case run_outcome::failed:
            return "failed";
        case run_outcome::watchdog_reset:
            return "watchdog-reset";
    }
    return "?";
}

int exit_code_of(run_outcome o) { return o == run_outcome::watchdog_reset ? 5 : 3; }

std::string failure_report::text() const {
    std::ostringstream s;
    s << "firmware " << to_string(outcome) << " at " << sim::format_time(at) << ": " << message
      << "\n";
    if (!last_accesses.empty()) {
        s << "last " << last_accesses.size() << " bus accesses (oldest first):\n";
        for (std::size_t i = 0; i < last_accesses.size(); ++i) {
            const access_record& a = last_accesses[i];
            // Columns padded with strings, so a long register name widens its line instead of
            // cutting it short.
            const auto padded = [](std::string t, std::size_t width) {
                if (t.size() < width) t.resize(width, ' ');
                return t;
            };
            char numbers[48];
            std::snprintf(numbers, sizeof numbers, "%2u-bit 0x%08x", a.size * 8, a.address);
            char value[16];
            std::snprintf(value, sizeof value, "0x%08x", a.value);
            s << "  " << padded(sim::format_time(a.at), 18) << ' '
              << padded(a.write ? "write" : "read", 5) << ' ' << numbers << ' '
              << padded(i < access_names.size() ? access_names[i] : "", 24) << ' ' << value
              << (a.failed ? "  (bus error)" : "") << "\n";
        }
    }
    if (!backtrace.empty()) {
        s << "host backtrace:\n";
        for (const std::string& f : backtrace) s << "  " << f << "\n";
    }
    return s.str();  // every line above ends in '\n', the last one too
}

// Forwards a timer's interrupt request line to the interrupt controller.
struct irq_forwarder final : models::timer_observer {
    interrupt_controller* irqs = nullptr;
    unsigned line = 0;
    void on_pin(unsigned, bool, time_ps) override {}
    void on_flags_set(std::uint32_t, time_ps) override {}
    void on_irq(bool level, time_ps at) override { irqs->set_level(line, level, at); }
    void on_trigger(time_ps) override {}
};

// Forwards a tick timer's interrupt request line to the interrupt controller.
struct tick_irq_forwarder final : models::tick_observer {
    interrupt_controller* irqs = nullptr;
    unsigned line = 0;
    void on_flags_set(std::uint32_t, time_ps) override {}
    void on_irq(bool level, time_ps at) override { irqs->set_level(line, level, at); }
};

// Forwards a slow-clock counter's interrupt request line to the interrupt controller.
struct slow_irq_forwarder final : models::slow_observer {
    interrupt_controller* irqs = nullptr;
    unsigned line = 0;
    void on_flags_set(std::uint32_t, time_ps) override {}
    void on_irq(bool level, time_ps at) override { irqs->set_level(line, level, at); }
};

// Stands in for the cpu on the bus when a part runs without firmware.
struct platform::idle_initiator : sc_core::sc_module {
    tlm_utils::simple_initiator_socket<idle_initiator> socket;
    explicit idle_initiator(const sc_core::sc_module_name& n)
        : sc_core::sc_module(n), socket("socket") {}
};

struct platform::timer_slot {
    timer_spec spec;
    std::unique_ptr<models::timer_module> module;
    std::unique_ptr<models::register_file> registers;
    std::unique_ptr<models::timer_target> target;
    irq_forwarder irq;
};

// A peripheral of another kind: no kernel shell, since nothing in the kernel listens to it; the cpu
// brings it along in time like a timer and the run's end brings it to the end.
struct platform::peripheral_slot {
    // Hears a watchdog's reset: tells the spec's observers, then ends the run unless expected.
    struct reset_watch final : models::watchdog_observer {
        platform* owner = nullptr;
        peripheral_slot* slot = nullptr;
        void on_reset(models::watchdog_fault why, time_ps at) override {
            for (models::watchdog_observer* o : slot->spec.reset_observers) o->on_reset(why, at);
            if (slot->spec.reset_expected) return;
            const auto last = slot->dog->last_refresh();
            owner->fail(run_outcome::watchdog_reset,
                        "watchdog '" + slot->spec.name + "' reset the part at " +
                            sim::format_time(at) + ": " + models::to_string(why) +
                            (last ? ", last refresh (or start) at " + sim::format_time(*last)
                                  : ", never started") +
                            " (the scenario does not expect a reset: add reset-expected = true "
                            "and a check on " +
                            slot->spec.name + ".reset to make it one)");
        }
    };
    peripheral_spec spec;
    std::unique_ptr<models::tick_timer_core> tick;
    std::unique_ptr<models::watchdog_core> dog;
    std::unique_ptr<models::slow_counter_core> slow;
    std::unique_ptr<models::clock_control_core> clock_control;
    reset_watch dog_watch;
    // The model, whichever kind it is.
    models::event_source* model() const {
        if (tick) return tick.get();
        if (slow) return slow.get();
        if (clock_control) return clock_control.get();
        return dog.get();
    }
    std::unique_ptr<models::register_file> registers;
    std::unique_ptr<models::timer_target> target;
    tick_irq_forwarder irq;
    slow_irq_forwarder slow_irq;
};

// Wall-clock watch over firmware that stops calling into the simulator (a tight loop).
struct platform::watchdog {
    std::mutex mutex;
    std::condition_variable wake;
    bool stop = false;
    std::thread thread;
    // Sleeps up to `d`; false when told to stop.
    bool nap(std::chrono::milliseconds d) {
        std::unique_lock<std::mutex> lock(mutex);
        return !wake.wait_for(lock, d, [this] { return stop; });
    }
    ~watchdog() {
        {
            std::lock_guard<std::mutex> lock(mutex);
            stop = true;
        }
        wake.notify_all();
        if (thread.joinable()) thread.join();
    }
};

// The trapped peripheral windows of an unmodified-driver run.
struct platform::mapped {
    std::vector<mapped_region> regions;
};

void advance_in_order(const std::vector<models::event_source*>& models, time_ps t) {
    for (;;) {
        models::event_source* first = nullptr;
        time_ps first_at = t;
        for (models::event_source* m : models) {
            time_ps e;
            if (m->next_event(e) && e <= first_at && (!first || e < first_at)) {
                first = m;
                first_at = e;
            }
        }
        if (!first) break;
        first->advance_to(first_at);
    }
    for (models::event_source* m : models) m->advance_to(t);
}

std::string input_name(unsigned input) {
    if (input == models::trigger_pin_input) return "trigger";
    if (input == models::fault_input) return "fault";
    return "input" + std::to_string(input + 1);
}

void start_fresh_kernel() {
    // The kernel's current context is a pair of globals; a new context is a kernel that has not
    // elaborated yet. The old one stays allocated: its modules and stopped threads point into it.
    auto* fresh = new sc_core::sc_simcontext;
    sc_core::sc_curr_simcontext = fresh;
    sc_core::sc_default_global_context = fresh;
}

platform::platform() = default;
platform::~platform() = default;

void platform::add_timer(timer_spec spec) {
    if (built_) throw std::logic_error("platform: timer added after build()");
    auto slot = std::make_unique<timer_slot>();
    slot->spec = std::move(spec);
    timers_.push_back(std::move(slot));
}

void platform::add_peripheral(peripheral_spec spec) {
    if (built_) throw std::logic_error("platform: peripheral added after build()");
    if (spec.layout.kind != "tick_timer" && spec.layout.kind != "watchdog" &&
        spec.layout.kind != "slow_counter" && spec.layout.kind != "clock_control")
        throw std::invalid_argument("peripheral '" + spec.name + "': kind \"" + spec.layout.kind +
                                    "\" is not one the platform builds as a peripheral; accepted: "
                                    "\"tick_timer\", \"watchdog\", \"slow_counter\", "
                                    "\"clock_control\" (timers are added with add_timer)");
    auto slot = std::make_unique<peripheral_slot>();
    slot->spec = std::move(spec);
    peripherals_.push_back(std::move(slot));
}

void platform::set_firmware(const cpu_config& cfg, std::function<void()> entry) {
    cpu_cfg_ = cfg;
    entry_ = std::move(entry);
}

void platform::build() {
    clocks_.start();
    std::vector<interrupt_line_config> lines;
    for (const auto& t : timers_)
        lines.push_back({t->spec.name, t->spec.irq_priority, t->spec.irq_extra_delay});
    for (const auto& p : peripherals_)
        lines.push_back({p->spec.name, p->spec.irq_priority, p->spec.irq_extra_delay});
    irqs_ = std::make_unique<interrupt_controller>(lines);
    std::vector<models::address_range> ranges;
    for (auto& t : timers_) {
        t->module = std::make_unique<models::timer_module>(
            t->spec.name.c_str(), t->spec.layout.instance, clocks_, t->spec.clock);
        for (models::timer_observer* o : t->spec.observers) t->module->add_observer(o);
        for (models::input_observer* o : t->spec.input_observers)
            t->module->inputs().add_observer(o);
    }
    // Inputs take their initial levels before the reset values are written.
    wire_inputs();
    for (std::size_t i = 0; i < timers_.size(); ++i) {
        timer_slot& t = *timers_[i];
        const models::timer_config& cfg = t.spec.layout.instance;
        t.irq.irqs = irqs_.get();
        t.irq.line = static_cast<unsigned>(i);
        t.module->add_observer(&t.irq);
        t.registers = std::make_unique<models::register_file>(t.spec.layout, *t.module, cfg,
                                                              t.spec.name, policy_, t.spec.base);
        t.registers->apply_reset(0);
        if (t.spec.counter_start)
            t.module->write(models::timer_field::counter, 0, *t.spec.counter_start, 0);
        if (t.spec.running_at_start) t.module->write(models::timer_field::enable, 0, 1, 0);
        t.target = std::make_unique<models::timer_target>((t.spec.name + "_bus").c_str(),
                                                          *t.registers, t.spec.access_latency);
        ranges.push_back({t.spec.base, t.spec.layout.size, t.spec.name, &t.spec.layout});
    }
    for (std::size_t i = 0; i < peripherals_.size(); ++i) {
        peripheral_slot& p = *peripherals_[i];
        p.irq.irqs = irqs_.get();
        p.irq.line = static_cast<unsigned>(timers_.size() + i);
        models::field_port* port = nullptr;
        if (p.spec.layout.kind == "watchdog") {
            p.dog_watch.owner = this;
            p.dog_watch.slot = &p;
            p.dog = std::make_unique<models::watchdog_core>(
                p.spec.layout.watchdog, clocks_.domain(p.spec.clock), &p.dog_watch);
            models::watchdog_core* core = p.dog.get();
            clocks_.subscribe(p.spec.clock, p.spec.name,
                              [core](sim::time_ps t) { core->clock_changed(t); });
            port = core;
        } else if (p.spec.layout.kind == "clock_control") {
            const auto bad = models::check_clock_bindings(p.spec.layout, clocks_);
            if (!bad.empty()) throw sim::scenario_error(bad);
            // Its requests change the tree, whose consumers follow on their own.
            p.clock_control =
                std::make_unique<models::clock_control_core>(clocks_, p.spec.layout.clock_slots);
            port = p.clock_control.get();
        } else if (p.spec.layout.kind == "slow_counter") {
            p.slow_irq.irqs = irqs_.get();
            p.slow_irq.line = p.irq.line;
            // A slow-clock counter keeps no edge times, so a clock change needs no notice.
            p.slow = std::make_unique<models::slow_counter_core>(
                p.spec.layout.slow, clocks_.domain(p.spec.clock), &p.slow_irq);
            port = p.slow.get();
        } else {
            p.tick = std::make_unique<models::tick_timer_core>(
                p.spec.layout.tick, clocks_.domain(p.spec.clock), &p.irq);
            models::tick_timer_core* core = p.tick.get();
            clocks_.subscribe(p.spec.clock, p.spec.name,
                              [core](sim::time_ps t) { core->clock_changed(t); });
            port = core;
        }
        p.registers = std::make_unique<models::register_file>(p.spec.layout, *port, p.spec.name,
                                                              policy_, p.spec.base);
        // A clock-control block's reset state is the tree's, already in force.
        if (!p.clock_control) p.registers->apply_reset(0);
        if (p.slow) p.slow->settle(0);
        p.target = std::make_unique<models::timer_target>((p.spec.name + "_bus").c_str(),
                                                          *p.registers, p.spec.access_latency);
        ranges.push_back({p.spec.base, p.spec.layout.size, p.spec.name, &p.spec.layout});
    }
    router_ = std::make_unique<models::address_router>("bus", ranges, policy_);
    for (auto& t : timers_) router_->initiator_socket.bind(t->target->socket);
    for (auto& p : peripherals_) router_->initiator_socket.bind(p->target->socket);
    if (cpu_cfg_) {
        cpu_ = std::make_unique<harness::cpu>("cpu", *cpu_cfg_, clocks_, *irqs_, entry_);
        for (auto& t : timers_) {
            cpu_->watch(*t->module);
            // Every level input by name, for tick_input(); the driven ones say by what.
            const models::timer_config& cfg = t->spec.layout.instance;
            std::vector<unsigned> levels;
            for (unsigned c = 0; c < cfg.channels; ++c)
                levels.push_back(models::input_of_channel(c));
            levels.push_back(models::trigger_pin_input);
            levels.push_back(models::fault_input);
            for (unsigned in : levels) {
                std::string driver;
                for (const input_wiring& w : inputs_)
                    if (w.timer == t->spec.name && w.input == in &&
                        w.kind != input_wiring::source_kind::chain &&
                        w.kind != input_wiring::source_kind::firmware)
                        driver = w.label;
                cpu_->add_input(t->spec.name + "." + input_name(in), *t->module, in, driver);
            }
        }
        for (auto& p : peripherals_) cpu_->watch(*p->model());
        cpu_->socket.bind(router_->target_socket);
        cpu_->on_failure([this](const std::string& why) {
            fail(why.rfind("firmware hang", 0) == 0 ? run_outcome::hung : run_outcome::failed, why);
        });
        firmware_context::get().on_failed_check = [this](const firmware_check& c) {
            fail(run_outcome::check_failed, "firmware check '" + c.name + "' failed at " + c.file +
                                                ":" + std::to_string(c.line));
        };
    } else {
        // No firmware: the router still needs its target socket bound. A part without a processor
        // is driven by test benches through the timer modules directly.
        idle_ = std::make_unique<idle_initiator>("no_cpu");
        idle_->socket.bind(router_->target_socket);
    }
    built_ = true;
}

void platform::wire_inputs() {
    const auto slot = [this](const std::string& name) -> timer_slot& {
        for (auto& t : timers_)
            if (t->spec.name == name) return *t;
        throw std::invalid_argument("input wiring names no timer '" + name + "'");
    };
    // A consumer is brought along by its producers: refuse any timer that depends on itself.
    const auto depends = [this](const std::string& from) {
        std::vector<std::string> path = {from};
        std::vector<std::string> todo = {from};
        std::vector<std::string> seen;
        while (!todo.empty()) {
            const std::string t = todo.back();
            todo.pop_back();
            for (const input_wiring& w : inputs_) {
                if (w.timer != t || w.producer.empty()) continue;
                if (w.producer == from)
                    throw std::invalid_argument("wiring loop: timer '" + from +
                                                "' depends on its own outputs through '" + t + "." +
                                                input_name(w.input) + "' (" + w.label +
                                                "); accepted: wiring in which no timer feeds "
                                                "itself, directly or through others");
                if (std::find(seen.begin(), seen.end(), w.producer) == seen.end()) {
                    seen.push_back(w.producer);
                    todo.push_back(w.producer);
                }
            }
        }
    };
    for (auto& t : timers_) depends(t->spec.name);
    for (const input_wiring& w : inputs_) {
        models::timer_inputs& in = slot(w.timer).module->inputs();
        switch (w.kind) {
            case input_wiring::source_kind::stimulus:
                if (const auto* fan =
                        std::get_if<sim::stimulus::fan_spec>(&w.stimulus.spec->settings)) {
                    models::timer_module& p = *slot(fan->timer).module;
                    p.add_observer(
                        &in.follow_fan(w.input, p, fan->pin,
                                       std::make_unique<sim::stimulus::fan_tach>(fan->settings)));
                } else {
                    in.drive(w.input, sim::stimulus::make_source(w.stimulus));
                }
                break;
            case input_wiring::source_kind::loopback: {
                models::timer_module& p = *slot(w.producer).module;
                p.add_observer(&in.follow_pin(w.input, p, w.pin));
                break;
            }
            case input_wiring::source_kind::chain: {
                models::timer_module& p = *slot(w.producer).module;
                p.add_observer(&in.follow_triggers(p));
                break;
            }
            case input_wiring::source_kind::firmware:
                break;
        }
    }
}

void platform::start_watchdog() {
    if (!cpu_ || hang_wall_seconds_ <= 0) return;
    watchdog_ = std::make_unique<watchdog>();
    watchdog* self = watchdog_.get();
    watchdog_->thread = std::thread([this, self] {
        std::uint64_t last = cpu_->heartbeat().load();
        auto since = std::chrono::steady_clock::now();
        while (self->nap(std::chrono::milliseconds(50))) {
            const std::uint64_t beat = cpu_->heartbeat().load();
            const auto now = std::chrono::steady_clock::now();
            if (beat != last || !cpu_->in_firmware()) {
                last = beat;
                since = now;
                continue;
            }
            if (std::chrono::duration<double>(now - since).count() >= hang_wall_seconds_) {
                char what[128];
                std::snprintf(what, sizeof what,
                              "firmware made no call into the simulator for %.1f wall seconds "
                              "(a loop with no bus access, cycle annotation or wait)",
                              hang_wall_seconds_);
                fail(run_outcome::hung, what);
            }
        }
    });
}

void platform::run(time_ps duration) {
    if (!built_) build();
    // Crashes in firmware (or anywhere while it runs) become a report, like every other failure.
    trap_engine::instance().set_crash_hook([this](const crash_info& c) {
        const run_outcome o =
            c.signal_name == "SIGABRT" ? run_outcome::aborted : run_outcome::crashed;
        fail(o, c.signal_name + (c.message.empty() ? "" : ": " + c.message), c.backtrace);
    });
    trap_engine::ensure_alt_stack();
    if (map_peripherals_ && cpu_ && !mapped_) {
        mapped_ = std::make_unique<mapped>();
        std::vector<std::pair<std::string, std::pair<std::uint64_t, std::uint32_t>>> windows;
        for (const auto& t : timers_)
            windows.push_back({t->spec.name, {t->spec.base, t->spec.layout.size}});
        for (const auto& p : peripherals_)
            windows.push_back({p->spec.name, {p->spec.base, p->spec.layout.size}});
        for (const auto& [name, window] : windows) {
            harness::cpu* c = cpu_.get();
            mapped_->regions.push_back(trap_engine::instance().map_region(
                name, window.first, window.second, [c](access& a) {
                    // The register layouts are at most 32 bits wide: a 64-bit access is two.
                    const auto address = static_cast<std::uint32_t>(a.address);
                    const unsigned first = a.width > 4 ? 4 : a.width;
                    if (a.is_write) {
                        c->write(address, first, static_cast<std::uint32_t>(a.value));
                        if (a.width > 4)
                            c->write(address + 4, 4, static_cast<std::uint32_t>(a.value >> 32));
                    } else {
                        a.value = c->read(address, first);
                        if (a.width > 4) a.value |= std::uint64_t{c->read(address + 4, 4)} << 32;
                    }
                }));
        }
    }
    const time_ps end = sc_core::sc_time_stamp().value() + duration;
    if (cpu_) cpu_->set_end(end);
    run_thread_ = std::this_thread::get_id();
    start_watchdog();
    try {
        sc_core::sc_start(sc_core::sc_time::from_value(duration));
        if (failed_) {
            // fail() stopped the kernel after finishing the outputs: nothing more to bring along.
            if (watchdog_) watchdog_.reset();
            mapped_.reset();
            return;
        }
        // Timers nobody watches through the kernel advance on demand: bring every one to the end,
        // in time order across timers so that observers hear changes in order.
        std::vector<models::event_source*> cores;
        for (auto& t : timers_) cores.push_back(t->module.get());
        for (auto& p : peripherals_) cores.push_back(p->model());
        advance_in_order(cores, end);
    } catch (const std::exception& e) {
        fail(run_outcome::failed, e.what());
    }
    if (watchdog_) watchdog_.reset();
    // Unmapped so that a later run in this process can map the same windows again.
    mapped_.reset();
}

models::timer_module& platform::timer(const std::string& name) {
    for (auto& t : timers_)
        if (t->spec.name == name) return *t->module;
    throw std::out_of_range("no timer '" + name + "'");
}

models::tick_timer_core& platform::tick_timer(const std::string& name) {
    for (auto& p : peripherals_)
        if (p->spec.name == name && p->tick) return *p->tick;
    throw std::out_of_range("no tick timer '" + name + "'");
}

models::watchdog_core& platform::watchdog_timer(const std::string& name) {
    for (auto& p : peripherals_)
        if (p->spec.name == name && p->dog) return *p->dog;
    throw std::out_of_range("no watchdog '" + name + "'");
}

std::vector<std::string> platform::timer_names() const {
    std::vector<std::string> v;
    for (const auto& t : timers_) v.push_back(t->spec.name);
    return v;
}

std::string platform::describe_address(std::uint64_t address) const {
    for (const auto& t : timers_) {
        const auto& s = t->spec;
        if (address < s.base || address >= s.base + s.layout.size) continue;
        if (const auto* r = s.layout.find(static_cast<std::uint32_t>(address - s.base)))
            return s.name + "." + r->name;
        return s.name + ".(reserved)";
    }
    for (const auto& p : peripherals_) {
        const auto& s = p->spec;
        if (address < s.base || address >= s.base + s.layout.size) continue;
        if (const auto* r = s.layout.find(static_cast<std::uint32_t>(address - s.base)))
            return s.name + "." + r->name;
        return s.name + ".(reserved)";
    }
    return "(unmapped)";
}

namespace {
std::atomic<bool> failing{false};
}  // namespace

void platform::fail(run_outcome outcome, const std::string& message,
                    std::vector<std::string> backtrace) {
    if (failing.exchange(true)) _exit(3);  // a second failure while reporting the first
    failure_report r;
    r.outcome = outcome;
    r.message = message;
    r.backtrace = std::move(backtrace);
    if (cpu_) {
        r.at = cpu_->now();
        r.last_accesses = cpu_->last_accesses();
        for (const auto& a : r.last_accesses) r.access_names.push_back(describe_address(a.address));
    }
    if (on_failure_) on_failure_(r);
    std::cerr << "tickbench: " << r.text() << std::flush;
    for (auto& c : closers_) {
        try {
            c();
        } catch (const std::exception& e) {
            std::cerr << "tickbench: while closing outputs: " << e.what() << "\n";
        }
    }
    std::cerr.flush();
    const bool on_firmware_thread =
        std::this_thread::get_id() == run_thread_ && sc_core::sc_is_running() &&
        sc_core::sc_get_current_process_handle().valid() &&
        sc_core::sc_get_current_process_handle().proc_kind() == sc_core::SC_THREAD_PROC_;
    if (keep_process_ && on_firmware_thread && outcome != run_outcome::crashed &&
        outcome != run_outcome::aborted) {
        // The run is over: stop the kernel and leave this thread waiting for good, so that run()
        // returns on the main stack and the process can run something else.
        failed_ = true;
        failing = false;
        sc_core::sc_stop();
        sc_core::sc_event never;
        for (;;) sc_core::wait(never);
    }
    spdlog::shutdown();
    std::cout.flush();
    std::cerr.flush();
    _exit(exit_code_of(outcome));
}

}  // namespace harness
