#pragma once
// The loop the corpora of malformed files share (tests/data/bad_scenarios/, bad_clocks/,
// bad_layouts/): every NAME.toml of a corpus folder must be refused, and the refusal must contain
// each non-empty line of NAME.expect beside it. A line is a whole finding as a user sees it
// ("NAME.toml:LINE:COLUMN: KEY.PATH: message") or a fragment of one, so a corpus pins both the
// place and the wording. A corpus test runs one parameterised case per file (corpus_names) and
// hands expect_refused the loader that reads one file the way the product does.

#include "sim/scenario_error.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <functional>
#include <string>
#include <vector>

namespace tickbench::test_support {

// The names of the corpus cases in `folder`: the stems of its .toml files, sorted.
inline std::vector<std::string> corpus_names(const std::filesystem::path& folder) {
    std::vector<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(folder))
        if (e.path().extension() == ".toml") names.push_back(e.path().stem().string());
    std::sort(names.begin(), names.end());
    return names;
}

// Reads one corpus file the way the product does; returns the error message, or "" when the file
// was accepted.
using corpus_loader = std::function<std::string(const std::filesystem::path& toml)>;

// The message of the scenario_error `load` throws, or "" when it throws none.
template <typename Load>
std::string scenario_error_text(Load&& load) {
    try {
        load();
    } catch (const sim::scenario_error& e) {
        return e.what();
    }
    return "";
}

// Checks that `load` refuses folder/NAME.toml with every line of folder/NAME.expect in its message.
inline void expect_refused(const std::filesystem::path& folder, const std::string& name,
                           const corpus_loader& load) {
    std::ifstream expect_file(folder / (name + ".expect"));
    ASSERT_TRUE(expect_file) << "missing " << name << ".expect";
    std::vector<std::string> fragments;
    for (std::string line; std::getline(expect_file, line);)
        if (!line.empty()) fragments.push_back(line);
    ASSERT_FALSE(fragments.empty()) << name << ".expect is empty";

    const std::string what = load(folder / (name + ".toml"));
    ASSERT_FALSE(what.empty()) << name << ".toml was accepted";
    for (const std::string& f : fragments)
        EXPECT_NE(what.find(f), std::string::npos) << "expected: " << f << "\ngot: " << what;
}

// The test name of a corpus case: its file's stem.
inline std::string corpus_case_name(const ::testing::TestParamInfo<std::string>& info) {
    return info.param;
}

}  // namespace tickbench::test_support
