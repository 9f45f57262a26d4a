#pragma once
// The clock tree: a graph of clock sources, PLLs, dividers, multiplexers and gates whose every
// output is an exact timeline (clock_domain), and whose consumers are told of each change with the
// exact time it takes effect (docs/architecture.md, "The clock tree").
//
// Each node's output is a pure function of its inputs' timelines and its own time-stamped settings.
// A run-time change (a multiplexer switch, a divider or PLL reprogrammed, a gate opened) adds a
// setting at the instant it takes effect; the node then rebuilds its timeline from that instant and
// the change flows downstream in topological order. A rebuild that reproduces the same timeline
// stops the flow, so consumers hear only of real changes. Nothing here needs a running SystemC
// kernel: the kernel shell and the peripheral models ask this tree, and unit tests drive it
// directly.

#include "sim/clock_domain.h"
#include "sim/frequency.h"

#include <cstdint>
#include <functional>
#include <map>
#include <memory>
#include <optional>
#include <stdexcept>
#include <string>
#include <vector>

namespace sim {

// An impossible clock configuration: names the node and the rule broken.
class clock_config_error : public std::runtime_error {
public:
    using std::runtime_error::runtime_error;
};

enum class clock_kind { crystal, rc_oscillator, external, pll, divider, mux, gate, boost };
// "crystal", "rc-oscillator", "external", "pll", "divider", "mux", "gate", "boost".
const char* to_string(clock_kind k);

// A quartz crystal oscillator. Its frequency is nominal offset by `offset_ppb` plus a parabolic
// temperature term tempco_ppb_per_c2 * (temperature - turnover)^2 (tuning-fork watch crystals
// follow such a parabola; the coefficient is the user's datasheet value).
struct crystal_params {
    frequency nominal;
    std::int64_t offset_ppb = 0;
    std::int64_t tempco_ppb_per_c2 = 0;
    std::int64_t turnover_c = 25;
    std::int64_t temperature_c = 25;
    time_ps jitter = 0;  // peak phase jitter per edge, seeded, under half a period
    std::uint64_t seed = 0;
};

// An RC oscillator: nominal frequency, off by `deviation_ppb` (which must lie inside the tolerance
// band), corrected by trim * trim_step_ppb; trim is settable at run time within [trim_min,
// trim_max].
struct rc_params {
    frequency nominal;
    std::int64_t tolerance_ppb = 0;
    std::int64_t deviation_ppb = 0;
    std::int64_t trim_step_ppb = 0;
    std::int64_t trim_min = 0;
    std::int64_t trim_max = 0;
    std::int64_t trim = 0;
};

// A frequency range; a bound at 0 Hz is not checked.
struct frequency_range {
    frequency min;
    frequency max;
    bool contains(const frequency& f) const {
        return (min.is_zero() || f >= min) && (max.is_zero() || f <= max);
    }
};

// PLL output = input * multiplier / (input_divider * output_divider). The output stops when the
// PLL is disturbed (reprogrammed, disabled, or its input changes) and runs again lock_time later.
struct pll_params {
    std::uint64_t input_divider = 1;
    std::uint64_t multiplier = 1;
    std::uint64_t output_divider = 1;
    time_ps lock_time = 0;
    bool enabled = true;
    frequency_range input_range;  // of input / input_divider
    frequency_range vco_range;    // of input * multiplier / input_divider
    frequency_range output_range;
};

// One row of the clock plan: what a node produces and what it feeds.
struct clock_plan_row {
    std::string name;
    clock_kind kind;
    std::string settings;  // the node's settings in words, e.g. "divide by 4"
    frequency freq;        // 0 Hz when stopped
    bool running = false;
    std::vector<std::string> inputs;
    std::vector<std::string> feeds;  // nodes and consumers
};

class clock_tree {
public:
    // Called with the instant from which the node's timeline differs from what was known before.
    using change_callback = std::function<void(time_ps from)>;

    clock_tree();
    ~clock_tree();
    clock_tree(const clock_tree&) = delete;
    clock_tree& operator=(const clock_tree&) = delete;

    // Building. Names are unique; inputs are named and may be declared later. Problems are
    // reported by problems() / start(), all at once, not here.
    void add_crystal(const std::string& name, const crystal_params& p);
    void add_rc_oscillator(const std::string& name, const rc_params& p);
    // An external clock input pin; 0 Hz means nothing drives it.
    void add_external(const std::string& name, const frequency& f);
    void add_pll(const std::string& name, const std::string& input, const pll_params& p);
    void add_divider(const std::string& name, const std::string& input, std::uint64_t factor);
    // selected is an index into inputs.
    void add_mux(const std::string& name, const std::vector<std::string>& inputs,
                 std::size_t selected);
    void add_gate(const std::string& name, const std::string& input, bool enabled);
    // A boost: its input, which must be a divider, multiplied by `factor` while that divider
    // divides by more than 1, and passed unchanged while it divides by 1 (the clock of timers on a
    // divided bus; docs/scenario.md, "Clock tree").
    void add_boost(const std::string& name, const std::string& input, std::uint64_t factor);

    // A consumer (a peripheral, a probe) listening to a node. With needs_running, the node must be
    // running when the run starts. The callback may be empty (the consumer only reads the domain).
    void subscribe(const std::string& node, const std::string& consumer, change_callback on_change,
                   bool needs_running = false);

    // Every configuration problem, each naming the node and the rule broken; empty when sound.
    std::vector<std::string> problems() const;
    // Validates (throwing clock_config_error with all problems) and builds every timeline from 0.
    void start();
    bool started() const { return started_; }

    bool has_node(const std::string& name) const;
    std::vector<std::string> node_names() const;
    // The node's output timeline (after start()).
    const clock_domain& domain(const std::string& name) const;
    clock_kind kind(const std::string& name) const;

    // Run-time changes, requested at time `at` (non-decreasing across calls). Each returns the
    // instant the change takes effect. A request cancels effects of earlier requests to the same
    // node that are still pending. Throws clock_config_error when the result would be impossible.
    //
    // Multiplexer: the output follows the old input through its first edge after `at`, holds low
    // until the new input's first edge after that, and follows the new input from that edge.
    time_ps select(const std::string& mux, const std::string& input, time_ps at);
    // Gate: edges at or after `at` are passed (open) or suppressed (closed).
    time_ps set_gate(const std::string& gate, bool enabled, time_ps at);
    // Divider: the next output edge at or after `at` comes with the old factor; the new factor
    // counts from that edge.
    time_ps set_divider(const std::string& divider, std::uint64_t factor, time_ps at);
    // PLL: the output stops at `at` and restarts lock_time later at the new frequency.
    time_ps set_pll(const std::string& pll, const pll_params& p, time_ps at);
    // RC trim or external frequency: the new frequency starts at the first edge at or after `at`.
    time_ps set_trim(const std::string& rc, std::int64_t trim, time_ps at);
    time_ps set_external(const std::string& input, const frequency& f, time_ps at);
    time_ps set_temperature(const std::string& crystal, std::int64_t celsius, time_ps at);

    // Reading settings back (for a clock-control block). Each throws clock_config_error for an
    // unknown node or a node of another kind.
    // The inputs of a node, in order.
    const std::vector<std::string>& inputs_of(const std::string& name) const;
    // A mux's selected input at t (its index in inputs_of), or none while it switches.
    std::optional<std::size_t> selected_at(const std::string& mux, time_ps t) const;
    // A divider's factor in force at t.
    std::uint64_t divider_at(const std::string& divider, time_ps t) const;
    // A PLL's settings in force at t.
    pll_params pll_at(const std::string& pll, time_ps t) const;
    // Whether a gate is open at t.
    bool gate_at(const std::string& gate, time_ps t) const;

    // Forget timeline history before t in every node (bounds memory in long runs).
    void forget_before(time_ps t);

    // The clock plan at time t, in topological order (sources first).
    std::vector<clock_plan_row> plan(time_ps at = 0) const;

private:
    struct node;
    node& find(const std::string& name, clock_kind expected);
    const node& find(const std::string& name) const;
    node& add(const std::string& name, clock_kind k);
    void rebuild_and_propagate(std::size_t id, time_ps from);
    std::optional<time_ps> rebuild(std::size_t id, time_ps from);
    clock_segment make_segment(std::size_t id, time_ps at) const;
    std::vector<time_ps> event_times(std::size_t id, time_ps from) const;
    // Time of the latest change of a PLL's settings or input at or before `at`.
    time_ps last_disturbance(std::size_t id, time_ps at) const;

    std::vector<std::unique_ptr<node>> nodes_;
    std::map<std::string, std::size_t> by_name_;
    std::vector<std::size_t> topo_;  // node ids, inputs before their users
    bool started_ = false;
};

// Parts-per-billion offset of f from nominal, rounded to the nearest ppb (for reports and tests).
std::int64_t offset_ppb(const frequency& f, const frequency& nominal);

}  // namespace sim
