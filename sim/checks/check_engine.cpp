// The streaming check engine; see check_engine.h.

#include "sim/checks/check_engine.h"

#include "sim/checks/detail/check_state.h"

#include <stdexcept>

namespace sim {

check_engine::check_engine(std::vector<check_spec> specs) {
    std::string problems;
    for (const check_spec& s : specs) {
        for (const check_spec_problem& p : validate(s))
            problems += "\ncheck '" + s.name + "': " + p.field + ": " + p.message;
    }
    if (!problems.empty()) throw std::invalid_argument("invalid checks:" + problems);
    checks_.reserve(specs.size());
    for (const check_spec& s : specs) checks_.push_back(detail::make_check_state(s));
}

check_engine::~check_engine() = default;

void check_engine::declare(signal_id id, const signal_info& info) {
    if (begun_) throw std::logic_error("check_engine: signal declared after begin()");
    if (id != names_.size())
        throw std::logic_error("check_engine: signals must be declared densely in id order");
    names_.push_back(info.scope.empty() ? info.name : info.scope + "." + info.name);
    levels_.push_back(info.initial ? 1 : 0);
}

signal_id check_engine::resolve(const std::string& check, const std::string& name) const {
    for (signal_id i = 0; i < names_.size(); ++i)
        if (names_[i] == name) return i;
    // A bare name matches "scope.name" when exactly one signal has it.
    signal_id found = 0;
    unsigned matches = 0;
    for (signal_id i = 0; i < names_.size(); ++i) {
        const std::string& n = names_[i];
        if (n.size() > name.size() && n.compare(n.size() - name.size(), name.size(), name) == 0 &&
            n[n.size() - name.size() - 1] == '.') {
            found = i;
            ++matches;
        }
    }
    if (matches == 1) return found;
    std::string known;
    for (const std::string& n : names_) known += (known.empty() ? "" : ", ") + n;
    throw std::invalid_argument("check '" + check + "': " +
                                (matches > 1
                                     ? "signal name '" + name + "' is ambiguous; give scope.name"
                                     : "no signal named '" + name + "'") +
                                "; declared signals: " + (known.empty() ? "none" : known));
}

void check_engine::begin() {
    if (begun_) throw std::logic_error("check_engine: begin() called twice");
    const std::size_t n = names_.size();
    std::vector<std::uint32_t> edge_count(n, 0), instant_count(n, 0);
    std::vector<std::vector<signal_id>> bound(checks_.size());
    for (std::size_t c = 0; c < checks_.size(); ++c) {
        std::vector<signal_id> ids;
        for (const std::string& name : checks_[c]->signal_names())
            ids.push_back(resolve(checks_[c]->spec().name, name));
        for (signal_id id : ids) ++(checks_[c]->instant_driven() ? instant_count : edge_count)[id];
        bound[c] = std::move(ids);
    }
    // Compressed per-signal target lists.
    edge_first_.assign(n + 1, 0);
    instant_first_.assign(n + 1, 0);
    for (std::size_t s = 0; s < n; ++s) {
        edge_first_[s + 1] = edge_first_[s] + edge_count[s];
        instant_first_[s + 1] = instant_first_[s] + instant_count[s];
    }
    edge_targets_.assign(edge_first_[n], edge_target{nullptr, 0});
    instant_targets_.assign(instant_first_[n], 0);
    std::vector<std::uint32_t> edge_fill(edge_first_.begin(), edge_first_.end() - 1);
    std::vector<std::uint32_t> instant_fill(instant_first_.begin(), instant_first_.end() - 1);
    for (std::size_t c = 0; c < checks_.size(); ++c) {
        for (std::uint32_t slot = 0; slot < bound[c].size(); ++slot) {
            const signal_id id = bound[c][slot];
            if (checks_[c]->instant_driven()) {
                // One entry per check and signal, even when a condition names the signal twice.
                bool seen = false;
                for (std::uint32_t k = instant_first_[id]; k < instant_fill[id]; ++k)
                    seen |= instant_targets_[k] == c;
                if (!seen) instant_targets_[instant_fill[id]++] = static_cast<std::uint32_t>(c);
            } else {
                edge_targets_[edge_fill[id]++] = edge_target{checks_[c].get(), slot};
            }
        }
        checks_[c]->bind(std::move(bound[c]));
    }
    // Unused entries (duplicates) point at nothing: shrink each list's end to its fill.
    for (std::size_t s = 0; s < n; ++s) {
        for (std::uint32_t k = instant_fill[s]; k < instant_first_[s + 1]; ++k)
            instant_targets_[k] = ~std::uint32_t{0};
    }
    dirty_.reserve(checks_.size());
    is_dirty_.assign(checks_.size(), 0);
    results_.reserve(checks_.size());
    for (auto& c : checks_) c->start(levels_.data());
    begun_ = true;
}

void check_engine::flush_instant() {
    for (std::uint32_t c : dirty_) {
        checks_[c]->on_instant(levels_.data(), instant_);
        is_dirty_[c] = 0;
    }
    dirty_.clear();
}

void check_engine::change(signal_id id, bool level, time_ps at) {
    if (!begun_ || ended_) throw std::logic_error("check_engine: change() outside the run");
    if (id >= levels_.size())
        throw std::logic_error("check_engine: change() of an undeclared signal");
    if (at < instant_) {
        throw std::logic_error("check_engine: time went backwards, from " + format_time(instant_) +
                               " to " + format_time(at));
    }
    if (at > instant_) {
        flush_instant();
        instant_ = at;
    }
    if ((levels_[id] != 0) == level) return;  // not a change
    levels_[id] = level ? 1 : 0;
    for (std::uint32_t k = edge_first_[id]; k < edge_first_[id + 1]; ++k)
        edge_targets_[k].check->on_change(edge_targets_[k].slot, level, at);
    for (std::uint32_t k = instant_first_[id]; k < instant_first_[id + 1]; ++k) {
        const std::uint32_t c = instant_targets_[k];
        if (c == ~std::uint32_t{0} || is_dirty_[c]) continue;
        is_dirty_[c] = 1;
        dirty_.push_back(c);
    }
}

void check_engine::end(time_ps at) {
    if (ended_) return;
    if (!begun_) throw std::logic_error("check_engine: end() before begin()");
    if (at < instant_) throw std::logic_error("check_engine: the run ends before its last change");
    flush_instant();
    ended_ = true;
    for (auto& c : checks_) {
        c->finish(at);
        results_.push_back(c->result());
    }
}

void check_engine::set_failure_listener(
    std::function<void(std::size_t check, time_ps at)> listener) {
    for (std::size_t c = 0; c < checks_.size(); ++c) {
        if (!listener) {
            checks_[c]->on_first_failure(nullptr);
            continue;
        }
        checks_[c]->on_first_failure([listener, c](time_ps at) { listener(c, at); });
    }
}

const std::vector<signal_id>& check_engine::check_signals(std::size_t check) const {
    return checks_.at(check)->ids();
}

bool check_engine::all_passed() const {
    if (!ended_) return false;
    for (const check_result& r : results_)
        if (!r.passed) return false;
    return true;
}

std::size_t check_engine::footprint_bytes() const {
    std::size_t n = sizeof(*this) + levels_.capacity() +
                    edge_first_.capacity() * sizeof(std::uint32_t) +
                    edge_targets_.capacity() * sizeof(edge_target) +
                    instant_first_.capacity() * sizeof(std::uint32_t) +
                    instant_targets_.capacity() * sizeof(std::uint32_t) +
                    dirty_.capacity() * sizeof(std::uint32_t) + is_dirty_.capacity() +
                    checks_.capacity() * sizeof(checks_[0]);
    for (const std::string& s : names_) n += sizeof(std::string) + s.capacity();
    for (const auto& c : checks_) n += c->footprint_bytes();
    return n;
}

}  // namespace sim
