// The corpus of malformed clock trees: each tests/data/bad_clocks/NAME.toml must be refused with a
// scenario_error whose message contains every line of NAME.expect (file:line:column included).

#include "sim/clock_tree_loader.h"
#include "tests/support/bad_corpus.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

namespace {

namespace fs = std::filesystem;
using namespace tickbench::test_support;

const fs::path corpus = fs::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_clocks";

class bad_clocks_test : public ::testing::TestWithParam<std::string> {};

TEST_P(bad_clocks_test, is_refused_with_the_expected_message) {
    expect_refused(corpus, GetParam(), [](const fs::path& toml) {
        sim::clock_tree tree;
        return scenario_error_text([&] { sim::load_clock_tree_file(toml.string(), tree); });
    });
}

INSTANTIATE_TEST_SUITE_P(corpus, bad_clocks_test, ::testing::ValuesIn(corpus_names(corpus)),
                         corpus_case_name);

TEST(bad_clocks_corpus_test, has_at_least_fifteen_cases) {
    EXPECT_GE(corpus_names(corpus).size(), 15u);
}

}  // namespace
