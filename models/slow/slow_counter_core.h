#pragma once
// The slow-clock counter: an up-counter on a slow clock (a watch crystal) that is asynchronous to
// the bus (docs/slow-counter.md). A bus read of the counter goes through a synchroniser, so it
// returns the counter as it stood a fixed window before the read; a write of a slow-side field
// waits for a number of slow-clock edges, with a busy flag meanwhile, and a second write while busy
// is lost.
//
// Like the other counters it does no work per tick (docs/architecture.md, "Counters are computed,
// not ticked"): its state is a short list of spans "from edge n on, the counter started at c with
// this enable and prescale", the counter at any edge follows by arithmetic, and the only instants
// it stops at are a pending write taking effect and the alarm flag setting. Plain C++, no SystemC.

#include "models/event_source.h"
#include "models/layout/field_port.h"
#include "sim/clock_domain.h"

#include <array>
#include <cstdint>
#include <optional>
#include <vector>

namespace models {

using sim::time_ps;

// Functional fields of the slow-clock counter (layout names in to_string()).
enum class slow_field : std::uint32_t {
    enable,      // slow side, through the write path: 1 counts
    prescale,    // slow side: k counts every 2^k-th slow edge (0..15)
    count,       // slow side: the counter; reads go through the synchroniser
    alarm,       // slow side: the flag sets when the counter steps to this value
    irq_enable,  // bus side, immediate: the alarm flag raises the interrupt request
    flags,       // bus side: flag bits (slow_flag_alarm)
    busy,        // bus side, read-only: 1 while a write waits for its slow edge
};
inline constexpr std::uint32_t slow_field_count = 7;
// Readable name of a field ("count"...), for layouts and messages.
const char* to_string(slow_field f);
// Flag bit set when a counted edge brings the counter to the alarm value.
inline constexpr std::uint32_t slow_flag_alarm = 1;
// Number of slow-side fields (enable, prescale, count, alarm): the ones a write must wait for.
inline constexpr std::uint32_t slow_side_field_count = 4;

// What one slow-clock counter instance has: fixed by the part.
struct slow_config {
    unsigned counter_bits = 32;    // 1..32
    unsigned write_latency = 2;    // 1..16: a write takes effect at this slow edge after it
    time_ps read_window = 40'000;  // 0..1 ms in ps: a read sees the counter as of this long ago
    // Throws std::invalid_argument naming the first out-of-range value.
    void validate() const;
    std::uint32_t counter_max() const {
        return counter_bits >= 32 ? 0xffff'ffffu : (1u << counter_bits) - 1;
    }
};

// What the slow-clock counter reports as it runs, with exact times.
class slow_observer {
public:
    virtual ~slow_observer() = default;
    // The alarm flag went from clear to set.
    virtual void on_flags_set(std::uint32_t bits, time_ps at) = 0;
    // The interrupt request line changed level.
    virtual void on_irq(bool level, time_ps at) = 0;
};

// The interface the fast core and the edge-by-edge reference both implement. Calls come in
// non-decreasing time; a call at time t sees every slow edge at or before t as already happened.
class slow_counter_if : public field_port, public event_source {
public:
    // Processes everything that happens at or before t.
    void advance_to(time_ps t) override = 0;
    // Writes field f at time t (slow-side fields through the write path).
    virtual void write(slow_field f, std::uint32_t value, time_ps t) = 0;
    // Reads field f at time t (the count through the synchroniser).
    virtual std::uint32_t read(slow_field f, time_ps t) = 0;
    // Clears the flag bits in mask at time t.
    virtual void clear_flags(std::uint32_t mask, time_ps t) = 0;
    // The earliest time something may happen that was not yet processed, or none.
    bool next_event(time_ps& at) const override = 0;

    // field_port: the field number is a slow_field.
    std::uint32_t read_field(std::uint32_t field, time_ps t) override {
        return read(static_cast<slow_field>(field), t);
    }
    void write_field(std::uint32_t field, std::uint32_t value, time_ps t) override {
        write(static_cast<slow_field>(field), value, t);
    }
    void clear_flag_bits(std::uint32_t mask, time_ps t) override { clear_flags(mask, t); }
};

class slow_counter_core final : public slow_counter_if {
public:
    // A counter on the edges of `clock` (which must outlive it); `observer` may be null.
    slow_counter_core(const slow_config& cfg, const sim::clock_domain& clock,
                      slow_observer* observer = nullptr);

    void advance_to(time_ps t) override;
    void write(slow_field f, std::uint32_t value, time_ps t) override;
    std::uint32_t read(slow_field f, time_ps t) override;
    void clear_flags(std::uint32_t mask, time_ps t) override;
    bool next_event(time_ps& at) const override;
    // Puts the pending write in force at once, with no busy time: a reset acts on the slow side
    // directly, so the platform calls this after writing the reset values.
    void settle(time_ps t);
    // Adds an observer (told of everything from now on).
    void set_observer(slow_observer* o) { observer_ = o; }
    // Instants handled one by one so far (writes taking effect, alarm flags setting).
    std::uint64_t events_processed() const { return events_; }

private:
    // From edge `first` on (edges first, first+1, ... counted with these settings) the counter
    // started at `start`.
    struct span {
        std::uint64_t first = 0;
        std::uint32_t start = 0;
        bool enable = false;
        unsigned prescale = 0;
    };
    // Counted edges among edges [a, b) under span s.
    static std::uint64_t counted(const span& s, std::uint64_t a, std::uint64_t b);
    // The counter after the first n edges (n >= s.first) under span s.
    std::uint32_t value_at(const span& s, std::uint64_t n) const;
    // The span in force for the state after the first n edges.
    const span& span_for(std::uint64_t n) const;
    // Processes edges [done_, n) under the current span: the alarm flag on the way.
    void run_to(std::uint64_t n);
    // Edge index of the next alarm match at or after edge done_, or none.
    std::optional<std::uint64_t> alarm_edge() const;
    // Puts the pending write in force from edge `first` on.
    void apply_pending(std::uint64_t first);
    // Time of edge k, or none if the clock never gets there.
    std::optional<time_ps> edge_time(std::uint64_t k) const;
    // Number of edges at or before t.
    std::uint64_t edges_through(time_ps t) const;
    // Edges a read at t sees through the synchroniser: those at or before t - read_window.
    std::uint64_t seen_edges(time_ps t) const;
    // Drops the spans no read from edge n on needs (the one in force at n stays).
    void forget_before(std::uint64_t n);
    void update_irq(time_ps at);

    slow_config cfg_;
    const sim::clock_domain& clock_;
    slow_observer* observer_;
    std::vector<span> spans_{span{}};  // in order of first; the last is in force
    std::uint64_t done_ = 0;           // edges 0..done_-1 have happened
    std::uint32_t alarm_ = 0;
    bool irq_enable_ = false;
    std::uint32_t flags_ = 0;
    bool irq_ = false;
    // The write waiting for its slow edge: the values of the slow-side fields it sets.
    std::array<std::optional<std::uint32_t>, slow_side_field_count> pending_{};
    bool has_pending_ = false;
    time_ps pending_at_ = 0;          // bus time of the write
    std::uint64_t pending_edge_ = 0;  // it takes effect at this edge (counted before it applies)
    std::uint64_t events_ = 0;
};

}  // namespace models
