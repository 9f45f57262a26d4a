#pragma once
// The system tick timer: a down-counter with a reload value that raises a flag, and an interrupt
// request, each time it counts to zero (docs/tick-timer.md).
//
// Like timer_core it does no work per tick (docs/architecture.md, "Counters are computed, not
// ticked"): its state is "after the first n edges of the clock the counter held c", the counter at
// any later time follows from the number of counted ticks by arithmetic, and the only instant it
// stops at is the next time the flag sets while it is clear. Plain C++, no SystemC: the kernel
// shell (tick_timer_module) and the tests drive it.

#include "models/event_source.h"
#include "models/layout/field_port.h"
#include "sim/clock_domain.h"

#include <cstdint>
#include <optional>
#include <string>

namespace models {

using sim::time_ps;

// Functional fields of the tick timer (layout names in to_string()).
enum class tick_field : std::uint32_t {
    enable,        // 1: counting
    irq_enable,    // 1: the reached-zero flag raises the interrupt request
    clock_choice,  // 0: count the instance clock; 1: count it divided by the instance's divider
    flags,         // flag bits (tick_flag_zero)
    reload,        // value loaded on the tick after the counter reached 0
    current,       // the counter; any write clears it to 0 without setting the flag
};
inline constexpr std::uint32_t tick_field_count = 6;
// Readable name of a field ("reload"...), for layouts and messages.
const char* to_string(tick_field f);
// Flag bit set when the counter steps from 1 to 0.
inline constexpr std::uint32_t tick_flag_zero = 1;

// What one tick timer instance has: fixed by the part.
struct tick_config {
    unsigned counter_bits = 24;  // 1..32
    unsigned divider = 8;        // 2..65536: the divided clock choice counts every divider-th edge
    // Throws std::invalid_argument naming the first out-of-range value.
    void validate() const;
    std::uint32_t counter_max() const {
        return counter_bits >= 32 ? 0xffff'ffffu : (1u << counter_bits) - 1;
    }
};

// What the tick timer reports as it runs, with exact times.
class tick_observer {
public:
    virtual ~tick_observer() = default;
    // The reached-zero flag went from clear to set.
    virtual void on_flags_set(std::uint32_t bits, time_ps at) = 0;
    // The interrupt request line changed level.
    virtual void on_irq(bool level, time_ps at) = 0;
};

// The interface the fast core and the tick-exact reference both implement. Calls come in
// non-decreasing time; a call at time t sees every clock edge at or before t as already happened.
class tick_timer_if : public field_port, public event_source {
public:
    // Processes everything that happens at or before t.
    void advance_to(time_ps t) override = 0;
    // Writes field f at time t.
    virtual void write(tick_field f, std::uint32_t value, time_ps t) = 0;
    // Reads field f at time t.
    virtual std::uint32_t read(tick_field f, time_ps t) = 0;
    // Clears the flag bits in mask at time t.
    virtual void clear_flags(std::uint32_t mask, time_ps t) = 0;
    // The earliest time something may happen that was not yet processed, or none.
    bool next_event(time_ps& at) const override = 0;

    // field_port: the field number is a tick_field.
    std::uint32_t read_field(std::uint32_t field, time_ps t) override {
        return read(static_cast<tick_field>(field), t);
    }
    void write_field(std::uint32_t field, std::uint32_t value, time_ps t) override {
        write(static_cast<tick_field>(field), value, t);
    }
    void clear_flag_bits(std::uint32_t mask, time_ps t) override { clear_flags(mask, t); }
};

class tick_timer_core final : public tick_timer_if {
public:
    // A tick timer counting edges of `clock` (which must outlive it); `observer` may be null.
    tick_timer_core(const tick_config& cfg, const sim::clock_domain& clock,
                    tick_observer* observer = nullptr);

    void advance_to(time_ps t) override;
    void write(tick_field f, std::uint32_t value, time_ps t) override;
    std::uint32_t read(tick_field f, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    bool next_event(time_ps& at) const override;
    // The clock's timeline changed from time t on: the cached time of the next event is stale.
    void clock_changed(time_ps t);
    // Adds an observer (told of everything from now on).
    void set_observer(tick_observer* o) { observer_ = o; }
    // Flag-setting instants processed so far (the only instants handled one by one).
    std::uint64_t events_processed() const { return events_; }

private:
    // Brings the state to "the first n clock edges have happened", reporting a flag set on the way.
    void skip_to(std::uint64_t n);
    // Counted ticks among clock edges [a, b).
    std::uint64_t counted(std::uint64_t a, std::uint64_t b) const;
    // Index of the m-th counted edge (m >= 1) at or after edge a.
    std::uint64_t counted_edge(std::uint64_t a, std::uint64_t m) const;
    // The counter after m more counted ticks from the current state (flag handling aside).
    std::uint32_t value_after(std::uint64_t m) const;
    // Counted ticks from now to the next step from 1 to 0, or none.
    std::optional<std::uint64_t> ticks_to_zero() const;
    void update_irq(time_ps at);

    tick_config cfg_;
    const sim::clock_domain& clock_;
    tick_observer* observer_;
    std::uint64_t done_ = 0;  // clock edges processed: edges 0..done_-1 have happened
    std::uint32_t counter_ = 0;
    std::uint32_t reload_ = 0;
    bool enable_ = false;
    bool irq_enable_ = false;
    bool divided_ = false;
    std::uint32_t flags_ = 0;
    bool irq_ = false;
    std::uint64_t events_ = 0;
    mutable std::optional<time_ps> cached_next_;  // next_event's answer while the state stands
    mutable bool cache_valid_ = false;
};

}  // namespace models
