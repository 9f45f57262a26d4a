#include "sim/vcd_compare.h"

#include "sim/word_hint.h"

#include <algorithm>
#include <array>
#include <deque>
#include <limits>
#include <map>
#include <utility>

namespace sim {

time_ps vcd_difference::at() const {
    switch (what) {
        case kind::only_a:
            return at_a;
        case kind::only_b:
            return at_b;
        default:
            return std::min(at_a, at_b);
    }
}

bool vcd_signal_comparison::same() const {
    return in_a && in_b && width_a == width_b && differences == 0;
}

bool vcd_comparison::same() const { return !ends_differ && differing_signals() == 0; }

std::size_t vcd_comparison::differing_signals() const {
    return static_cast<std::size_t>(
        std::count_if(signals.begin(), signals.end(),
                      [](const vcd_signal_comparison& s) { return s.differs(); }));
}

namespace {

constexpr std::size_t none = std::numeric_limits<std::size_t>::max();

time_ps distance(time_ps x, time_ps y) { return x > y ? x - y : y - x; }
time_ps plus(time_ps x, time_ps y) { return x > max_time_ps - y ? max_time_ps : x + y; }

struct edge {
    time_ps at = 0;
    std::string value;
};

// One run's side of one signal: its value so far and its edges not yet paired.
struct side_state {
    std::deque<edge> edges;
    std::string value;
    bool has_value = false;
};

struct signal_state {
    std::size_t result = 0;  // index into vcd_comparison::signals
    std::array<side_state, 2> sides;
};

class comparer {
public:
    comparer(vcd_reader& a, vcd_reader& b, const vcd_compare_options& options)
        : readers_{&a, &b}, options_(options) {}

    vcd_comparison run() {
        select_signals();
        vcd_change change;
        while (!done_[0] || !done_[1]) {
            const int s = done_[0]                                     ? 1
                          : done_[1]                                   ? 0
                          : readers_[0]->time() <= readers_[1]->time() ? 0
                                                                       : 1;
            if (!readers_[s]->next(change)) {
                done_[s] = true;
                for (signal_state& st : states_) resolve(st);
                continue;
            }
            const std::size_t index = slot_of_[s][change.variable];
            if (index == none) continue;
            signal_state& st = states_[index];
            side_state& side = st.sides[s];
            if (side.has_value && side.value == change.value) continue;  // no edge
            side.value = change.value;
            side.has_value = true;
            vcd_signal_comparison& r = out_.signals[st.result];
            ++(s == 0 ? r.edges_a : r.edges_b);
            side.edges.push_back({change.at, std::move(change.value)});
            resolve(st);
        }
        out_.end_a = readers_[0]->time();
        out_.end_b = readers_[1]->time();
        out_.ends_differ = distance(out_.end_a, out_.end_b) > options_.tolerance;
        return std::move(out_);
    }

private:
    // The first variable of each name, per file.
    static std::map<std::string, std::size_t> names_of(const vcd_reader& r) {
        std::map<std::string, std::size_t> names;
        for (std::size_t i = 0; i < r.variables().size(); ++i)
            names.emplace(r.variables()[i].name, i);
        return names;
    }

    void select_signals() {
        const std::array<std::map<std::string, std::size_t>, 2> names = {names_of(*readers_[0]),
                                                                         names_of(*readers_[1])};
        std::vector<std::string> wanted = options_.signals;
        const bool all = wanted.empty();
        if (all) {
            for (const vcd_reader* r : readers_)
                for (const vcd_variable& v : r->variables())
                    if (std::find(wanted.begin(), wanted.end(), v.name) == wanted.end())
                        wanted.push_back(v.name);
        }
        std::vector<std::string> known;
        for (const auto& n : names)
            for (const auto& [name, index] : n) known.push_back(name);
        for (int s = 0; s < 2; ++s) slot_of_[s].assign(readers_[s]->variables().size(), none);
        for (const std::string& name : wanted) {
            if (std::any_of(out_.signals.begin(), out_.signals.end(),
                            [&](const vcd_signal_comparison& c) { return c.name == name; }))
                continue;
            vcd_signal_comparison c;
            c.name = name;
            std::array<std::size_t, 2> variable = {none, none};
            for (int s = 0; s < 2; ++s) {
                const auto found = names[s].find(name);
                if (found == names[s].end()) continue;
                variable[s] = found->second;
                (s == 0 ? c.in_a : c.in_b) = true;
                (s == 0 ? c.width_a : c.width_b) = readers_[s]->variables()[found->second].width;
            }
            if (!c.in_a && !c.in_b)
                throw vcd_error(
                    "signal \"" + name + "\" is in neither " + readers_[0]->source() + " nor " +
                    readers_[1]->source() + hint(name, known) + "; expected full names such as \"" +
                    (known.empty() ? std::string("timer.channel1") : known.front()) + "\"");
            if (all && options_.only_common && !(c.in_a && c.in_b)) c.counts = false;
            if (c.in_a && c.in_b && c.width_a == c.width_b) {
                for (int s = 0; s < 2; ++s) slot_of_[s][variable[s]] = states_.size();
                signal_state st;
                st.result = out_.signals.size();
                states_.push_back(std::move(st));
            }
            out_.signals.push_back(std::move(c));
        }
    }

    // True when every edge of side `s` at or before `t` has been read.
    bool known_through(const signal_state& st, int s, time_ps t) const {
        const std::deque<edge>& q = st.sides[s].edges;
        return done_[s] || t < readers_[s]->time() || (!q.empty() && q.back().at > t);
    }

    void report(signal_state& st, vcd_difference d) {
        vcd_signal_comparison& r = out_.signals[st.result];
        ++r.differences;
        if (r.kept.size() < options_.kept_per_signal) r.kept.push_back(std::move(d));
    }

    // Reports the first `n` waiting edges of side `s` as edges the other run lacks.
    void report_extra(signal_state& st, int s, std::size_t n) {
        std::deque<edge>& q = st.sides[s].edges;
        vcd_difference d;
        d.what = s == 0 ? vcd_difference::kind::only_a : vcd_difference::kind::only_b;
        (s == 0 ? d.at_a : d.at_b) = q.front().at;
        (s == 0 ? d.last_a : d.last_b) = q[n - 1].at;
        (s == 0 ? d.value_a : d.value_b) = q.front().value;
        d.count = n;
        q.erase(q.begin(), q.begin() + static_cast<std::ptrdiff_t>(n));
        report(st, std::move(d));
    }

    // The first edge of side `s` after its front that pairs with `with` within the tolerance, or
    // none.
    std::size_t later_pair(const signal_state& st, int s, const edge& with) const {
        const std::deque<edge>& q = st.sides[s].edges;
        for (std::size_t k = 1; k < q.size(); ++k) {
            if (q[k].at > plus(with.at, options_.tolerance)) break;
            if (q[k].value == with.value && distance(q[k].at, with.at) <= options_.tolerance)
                return k;
        }
        return none;
    }

    // Pairs the waiting edges of one signal as far as what has been read allows.
    void resolve(signal_state& st) {
        const time_ps tol = options_.tolerance;
        for (;;) {
            std::deque<edge>& qa = st.sides[0].edges;
            std::deque<edge>& qb = st.sides[1].edges;
            if (qa.empty() && qb.empty()) return;
            if (qa.empty() || qb.empty()) {
                const int s = qa.empty() ? 1 : 0;
                const std::size_t waiting = st.sides[s].edges.size();
                if (done_[1 - s]) {
                    report_extra(st, s, waiting);
                } else if (waiting > options_.max_waiting_edges) {
                    report_extra(st, s, waiting / 2);
                } else {
                    return;  // the other run's next edge may still pair with these
                }
                continue;
            }
            const edge& a = qa.front();
            const edge& b = qb.front();
            if (a.value == b.value && distance(a.at, b.at) <= tol) {
                qa.pop_front();
                qb.pop_front();
                continue;
            }
            const bool overfull =
                qa.size() > options_.max_waiting_edges || qb.size() > options_.max_waiting_edges;
            const int e = b.at < a.at ? 1 : 0;  // the side whose edge comes first
            const int o = 1 - e;
            const edge& first = st.sides[e].edges.front();
            const edge& other = st.sides[o].edges.front();
            // Edges of the earlier run that the other lacks, after which the two are in step.
            if (!known_through(st, e, plus(other.at, tol)) && !overfull) return;
            if (const std::size_t k = later_pair(st, e, other); k != none) {
                report_extra(st, e, k);
                continue;
            }
            if (!known_through(st, o, plus(first.at, tol)) && !overfull) return;
            if (const std::size_t k = later_pair(st, o, first); k != none) {
                report_extra(st, o, k);
                continue;
            }
            if (first.value == other.value || distance(first.at, other.at) <= tol) {
                vcd_difference d;
                d.what = first.value == other.value ? vcd_difference::kind::shifted
                                                    : vcd_difference::kind::value;
                d.at_a = a.at;
                d.at_b = b.at;
                d.last_a = a.at;
                d.last_b = b.at;
                d.value_a = a.value;
                d.value_b = b.value;
                qa.pop_front();
                qb.pop_front();
                report(st, std::move(d));
                continue;
            }
            report_extra(st, e, 1);
        }
    }

    std::array<vcd_reader*, 2> readers_;
    const vcd_compare_options& options_;
    std::array<bool, 2> done_ = {false, false};
    std::array<std::vector<std::size_t>, 2> slot_of_;  // variable index -> states_ index
    std::vector<signal_state> states_;
    vcd_comparison out_;
};

}  // namespace

vcd_comparison compare_vcd(vcd_reader& a, vcd_reader& b, const vcd_compare_options& options) {
    return comparer(a, b, options).run();
}

}  // namespace sim
