#pragma once
// The waveform memory of the failure report (report.html): a signal_sink that keeps, for each
// signal a check watches, a ring of its most recent edges, and freezes a copy of those rings when
// a check first fails, completed by a few edges after the failure. The report draws each failed
// check from its frozen window and each passed check from the last edges of the run, so the run
// never re-reads its waveform file (docs/architecture.md, "Outputs").
//
// Memory is bounded and allocated when the checks are known (watch()): one ring of
// `ring_edges` edges per watched signal, plus, per check that fails, one frozen copy of each of
// its signals' rings with room for `after_edges` more. bound_bytes() states the bound; nothing
// grows with the length of the run.

#include "sim/signal_sink.h"

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

namespace sim {

// How much the recorder keeps.
struct recorder_limits {
    std::size_t ring_edges = 256;     // recent edges kept per watched signal
    std::size_t after_edges = 24;     // edges kept per signal after a check's first failure
    std::size_t thumbnail_edges = 8;  // last edges per signal handed out for a passed check
};

// One recorded stretch of a signal: its level before the first edge, then every change inside
// [known_from, known_to] (levels alternate, starting with !before).
struct wave_trace {
    std::string name;  // "scope.name"
    bool before = false;
    std::vector<time_ps> edges;
    time_ps known_from = 0;  // nothing is known of the signal before this time
    time_ps known_to = 0;    // nor after this one
};

class wave_recorder final : public signal_sink {
public:
    explicit wave_recorder(recorder_limits limits = {});

    void declare(signal_id id, const signal_info& info) override;
    void begin() override;
    // Keeps the change when it is one (a repeated level is ignored); throws std::logic_error when
    // time goes backwards or the id is unknown.
    void change(signal_id id, bool level, time_ps at) override;
    void end(time_ps at) override;

    // The signals of each check, by declared id (check_engine::check_signals); allocates every
    // ring and frozen slot. Call once, after the signals are declared and before the first
    // change. Throws std::invalid_argument for an undeclared id.
    void watch(const std::vector<std::vector<signal_id>>& checks);
    // Check `check` has just failed for the first time: freezes the recent edges of its signals
    // and keeps the next after_edges of each. Later calls for the same check do nothing; a call
    // before watch() (a check failing as the run begins) takes effect in watch().
    void failure_detected(std::size_t check);

    // Whether `check`'s window was frozen.
    bool frozen(std::size_t check) const;
    // The traces of `check`, slot by slot: the frozen window when it failed, else the last
    // thumbnail_edges edges of each signal up to the end of the run. Call after end().
    std::vector<wave_trace> traces(std::size_t check) const;
    // The most the recorder can hold for the watched checks, in bytes.
    std::size_t bound_bytes() const;

private:
    struct ring {
        std::vector<time_ps> at;  // capacity ring_edges; levels alternate
        std::size_t head = 0;     // index of the oldest kept edge
        std::size_t size = 0;
        bool dropped = false;  // older edges were overwritten
        bool initial = false;  // level at time 0
        bool level = false;    // current level
    };
    struct frozen_slot {
        std::uint32_t ring = 0;  // watched-signal index
        bool before = false;
        bool dropped = false;
        std::vector<time_ps> edges;  // capacity ring_edges + after_edges
        std::size_t after_left = 0;
        time_ps known_to = 0;
        bool closed = false;
    };
    struct check_slots {
        std::vector<std::uint32_t> rings;  // watched-signal index per slot
        bool frozen = false;
        std::vector<frozen_slot> slots;
    };
    // The oldest-first edges of ring r; the last `last` of them when last != 0.
    std::vector<time_ps> ring_edges(const ring& r, std::size_t last) const;

    recorder_limits limits_;
    std::vector<std::string> names_;
    std::vector<bool> initial_;
    std::vector<std::uint32_t> ring_of_;  // by signal id: watched index, or none
    std::vector<ring> rings_;
    std::vector<check_slots> checks_;
    // Per watched signal: (check, slot) pairs still collecting edges after a failure.
    std::vector<std::vector<std::pair<std::uint32_t, std::uint32_t>>> collecting_;
    std::vector<std::size_t> pending_;  // failures reported before watch()
    bool watching_ = false;
    time_ps last_ = 0;
    time_ps end_ = 0;
    bool ended_ = false;
    static constexpr std::uint32_t none_ = ~std::uint32_t{0};
};

}  // namespace sim
