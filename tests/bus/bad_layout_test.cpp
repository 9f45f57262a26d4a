// The malformed-layout corpus in tests/data/bad_layouts/: each file says, in its first two comment
// lines, the message fragment its error must carry ("# expect: ...") and where it must point
// ("# at: line:column"). The test loads each and checks one finding has both.

#include "models/layout/register_layout.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace {

namespace fs = std::filesystem;

const fs::path corpus = fs::path(TICKBENCH_SOURCE_DIR) / "tests/data/bad_layouts";

struct bad_case {
    fs::path path;
    std::string expect;
    std::string at;
};

std::vector<bad_case> read_corpus() {
    std::vector<bad_case> out;
    for (const auto& e : fs::directory_iterator(corpus)) {
        if (e.path().extension() != ".toml") continue;
        bad_case c{e.path(), "", ""};
        std::ifstream in(e.path());
        std::string line;
        while (std::getline(in, line)) {
            if (line.rfind("# expect: ", 0) == 0) c.expect = line.substr(10);
            if (line.rfind("# at: ", 0) == 0) c.at = line.substr(6);
        }
        out.push_back(c);
    }
    std::sort(out.begin(), out.end(), [](const auto& a, const auto& b) { return a.path < b.path; });
    return out;
}

TEST(bad_layout_test, corpus_has_enough_cases) {
    const auto cases = read_corpus();
    EXPECT_GE(cases.size(), 10u);
    for (const auto& c : cases) {
        EXPECT_FALSE(c.expect.empty()) << c.path << " lacks '# expect:'";
        EXPECT_FALSE(c.at.empty()) << c.path << " lacks '# at:'";
    }
}

TEST(bad_layout_test, every_file_is_refused_with_place_and_remedy) {
    for (const auto& c : read_corpus()) {
        SCOPED_TRACE(c.path.filename().string());
        try {
            models::load_register_layout_file(c.path.string());
            ADD_FAILURE() << "loaded without error";
        } catch (const sim::scenario_error& e) {
            const std::string place = c.path.filename().string() + ":" + c.at + ": ";
            bool found = false;
            for (const auto& f : e.findings()) {
                const auto text = f.text();
                found |= text.find(place) != std::string::npos &&
                         text.find(c.expect) != std::string::npos;
            }
            EXPECT_TRUE(found) << "expected a finding at " << place << " with \"" << c.expect
                               << "\"; got:\n"
                               << e.what();
        }
    }
}

TEST(bad_layout_test, an_unreadable_file_is_an_error) {
    EXPECT_THROW(models::load_register_layout_file((corpus / "no_such_file.toml").string()),
                 sim::scenario_error);
}

}  // namespace
