#include "sim/clock_tree.h"

#include <algorithm>
#include <limits>
#include <set>
#include <sstream>

namespace sim {

const char* to_string(clock_kind k) {
    switch (k) {
        case clock_kind::crystal:
            return "crystal";
        case clock_kind::rc_oscillator:
            return "rc-oscillator";
        case clock_kind::external:
            return "external";
        case clock_kind::pll:
            return "pll";
        case clock_kind::divider:
            return "divider";
        case clock_kind::mux:
            return "mux";
        case clock_kind::gate:
            return "gate";
        case clock_kind::boost:
            return "boost";
    }
    return "?";
}

namespace {
constexpr std::int64_t ppb_limit = 100'000'000;  // 10 %: past this a "ppm" offset is a typo
// An RC oscillator's band is tens of percent on many parts (a low-speed one for a watchdog is
// often +-30 % or more: fact of the trade, no source), so it may run up to 50 % off nominal.
constexpr std::int64_t rc_ppb_limit = 500'000'000;

struct settings {
    crystal_params crystal;
    rc_params rc;
    frequency external;
    pll_params pll;
    std::uint64_t factor = 1;
    std::int64_t selected = 0;  // -1: holding low between the two inputs of a switch
    bool enabled = true;
};

std::int64_t crystal_ppb(const crystal_params& c) {
    const std::int64_t dt = c.temperature_c - c.turnover_c;
    return c.offset_ppb + c.tempco_ppb_per_c2 * dt * dt;
}

std::string ppm_text(std::int64_t ppb) {
    std::ostringstream s;
    s << (ppb >= 0 ? "+" : "-");
    const std::int64_t a = ppb >= 0 ? ppb : -ppb;
    s << a / 1000;
    if (a % 1000 != 0) {
        std::string f = std::to_string(a % 1000);
        f.insert(f.begin(), 3 - f.size(), '0');
        while (f.back() == '0') f.pop_back();
        s << "." << f;
    }
    s << " ppm";
    return s.str();
}
}  // namespace

struct clock_tree::node {
    struct consumer {
        std::string name;
        change_callback on_change;
        bool needs_running = false;
    };
    std::string name;
    clock_kind kind;
    std::vector<std::string> input_names;
    std::vector<std::size_t> inputs;
    std::vector<std::size_t> children;
    std::vector<std::pair<time_ps, settings>> history;  // first entry at 0
    std::vector<consumer> consumers;
    clock_domain out;
    std::size_t topo_pos = 0;

    const settings& at(time_ps t) const {
        auto it = std::upper_bound(history.begin(), history.end(), t,
                                   [](time_ps v, const auto& e) { return v < e.first; });
        return it == history.begin() ? history.front().second : (it - 1)->second;
    }
};

clock_tree::clock_tree() = default;
clock_tree::~clock_tree() = default;

clock_tree::node& clock_tree::add(const std::string& name, clock_kind k) {
    if (started_) throw std::logic_error("clock tree: node '" + name + "' added after start");
    auto n = std::make_unique<node>();
    n->name = name;
    n->kind = k;
    n->history.emplace_back(0, settings{});
    nodes_.push_back(std::move(n));
    by_name_.emplace(name,
                     nodes_.size() - 1);  // a duplicate keeps the first; problems() reports it
    return *nodes_.back();
}

void clock_tree::add_crystal(const std::string& name, const crystal_params& p) {
    add(name, clock_kind::crystal).history.back().second.crystal = p;
}
void clock_tree::add_rc_oscillator(const std::string& name, const rc_params& p) {
    add(name, clock_kind::rc_oscillator).history.back().second.rc = p;
}
void clock_tree::add_external(const std::string& name, const frequency& f) {
    add(name, clock_kind::external).history.back().second.external = f;
}
void clock_tree::add_pll(const std::string& name, const std::string& input, const pll_params& p) {
    node& n = add(name, clock_kind::pll);
    n.input_names = {input};
    n.history.back().second.pll = p;
}
void clock_tree::add_divider(const std::string& name, const std::string& input,
                             std::uint64_t factor) {
    node& n = add(name, clock_kind::divider);
    n.input_names = {input};
    n.history.back().second.factor = factor;
}
void clock_tree::add_mux(const std::string& name, const std::vector<std::string>& inputs,
                         std::size_t selected) {
    node& n = add(name, clock_kind::mux);
    n.input_names = inputs;
    n.history.back().second.selected = static_cast<std::int64_t>(selected);
}
void clock_tree::add_gate(const std::string& name, const std::string& input, bool enabled) {
    node& n = add(name, clock_kind::gate);
    n.input_names = {input};
    n.history.back().second.enabled = enabled;
}

void clock_tree::add_boost(const std::string& name, const std::string& input,
                           std::uint64_t factor) {
    node& n = add(name, clock_kind::boost);
    n.input_names = {input};
    n.history.back().second.factor = factor;
}

void clock_tree::subscribe(const std::string& node_name, const std::string& consumer,
                           change_callback on_change, bool needs_running) {
    auto it = by_name_.find(node_name);
    if (it == by_name_.end())
        throw clock_config_error("consumer '" + consumer + "' subscribes to unknown clock '" +
                                 node_name + "'");
    nodes_[it->second]->consumers.push_back({consumer, std::move(on_change), needs_running});
}

bool clock_tree::has_node(const std::string& name) const { return by_name_.count(name) != 0; }

std::vector<std::string> clock_tree::node_names() const {
    std::vector<std::string> v;
    for (const auto& n : nodes_) v.push_back(n->name);
    return v;
}

const clock_tree::node& clock_tree::find(const std::string& name) const {
    auto it = by_name_.find(name);
    if (it == by_name_.end()) {
        std::string known;
        for (const auto& n : nodes_) known += (known.empty() ? "" : ", ") + n->name;
        throw clock_config_error("unknown clock '" + name + "'; known clocks: " + known);
    }
    return *nodes_[it->second];
}

clock_tree::node& clock_tree::find(const std::string& name, clock_kind expected) {
    const node& n = static_cast<const clock_tree&>(*this).find(name);
    if (n.kind != expected)
        throw clock_config_error("clock '" + name + "' is a " + to_string(n.kind) + ", not a " +
                                 to_string(expected));
    if (!started_) throw std::logic_error("clock tree: run-time change before start()");
    return const_cast<node&>(n);
}

const clock_domain& clock_tree::domain(const std::string& name) const { return find(name).out; }
clock_kind clock_tree::kind(const std::string& name) const { return find(name).kind; }

namespace {
// The frequency each node settles at with the settings in force at t, ignoring lock delays.
std::vector<frequency> settled(const std::vector<std::size_t>& topo,
                               const std::vector<const settings*>& s,
                               const std::vector<std::vector<std::size_t>>& inputs,
                               const std::vector<clock_kind>& kinds) {
    std::vector<frequency> f(kinds.size());
    for (std::size_t id : topo) {
        const settings& c = *s[id];
        switch (kinds[id]) {
            case clock_kind::crystal:
                if (!c.crystal.nominal.is_zero() && std::llabs(crystal_ppb(c.crystal)) < ppb_limit)
                    f[id] = c.crystal.nominal.offset_ppb(crystal_ppb(c.crystal));
                break;
            case clock_kind::rc_oscillator: {
                const std::int64_t ppb = c.rc.deviation_ppb + c.rc.trim * c.rc.trim_step_ppb;
                if (!c.rc.nominal.is_zero() && std::llabs(ppb) < rc_ppb_limit)
                    f[id] = c.rc.nominal.offset_ppb(ppb);
                break;
            }
            case clock_kind::external:
                f[id] = c.external;
                break;
            case clock_kind::pll:
                if (c.pll.enabled && c.pll.input_divider != 0 && c.pll.output_divider != 0)
                    f[id] = f[inputs[id][0]].scaled(c.pll.multiplier,
                                                    c.pll.input_divider * c.pll.output_divider);
                break;
            case clock_kind::divider:
                if (c.factor != 0) f[id] = f[inputs[id][0]].scaled(1, c.factor);
                break;
            case clock_kind::mux:
                if (c.selected >= 0 && static_cast<std::size_t>(c.selected) < inputs[id].size())
                    f[id] = f[inputs[id][static_cast<std::size_t>(c.selected)]];
                break;
            case clock_kind::gate:
                if (c.enabled) f[id] = f[inputs[id][0]];
                break;
            case clock_kind::boost: {
                const std::size_t in = inputs[id][0];
                const bool divided = kinds[in] == clock_kind::divider && s[in]->factor > 1;
                f[id] = divided ? f[in].scaled(c.factor, 1) : f[in];
                break;
            }
        }
    }
    return f;
}

// PLL rules for an input frequency; empty when all hold.
std::string pll_rule_broken(const pll_params& p, const frequency& in) {
    if (p.input_divider == 0) return "input divider is 0; accepted: 1 or more";
    if (p.multiplier == 0) return "multiplier is 0; accepted: 1 or more";
    if (p.output_divider == 0) return "output divider is 0; accepted: 1 or more";
    if (!p.enabled || in.is_zero()) return {};
    const frequency pfd = in.scaled(1, p.input_divider);
    const frequency vco = pfd.scaled(p.multiplier, 1);
    const frequency out = vco.scaled(1, p.output_divider);
    auto range = [](const frequency_range& r) {
        return (r.min.is_zero() ? std::string("0 Hz") : r.min.pretty()) + " to " +
               (r.max.is_zero() ? std::string("any") : r.max.pretty());
    };
    if (!p.input_range.contains(pfd))
        return "input after the input divider is " + pfd.pretty() + ", outside the allowed " +
               range(p.input_range);
    if (!p.vco_range.contains(vco))
        return "VCO frequency (input / " + std::to_string(p.input_divider) + " x " +
               std::to_string(p.multiplier) + ") is " + vco.pretty() + ", outside the allowed " +
               range(p.vco_range);
    if (!p.output_range.contains(out))
        return "output frequency is " + out.pretty() + ", outside the allowed " +
               range(p.output_range);
    return {};
}
}  // namespace

std::vector<std::string> clock_tree::problems() const {
    std::vector<std::string> out;
    std::set<std::string> seen;
    for (const auto& n : nodes_) {
        if (n->name.empty()) out.push_back("a clock has an empty name");
        if (!seen.insert(n->name).second) out.push_back("clock '" + n->name + "' is defined twice");
    }
    // Inputs must exist; then a topological order must exist (no loops).
    std::vector<std::vector<std::size_t>> inputs(nodes_.size());
    bool inputs_ok = true;
    for (std::size_t i = 0; i < nodes_.size(); ++i) {
        const node& n = *nodes_[i];
        if (n.kind == clock_kind::mux && n.input_names.empty()) {
            out.push_back("mux '" + n.name + "' has no inputs; accepted: one or more clock names");
            inputs_ok = false;
        }
        for (const std::string& in : n.input_names) {
            auto it = by_name_.find(in);
            if (it == by_name_.end()) {
                out.push_back(std::string(to_string(n.kind)) + " '" + n.name +
                              "' has unknown input '" + in + "'");
                inputs_ok = false;
            } else {
                inputs[i].push_back(it->second);
            }
        }
    }
    for (const auto& n : nodes_) {
        const settings& s = n->history.front().second;
        const std::string who = std::string(to_string(n->kind)) + " '" + n->name + "'";
        switch (n->kind) {
            case clock_kind::crystal:
                if (s.crystal.nominal.is_zero())
                    out.push_back(who + ": nominal frequency is 0; accepted: above 0 Hz");
                if (std::llabs(crystal_ppb(s.crystal)) >= ppb_limit)
                    out.push_back(who + ": total offset " + ppm_text(crystal_ppb(s.crystal)) +
                                  " is implausible; accepted: within +/-100000 ppm");
                break;
            case clock_kind::rc_oscillator:
                if (s.rc.nominal.is_zero())
                    out.push_back(who + ": nominal frequency is 0; accepted: above 0 Hz");
                if (s.rc.tolerance_ppb < 0) out.push_back(who + ": tolerance is negative");
                if (std::llabs(s.rc.deviation_ppb) > s.rc.tolerance_ppb)
                    out.push_back(who + ": deviation " + ppm_text(s.rc.deviation_ppb) +
                                  " is outside the tolerance band of +/-" +
                                  ppm_text(s.rc.tolerance_ppb).substr(1));
                if (s.rc.trim_min > s.rc.trim_max)
                    out.push_back(who + ": trim range is empty (minimum above maximum)");
                else if (s.rc.trim < s.rc.trim_min || s.rc.trim > s.rc.trim_max)
                    out.push_back(who + ": trim " + std::to_string(s.rc.trim) + " is outside " +
                                  std::to_string(s.rc.trim_min) + ".." +
                                  std::to_string(s.rc.trim_max));
                break;
            case clock_kind::divider:
                if (s.factor == 0) out.push_back(who + ": divide factor is 0; accepted: 1 or more");
                break;
            case clock_kind::boost:
                if (s.factor == 0) out.push_back(who + ": factor is 0; accepted: 1 or more");
                break;
            case clock_kind::mux:
                if (s.selected < 0 || static_cast<std::size_t>(s.selected) >= n->input_names.size())
                    out.push_back(who + ": selected input " + std::to_string(s.selected) +
                                  " does not exist; accepted: 0.." +
                                  std::to_string(n->input_names.size() - 1));
                break;
            default:
                break;
        }
    }
    if (!inputs_ok) return out;
    for (std::size_t i = 0; i < nodes_.size(); ++i) {
        const node& n = *nodes_[i];
        if (n.kind != clock_kind::boost) continue;
        const node& in = *nodes_[inputs[i][0]];
        if (in.kind != clock_kind::divider)
            out.push_back("boost '" + n.name + "': input '" + in.name + "' is a " +
                          to_string(in.kind) +
                          "; accepted: a divider (the boost multiplies while that divider divides "
                          "by more than 1)");
    }
    std::vector<std::size_t> order;
    {
        std::vector<std::size_t> pending(nodes_.size());
        std::vector<std::vector<std::size_t>> users(nodes_.size());
        for (std::size_t i = 0; i < nodes_.size(); ++i) {
            pending[i] = inputs[i].size();
            for (std::size_t in : inputs[i]) users[in].push_back(i);
        }
        std::vector<std::size_t> ready;
        for (std::size_t i = 0; i < nodes_.size(); ++i)
            if (pending[i] == 0) ready.push_back(i);
        while (!ready.empty()) {
            const std::size_t i = ready.front();
            ready.erase(ready.begin());
            order.push_back(i);
            for (std::size_t u : users[i])
                if (--pending[u] == 0) ready.push_back(u);
        }
        if (order.size() != nodes_.size()) {
            std::string loop;
            for (std::size_t i = 0; i < nodes_.size(); ++i)
                if (pending[i] != 0) loop += (loop.empty() ? "" : ", ") + nodes_[i]->name;
            out.push_back("clock loop: " + loop +
                          " feed each other; a clock's inputs must not depend on it");
            return out;
        }
    }
    if (!out.empty()) return out;
    std::vector<const settings*> s0;
    std::vector<clock_kind> kinds;
    for (const auto& n : nodes_) {
        s0.push_back(&n->history.front().second);
        kinds.push_back(n->kind);
    }
    const std::vector<frequency> f = settled(order, s0, inputs, kinds);
    for (std::size_t i = 0; i < nodes_.size(); ++i) {
        const node& n = *nodes_[i];
        if (n.kind == clock_kind::pll) {
            const std::string rule = pll_rule_broken(s0[i]->pll, f[inputs[i][0]]);
            if (!rule.empty()) out.push_back("pll '" + n.name + "': " + rule);
        }
        if (n.kind == clock_kind::crystal && s0[i]->crystal.jitter != 0 && !f[i].is_zero()) {
            try {
                (void)clock_segment::running(0, 0, f[i], s0[i]->crystal.jitter, 0);
            } catch (const std::invalid_argument& e) {
                out.push_back("crystal '" + n.name + "': " + e.what());
            }
        }
        for (const auto& c : n.consumers)
            if (c.needs_running && f[i].is_zero())
                out.push_back("consumer '" + c.name + "' needs clock '" + n.name +
                              "' running at start, but it is stopped (a closed gate, a disabled "
                              "PLL or a stopped input upstream)");
    }
    return out;
}

void clock_tree::start() {
    const std::vector<std::string> p = problems();
    if (!p.empty()) {
        std::string msg = "clock tree configuration is invalid:";
        for (const std::string& s : p) msg += "\n  " + s;
        throw clock_config_error(msg);
    }
    // problems() proved the inputs exist and the graph is acyclic; resolve and order.
    std::vector<std::size_t> pending(nodes_.size());
    for (std::size_t i = 0; i < nodes_.size(); ++i) {
        node& n = *nodes_[i];
        n.inputs.clear();
        for (const std::string& in : n.input_names) {
            const std::size_t j = by_name_.at(in);
            n.inputs.push_back(j);
            nodes_[j]->children.push_back(i);
        }
        pending[i] = n.inputs.size();
    }
    topo_.clear();
    for (std::size_t i = 0; i < nodes_.size(); ++i)
        if (pending[i] == 0) topo_.push_back(i);
    for (std::size_t k = 0; k < topo_.size(); ++k)
        for (std::size_t c : nodes_[topo_[k]]->children)
            if (--pending[c] == 0) topo_.push_back(c);
    for (std::size_t k = 0; k < topo_.size(); ++k) nodes_[topo_[k]]->topo_pos = k;
    started_ = true;
    for (std::size_t id : topo_) rebuild(id, 0);
}

namespace {
// Segments of a timeline that start at or after t.
std::vector<clock_segment>::const_iterator first_from(const std::vector<clock_segment>& segs,
                                                      time_ps t) {
    return std::lower_bound(segs.begin(), segs.end(), t,
                            [](const clock_segment& s, time_ps v) { return s.start() < v; });
}
}  // namespace

time_ps clock_tree::last_disturbance(std::size_t id, time_ps at) const {
    // A PLL is disturbed by a change of its own settings or a new segment of its input.
    const node& n = *nodes_[id];
    auto h = std::upper_bound(n.history.begin(), n.history.end(), at,
                              [](time_ps v, const auto& e) { return v < e.first; });
    time_ps d = h == n.history.begin() ? 0 : (h - 1)->first;
    const auto& segs = nodes_[n.inputs[0]]->out.segments();
    auto s = std::upper_bound(segs.begin(), segs.end(), at,
                              [](time_ps v, const clock_segment& x) { return v < x.start(); });
    if (s != segs.begin()) d = std::max(d, (s - 1)->start());
    return d;
}

std::vector<time_ps> clock_tree::event_times(std::size_t id, time_ps from) const {
    // Only what starts at or after `from` can change the timeline from there on, so the cost of a
    // rebuild does not grow with the run's history.
    const node& n = *nodes_[id];
    std::vector<time_ps> t;
    auto h = std::lower_bound(n.history.begin(), n.history.end(), from,
                              [](const auto& e, time_ps v) { return e.first < v; });
    for (; h != n.history.end(); ++h) t.push_back(h->first);
    for (std::size_t in : n.inputs) {
        const auto& segs = nodes_[in]->out.segments();
        for (auto s = first_from(segs, from); s != segs.end(); ++s) t.push_back(s->start());
    }
    if (n.kind == clock_kind::pll) {
        // Each disturbance from `from` on, and the last one before it, may end in a lock after
        // `from`.
        std::vector<time_ps> disturbances = t;
        if (from > 0) disturbances.push_back(last_disturbance(id, from - 1));
        for (time_ps d : disturbances) {
            const time_ps lock = n.at(d).pll.lock_time;
            if (d <= max_time_ps - lock && d + lock >= from) t.push_back(d + lock);
        }
    }
    std::sort(t.begin(), t.end());
    t.erase(std::unique(t.begin(), t.end()), t.end());
    return t;
}

clock_segment clock_tree::make_segment(std::size_t id, time_ps at) const {
    const node& n = *nodes_[id];
    // A setting that takes effect at `at` acts on edges after `at`: anything at `at` itself (a
    // peripheral's tick, a firmware write) has already seen the edge there, if there is one.
    const settings& s = n.at(at);
    const time_ps after = at == max_time_ps ? at : at + 1;
    const std::uint64_t next = n.out.tick_at(after);
    auto stopped = [&] { return clock_segment::stopped(next, at == 0 ? 0 : after); };
    // The first instant whose input edge this node passes: at reset the edge at 0; when the
    // input's new timeline starts with an edge at `at` (a mux reaching its new input, a PLL
    // locking), that edge, which no earlier timeline of this node had; otherwise edges after `at`.
    auto input_from = [&](std::size_t input) {
        if (at == 0) return time_ps{0};
        const clock_segment& in = nodes_[input]->out.segment_at(at);
        return in.is_running() && in.start() == at ? at : after;
    };
    auto follow = [&](std::size_t input) {
        const time_ps from = input_from(input);
        const clock_segment& in = nodes_[input]->out.segment_at(from);
        if (!in.is_running()) return stopped();
        return clock_segment::derived(in, in.tick_at(from), n.out.tick_at(from), 1);
    };
    auto source = [&](const frequency& f, time_ps jitter, std::uint64_t seed) {
        const clock_segment& old = n.out.segment_at(at);
        if (n.out.segments().empty()) return clock_segment::running(0, at, f, jitter, seed);
        if (!old.is_running()) return clock_segment::running(next, after, f, jitter, seed);
        const std::uint64_t k = old.tick_at(after);
        return clock_segment::running(k, old.time_of(k), f, jitter, seed);
    };
    switch (n.kind) {
        case clock_kind::crystal:
            return source(s.crystal.nominal.offset_ppb(crystal_ppb(s.crystal)), s.crystal.jitter,
                          s.crystal.seed);
        case clock_kind::rc_oscillator:
            return source(
                s.rc.nominal.offset_ppb(s.rc.deviation_ppb + s.rc.trim * s.rc.trim_step_ppb), 0, 0);
        case clock_kind::external:
            if (s.external.is_zero()) return stopped();
            return source(s.external, 0, 0);
        case clock_kind::gate:
            return s.enabled ? follow(n.inputs[0]) : stopped();
        case clock_kind::mux:
            return s.selected < 0 ? stopped()
                                  : follow(n.inputs[static_cast<std::size_t>(s.selected)]);
        case clock_kind::divider: {
            const time_ps from = at == 0 ? 0 : after;
            const clock_segment& in = nodes_[n.inputs[0]]->out.segment_at(from);
            if (!in.is_running()) return stopped();
            std::uint64_t j = in.tick_at(from);
            if (next > 0) {
                // Count on from the last output edge: its parent edge plus the factor then in
                // force.
                const std::uint64_t last = next - 1;
                const auto& segs = n.out.segments();
                auto it = std::upper_bound(
                    segs.begin(), segs.end(), last,
                    [](std::uint64_t v, const clock_segment& c) { return v < c.first_tick(); });
                if (it != segs.begin() && (it - 1)->is_running())
                    j = std::max(in.first_tick(),
                                 (it - 1)->source_tick_of(last) + (it - 1)->factor());
            }
            return clock_segment::derived(in, j, next, s.factor);
        }
        case clock_kind::boost: {
            const time_ps from = input_from(n.inputs[0]);
            const std::uint64_t first = n.out.tick_at(from);
            const node& div = *nodes_[n.inputs[0]];
            const clock_segment& d = div.out.segment_at(from);
            if (!d.is_running()) return stopped();
            const std::uint64_t q = d.factor();
            if (q <= 1 || s.factor == 1) return follow(n.inputs[0]);
            if (q % s.factor == 0) {
                // Every (q / factor)-th edge of the divider's own input, counted from an edge of
                // the divider: exact to the input's sub-picosecond phase.
                const std::uint64_t step = q / s.factor;
                const clock_segment& src = nodes_[div.inputs[0]]->out.segment_at(from);
                if (src.is_running() && d.source_tick() >= src.first_tick()) {
                    const std::uint64_t g = src.tick_at(from);
                    std::uint64_t p = d.source_tick();
                    if (g > p) p += (g - p + step - 1) / step * step;
                    return clock_segment::derived(src, p, first, step);
                }
            }
            // A factor that does not divide the divider's: the multiplied clock starts at the
            // divider's next edge.
            const std::uint64_t k = d.tick_at(from);
            return clock_segment::running(first, d.time_of(k), d.freq().scaled(s.factor, 1));
        }
        case clock_kind::pll: {
            // The latest disturbance at or before `at` decides whether the PLL has locked yet.
            const time_ps d = last_disturbance(id, at);
            const time_ps lock = n.at(d).pll.lock_time;
            const clock_segment& in = nodes_[n.inputs[0]]->out.segment_at(at);
            if (at - d < lock || !s.pll.enabled || !in.is_running()) return stopped();
            const std::string rule = pll_rule_broken(s.pll, in.freq());
            if (!rule.empty())
                throw clock_config_error("pll '" + n.name + "' at " + format_time(at) + ": " +
                                         rule);
            // With no lock time the new output starts right after the disturbance's instant.
            const time_ps origin = (lock == 0 && at > 0) ? after : at;
            return clock_segment::running(
                next, origin,
                in.freq().scaled(s.pll.multiplier, s.pll.input_divider * s.pll.output_divider));
        }
    }
    return clock_segment::stopped(next, at);
}

std::optional<time_ps> clock_tree::rebuild(std::size_t id, time_ps from) {
    node& n = *nodes_[id];
    const std::vector<clock_segment> removed = n.out.truncate_from(from);
    const std::size_t kept = n.out.segments().size();
    for (time_ps t : event_times(id, from)) {
        const clock_segment s = make_segment(id, t);
        // A segment that continues the previous one unchanged adds nothing.
        if (!n.out.segments().empty()) {
            const clock_segment& l = n.out.last();
            if (!l.is_running() && !s.is_running()) continue;
            if (s.continues(l)) continue;
        }
        n.out.append(s);
    }
    const auto& segs = n.out.segments();
    const std::size_t added = segs.size() - kept;
    for (std::size_t i = 0; i < std::max(added, removed.size()); ++i) {
        const clock_segment* a = i < added ? &segs[kept + i] : nullptr;
        const clock_segment* r = i < removed.size() ? &removed[i] : nullptr;
        if (a && r && a->same_as(*r)) continue;
        if (a && r) return std::min(a->start(), r->start());
        return a ? a->start() : r->start();
    }
    return std::nullopt;
}

void clock_tree::rebuild_and_propagate(std::size_t id, time_ps from) {
    std::vector<std::optional<time_ps>> dirty(nodes_.size());
    dirty[id] = from;
    std::vector<std::pair<std::size_t, time_ps>> changed;
    for (std::size_t k = nodes_[id]->topo_pos; k < topo_.size(); ++k) {
        const std::size_t x = topo_[k];
        if (!dirty[x]) continue;
        const std::optional<time_ps> c = rebuild(x, *dirty[x]);
        if (!c) continue;
        changed.emplace_back(x, *c);
        for (std::size_t child : nodes_[x]->children)
            dirty[child] = dirty[child] ? std::min(*dirty[child], *c) : *c;
    }
    // Consumers hear of changes only once every timeline is consistent again.
    for (const auto& [x, t] : changed)
        for (const auto& c : nodes_[x]->consumers)
            if (c.on_change) c.on_change(t);
}

namespace {
// Drops settings still pending after `at` (a newer request overrides them) and returns a copy of
// the settings in force at `at` to edit.
template <typename Node>
settings begin_change(Node& n, time_ps at) {
    while (n.history.size() > 1 && n.history.back().first > at) n.history.pop_back();
    return n.at(at);
}
template <typename Node>
void put(Node& n, time_ps at, const settings& s) {
    if (n.history.back().first == at)
        n.history.back().second = s;
    else
        n.history.emplace_back(at, s);
}
}  // namespace

time_ps clock_tree::select(const std::string& mux, const std::string& input, time_ps at) {
    node& n = find(mux, clock_kind::mux);
    auto pos = std::find(n.input_names.begin(), n.input_names.end(), input);
    if (pos == n.input_names.end()) {
        std::string accepted;
        for (const auto& i : n.input_names) accepted += (accepted.empty() ? "" : ", ") + i;
        throw clock_config_error("mux '" + mux + "' has no input '" + input +
                                 "'; accepted: " + accepted);
    }
    const std::int64_t want = pos - n.input_names.begin();
    settings s = begin_change(n, at);
    const std::int64_t old = s.selected;
    time_ps effective = at;
    if (old != want) {
        const auto& new_out = nodes_[n.inputs[static_cast<std::size_t>(want)]]->out;
        std::optional<clock_edge> e_old;
        if (old >= 0) e_old = nodes_[n.inputs[static_cast<std::size_t>(old)]]->out.edge_after(at);
        if (e_old) {
            // The old input's edge e_old passes; the output holds from just after it.
            settings hold = s;
            hold.selected = -1;
            put(n, e_old->at, hold);
            const auto e_new = new_out.edge_after(e_old->at);
            effective = e_new ? e_new->at : e_old->at + 1;
        }
        // A setting at t follows edges after t: set it just before the new input's first edge.
        s.selected = want;
        put(n, effective == at ? at : effective - 1, s);
    }
    rebuild_and_propagate(by_name_.at(mux), at);
    return effective;
}

time_ps clock_tree::set_gate(const std::string& gate, bool enabled, time_ps at) {
    node& n = find(gate, clock_kind::gate);
    settings s = begin_change(n, at);
    s.enabled = enabled;
    put(n, at, s);
    rebuild_and_propagate(by_name_.at(gate), at);
    return at;
}

time_ps clock_tree::set_divider(const std::string& divider, std::uint64_t factor, time_ps at) {
    node& n = find(divider, clock_kind::divider);
    if (factor == 0)
        throw clock_config_error("divider '" + divider + "' at " + format_time(at) +
                                 ": divide factor is 0; accepted: 1 or more");
    settings s = begin_change(n, at);
    s.factor = factor;
    // The next output edge still counts with the old factor; the new one counts from there.
    const auto e = n.out.edge_after(at);
    const time_ps effective = e ? e->at : at;
    put(n, effective == at ? at : effective - 1, s);
    rebuild_and_propagate(by_name_.at(divider), at);
    return effective;
}

time_ps clock_tree::set_pll(const std::string& pll, const pll_params& p, time_ps at) {
    node& n = find(pll, clock_kind::pll);
    const frequency in = nodes_[n.inputs[0]]->out.freq_at(at);
    const std::string rule = pll_rule_broken(p, in);
    if (!rule.empty())
        throw clock_config_error("pll '" + pll + "' at " + format_time(at) + ": " + rule);
    settings s = begin_change(n, at);
    s.pll = p;
    put(n, at, s);
    rebuild_and_propagate(by_name_.at(pll), at);
    return at + p.lock_time;
}

time_ps clock_tree::set_trim(const std::string& rc, std::int64_t trim, time_ps at) {
    node& n = find(rc, clock_kind::rc_oscillator);
    settings s = begin_change(n, at);
    if (trim < s.rc.trim_min || trim > s.rc.trim_max)
        throw clock_config_error(
            "rc-oscillator '" + rc + "' at " + format_time(at) + ": trim " + std::to_string(trim) +
            " is outside " + std::to_string(s.rc.trim_min) + ".." + std::to_string(s.rc.trim_max));
    s.rc.trim = trim;
    put(n, at, s);
    rebuild_and_propagate(by_name_.at(rc), at);
    const auto e = n.out.edge_after(at);
    return e ? e->at : at;
}

time_ps clock_tree::set_external(const std::string& input, const frequency& f, time_ps at) {
    node& n = find(input, clock_kind::external);
    settings s = begin_change(n, at);
    s.external = f;
    put(n, at, s);
    rebuild_and_propagate(by_name_.at(input), at);
    const auto e = n.out.edge_after(at);
    return e ? e->at : at;
}

time_ps clock_tree::set_temperature(const std::string& crystal, std::int64_t celsius, time_ps at) {
    node& n = find(crystal, clock_kind::crystal);
    settings s = begin_change(n, at);
    s.crystal.temperature_c = celsius;
    if (std::llabs(crystal_ppb(s.crystal)) >= ppb_limit)
        throw clock_config_error("crystal '" + crystal + "' at " + format_time(at) + ": offset " +
                                 ppm_text(crystal_ppb(s.crystal)) + " at " +
                                 std::to_string(celsius) +
                                 " C is implausible; accepted: within +/-100000 ppm");
    put(n, at, s);
    rebuild_and_propagate(by_name_.at(crystal), at);
    const auto e = n.out.edge_after(at);
    return e ? e->at : at;
}

const std::vector<std::string>& clock_tree::inputs_of(const std::string& name) const {
    return find(name).input_names;
}

namespace {
template <typename Node>
const Node& of_kind(const Node& n, clock_kind expected) {
    if (n.kind != expected)
        throw clock_config_error("clock '" + n.name + "' is a " + to_string(n.kind) + ", not a " +
                                 to_string(expected));
    return n;
}
}  // namespace

std::optional<std::size_t> clock_tree::selected_at(const std::string& mux, time_ps t) const {
    const std::int64_t s = of_kind(find(mux), clock_kind::mux).at(t).selected;
    if (s < 0) return std::nullopt;
    return static_cast<std::size_t>(s);
}

std::uint64_t clock_tree::divider_at(const std::string& divider, time_ps t) const {
    return of_kind(find(divider), clock_kind::divider).at(t).factor;
}

pll_params clock_tree::pll_at(const std::string& pll, time_ps t) const {
    return of_kind(find(pll), clock_kind::pll).at(t).pll;
}

bool clock_tree::gate_at(const std::string& gate, time_ps t) const {
    return of_kind(find(gate), clock_kind::gate).at(t).enabled;
}

void clock_tree::forget_before(time_ps t) {
    for (auto& n : nodes_) {
        n->out.forget_before(t);
        // Keep the settings in force at t and everything after.
        std::size_t keep = 0;
        while (keep + 1 < n->history.size() && n->history[keep + 1].first <= t) ++keep;
        n->history.erase(n->history.begin(),
                         n->history.begin() + static_cast<std::ptrdiff_t>(keep));
    }
}

std::vector<clock_plan_row> clock_tree::plan(time_ps at) const {
    std::vector<std::vector<std::size_t>> inputs(nodes_.size());
    std::vector<const settings*> s;
    std::vector<clock_kind> kinds;
    for (std::size_t i = 0; i < nodes_.size(); ++i) {
        for (const std::string& in : nodes_[i]->input_names) inputs[i].push_back(by_name_.at(in));
        s.push_back(&nodes_[i]->at(at));
        kinds.push_back(nodes_[i]->kind);
    }
    std::vector<std::size_t> order = topo_;
    if (!started_) {
        if (!problems().empty()) throw clock_config_error("clock plan of an invalid clock tree");
        // Same order start() would compute.
        std::vector<std::size_t> pending(nodes_.size());
        std::vector<std::vector<std::size_t>> users(nodes_.size());
        for (std::size_t i = 0; i < nodes_.size(); ++i) {
            pending[i] = inputs[i].size();
            for (std::size_t in : inputs[i]) users[in].push_back(i);
        }
        for (std::size_t i = 0; i < nodes_.size(); ++i)
            if (pending[i] == 0) order.push_back(i);
        for (std::size_t k = 0; k < order.size(); ++k)
            for (std::size_t u : users[order[k]])
                if (--pending[u] == 0) order.push_back(u);
    }
    const std::vector<frequency> f = settled(order, s, inputs, kinds);
    std::vector<clock_plan_row> rows;
    for (std::size_t id : order) {
        const node& n = *nodes_[id];
        const settings& c = *s[id];
        clock_plan_row r;
        r.name = n.name;
        r.kind = n.kind;
        r.freq = f[id];
        r.running = !f[id].is_zero();
        r.inputs = n.input_names;
        for (std::size_t u = 0; u < nodes_.size(); ++u)
            for (std::size_t in : inputs[u])
                if (in == id) r.feeds.push_back(nodes_[u]->name);
        for (const auto& con : n.consumers) r.feeds.push_back(con.name);
        std::ostringstream d;
        switch (n.kind) {
            case clock_kind::crystal:
                d << "nominal " << c.crystal.nominal.pretty() << ", offset "
                  << ppm_text(crystal_ppb(c.crystal));
                if (c.crystal.jitter) d << ", jitter " << c.crystal.jitter << " ps";
                break;
            case clock_kind::rc_oscillator:
                d << "nominal " << c.rc.nominal.pretty() << ", deviation "
                  << ppm_text(c.rc.deviation_ppb) << ", trim " << c.rc.trim << " x "
                  << ppm_text(c.rc.trim_step_ppb);
                break;
            case clock_kind::external:
                d << (c.external.is_zero() ? "not driven" : "driven");
                break;
            case clock_kind::pll:
                if (!c.pll.enabled)
                    d << "disabled";
                else
                    d << "input / " << c.pll.input_divider << " x " << c.pll.multiplier << " / "
                      << c.pll.output_divider << ", lock " << format_time(c.pll.lock_time);
                break;
            case clock_kind::divider:
                d << "divide by " << c.factor;
                break;
            case clock_kind::mux:
                d << "selects "
                  << (c.selected >= 0 ? n.input_names[static_cast<std::size_t>(c.selected)]
                                      : "nothing (switching)");
                break;
            case clock_kind::gate:
                d << (c.enabled ? "open" : "closed");
                break;
            case clock_kind::boost: {
                const std::size_t in = inputs[id][0];
                const bool divided = kinds[in] == clock_kind::divider && s[in]->factor > 1;
                d << "x" << c.factor << " while " << n.input_names[0]
                  << " divides by more than 1 (now x" << (divided ? c.factor : 1) << ")";
                break;
            }
        }
        r.settings = d.str();
        rows.push_back(std::move(r));
    }
    return rows;
}

std::int64_t offset_ppb(const frequency& f, const frequency& nominal) {
    // (f - nominal) / nominal * 1e9 = (f.num*nom.den - nom.num*f.den) * 1e9 / (nom.num * f.den)
    const i128 a = static_cast<i128>(f.num()) * nominal.den();
    const i128 b = static_cast<i128>(nominal.num()) * f.den();
    const i128 num = (a - b) * 1'000'000'000;
    const i128 den = b;
    const i128 q = (num >= 0 ? num + den / 2 : num - den / 2) / den;
    return static_cast<std::int64_t>(q);
}

}  // namespace sim
