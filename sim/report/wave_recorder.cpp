// The failure report's waveform memory; see wave_recorder.h.

#include "sim/report/wave_recorder.h"

#include <stdexcept>

namespace sim {

wave_recorder::wave_recorder(recorder_limits limits) : limits_(limits) {
    if (limits_.ring_edges == 0) limits_.ring_edges = 1;
}

void wave_recorder::declare(signal_id id, const signal_info& info) {
    if (id != names_.size())
        throw std::logic_error("wave_recorder: signals must be declared densely in id order");
    names_.push_back(info.scope.empty() ? info.name : info.scope + "." + info.name);
    initial_.push_back(info.initial);
}

void wave_recorder::begin() {}

void wave_recorder::watch(const std::vector<std::vector<signal_id>>& checks) {
    ring_of_.assign(names_.size(), none_);
    rings_.clear();
    checks_.clear();
    checks_.resize(checks.size());
    for (std::size_t c = 0; c < checks.size(); ++c) {
        for (signal_id id : checks[c]) {
            if (id >= names_.size())
                throw std::invalid_argument("wave_recorder: check " + std::to_string(c) +
                                            " watches undeclared signal " + std::to_string(id));
            bool seen = false;
            for (std::uint32_t r : checks_[c].rings) seen |= r == ring_of_[id];
            if (seen) continue;  // a condition may name a signal twice
            if (ring_of_[id] == none_) {
                ring_of_[id] = static_cast<std::uint32_t>(rings_.size());
                ring r;
                r.at.assign(limits_.ring_edges, 0);
                r.initial = r.level = initial_[id];
                rings_.push_back(std::move(r));
            }
            checks_[c].rings.push_back(ring_of_[id]);
        }
        checks_[c].slots.resize(checks_[c].rings.size());
        for (std::size_t s = 0; s < checks_[c].slots.size(); ++s) {
            checks_[c].slots[s].ring = checks_[c].rings[s];
            checks_[c].slots[s].edges.reserve(limits_.ring_edges + limits_.after_edges);
        }
    }
    collecting_.assign(rings_.size(), {});
    std::vector<std::size_t> per_ring(rings_.size(), 0);
    for (const check_slots& c : checks_)
        for (std::uint32_t r : c.rings) ++per_ring[r];
    for (std::size_t r = 0; r < rings_.size(); ++r) collecting_[r].reserve(per_ring[r]);
    watching_ = true;
    for (std::size_t c : pending_) failure_detected(c);
    pending_.clear();
}

void wave_recorder::change(signal_id id, bool level, time_ps at) {
    if (id >= names_.size())
        throw std::logic_error("wave_recorder: change() of an undeclared signal");
    if (at < last_) throw std::logic_error("wave_recorder: time went backwards");
    last_ = at;
    if (id >= ring_of_.size() || ring_of_[id] == none_) return;
    const std::uint32_t ri = ring_of_[id];
    ring& r = rings_[ri];
    if (r.level == level) return;
    r.level = level;
    const std::size_t cap = r.at.size();
    if (r.size < cap) {
        r.at[(r.head + r.size) % cap] = at;
        ++r.size;
    } else {
        r.at[r.head] = at;
        r.head = (r.head + 1) % cap;
        r.dropped = true;
    }
    auto& list = collecting_[ri];
    for (std::size_t k = 0; k < list.size();) {
        frozen_slot& f = checks_[list[k].first].slots[list[k].second];
        f.edges.push_back(at);
        if (--f.after_left == 0) {
            f.closed = true;
            f.known_to = at;
            list[k] = list.back();
            list.pop_back();
            continue;
        }
        ++k;
    }
}

void wave_recorder::end(time_ps at) {
    if (ended_) return;
    ended_ = true;
    end_ = at;
    for (auto& list : collecting_) list.clear();
}

std::vector<time_ps> wave_recorder::ring_edges(const ring& r, std::size_t last) const {
    const std::size_t n = last != 0 && last < r.size ? last : r.size;
    std::vector<time_ps> out;
    out.reserve(n);
    const std::size_t cap = r.at.size();
    for (std::size_t k = r.size - n; k < r.size; ++k) out.push_back(r.at[(r.head + k) % cap]);
    return out;
}

void wave_recorder::failure_detected(std::size_t check) {
    if (!watching_) {
        pending_.push_back(check);
        return;
    }
    if (check >= checks_.size() || checks_[check].frozen) return;
    check_slots& c = checks_[check];
    c.frozen = true;
    for (std::size_t s = 0; s < c.slots.size(); ++s) {
        frozen_slot& f = c.slots[s];
        const ring& r = rings_[f.ring];
        const std::size_t cap = r.at.size();
        f.edges.clear();
        for (std::size_t k = 0; k < r.size; ++k) f.edges.push_back(r.at[(r.head + k) % cap]);
        f.dropped = r.dropped;
        // Levels alternate, so the level before the oldest kept edge follows from the current one.
        f.before = r.size % 2 == 0 ? r.level : !r.level;
        f.after_left = limits_.after_edges;
        if (ended_ || f.after_left == 0) {
            f.closed = true;
            f.known_to = ended_ ? end_ : last_;
        } else {
            collecting_[f.ring].emplace_back(static_cast<std::uint32_t>(check),
                                             static_cast<std::uint32_t>(s));
        }
    }
}

bool wave_recorder::frozen(std::size_t check) const {
    return check < checks_.size() && checks_[check].frozen;
}

std::vector<wave_trace> wave_recorder::traces(std::size_t check) const {
    std::vector<wave_trace> out;
    if (check >= checks_.size()) return out;
    const check_slots& c = checks_[check];
    for (std::size_t s = 0; s < c.rings.size(); ++s) {
        const ring& r = rings_[c.rings[s]];
        wave_trace t;
        for (signal_id id = 0; id < ring_of_.size(); ++id)
            if (ring_of_[id] == c.rings[s]) t.name = names_[id];
        if (c.frozen) {
            const frozen_slot& f = c.slots[s];
            t.before = f.before;
            t.edges = f.edges;
            t.known_from = f.dropped && !f.edges.empty() ? f.edges.front() : 0;
            t.known_to = f.closed ? f.known_to : end_;
        } else {
            t.edges = ring_edges(r, limits_.thumbnail_edges);
            const bool cut = r.dropped || t.edges.size() < r.size;
            t.before = t.edges.size() % 2 == 0 ? r.level : !r.level;
            t.known_from = cut && !t.edges.empty() ? t.edges.front() : 0;
            t.known_to = end_;
        }
        out.push_back(std::move(t));
    }
    return out;
}

std::size_t wave_recorder::bound_bytes() const {
    std::size_t n = sizeof(*this) + ring_of_.capacity() * sizeof(std::uint32_t);
    for (const ring& r : rings_) n += sizeof(ring) + r.at.capacity() * sizeof(time_ps);
    for (const check_slots& c : checks_) {
        n += sizeof(check_slots) + c.rings.capacity() * sizeof(std::uint32_t);
        n += c.slots.size() *
             (sizeof(frozen_slot) + (limits_.ring_edges + limits_.after_edges) * sizeof(time_ps));
    }
    for (const auto& list : collecting_) n += sizeof(list) + list.capacity() * sizeof(list[0]);
    for (const std::string& s : names_) n += sizeof(std::string) + s.capacity();
    return n;
}

}  // namespace sim
