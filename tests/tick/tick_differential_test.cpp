// Randomized differential test: the fast tick timer against the tick-exact reference
// (tests/tick/tick_reference.h), on random instances, clocks and programs of writes, reads and
// flag clears at random times. Both must report the same flag and interrupt changes at the same
// picoseconds and read the same values.
#include "tests/tick/tick_reference.h"

#include <gtest/gtest.h>

#include <random>
#include <sstream>
#include <string>
#include <vector>

namespace {

using models::tick_field;

struct recorder final : models::tick_observer {
    std::vector<std::string> events;
    void on_flags_set(std::uint32_t bits, sim::time_ps at) override {
        events.push_back("flags " + std::to_string(bits) + " @" + std::to_string(at));
    }
    void on_irq(bool level, sim::time_ps at) override {
        events.push_back("irq " + std::to_string(level) + " @" + std::to_string(at));
    }
};

// Runs program `seed` on both models; returns the first disagreement, or "".
std::string run_program(std::uint64_t seed) {
    std::mt19937_64 rng(seed);
    const auto pick = [&](std::uint64_t lo, std::uint64_t hi) {
        return std::uniform_int_distribution<std::uint64_t>(lo, hi)(rng);
    };
    models::tick_config cfg;
    cfg.counter_bits = unsigned(pick(3, 8));
    cfg.divider = unsigned(pick(2, 5));
    // A period that is not a whole number of picoseconds for some seeds.
    const sim::clock_domain clock(sim::frequency(pick(1'000'000, 50'000'000), pick(1, 3)));
    recorder fast_log, ref_log;
    models::tick_timer_core fast(cfg, clock, &fast_log);
    tests::tick_reference ref(cfg, clock, &ref_log);
    const sim::time_ps period = clock.time_of(1) - clock.time_of(0) + 1;
    sim::time_ps t = 0;
    std::ostringstream trace;
    for (int op = 0; op < 300; ++op) {
        t += pick(0, period * (cfg.counter_max() + 2) * 2);
        const auto what = pick(0, 9);
        if (what <= 3) {
            const auto f = static_cast<tick_field>(pick(0, models::tick_field_count - 1));
            const auto v = static_cast<std::uint32_t>(pick(0, 1) ? pick(0, cfg.counter_max())
                                                                 : pick(0, 0xffff'ffffu));
            trace << "write " << to_string(f) << "=" << v << " @" << t << "\n";
            fast.write(f, v, t);
            ref.write(f, v, t);
        } else if (what <= 5) {
            trace << "clear @" << t << "\n";
            fast.clear_flags(models::tick_flag_zero, t);
            ref.clear_flags(models::tick_flag_zero, t);
        } else if (what <= 7) {
            sim::time_ps a = 0, b = 0;
            const bool fa = fast.next_event(a), ra = ref.next_event(b);
            if (fa != ra || (fa && a != b))
                return trace.str() + "next event differs: fast " +
                       (fa ? std::to_string(a) : "none") + ", reference " +
                       (ra ? std::to_string(b) : "none");
            if (fa) {
                t = std::max(t, a);
                fast.advance_to(t);
                ref.advance_to(t);
            }
        }
        for (std::uint32_t i = 0; i < models::tick_field_count; ++i) {
            const auto f = static_cast<tick_field>(i);
            const auto a = fast.read(f, t), b = ref.read(f, t);
            if (a != b)
                return trace.str() + "read " + to_string(f) + " @" + std::to_string(t) + ": fast " +
                       std::to_string(a) + ", reference " + std::to_string(b);
        }
        if (fast_log.events != ref_log.events)
            return trace.str() + "reports differ after " + std::to_string(op) + " steps";
    }
    return "";
}

TEST(tick_differential_test, fast_core_matches_the_tick_exact_reference) {
    for (std::uint64_t seed = 1; seed <= 150; ++seed) {
        const std::string diff = run_program(seed);
        ASSERT_EQ(diff, "") << "seed " << seed;
    }
}

}  // namespace
