#pragma once
// One signal_sink feeding several: the timers' probes report once, and the waveform writer and the
// check engine both see the changes. Each target may take a subset of the signals (the waveform
// keeps only those [waves] names); it sees them with ids renumbered densely from 0.

#include "sim/signal_sink.h"

#include <atomic>
#include <string>
#include <vector>

namespace harness::run {

class signal_fanout final : public sim::signal_sink {
public:
    // Adds a target taking the signals whose full names ("scope.name") are in `names`, or every
    // signal when `all` is true. Call before the first declare(). The target must outlive this.
    void add(sim::signal_sink& sink, std::vector<std::string> names, bool all);

    void declare(sim::signal_id id, const sim::signal_info& info) override;
    void begin() override;
    void change(sim::signal_id id, bool level, sim::time_ps at) override;
    void end(sim::time_ps at) override;

    // The latest change time seen (0 before any).
    sim::time_ps last_time() const { return last_; }
    // The same, safe to read from another thread while changes arrive (for progress displays).
    sim::time_ps reached() const { return reached_.load(std::memory_order_relaxed); }
    bool ended() const { return ended_; }

private:
    static constexpr sim::signal_id none_ = ~sim::signal_id{0};
    struct target {
        sim::signal_sink* sink;
        std::vector<std::string> names;
        bool all;
        std::vector<sim::signal_id> local;  // by global id: the target's id, or none_
        sim::signal_id next = 0;
    };
    std::vector<target> targets_;
    sim::time_ps last_ = 0;
    std::atomic<sim::time_ps> reached_{0};
    bool ended_ = false;
};

}  // namespace harness::run
