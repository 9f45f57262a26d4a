// The sweep's reports: range compression, the summary's groups, record lines, and merging shards
// into the unsharded sweep's reports byte for byte (harness/run/sweep_report.h, docs/cli.md).

#include "harness/run/sweep_report.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

namespace fs = std::filesystem;
using namespace harness::run;

namespace {

std::string read_file(const fs::path& p) {
    std::ifstream f(p, std::ios::binary);
    std::ostringstream s;
    s << f.rdbuf();
    return s.str();
}

// A sweep of two variants over offsets 0..5 where the naive variant fails at 1, 2 and 5.
struct example {
    sweep_plan plan{{parse_axis("param.variant=naive,careful"), parse_axis("start-offset=0..5")}};
    sweep_header header;
    std::vector<point_record> records;

    example() {
        header.scenario = "demo.toml";
        header.scenario_digest = "0123456789abcdef";
        header.axes = {{"param.variant", "naive,careful"}, {"start-offset", "0..5"}};
        header.points = plan.points();
        for (std::uint64_t i = 0; i < plan.points(); ++i) {
            point_record r;
            r.index = i;
            if (i == 1 || i == 2 || i == 5) {
                r.verdict = "fail";
                r.exit_code = 3;
                r.outcome = "firmware-check-failed";
                r.message = "firmware check 'never back' failed at fw.c:9";
                r.failed_checks = {
                    R"({"check":"never back","verdict":"fail","detail":"failed at 1 us"})"};
            }
            records.push_back(r);
        }
    }
};

fs::path fresh_dir(const std::string& name) {
    const fs::path d = fs::temp_directory_path() / ("tickbench_sweep_report_test_" + name);
    fs::remove_all(d);
    return d;
}

}  // namespace

TEST(sweep_report_test, compresses_consecutive_positions_into_ranges) {
    const std::vector<std::string> v = {"0", "1", "2", "3", "4", "5", "6"};
    EXPECT_EQ(compress_ranges(v, {}), "");
    EXPECT_EQ(compress_ranges(v, {3}), "3");
    EXPECT_EQ(compress_ranges(v, {0, 1, 2, 4, 6}), "0-2, 4, 6");
    EXPECT_EQ(compress_ranges(v, {1, 2}), "1-2");
    const std::vector<std::string> q = {"7.9 MHz", "7.95 MHz", "8 MHz"};
    EXPECT_EQ(compress_ranges(q, {0, 1}), "7.9 MHz to 7.95 MHz");
    // Positions, not values, decide: a stepped range's neighbours compress.
    const std::vector<std::string> stepped = {"0", "5", "10", "15"};
    EXPECT_EQ(compress_ranges(stepped, {1, 2, 3}), "5-15");
}

TEST(sweep_report_test, summary_groups_by_the_outer_axes) {
    const example e;
    EXPECT_EQ(sweep_summary_text(e.header, e.plan, e.records),
              "sweep of demo.toml: 12 points\n"
              "12 ran: 9 passed, 3 failed (3 firmware, 0 checks)\n"
              "param.variant=naive: fails at start-offset 1-2, 5 (3 of 6)\n"
              "param.variant=careful: passes at every start-offset (0 of 6 fail)\n");
}

TEST(sweep_report_test, summary_of_one_axis_and_of_a_partial_sweep) {
    const sweep_plan plan({parse_axis("seed=1..4")});
    sweep_header h;
    h.scenario = "s.toml";
    h.points = 4;
    h.partial = true;
    point_record a;
    a.index = 0;
    point_record b;
    b.index = 1;
    b.verdict = "fail";
    b.exit_code = 1;
    b.outcome = "checks-failed";
    point_record c;
    c.index = 2;
    c.verdict = "error";
    c.exit_code = 2;
    c.outcome = "bad-input";
    EXPECT_EQ(sweep_summary_text(h, plan, {a, b, c}),
              "sweep of s.toml: 4 points\n"
              "PARTIAL: stopped before every point ran; 3 points ran, the others are left out of "
              "every report\n"
              "3 ran: 1 passed, 1 failed (0 firmware, 1 checks), 1 could not run\n"
              "all points: fails at seed 2 (1 of 3); cannot run at seed 3 (1 of 3)\n");
    const sweep_totals t = totals_of({a, b, c}, true);
    EXPECT_EQ(t.run, 3u);
    EXPECT_EQ(t.failed_checks, 1u);
    EXPECT_EQ(t.errors, 1u);
    EXPECT_TRUE(t.partial);
}

TEST(sweep_report_test, a_record_line_reads_back) {
    const example e;
    const std::string line = record_line(e.plan, e.records[5]);
    EXPECT_EQ(
        line,
        R"({"point":5,"values":{"param.variant":"naive","start-offset":"5"},"verdict":"fail",)"
        R"("exit":3,"outcome":"firmware-check-failed","message":"firmware check 'never back' )"
        R"(failed at fw.c:9","failed":[{"check":"never back","verdict":"fail","detail":)"
        R"("failed at 1 us"}]})");
    const point_record r = parse_record_line(line, "x:2");
    EXPECT_EQ(r.index, 5u);
    EXPECT_EQ(r.exit_code, 3);
    EXPECT_EQ(record_line(e.plan, r), line);
    EXPECT_THROW(parse_record_line("{\"point\":1}", "x:3"), sweep_error);
}

TEST(sweep_report_test, junit_has_one_case_per_point_named_by_its_values) {
    const example e;
    const std::string x = sweep_junit_text(e.header, e.plan, e.records);
    EXPECT_NE(x.find("<testsuite name=\"demo sweep\" tests=\"12\" failures=\"3\" errors=\"0\">"),
              std::string::npos);
    EXPECT_NE(x.find("<testcase name=\"param.variant=naive start-offset=1\""), std::string::npos);
    EXPECT_NE(x.find("<failure message=\"firmware-check-failed: firmware check &apos;never "
                     "back&apos; failed at fw.c:9\""),
              std::string::npos);
}

TEST(sweep_report_test, merged_shards_equal_the_unsharded_reports) {
    const example e;
    const fs::path whole = fresh_dir("whole");
    write_sweep_reports(whole.string(), e.header, e.plan, e.records);
    std::vector<std::string> dirs;
    // The shards given out of order: the merge sorts points by index.
    for (std::uint64_t k : {3u, 1u, 2u}) {
        sweep_header h = e.header;
        h.part = shard{k, 3};
        std::vector<point_record> part;
        for (const point_record& r : e.records)
            if (h.part.includes(r.index)) part.push_back(r);
        const fs::path d = fresh_dir("shard" + std::to_string(k));
        write_sweep_reports(d.string(), h, e.plan, part);
        dirs.push_back(d.string());
    }
    const fs::path merged = fresh_dir("merged");
    std::string summary;
    const sweep_totals t = merge_sweeps(dirs, merged.string(), summary);
    EXPECT_EQ(t.failed_firmware, 3u);
    for (const char* f : {"sweep.jsonl", "junit.xml", "summary.txt"})
        EXPECT_EQ(read_file(merged / f), read_file(whole / f)) << f;
    EXPECT_EQ(summary, read_file(whole / "summary.txt"));
}

TEST(sweep_report_test, merge_refuses_shards_of_different_sweeps) {
    const example e;
    auto write_shard = [&](const std::string& name, sweep_header h, std::uint64_t k,
                           std::uint64_t n) {
        h.part = shard{k, n};
        std::vector<point_record> part;
        for (const point_record& r : e.records)
            if (h.part.includes(r.index)) part.push_back(r);
        const fs::path d = fresh_dir(name);
        write_sweep_reports(d.string(), h, e.plan, part);
        return d.string();
    };
    const std::string one = write_shard("one", e.header, 1, 2);
    sweep_header other = e.header;
    other.scenario = "other.toml";
    const std::string two_other = write_shard("two_other", other, 2, 2);
    const fs::path out = fresh_dir("refused");
    std::string summary;
    try {
        merge_sweeps({one, two_other}, out.string(), summary);
        FAIL() << "merged shards of two sweeps";
    } catch (const sweep_error& e2) {
        EXPECT_EQ(std::string(e2.what()),
                  two_other + "/sweep.jsonl: a shard of a different sweep than " + one +
                      "/sweep.jsonl (scenario other.toml, not demo.toml); merge only shards of "
                      "one sweep");
    }
    sweep_header digest = e.header;
    digest.scenario_digest = "ffffffffffffffff";
    const std::string two_digest = write_shard("two_digest", digest, 2, 2);
    EXPECT_THROW(merge_sweeps({one, two_digest}, out.string(), summary), sweep_error);
    sweep_header axes = e.header;
    axes.axes[1].second = "0..6";
    const std::string two_axes = write_shard("two_axes", axes, 2, 2);
    EXPECT_THROW(merge_sweeps({one, two_axes}, out.string(), summary), sweep_error);
    try {
        merge_sweeps({one}, out.string(), summary);
        FAIL() << "merged with a shard missing";
    } catch (const sweep_error& e2) {
        EXPECT_EQ(std::string(e2.what()),
                  "merge: shard 2/2 missing; give the folders of all 2 shards");
    }
    try {
        merge_sweeps({one, one}, out.string(), summary);
        FAIL() << "merged one shard twice";
    } catch (const sweep_error& e2) {
        EXPECT_EQ(std::string(e2.what()), one + "/sweep.jsonl: shard 1/2 is also in " + one +
                                              "/sweep.jsonl; give each shard once");
    }
    EXPECT_FALSE(fs::exists(out / "sweep.jsonl"));
}

TEST(sweep_report_test, a_failure_with_an_exit_code_of_its_own_counts_as_the_firmware_s) {
    point_record checks;
    checks.verdict = "fail";
    checks.exit_code = 1;
    point_record other;
    other.index = 1;
    other.verdict = "fail";
    other.exit_code = 5;
    point_record internal;
    internal.index = 2;
    internal.verdict = "error";
    internal.exit_code = 4;
    const sweep_totals t = totals_of({checks, other, internal}, false);
    EXPECT_EQ(t.failed_checks, 1u);
    EXPECT_EQ(t.failed_firmware, 1u);
    EXPECT_EQ(t.internal, 1u);
    EXPECT_EQ(t.errors, 0u);
}
