// Metrics of the clock tree: the cost of propagating one run-time change to its consumers.
//
// An RC oscillator feeds a divide-by-2 divider with 100 subscribed consumers (the peripherals of
// a large part). Each iteration changes the oscillator's trim 10 us of simulated time after the
// previous change, alternating between two values so that every change is real and reaches all
// 100 consumers. The consumers' callbacks only count, so the figure is the tree's own cost.
//
// A change must cost the same however many changes came before it (the tree drops settings and
// timeline history older than forget_before()), so the two metrics fix that depth rather than let
// the iteration count decide it: the first starts a fresh tree every 1000 changes, the second
// measures 200 changes on a tree that has already seen 10 000. Side by side, they show any growth.

#include "sim/clock_tree.h"
#include "sim/frequency.h"
#include "tests/bench/metric.h"

#include <benchmark/benchmark.h>

#include <cstdint>
#include <memory>
#include <string>

namespace {

constexpr int consumer_count = 100;
constexpr sim::time_ps change_interval = 10'000'000;  // 10 us
// Timeline history older than this many changes is dropped, as a long simulation does.
constexpr std::uint64_t forget_every = 64;

// The RC oscillator -> divider -> 100 consumers tree, and the changes made to it.
class trim_tree {
public:
    trim_tree() {
        // The demo part's fast RC oscillator (demo values, examples/parts/demo_part.toml).
        sim::rc_params rc;
        rc.nominal = sim::frequency::hz(16'000'000);
        rc.tolerance_ppb = 20'000'000;  // 2 %
        rc.trim_step_ppb = 1'000'000;   // 0.1 % per trim step
        rc.trim_min = -32;
        rc.trim_max = 31;
        tree_.add_rc_oscillator("rc", rc);
        tree_.add_divider("rc_div2", "rc", 2);
        for (int i = 0; i < consumer_count; ++i)
            tree_.subscribe("rc_div2", "consumer_" + std::to_string(i),
                            [this](sim::time_ps) { ++notified_; });
        tree_.start();
    }
    trim_tree(const trim_tree&) = delete;
    trim_tree& operator=(const trim_tree&) = delete;

    // One trim change, 10 us after the previous one.
    void change() {
        at_ += change_interval;
        ++changes_;
        tree_.set_trim("rc", (changes_ & 1) != 0 ? 1 : 2, at_);
        if (changes_ % forget_every == 0) tree_.forget_before(at_);
    }
    std::uint64_t changes() const { return changes_; }
    // True when every change reached every consumer exactly once.
    bool all_notified() const { return notified_ == changes_ * consumer_count; }

private:
    sim::clock_tree tree_;
    sim::time_ps at_ = 0;
    std::uint64_t changes_ = 0;
    std::uint64_t notified_ = 0;
};

void check(benchmark::State& state, const trim_tree& t) {
    if (!t.all_notified())
        bench::fail(state,
                    "a change did not reach all " + std::to_string(consumer_count) + " consumers");
}

void clock_change_100_consumers(benchmark::State& state) {
    constexpr std::uint64_t changes_per_tree = 1000;
    auto tree = std::make_unique<trim_tree>();
    for (auto _ : state) {
        if (tree->changes() == changes_per_tree) {
            state.PauseTiming();
            check(state, *tree);
            tree = std::make_unique<trim_tree>();
            state.ResumeTiming();
        }
        tree->change();
    }
    check(state, *tree);
}
const bench::add_metric clock_change_metric{
    {"clock_change_100_consumers_us", "us",
     "one RC trim change through a divider to 100 consumers (tree under 1000 changes old)",
     clock_change_100_consumers}};

void clock_change_after_10k_changes(benchmark::State& state) {
    trim_tree tree;
    while (tree.changes() < 10'000) tree.change();
    for (auto _ : state) tree.change();
    check(state, tree);
}
const bench::add_metric clock_change_after_10k_metric{
    {"clock_change_100_consumers_after_10k_us", "us",
     "the same change on a tree that has seen 10 000 changes", clock_change_after_10k_changes,
     200}};

}  // namespace
