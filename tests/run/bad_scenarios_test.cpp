// The corpus of malformed scenarios: each tests/data/bad_scenarios/NAME.toml must be refused by
// `tickbench check`'s validation with every line of NAME.expect in the message (file:line:column,
// key path and a fragment of what was wrong).

#include "harness/firmware_library.h"
#include "harness/run/scenario_runner.h"
#include "tests/support/bad_corpus.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <sstream>
#include <string>

namespace {

namespace fs = std::filesystem;
using namespace tickbench::test_support;

const fs::path corpus = fs::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_scenarios";

class bad_scenarios_test : public ::testing::TestWithParam<std::string> {};

TEST_P(bad_scenarios_test, is_refused_with_the_expected_message) {
    expect_refused(corpus, GetParam(), [](const fs::path& toml) {
        // Paths in the corpus are relative to the corpus folder, as a user would run it from
        // there.
        const auto previous = fs::current_path();
        fs::current_path(toml.parent_path());
        std::string what;
        try {
            what = scenario_error_text([&] {
                std::ostringstream out;
                harness::run::check_scenario(toml.filename().string(), out);
            });
        } catch (const harness::firmware_load_error& e) {
            what = e.what();
        }
        fs::current_path(previous);
        return what;
    });
}

INSTANTIATE_TEST_SUITE_P(corpus, bad_scenarios_test, ::testing::ValuesIn(corpus_names(corpus)),
                         corpus_case_name);

TEST(bad_scenarios_corpus_test, has_at_least_thirty_cases) {
    EXPECT_GE(corpus_names(corpus).size(), 30u);
}

}  // namespace
