// The corpus of malformed scenarios: each tests/data/bad_scenarios/NAME.toml must be refused by
// `tickbench check`'s validation with every line of NAME.expect in the message (file:line:column,
// key path and a fragment of what was wrong).

#include "harness/firmware_library.h"
#include "harness/run/scenario_runner.h"
#include "sim/scenario_error.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace {

const std::filesystem::path corpus =
    std::filesystem::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_scenarios";

std::vector<std::string> corpus_names() {
    std::vector<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(corpus))
        if (e.path().extension() == ".toml") names.push_back(e.path().stem().string());
    std::sort(names.begin(), names.end());
    return names;
}

class bad_scenarios_test : public ::testing::TestWithParam<std::string> {};

TEST_P(bad_scenarios_test, is_refused_with_the_expected_message) {
    std::ifstream expect_file(corpus / (GetParam() + ".expect"));
    ASSERT_TRUE(expect_file) << "missing " << GetParam() << ".expect";
    std::vector<std::string> fragments;
    for (std::string line; std::getline(expect_file, line);)
        if (!line.empty()) fragments.push_back(line);
    ASSERT_FALSE(fragments.empty());

    // Paths in the corpus are relative to the corpus folder, as a user would run it from there.
    const auto previous = std::filesystem::current_path();
    std::filesystem::current_path(corpus);
    std::string what;
    try {
        std::ostringstream out;
        harness::run::check_scenario(GetParam() + ".toml", out);
    } catch (const sim::scenario_error& e) {
        what = e.what();
    } catch (const harness::firmware_load_error& e) {
        what = e.what();
    }
    std::filesystem::current_path(previous);
    ASSERT_FALSE(what.empty()) << GetParam() << ".toml was accepted";
    for (const std::string& f : fragments)
        EXPECT_NE(what.find(f), std::string::npos) << "expected: " << f << "\ngot: " << what;
}

INSTANTIATE_TEST_SUITE_P(corpus, bad_scenarios_test, ::testing::ValuesIn(corpus_names()),
                         [](const ::testing::TestParamInfo<std::string>& i) { return i.param; });

TEST(bad_scenarios_corpus_test, has_at_least_thirty_cases) {
    EXPECT_GE(corpus_names().size(), 30u);
}

}  // namespace
