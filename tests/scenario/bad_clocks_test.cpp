// The corpus of malformed clock trees: each tests/data/bad_clocks/NAME.toml must be refused with a
// scenario_error whose message contains every line of NAME.expect (file:line:column included).

#include "sim/clock_tree_loader.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace {

const std::filesystem::path corpus =
    std::filesystem::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_clocks";

std::vector<std::string> corpus_names() {
    std::vector<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(corpus))
        if (e.path().extension() == ".toml") names.push_back(e.path().stem().string());
    std::sort(names.begin(), names.end());
    return names;
}

class bad_clocks_test : public ::testing::TestWithParam<std::string> {};

TEST_P(bad_clocks_test, is_refused_with_the_expected_message) {
    const std::filesystem::path toml = corpus / (GetParam() + ".toml");
    std::ifstream expect_file(corpus / (GetParam() + ".expect"));
    ASSERT_TRUE(expect_file) << "missing " << GetParam() << ".expect";
    std::vector<std::string> fragments;
    for (std::string line; std::getline(expect_file, line);)
        if (!line.empty()) fragments.push_back(line);
    ASSERT_FALSE(fragments.empty());

    sim::clock_tree tree;
    try {
        sim::load_clock_tree_file(toml.string(), tree);
        FAIL() << GetParam() << ".toml was accepted";
    } catch (const sim::scenario_error& e) {
        const std::string what = e.what();
        for (const std::string& f : fragments)
            EXPECT_NE(what.find(f), std::string::npos) << "expected: " << f << "\ngot: " << what;
        EXPECT_EQ(std::filesystem::path(e.file()).filename(), toml.filename());
    }
}

INSTANTIATE_TEST_SUITE_P(corpus, bad_clocks_test, ::testing::ValuesIn(corpus_names()),
                         [](const ::testing::TestParamInfo<std::string>& i) { return i.param; });

TEST(bad_clocks_corpus_test, has_at_least_fifteen_cases) { EXPECT_GE(corpus_names().size(), 15u); }

}  // namespace
