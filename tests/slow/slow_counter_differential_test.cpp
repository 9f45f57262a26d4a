// Randomized differential test: the fast slow-clock counter against the edge-by-edge reference
// (tests/slow/slow_counter_reference.h), on random instances, clocks and programs of writes, reads
// and flag clears. Reads land at random instants, many of them within the synchroniser window after
// an edge and writes often come while one is pending. Both must read the same values and report the
// same flag and interrupt changes at the same picoseconds.
#include "tests/slow/slow_counter_reference.h"

#include <gtest/gtest.h>

#include <random>
#include <sstream>
#include <string>
#include <vector>

namespace {

using models::slow_field;

struct recorder final : models::slow_observer {
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
    models::slow_config cfg;
    cfg.counter_bits = unsigned(pick(3, 8));
    cfg.write_latency = unsigned(pick(1, 4));
    // A period that is not a whole number of picoseconds for some seeds.
    const sim::clock_domain clock(sim::frequency(pick(20'000, 200'000), pick(1, 3)));
    const sim::time_ps period = clock.time_of(1) - clock.time_of(0) + 1;
    // Windows from none to longer than a period, so a read may look back across several edges.
    cfg.read_window = pick(0, 3) == 0 ? pick(0, period * 2) : pick(0, 200'000);
    recorder fast_log, ref_log;
    models::slow_counter_core fast(cfg, clock, &fast_log);
    tests::slow_counter_reference ref(cfg, clock, &ref_log);
    sim::time_ps t = 0;
    std::uint64_t edge = 0;
    std::ostringstream trace;
    trace << "bits " << cfg.counter_bits << " latency " << cfg.write_latency << " window "
          << cfg.read_window << " period " << period << "\n";
    for (int op = 0; op < 300; ++op) {
        const auto where = pick(0, 3);
        if (where == 0) {
            // Just after an edge, inside or around the window.
            edge += pick(0, 6);
            t = std::max(t, clock.time_of(edge) + pick(0, cfg.read_window + 2));
        } else if (where == 1) {
            t += pick(0, 3'000'000);
        } else {
            t += pick(0, period * 8);
        }
        edge = std::max(edge, clock.tick_at(t));
        const auto what = pick(0, 9);
        if (what <= 3) {
            const auto f = static_cast<slow_field>(pick(0, models::slow_field_count - 1));
            std::uint32_t v = static_cast<std::uint32_t>(pick(0, cfg.counter_max()));
            if (f == slow_field::prescale) v = std::uint32_t(pick(0, 3));
            if (f == slow_field::enable) v = pick(0, 3) != 0;
            trace << "write " << to_string(f) << "=" << v << " @" << t << "\n";
            fast.write(f, v, t);
            ref.write(f, v, t);
        } else if (what == 4) {
            trace << "clear @" << t << "\n";
            fast.clear_flags(models::slow_flag_alarm, t);
            ref.clear_flags(models::slow_flag_alarm, t);
        } else if (what <= 6) {
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
        for (std::uint32_t i = 0; i < models::slow_field_count; ++i) {
            const auto f = static_cast<slow_field>(i);
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

TEST(slow_counter_differential_test, fast_core_matches_the_edge_by_edge_reference) {
    for (std::uint64_t seed = 1; seed <= 150; ++seed) {
        const std::string diff = run_program(seed);
        ASSERT_EQ(diff, "") << "seed " << seed;
    }
}

// The programs do reach the cases the test is for: stale reads and lost writes.
TEST(slow_counter_differential_test, programs_reach_stale_reads_and_lost_writes) {
    models::slow_config cfg;
    cfg.read_window = 100'000;
    const sim::clock_domain clock(sim::frequency::hz(50'000));  // 20 us period
    models::slow_counter_core fast(cfg, clock);
    tests::slow_counter_reference ref(cfg, clock, nullptr);
    for (models::slow_counter_if* m : {static_cast<models::slow_counter_if*>(&fast),
                                       static_cast<models::slow_counter_if*>(&ref)}) {
        m->write(slow_field::enable, 1, 1'000);
        m->write(slow_field::count, 9, 2'000);  // lost: the enable write is pending
        // Enable in force from edge 2 (40 us): edge 3 at 60 us is the first counted.
        EXPECT_EQ(m->read(slow_field::count, 60'000'000 + 99'999), 0u);
        EXPECT_EQ(m->read(slow_field::count, 60'000'000 + 100'000), 1u);
    }
}

}  // namespace
