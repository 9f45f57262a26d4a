#pragma once
// A simulated part ready to run firmware: clock tree, timers behind their register layouts, the
// address router, the interrupt controller and the cpu, wired as docs/architecture.md describes in
// "The clock tree", "Registers are data" and "Firmware on the host". Both the GoogleTest fixture
// and the tickbench command build one; it is also the place where a run's failures (crash, abort,
// failed firmware check, hang) become a report and exit code 3 after every output has been flushed
// and closed.

#include "harness/cpu.h"
#include "harness/interrupt_controller.h"
#include "models/bus/address_router.h"
#include "models/bus/timer_target.h"
#include "models/layout/register_file.h"
#include "models/layout/register_layout.h"
#include "models/tick/tick_timer_core.h"
#include "models/timer/timer_module.h"
#include "models/watchdog/watchdog_core.h"
#include "sim/clock_tree.h"
#include "sim/stimulus/source_spec.h"

#include <functional>
#include <memory>
#include <optional>
#include <string>
#include <thread>
#include <vector>

namespace harness {

// Starts a new simulation kernel in this process: time 0, nothing elaborated, so that another part
// can be built and run (a sweep runs many points per process this way). Every SystemC object of the
// kernel before is left behind as it is, never used or freed again; call it between runs only.
void start_fresh_kernel();

// One timer instance of the part.
struct timer_spec {
    std::string name;                // instance name, also its interrupt line's name
    models::register_layout layout;  // its registers (and instance configuration)
    std::string clock;               // clock-tree node of its timer clock
    std::uint64_t base = 0;          // bus address of its register window
    unsigned irq_priority = 8;
    time_ps irq_extra_delay = 0;                 // injected interrupt delivery delay
    std::optional<std::uint32_t> counter_start;  // counter value at time 0 (edge-case set-up)
    bool running_at_start = false;               // counting from time 0, before firmware touches it
    sc_core::sc_time access_latency = sc_core::SC_ZERO_TIME;  // added per bus access
    // Watchers of the timer's outputs (waveform and check probes), attached before the reset
    // values are applied so they see every output change from time 0. They must outlive the run.
    std::vector<models::timer_observer*> observers;
    // Watchers of the timer's inputs (the same probes), told of every level an input takes.
    std::vector<models::input_observer*> input_observers;
};

// One peripheral of a kind other than the timer (a tick timer, a watchdog), chosen by its layout's
// kind.
struct peripheral_spec {
    std::string name;                // instance name, also its interrupt line's name
    models::register_layout layout;  // its registers (kind and instance configuration)
    std::string clock;               // clock-tree node it counts
    std::uint64_t base = 0;          // bus address of its register window
    unsigned irq_priority = 8;
    time_ps irq_extra_delay = 0;                              // injected interrupt delivery delay
    sc_core::sc_time access_latency = sc_core::SC_ZERO_TIME;  // added per bus access
    // Watchdogs: a reset is expected (a check decides whether it came in time) rather than a
    // failure that ends the run.
    bool reset_expected = false;
    // Watchdogs: told of the reset before the platform acts on it. They must outlive the run.
    std::vector<models::watchdog_observer*> reset_observers;
};

// What drives one input of a timer (docs/scenario.md, "Inputs"; docs/architecture.md, "Input
// stimulus").
struct input_wiring {
    enum class source_kind {
        stimulus,  // a described source, computed lazily
        loopback,  // another timer's output pin
        chain,     // another timer's trigger pulses, on the chained input
        firmware,  // set by the firmware with tick_input_set()
    };
    std::string timer;   // the timer whose input this is
    unsigned input = 0;  // input_of_channel(c), trigger_pin_input or fault_input (not for chain)
    source_kind kind = source_kind::stimulus;
    sim::stimulus::source_ref stimulus;  // stimulus
    std::string producer;                // loopback, chain, fan stimulus: the timer that produces
    unsigned pin = 0;                    // loopback: the producer's output pin
    std::string label;                   // for messages: "stimulus \"tach\"", "fan.channel2"
};

// The name of input `input` of a timer: "input1" (channel 0's), ..., "trigger", "fault".
std::string input_name(unsigned input);

// Brings every model up to time t, always advancing the one whose next event is earliest, so that
// what they report reaches shared observers (waveforms, checks) in time order.
void advance_in_order(const std::vector<models::event_source*>& models, time_ps t);

// How a run ended.
enum class run_outcome {
    completed,
    crashed,
    aborted,
    check_failed,
    hung,
    failed,
    watchdog_reset,  // a watchdog whose reset the scenario did not expect reset the part
};
// "completed", "crashed", "aborted", "firmware-check-failed", "hung", "failed", "watchdog-reset".
const char* to_string(run_outcome o);

// The process exit code of a run that ended with `o` (other than completed): 5 for a watchdog
// reset, 3 for the others (docs/cli.md, "Exit codes").
int exit_code_of(run_outcome o);

// The report of a run that firmware ended badly.
struct failure_report {
    run_outcome outcome = run_outcome::failed;
    std::string message;
    time_ps at = 0;  // the firmware's simulated time
    std::vector<access_record> last_accesses;
    std::vector<std::string> access_names;  // register name of each access ("fan_timer.limit")
    std::vector<std::string> backtrace;     // crashes only
    // A readable, multi-line rendering; every line, the last one too, ends with '\n'.
    std::string text() const;
};

class platform {
public:
    platform();
    ~platform();
    platform(const platform&) = delete;
    platform& operator=(const platform&) = delete;

    // The clock tree, to fill before build().
    sim::clock_tree& clocks() { return clocks_; }
    void add_timer(timer_spec spec);
    // Adds a peripheral of another kind (before build()); its interrupt line comes after every
    // timer's. Throws std::invalid_argument for a kind the platform cannot build.
    void add_peripheral(peripheral_spec spec);
    // Drives a timer input (before build()). build() throws std::invalid_argument for an unknown
    // timer, an input driven twice, or wiring in which a timer depends on itself.
    void add_input(input_wiring w) { inputs_.push_back(std::move(w)); }
    // The firmware and its processor. Without it the part runs on its own.
    void set_firmware(const cpu_config& cfg, std::function<void()> entry);
    void set_unmapped_policy(models::unmapped_policy p) { policy_ = p; }
    // Something to flush and close before the process ends on a firmware failure.
    void on_close(std::function<void()> f) { closers_.push_back(std::move(f)); }
    // Wall seconds without any firmware call while in firmware code = hang (0: never).
    void set_hang_wall_seconds(double s) { hang_wall_seconds_ = s; }
    // Maps every peripheral window at its real address (no access rights) so unmodified driver code
    // reaches the models through plain pointers (docs/firmware-api.md, "Unmodified drivers").
    void set_map_peripherals(bool on) { map_peripherals_ = on; }
    // A failure raised on the firmware's thread (a failed firmware check, a hang the cpu counts, a
    // bus error) ends the run but not the process: the report and the closers run as usual, the
    // kernel stops, run() returns and failed() is true. Crashes, aborts and the wall-clock hang
    // watchdog still end the process, since their handlers run outside the firmware's thread.
    void set_keep_process(bool on) { keep_process_ = on; }
    // Whether the last run() ended through fail() (only possible with set_keep_process).
    bool failed() const { return failed_; }

    // Starts the clock tree and builds every module (SystemC elaboration). Throws on bad set-up.
    void build();
    // Runs the kernel for `duration`; nothing is simulated after that end (the firmware stops there
    // if it is still running, see harness::cpu). On a firmware failure the report goes to stderr,
    // every closer runs, and the process exits with code 3; `on_failure` (if set) sees the report
    // first.
    void run(time_ps duration);
    void on_failure(std::function<void(const failure_report&)> f) { on_failure_ = std::move(f); }

    models::timer_module& timer(const std::string& name);
    std::vector<std::string> timer_names() const;
    // The tick timer named `name` (throws std::out_of_range if there is none).
    models::tick_timer_core& tick_timer(const std::string& name);
    // The watchdog named `name` (throws std::out_of_range if there is none).
    models::watchdog_core& watchdog_timer(const std::string& name);
    harness::cpu* cpu() { return cpu_.get(); }
    interrupt_controller& interrupts() { return *irqs_; }
    // "peripheral.register" for a bus address, or the address in hex.
    std::string describe_address(std::uint64_t address) const;

    // Ends the run on a firmware failure: report, closers, exit code 3 (5 for an unexpected
    // watchdog reset; exit_code_of()). Never returns.
    [[noreturn]] void fail(run_outcome outcome, const std::string& message,
                           std::vector<std::string> backtrace = {});

private:
    struct timer_slot;
    struct peripheral_slot;
    struct idle_initiator;
    void start_watchdog();
    void wire_inputs();

    sim::clock_tree clocks_;
    std::vector<std::unique_ptr<timer_slot>> timers_;
    std::vector<std::unique_ptr<peripheral_slot>> peripherals_;
    std::vector<input_wiring> inputs_;
    std::optional<cpu_config> cpu_cfg_;
    std::function<void()> entry_;
    models::unmapped_policy policy_ = models::unmapped_policy::warn;
    std::unique_ptr<interrupt_controller> irqs_;
    std::unique_ptr<models::address_router> router_;
    std::unique_ptr<harness::cpu> cpu_;
    std::unique_ptr<idle_initiator> idle_;
    std::vector<std::function<void()>> closers_;
    std::function<void(const failure_report&)> on_failure_;
    double hang_wall_seconds_ = 10;
    struct watchdog;
    std::unique_ptr<watchdog> watchdog_;
    bool map_peripherals_ = false;
    struct mapped;
    std::unique_ptr<mapped> mapped_;
    bool built_ = false;
    bool keep_process_ = false;
    bool failed_ = false;
    std::thread::id run_thread_;
};

}  // namespace harness
