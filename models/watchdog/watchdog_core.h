#pragma once
// The watchdog: a down-counter on a low-speed oscillator that firmware must refresh, with a key
// sequence, before it runs out; a refresh while the counter is still above the window is a fault
// too (docs/watchdog.md).
//
// Like the timers it does no work per tick: after a start or a refresh the instant it runs out is
// one multiplication away, and that instant is its only event. Plain C++, no SystemC: the platform
// and the tests drive it, and an observer hears of the fault with its exact time.

#include "models/event_source.h"
#include "models/layout/field_port.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <optional>

namespace models {

using sim::time_ps;

// Functional fields of the watchdog (layout names in to_string()).
enum class watchdog_field : std::uint32_t {
    key,        // write-only: the refresh sequence is key_first then key_second, written in order
    start,      // write 1: start counting (nothing stops it but a reset); reads 1 once started
    prescaler,  // the counter steps every 4 << prescaler oscillator edges (0..6)
    reload,     // the value a start or a refresh loads
    window,     // a refresh is allowed only while the counter is at or below this value
    count,      // read-only: the counter now
};
inline constexpr std::uint32_t watchdog_field_count = 6;
// Readable name of a field ("reload"...), for layouts and messages.
const char* to_string(watchdog_field f);

// The refresh key sequence, of our own choosing: these two values written to `key` in this order,
// with no other key write between them.
inline constexpr std::uint32_t watchdog_key_first = 0x3c71;
inline constexpr std::uint32_t watchdog_key_second = 0x9e24;
// The largest prescaler value.
inline constexpr std::uint32_t watchdog_prescaler_max = 6;

// What one watchdog instance has: fixed by the part.
struct watchdog_config {
    unsigned counter_bits = 12;  // 4..16: width of reload, window and count
    // Throws std::invalid_argument naming the first out-of-range value.
    void validate() const;
    std::uint32_t counter_max() const { return (1u << counter_bits) - 1; }
};

// Why the watchdog resets the part.
enum class watchdog_fault : std::uint32_t {
    timeout,        // the counter ran out
    early_refresh,  // a refresh came while the counter was above the window
};
// "timeout", "early refresh".
const char* to_string(watchdog_fault f);

// What the watchdog reports.
class watchdog_observer {
public:
    virtual ~watchdog_observer() = default;
    // The watchdog resets the part at `at` (reported once; the watchdog stops there).
    virtual void on_reset(watchdog_fault why, time_ps at) = 0;
};

class watchdog_core final : public field_port, public event_source {
public:
    // A watchdog counting edges of `clock` (which must outlive it); `observer` may be null.
    watchdog_core(const watchdog_config& cfg, const sim::clock_domain& clock,
                  watchdog_observer* observer = nullptr);

    void advance_to(time_ps t) override;
    bool next_event(time_ps& at) const override;
    // Writes field f at time t (after bringing the watchdog up to t).
    void write(watchdog_field f, std::uint32_t value, time_ps t);
    // Reads field f at time t.
    std::uint32_t read(watchdog_field f, time_ps t);
    // The clock's timeline changed from time t on: the cached time of the next event is stale.
    void clock_changed(time_ps t);

    bool running() const { return running_; }
    // The time of the last completed refresh (or of the start), if any.
    std::optional<time_ps> last_refresh() const { return last_refresh_; }
    // The fault that reset the part, if one did.
    std::optional<watchdog_fault> fault() const { return fault_; }
    // When the fault happened (meaningful once fault() has a value).
    time_ps fault_time() const { return fault_at_; }

    // field_port: the field number is a watchdog_field; the watchdog has no flags.
    std::uint32_t read_field(std::uint32_t field, time_ps t) override {
        return read(static_cast<watchdog_field>(field), t);
    }
    void write_field(std::uint32_t field, std::uint32_t value, time_ps t) override {
        write(static_cast<watchdog_field>(field), value, t);
    }
    void clear_flag_bits(std::uint32_t, time_ps) override {}

private:
    // Oscillator edges per counter step.
    std::uint64_t step_edges() const { return std::uint64_t(4) << prescaler_; }
    // The edge index at which the counter runs out (steps from 1 to 0; at the first step when the
    // reload value is 0).
    std::uint64_t timeout_edge() const;
    // The counter at time t (running, no fault yet, t before the timeout).
    std::uint32_t counter_at(time_ps t) const;
    // Loads the counter at time t: counting restarts from the first edge after t.
    void load(time_ps t);
    void raise(watchdog_fault why, time_ps at);

    watchdog_config cfg_;
    const sim::clock_domain& clock_;
    watchdog_observer* observer_;
    bool running_ = false;
    std::uint32_t prescaler_ = 0;
    std::uint32_t reload_ = 0;
    std::uint32_t window_ = 0;
    std::uint64_t origin_ = 0;  // index of the first oscillator edge counted since the last load
    bool key_armed_ = false;    // key_first was the last key written
    std::optional<time_ps> last_refresh_;
    std::optional<watchdog_fault> fault_;
    time_ps fault_at_ = 0;
};

}  // namespace models
