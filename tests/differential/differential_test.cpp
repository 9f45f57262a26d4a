// The differential test: the fast timer model against the tick-exact reference on seeded random
// register programs (docs/architecture.md, "The reference model as oracle"). Both must report the
// same pin edges, flag sets, interrupt line changes, trigger pulses and read results, at the same
// exact times.
//
// Seeds. Two windows of programs run, each split in 8 shards, one CTest test per shard:
// - the fixed window, seeds 1..2000, the same programs on every run
//   (shards/fast_vs_reference.fixed_seeds/0..7);
// - the rotating window, 2000 programs from a first seed derived from the commit checked out
//   (`git rev-parse HEAD` in the source tree, asked at test time; the UTC date when git cannot
//   say): every commit explores programs no run has tried, a rerun of a commit tries the same ones
//   (shards/fast_vs_reference.rotating_seeds/0..7).
// Both windows are printed at the start of each test's output, e.g.
//   rotating seed window: 48213000..48214999 (from commit eb14454...)
// Environment: TICKBENCH_DIFF_PROGRAMS=<n> programs per window (--long: 200000);
// TICKBENCH_DIFF_FIRST_SEED=<s> starts the fixed window at s; TICKBENCH_DIFF_ROTATING_SEED=<s>
// starts the rotating window at s, =off drops it.
//
// A failure prints its seed, the shrunk program, the first differing event and the command that
// reruns that one program from the seed alone, e.g.
//   TICKBENCH_DIFF_FIRST_SEED=48213407 TICKBENCH_DIFF_PROGRAMS=1 TICKBENCH_DIFF_ROTATING_SEED=off
//   build/differential_tests --gtest_filter=shards/fast_vs_reference.fixed_seeds/0
//
// The harness proves its own worth: wrong models, wrapping the reference (mutants.h) or generated
// from the fast model's own source (fast_mutants.h), must be caught and shrunk.

#include "tests/differential/fast_mutants.h"
#include "tests/differential/mutants.h"
#include "tests/differential/program_runner.h"
#include "tests/differential/seed_windows.h"
#include "tests/differential/timer_program.h"

#include "models/reference/reference_timer.h"
#include "models/timer/timer_core.h"

#include <gtest/gtest.h>
#include <spdlog/sinks/null_sink.h>
#include <spdlog/spdlog.h>

#include <algorithm>
#include <cstdlib>
#include <cstring>
#include <iostream>
#include <map>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

namespace tickbench::differential {
namespace {

bool long_mode = false;
std::string program_path = "build/differential_tests";  // argv[0], for the rerun command

std::uint64_t default_programs() { return long_mode ? 200'000 : 2000; }

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
// The test that runs the fixed window, without its shard number; a rerun command names it.
constexpr const char* fixed_shard_test = "shards/fast_vs_reference.fixed_seeds";

// The windows of this process, read from the environment once.
const seed_window& fixed() {
    static const seed_window w = fixed_window(default_programs());
    return w;
}
const std::optional<seed_window>& rotating() {
    static const std::optional<seed_window> w =
        rotating_window(default_programs(), TICKBENCH_SOURCE_DIR);
    return w;
}

// What one shard of a window found.
struct shard_verdict {
    std::uint64_t programs = 0;
    std::uint64_t failures = 0;
    std::uint64_t first_failing = 0;
    // The first failure: its seed and window, the command that reruns it alone, the shrunk program
    // and the first differing event.
    std::string first_report;
};

shard_verdict run_shard(const seed_window& w, unsigned shard, const model_factory& expected,
                        const model_factory& actual) {
    shard_verdict v;
    for (std::uint64_t seed : shard_seeds(w, shard, shard_count)) {
        ++v.programs;
        const timer_program p = generate_program(seed);
        const run_result oracle = run_program(p, expected);
        const bool disagree = compare_runs(oracle, run_program(p, actual)).has_value();
        if (oracle.off_clock.empty() && !disagree) continue;
        if (v.failures++ > 0) continue;
        v.first_failing = seed;
        std::ostringstream s;
        s << "seed " << seed << " of the seed window " << describe(w) << "\n"
          << "rerun it alone: " << rerun_command(seed, program_path, fixed_shard_test) << "\n";
        if (!oracle.off_clock.empty()) s << "the reference reports " << oracle.off_clock << "\n";
        if (disagree) s << report_disagreement(p, expected, actual);
        v.first_report = s.str();
    }
    return v;
}

void expect_agreement(const seed_window& w, unsigned shard) {
    const shard_verdict v = run_shard(w, shard, reference, fast);
    if (v.failures > 0) ADD_FAILURE() << v.first_report;
    EXPECT_EQ(v.failures, 0u) << "programs of " << v.programs
                              << " in this shard that fail (first: seed " << v.first_failing << ")";
}

class fast_vs_reference : public ::testing::TestWithParam<unsigned> {};

TEST_P(fast_vs_reference, fixed_seeds) { expect_agreement(fixed(), GetParam()); }

TEST_P(fast_vs_reference, rotating_seeds) {
    if (!rotating()) GTEST_SKIP() << "rotating seed window off (TICKBENCH_DIFF_ROTATING_SEED=off)";
    expect_agreement(*rotating(), GetParam());
}

INSTANTIATE_TEST_SUITE_P(shards, fast_vs_reference, ::testing::Range(0u, shard_count));

// Prints the windows at the start of the output, so that any log says which programs ran.
class print_seed_windows : public ::testing::Environment {
public:
    void SetUp() override {
        try {
            const std::string fixed_text = describe(fixed());
            const std::string rotating_text =
                rotating() ? describe(*rotating()) : "off (TICKBENCH_DIFF_ROTATING_SEED=off)";
            std::cout << "fixed seed window: " << fixed_text << "\n"
                      << "rotating seed window: " << rotating_text << std::endl;
        } catch (const std::exception& e) {
            std::cout << "seed windows: " << e.what() << std::endl;  // each shard fails with it
        }
    }
};

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

// Proves that the harness catches a wrong model within `seeds` seeds and shrinks the program.
void expect_caught_and_shrunk(const model_factory& wrong, std::size_t max_ops_after_shrink,
                              std::uint64_t seeds = 400) {
    for (std::uint64_t seed = 1; seed <= seeds; ++seed) {
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
    ADD_FAILURE() << "no program in " << seeds << " seeds caught the mutant";
}

TEST(differential_harness_test, catches_compare_latency_off_by_one) {
    expect_caught_and_shrunk(factory_of<late_compare_timer>(), 8);
}

TEST(differential_harness_test, catches_dead_time_off_by_one) {
    expect_caught_and_shrunk(factory_of<long_dead_time_timer>(), 12);
}

class fast_model_mutant_test : public ::testing::TestWithParam<fast_mutant> {};

TEST_P(fast_model_mutant_test, is_caught_and_shrunk) {
    std::cout << "the fast model, except that it breaks: " << GetParam().rule << "\n";
    expect_caught_and_shrunk(GetParam().make, 16);
}

INSTANTIATE_TEST_SUITE_P(fast_model, fast_model_mutant_test,
                         ::testing::ValuesIn(all_fast_mutants()),
                         [](const ::testing::TestParamInfo<fast_mutant>& mutant) {
                             return mutant.param.name;
                         });

TEST(differential_harness_test, every_fast_model_mutant_is_listed) {
    // fast_mutants.cmake lists five; a table that lost its entries would test nothing.
    EXPECT_GE(all_fast_mutants().size(), 5u);
    for (const fast_mutant& m : all_fast_mutants()) {
        EXPECT_FALSE(m.rule.empty()) << m.name;
        EXPECT_TRUE(m.make) << m.name;
    }
}

// The words of a POSIX shell command line: blanks separate, single quotes quote, a backslash
// escapes the next character.
std::vector<std::string> shell_words(const std::string& line) {
    std::vector<std::string> words;
    std::string word;
    bool in_word = false, quoted = false;
    for (std::size_t i = 0; i < line.size(); ++i) {
        const char c = line[i];
        if (quoted) {
            if (c == '\'')
                quoted = false;
            else
                word += c;
        } else if (c == '\'') {
            quoted = in_word = true;
        } else if (c == '\\' && i + 1 < line.size()) {
            word += line[++i];
            in_word = true;
        } else if (c == ' ') {
            if (in_word) words.push_back(word);
            word.clear();
            in_word = false;
        } else {
            word += c;
            in_word = true;
        }
    }
    if (in_word) words.push_back(word);
    return words;
}

// Sets environment variables for a scope, restoring what was there before.
class scoped_environment {
public:
    void set(const std::string& name, const std::string& value) {
        const char* old = std::getenv(name.c_str());
        saved_.emplace(name, old ? std::optional<std::string>(old) : std::nullopt);
        ::setenv(name.c_str(), value.c_str(), 1);
    }
    ~scoped_environment() {
        for (const auto& [name, value] : saved_) {
            if (value)
                ::setenv(name.c_str(), value->c_str(), 1);
            else
                ::unsetenv(name.c_str());
        }
    }

private:
    std::map<std::string, std::optional<std::string>> saved_;
};

bool is_registered_test(const std::string& full_name) {
    const ::testing::UnitTest& all = *::testing::UnitTest::GetInstance();
    for (int i = 0; i < all.total_test_suite_count(); ++i) {
        const ::testing::TestSuite& suite = *all.GetTestSuite(i);
        for (int k = 0; k < suite.total_test_count(); ++k)
            if (std::string(suite.name()) + "." + suite.GetTestInfo(k)->name() == full_name)
                return true;
    }
    return false;
}

// A failure in a rotating window prints a command; run as the shell would, it selects exactly the
// failing program, and that program fails again.
TEST(differential_harness_test, a_failure_prints_the_command_that_reruns_its_program_alone) {
    const fast_mutant& wrong = all_fast_mutants().front();
    const seed_window window{7'301'000, 64, "a window for this test"};
    shard_verdict v;
    unsigned shard = 0;
    for (; shard < shard_count && v.failures == 0; ++shard)
        v = run_shard(window, shard, reference, wrong.make);
    ASSERT_GT(v.failures, 0u) << "the mutant " << wrong.name << " passed 64 programs";
    std::cout << v.first_report;

    const std::string marker = "rerun it alone: ";
    const std::size_t at = v.first_report.find(marker);
    ASSERT_NE(at, std::string::npos) << v.first_report;
    const std::size_t eol = v.first_report.find('\n', at);
    const std::vector<std::string> words =
        shell_words(v.first_report.substr(at + marker.size(), eol - at - marker.size()));

    // Variable assignments, then the program, then its arguments.
    scoped_environment env;
    std::size_t i = 0;
    for (; i < words.size() && words[i].find('=') != std::string::npos && words[i][0] != '-'; ++i)
        env.set(words[i].substr(0, words[i].find('=')), words[i].substr(words[i].find('=') + 1));
    ASSERT_EQ(words.size(), i + 2) << v.first_report;
    EXPECT_EQ(words[i], program_path);
    const std::string filter_flag = "--gtest_filter=";
    ASSERT_EQ(words[i + 1].rfind(filter_flag, 0), 0u) << words[i + 1];
    const std::string test = words[i + 1].substr(filter_flag.size());
    EXPECT_TRUE(is_registered_test(test)) << test;
    const std::string shard_suffix = test.substr(test.rfind('/') + 1);
    ASSERT_EQ(test.substr(0, test.rfind('/')), fixed_shard_test);

    // Under that environment the test runs the failing seed and nothing else.
    EXPECT_FALSE(rotating_window(default_programs(), TICKBENCH_SOURCE_DIR).has_value());
    const std::vector<std::uint64_t> seeds =
        shard_seeds(fixed_window(default_programs()),
                    static_cast<unsigned>(std::stoul(shard_suffix)), shard_count);
    ASSERT_EQ(seeds, std::vector<std::uint64_t>{v.first_failing});
    EXPECT_TRUE(differ(generate_program(seeds[0]), reference, wrong.make).has_value());
}

TEST(differential_harness_test, rotating_window_follows_its_origin) {
    // Deterministic: the same commit (or date) gives the same window.
    EXPECT_EQ(rotating_first_seed("eb14454"), rotating_first_seed("eb14454"));
    EXPECT_NE(rotating_first_seed("eb14454"), rotating_first_seed("eb14455"));
    for (const char* text : {"", "2026-12-02", "0123456789abcdef0123456789abcdef01234567"}) {
        const std::uint64_t first = rotating_first_seed(text);
        // Clear of the fixed window, even of --long's 200000 seeds.
        EXPECT_GE(first, 1'000'000u) << text;
        EXPECT_LT(first, 1'000'000'000u) << text;
        EXPECT_EQ(first % 1000, 0u) << text;
    }
    scoped_environment env;
    env.set("TICKBENCH_DIFF_ROTATING_SEED", "7301000");
    env.set("TICKBENCH_DIFF_PROGRAMS", "30");
    const auto w = rotating_window(2000, TICKBENCH_SOURCE_DIR);
    ASSERT_TRUE(w.has_value());
    EXPECT_EQ(describe(*w), "7301000..7301029 (TICKBENCH_DIFF_ROTATING_SEED)");
    env.set("TICKBENCH_DIFF_ROTATING_SEED", "73x");
    try {
        rotating_window(2000, TICKBENCH_SOURCE_DIR);
        ADD_FAILURE() << "a bad TICKBENCH_DIFF_ROTATING_SEED was taken";
    } catch (const std::invalid_argument& e) {
        EXPECT_EQ(std::string(e.what()),
                  "TICKBENCH_DIFF_ROTATING_SEED=73x: not a whole number; accepted: a seed, e.g. "
                  "7301000, or off");
    }
}

TEST(differential_harness_test, shards_cover_a_window_once) {
    const seed_window w{500, 21, "test"};
    std::vector<std::uint64_t> all;
    for (unsigned s = 0; s < shard_count; ++s)
        for (std::uint64_t seed : shard_seeds(w, s, shard_count)) all.push_back(seed);
    std::sort(all.begin(), all.end());
    std::vector<std::uint64_t> expected;
    for (std::uint64_t seed = 500; seed < 521; ++seed) expected.push_back(seed);
    EXPECT_EQ(all, expected);
}

}  // namespace
}  // namespace tickbench::differential

int main(int argc, char** argv) {
    if (argc > 0) tickbench::differential::program_path = argv[0];
    for (int i = 1; i < argc; ++i) {
        if (std::strcmp(argv[i], "--long") == 0) {
            tickbench::differential::long_mode = true;
            for (int k = i; k + 1 < argc; ++k) argv[k] = argv[k + 1];
            --argc;
            --i;
        }
    }
    // The programs write clipped dead times on purpose: their warnings would bury a failure.
    // (timing_rules_test installs its own "timer" logger to check that warning.)
    spdlog::register_logger(
        std::make_shared<spdlog::logger>("timer", std::make_shared<spdlog::sinks::null_sink_st>()));
    ::testing::InitGoogleTest(&argc, argv);
    ::testing::AddGlobalTestEnvironment(new tickbench::differential::print_seed_windows);
    return RUN_ALL_TESTS();
}
