// The three report files: checks.jsonl (keys, order and types, parsed back), junit.xml (well-formed
// per xmllint, escaped, one test case per check) and summary.txt (aligned table and totals), and
// the error raised when a file cannot be written.

#include "sim/report/checks_jsonl.h"
#include "sim/report/junit_xml.h"
#include "sim/report/summary_text.h"
#include "sim/vcd_writer.h"  // sim::output_error
#include "tests/checks/edge_script.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace {

using sim::check_kind;
using sim::check_spec;
using tickbench::test_support::edge_script;

constexpr sim::time_ps us = 1'000'000;
constexpr sim::time_ps ms = 1'000'000'000;

// Three checks on one square wave: a passing period, a failing duty cycle with a name full of XML
// specials, and a passing edge count.
std::vector<sim::check_result> sample_results() {
    edge_script s;
    s.signal("pwm.a").square("pwm.a", 0, 40 * us, 10 * us, 25);
    check_spec p;
    p.name = "period";
    p.kind = check_kind::period;
    p.signals = {"pwm.a"};
    p.expected = 40 * us;
    p.tol = sim::tolerance::relative_ppb(100'000);
    check_spec d;
    d.name = "duty <&\"'> \x01";
    d.kind = check_kind::duty_cycle;
    d.signals = {"pwm.a"};
    d.minimum = 300'000'000;
    check_spec n;
    n.name = "rises";
    n.kind = check_kind::edge_count;
    n.signals = {"pwm.a"};
    n.expected = 25;
    return s.run({p, d, n}, 1 * ms);
}

std::filesystem::path temp_dir(const std::string& name) {
    auto dir = std::filesystem::temp_directory_path() /
               ("tickbench_checks_" + name + "_" + std::to_string(::getpid()));
    std::filesystem::create_directories(dir);
    return dir;
}

std::string read_file(const std::filesystem::path& p) {
    std::ifstream in(p, std::ios::binary);
    std::stringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

TEST(report_test, jsonl_has_one_object_per_check_with_the_exact_keys_and_types) {
    const auto results = sample_results();
    const auto dir = temp_dir("jsonl");
    sim::write_checks_jsonl((dir / "checks.jsonl").string(), results);
    std::istringstream in(read_file(dir / "checks.jsonl"));
    std::vector<nlohmann::json> lines;
    for (std::string line; std::getline(in, line);) lines.push_back(nlohmann::json::parse(line));
    ASSERT_EQ(lines.size(), 3u);
    const std::vector<std::string> keys{"check",    "signal", "kind",    "expected", "tolerance",
                                        "measured", "unit",   "verdict", "at_s",     "detail"};
    for (const auto& j : lines) {
        ASSERT_TRUE(j.is_object());
        EXPECT_EQ(j.size(), keys.size());
        for (const auto& k : keys) EXPECT_TRUE(j.contains(k)) << k;
        EXPECT_TRUE(j["check"].is_string());
        EXPECT_TRUE(j["signal"].is_string());
        EXPECT_TRUE(j["kind"].is_string());
        EXPECT_TRUE(j["expected"].is_number() || j["expected"].is_object());
        EXPECT_TRUE(j["tolerance"].is_string() || j["tolerance"].is_null());
        EXPECT_TRUE(j["measured"].is_object());
        EXPECT_TRUE(j["measured"]["count"].is_number_unsigned());
        EXPECT_TRUE(j["unit"].is_string());
        EXPECT_TRUE(j["verdict"] == "pass" || j["verdict"] == "fail");
        EXPECT_TRUE(j["at_s"].is_number_float());
        EXPECT_TRUE(j["detail"].is_string());
    }
    // Key order as documented, on the raw text.
    const std::string first =
        read_file(dir / "checks.jsonl").substr(0, read_file(dir / "checks.jsonl").find('\n'));
    std::size_t pos = 0;
    for (const auto& k : keys) {
        const std::size_t at = first.find("\"" + k + "\":");
        ASSERT_NE(at, std::string::npos) << k;
        EXPECT_GT(at + 1, pos) << k;
        pos = at;
    }
    const auto& period = lines[0];
    EXPECT_EQ(period["check"], "period");
    EXPECT_EQ(period["signal"], "pwm.a");
    EXPECT_EQ(period["kind"], "period");
    EXPECT_DOUBLE_EQ(period["expected"].get<double>(), 40e-6);
    EXPECT_EQ(period["tolerance"], "100 ppm");
    EXPECT_EQ(period["measured"]["count"], 24);
    EXPECT_DOUBLE_EQ(period["measured"]["mean"].get<double>(), 40e-6);
    EXPECT_EQ(period["unit"], "s");
    EXPECT_EQ(period["verdict"], "pass");
    EXPECT_DOUBLE_EQ(period["at_s"].get<double>(), 1e-3);

    const auto& duty = lines[1];
    EXPECT_EQ(duty["verdict"], "fail");
    EXPECT_DOUBLE_EQ(duty["expected"]["min"].get<double>(), 30.0);
    EXPECT_FALSE(duty["expected"].contains("max"));
    EXPECT_TRUE(duty["tolerance"].is_null());
    EXPECT_EQ(duty["unit"], "%");
    EXPECT_DOUBLE_EQ(duty["measured"]["max"].get<double>(), 25.0);
    EXPECT_DOUBLE_EQ(duty["at_s"].get<double>(), 40e-6);
    EXPECT_EQ(duty["detail"],
              "duty cycle 25 % (high 10 us of 40 us) is below the minimum 30 % at 40 us; 24 of 24 "
              "periods failed");

    const auto& rises = lines[2];
    EXPECT_EQ(rises["unit"], "edges");
    EXPECT_EQ(rises["measured"].size(), 1u);  // count only
    EXPECT_EQ(rises["measured"]["count"], 25);
    std::filesystem::remove_all(dir);
}

TEST(report_test, junit_xml_is_well_formed_and_escaped) {
    const std::string xmllint = TICKBENCH_XMLLINT;
    ASSERT_TRUE(xmllint.find("NOTFOUND") == std::string::npos && !xmllint.empty())
        << "xmllint is missing: install Debian's libxml2-utils (scripts/lib/setup.sh lists it) and "
           "reconfigure";
    const auto results = sample_results();
    const auto dir = temp_dir("junit");
    const auto file = dir / "junit.xml";
    sim::write_junit_xml(file.string(), results, "demo <scenario>");
    const std::string cmd = "'" + xmllint + "' --noout '" + file.string() + "' 2>&1";
    const int status = std::system(cmd.c_str());
    ASSERT_TRUE(WIFEXITED(status));
    EXPECT_EQ(WEXITSTATUS(status), 0) << read_file(file);

    const std::string x = read_file(file);
    EXPECT_EQ(x.rfind("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n", 0), 0u);
    EXPECT_NE(x.find("<testsuite name=\"demo &lt;scenario&gt;\" tests=\"3\" failures=\"1\" "
                     "errors=\"0\" skipped=\"0\">"),
              std::string::npos)
        << x;
    EXPECT_NE(x.find("<testcase name=\"duty &lt;&amp;&quot;&apos;&gt; ?\" "
                     "classname=\"tickbench.duty_cycle\">"),
              std::string::npos)
        << x;
    std::size_t cases = 0, failures = 0;
    for (std::size_t p = 0; (p = x.find("<testcase ", p)) != std::string::npos; ++p) ++cases;
    for (std::size_t p = 0; (p = x.find("<failure ", p)) != std::string::npos; ++p) ++failures;
    EXPECT_EQ(cases, 3u);
    EXPECT_EQ(failures, 1u);
    EXPECT_NE(x.find("measured: count 24, min 25 %, mean 25 %, max 25 %"), std::string::npos) << x;
    std::filesystem::remove_all(dir);
}

TEST(report_test, summary_is_an_aligned_table_with_totals) {
    const auto results = sample_results();
    const std::string text = sim::summary_text(results);
    EXPECT_EQ(text,
              "verdict  check         kind        signal  measured\n"
              "pass     period        period      pwm.a   mean 40 us over 24\n"
              "FAIL     duty <&\"'> \x01  duty_cycle  pwm.a   mean 25 % over 24\n"
              "         -> duty cycle 25 % (high 10 us of 40 us) is below the minimum 30 % at 40 "
              "us; 24 of 24 periods failed\n"
              "pass     rises         edge_count  pwm.a   25 edges\n"
              "3 checks: 2 passed, 1 failed\n");
    const auto dir = temp_dir("summary");
    sim::write_summary((dir / "summary.txt").string(), results);
    EXPECT_EQ(read_file(dir / "summary.txt"), text);
    std::filesystem::remove_all(dir);
}

TEST(report_test, summary_notes_follow_the_totals) {
    const auto results = sample_results();
    const std::vector<std::string> notes = {"firmware log: 2 lines in firmware.log"};
    const std::string text = sim::summary_text(results, notes);
    EXPECT_EQ(text, sim::summary_text(results) + "firmware log: 2 lines in firmware.log\n");
    const auto dir = temp_dir("summary_notes");
    sim::write_summary((dir / "summary.txt").string(), results, notes);
    EXPECT_EQ(read_file(dir / "summary.txt"), text);
    std::filesystem::remove_all(dir);
}

TEST(report_test, an_unwritable_file_names_the_path_and_the_reason) {
    const std::string path = "/nonexistent-tickbench-dir/checks.jsonl";
    try {
        sim::write_checks_jsonl(path, sample_results());
        FAIL() << "no error";
    } catch (const sim::output_error& e) {
        EXPECT_STREQ(
            e.what(),
            "cannot create /nonexistent-tickbench-dir/checks.jsonl: No such file or directory");
    }
    EXPECT_THROW(sim::write_junit_xml("/nonexistent-tickbench-dir/junit.xml", {}, "s"),
                 sim::output_error);
    EXPECT_THROW(sim::write_summary("/nonexistent-tickbench-dir/summary.txt", {}),
                 sim::output_error);
    if (std::filesystem::exists("/dev/full")) {
        try {
            sim::write_summary("/dev/full", sample_results());
            FAIL() << "no error";
        } catch (const sim::output_error& e) {
            EXPECT_STREQ(e.what(), "cannot write /dev/full: No space left on device");
        }
    }
}

}  // namespace
