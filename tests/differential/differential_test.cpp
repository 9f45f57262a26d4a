// The differential test: the fast timer model against the tick-exact reference on seeded random
// register programs (docs/architecture.md, "The reference model as oracle"). Both must report the
// same pin edges, flag sets, interrupt line changes, trigger pulses and read results, at the same
// exact times.
//
// Programs per run: 2000 by default, split in shards so CTest can spread them over the cores;
// TICKBENCH_DIFF_PROGRAMS=<n> or --long (200000) runs more, TICKBENCH_DIFF_FIRST_SEED=<s> moves
// the seed window.

#include "tests/differential/mutants.h"
#include "tests/differential/program_runner.h"
#include "tests/differential/timer_program.h"

#include "models/reference/reference_timer.h"
#include "models/timer/timer_core.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <cstring>
#include <iostream>
#include <set>
#include <string>

namespace tickbench::differential {
namespace {

bool long_mode = false;

std::uint64_t env_or(const char* name, std::uint64_t fallback) {
    const char* v = std::getenv(name);
    return v && *v ? std::strtoull(v, nullptr, 10) : fallback;
}

std::uint64_t program_count() {
    return env_or("TICKBENCH_DIFF_PROGRAMS", long_mode ? 200'000 : 2000);
}
std::uint64_t first_seed() { return env_or("TICKBENCH_DIFF_FIRST_SEED", 1); }

template <class model>
model_factory factory_of() {
    return [](const models::timer_config& cfg, const sim::clock_domain& timer_clock,
              models::timer_observer* obs) {
        return std::unique_ptr<models::timer_core_if>(new model(cfg, timer_clock, obs));
    };
}

const model_factory reference = factory_of<models::reference::reference_timer>();
const model_factory fast = factory_of<models::timer_core>();

constexpr unsigned shard_count = 8;

// Runs this shard's seeds; on the first disagreement prints the seed and the shrunk program.
void run_shard(unsigned shard, const model_factory& expected, const model_factory& actual,
               std::uint64_t count) {
    std::uint64_t failures = 0;
    std::uint64_t first_failing = 0;
    for (std::uint64_t i = shard; i < count; i += shard_count) {
        const std::uint64_t seed = first_seed() + i;
        const timer_program p = generate_program(seed);
        const run_result oracle = run_program(p, expected);
        EXPECT_EQ(oracle.off_clock, "") << "seed " << seed;
        if (!compare_runs(oracle, run_program(p, actual))) continue;
        if (failures++ == 0) {
            first_failing = seed;
            ADD_FAILURE() << report_disagreement(p, expected, actual);
        }
    }
    EXPECT_EQ(failures, 0u) << "programs on which the models disagree in this shard (first: seed "
                            << first_failing << ")";
}

class fast_vs_reference : public ::testing::TestWithParam<unsigned> {};

TEST_P(fast_vs_reference, agree_on_every_event) {
    run_shard(GetParam(), reference, fast, program_count());
}

INSTANTIATE_TEST_SUITE_P(shards, fast_vs_reference, ::testing::Range(0u, shard_count));

TEST(differential_harness_test, reference_agrees_with_itself) {
    for (std::uint64_t seed = 1; seed <= 200; ++seed) {
        const timer_program p = generate_program(seed);
        const auto d = differ(p, reference, reference);
        ASSERT_FALSE(d) << "seed " << seed << ": " << d->text;
    }
}

TEST(differential_harness_test, programs_are_deterministic) {
    for (std::uint64_t seed : {3u, 77u, 1234u}) {
        const timer_program a = generate_program(seed);
        const timer_program b = generate_program(seed);
        EXPECT_EQ(describe(a), describe(b));
        EXPECT_EQ(run_program(a, reference).events, run_program(b, reference).events);
    }
}

// Proves that the harness catches a model wrong by one tick, and shrinks the program.
template <class mutant>
void expect_caught_and_shrunk(std::size_t max_ops_after_shrink) {
    const model_factory wrong = factory_of<mutant>();
    for (std::uint64_t seed = 1; seed <= 400; ++seed) {
        const timer_program p = generate_program(seed);
        if (!differ(p, reference, wrong)) continue;
        const timer_program small = shrink(p, reference, wrong);
        EXPECT_TRUE(differ(small, reference, wrong).has_value());
        EXPECT_LE(small.ops.size(), max_ops_after_shrink) << describe(small);
        EXPECT_LT(small.ops.size(), p.ops.size());
        EXPECT_LE(small.end, p.end);
        std::cout << "caught at seed " << seed << "; shrunk from " << p.ops.size()
                  << " operations:\n"
                  << describe(small) << differ(small, reference, wrong)->text;
        return;
    }
    ADD_FAILURE() << "no program in 400 seeds caught the mutant";
}

TEST(differential_harness_test, catches_compare_latency_off_by_one) {
    expect_caught_and_shrunk<late_compare_timer>(8);
}

TEST(differential_harness_test, catches_dead_time_off_by_one) {
    expect_caught_and_shrunk<long_dead_time_timer>(12);
}

// The generator must reach the awkward instants: operations within +/-2 ticks of wraps, in every
// counting mode.
TEST(differential_harness_test, programs_write_around_wraps_in_every_mode) {
    std::size_t writes = 0, near_wrap = 0;
    std::set<std::uint32_t> modes_near_wrap;
    for (std::uint64_t seed = 1; seed <= 150; ++seed) {
        const timer_program p = generate_program(seed);
        sim::clock_domain domain(sim::frequency::hz(p.clock_hz));
        models::reference::reference_timer model(p.config, domain, nullptr);
        std::vector<std::uint64_t> wrap_ticks;
        std::vector<std::uint32_t> wrap_modes;
        auto step_to = [&](sim::time_ps t) {
            sim::time_ps next = 0;
            while (model.next_event(next) && next <= t) {
                const std::uint64_t w = model.wraps();
                model.advance_to(next);
                if (model.wraps() != w) {
                    wrap_ticks.push_back(domain.tick_at(next));
                    wrap_modes.push_back(model.read(models::timer_field::mode, 0, next));
                }
            }
        };
        // First pass: every wrap of the run.
        for (const program_op& op : p.ops) {
            step_to(op.at);
            switch (op.kind) {
                case op_kind::write:
                    model.write(op.field, op.channel, op.value, op.at);
                    break;
                case op_kind::read:
                    model.read(op.field, op.channel, op.at);
                    break;
                case op_kind::clear_flags:
                    model.clear_flags(op.value, op.at);
                    break;
                case op_kind::fault_input:
                    model.set_fault_input(op.value != 0, op.at);
                    break;
                case op_kind::clock_change:
                    apply_clock_change(domain, op);
                    break;
            }
        }
        step_to(p.end);
        // Second pass: which operations sit within 2 ticks of a wrap.
        for (const program_op& op : p.ops) {
            if (op.kind != op_kind::write || op.at == p.ops.front().at) continue;
            ++writes;
            const std::uint64_t pos = domain.tick_at(op.at + 1);  // ticks at or before the write
            for (std::size_t i = 0; i < wrap_ticks.size(); ++i) {
                const std::uint64_t w = wrap_ticks[i] + 1;  // ticks at or before the wrap tick
                if (pos + 2 >= w && pos <= w + 2) {
                    ++near_wrap;
                    modes_near_wrap.insert(wrap_modes[i]);
                    break;
                }
            }
        }
    }
    EXPECT_GT(writes, 1000u);
    EXPECT_GT(near_wrap * 4, writes) << near_wrap << " of " << writes << " writes near a wrap";
    EXPECT_EQ(modes_near_wrap.size(), 3u);
}

}  // namespace
}  // namespace tickbench::differential

int main(int argc, char** argv) {
    for (int i = 1; i < argc; ++i) {
        if (std::strcmp(argv[i], "--long") == 0) {
            tickbench::differential::long_mode = true;
            for (int k = i; k + 1 < argc; ++k) argv[k] = argv[k + 1];
            --argc;
            --i;
        }
    }
    ::testing::InitGoogleTest(&argc, argv);
    return RUN_ALL_TESTS();
}
