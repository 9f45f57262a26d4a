// One signal_sink feeding several; see signal_fanout.h.

#include "harness/run/signal_fanout.h"

#include <algorithm>

namespace harness::run {

void signal_fanout::add(sim::signal_sink& sink, std::vector<std::string> names, bool all) {
    targets_.push_back({&sink, std::move(names), all, {}, 0});
}

void signal_fanout::declare(sim::signal_id id, const sim::signal_info& info) {
    const std::string full = info.scope + "." + info.name;
    for (target& t : targets_) {
        if (t.local.size() <= id) t.local.resize(id + 1, none_);
        if (!t.all && std::find(t.names.begin(), t.names.end(), full) == t.names.end()) continue;
        t.local[id] = t.next;
        t.sink->declare(t.next++, info);
    }
}

void signal_fanout::begin() {
    for (target& t : targets_) t.sink->begin();
}

void signal_fanout::change(sim::signal_id id, bool level, sim::time_ps at) {
    if (at > last_) {
        last_ = at;
        reached_.store(at, std::memory_order_relaxed);
    }
    for (target& t : targets_) {
        const sim::signal_id local = id < t.local.size() ? t.local[id] : none_;
        if (local != none_) t.sink->change(local, level, at);
    }
}

void signal_fanout::end(sim::time_ps at) {
    if (ended_) return;
    ended_ = true;
    for (target& t : targets_) t.sink->end(std::max(at, last_));
}

}  // namespace harness::run
