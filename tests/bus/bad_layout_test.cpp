// The corpus of malformed register layouts: each tests/data/bad_layouts/NAME.toml must be refused
// with a scenario_error whose message contains every line of NAME.expect (file:line:column, key
// path and what would be accepted).

#include "models/layout/register_layout.h"
#include "tests/support/bad_corpus.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

namespace {

namespace fs = std::filesystem;
using namespace tickbench::test_support;

const fs::path corpus = fs::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_layouts";

class bad_layout_test : public ::testing::TestWithParam<std::string> {};

TEST_P(bad_layout_test, is_refused_with_the_expected_message) {
    expect_refused(corpus, GetParam(), [](const fs::path& toml) {
        return scenario_error_text([&] { models::load_register_layout_file(toml.string()); });
    });
}

INSTANTIATE_TEST_SUITE_P(corpus, bad_layout_test, ::testing::ValuesIn(corpus_names(corpus)),
                         corpus_case_name);

TEST(bad_layout_corpus_test, has_at_least_ten_cases) {
    EXPECT_GE(corpus_names(corpus).size(), 10u);
}

TEST(bad_layout_corpus_test, an_unreadable_file_is_an_error_naming_it) {
    const std::string what = scenario_error_text(
        [] { models::load_register_layout_file((corpus / "no_such_file.toml").string()); });
    EXPECT_NE(what.find("no_such_file.toml: cannot read the file: "), std::string::npos) << what;
}

}  // namespace
