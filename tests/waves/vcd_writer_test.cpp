#include "sim/vcd_writer.h"
#include "tests/support/temp_files.h"
#include "tests/waves/vcd_reader.h"

#include <gtest/gtest.h>

#include <cstdio>
#include <filesystem>
#include <set>
#include <string>

namespace {

namespace fs = std::filesystem;
using sim::vcd_writer;

// A fresh file name in the test's temporary folder.
std::string temp_path(const std::string& name) {
    return tickbench::test_support::temp_path("tickbench_waves", name);
}

std::string slurp(const std::string& path) {
    return tickbench::test_support::read_whole_file(path);
}

sim::vcd_options fixed(sim::time_ps unit = 1) {
    sim::vcd_options o;
    o.unit_ps = unit;
    o.date = "test date";
    o.version = "test version";
    return o;
}

TEST(vcd_writer_test, writes_the_exact_file_for_a_small_sequence) {
    // The layout follows IEEE Std 1364-2005, clause 18 (recalled from memory): header sections,
    // nested $scope/$upscope, one $var per signal, $enddefinitions, #0 with $dumpvars, then
    // "#<time>" lines and "<value><code>" changes; codes '!' (33) onwards.
    const std::string path = temp_path("small.vcd");
    {
        vcd_writer w(path, fixed());
        w.declare(0, {"board.fan_timer", "channel1", false});
        w.declare(1, {"board.fan_timer", "channel1_complement", true});
        w.declare(2, {"board", "reset", true});
        w.declare(3, {"", "loose name", false});
        w.begin();
        w.change(0, true, 0);  // at time 0, after the initial values
        w.change(1, false, 1500);
        w.change(0, false, 1500);
        w.change(0, true, 2000);  // a glitch: up, down and up again at one instant
        w.change(0, false, 2000);
        w.change(0, true, 2000);
        w.change(2, true, 2000);  // no change: reset is already high
        w.change(3, true, 12'345'678'901'234);
        EXPECT_EQ(w.changes_written(), 7u);
        EXPECT_EQ(w.rounded_changes(), 0u);
        w.end(20'000'000'000'000);
    }
    EXPECT_EQ(slurp(path),
              "$date\n\ttest date\n$end\n"
              "$version\n\ttest version\n$end\n"
              "$timescale\n\t1 ps\n$end\n"
              "$scope module board $end\n"
              "$var wire 1 # reset $end\n"
              "$scope module fan_timer $end\n"
              "$var wire 1 ! channel1 $end\n"
              "$var wire 1 \" channel1_complement $end\n"
              "$upscope $end\n"
              "$upscope $end\n"
              "$scope module top $end\n"
              "$var wire 1 $ loose_name $end\n"
              "$upscope $end\n"
              "$enddefinitions $end\n"
              "#0\n$dumpvars\n0!\n1\"\n1#\n0$\n$end\n"
              "1!\n"
              "#1500\n0\"\n0!\n"
              "#2000\n1!\n0!\n1!\n"
              "#12345678901234\n1$\n"
              "#20000000000000\n");
}

TEST(vcd_writer_test, time_lines_are_exact_at_every_magnitude) {
    const std::string path = temp_path("times.vcd");
    const std::vector<sim::time_ps> times = {1,
                                             9,
                                             10,
                                             99,
                                             100,
                                             12'345,
                                             99'999'999,
                                             100'000'000,
                                             100'000'001,
                                             199'999'999,
                                             200'000'000,
                                             1'000'000'007,
                                             123'456'789'012'345,
                                             1'000'000'000'000'000'000ULL,
                                             9'999'999'999'999'999'999ULL,
                                             10'000'000'000'000'000'000ULL,
                                             sim::max_time_ps};
    {
        vcd_writer w(path, fixed());
        w.declare(0, {"t", "a", false});
        w.begin();
        bool level = false;
        for (const sim::time_ps t : times) w.change(0, level = !level, t);
        w.end(sim::max_time_ps);
    }
    const auto v = tickbench::waves_test::read_vcd(path);
    std::vector<sim::time_ps> expected = {0};
    expected.insert(expected.end(), times.begin(), times.end());
    EXPECT_EQ(v.times, expected);
    EXPECT_NE(slurp(path).find("\n#18446744073709551615\n"), std::string::npos);
}

TEST(vcd_writer_test, identifier_codes_are_short_unique_and_printable) {
    EXPECT_EQ(vcd_writer::identifier_code(0), "!");
    EXPECT_EQ(vcd_writer::identifier_code(93), "~");
    EXPECT_EQ(vcd_writer::identifier_code(94), "!!");
    EXPECT_EQ(vcd_writer::identifier_code(95), "\"!");
    EXPECT_EQ(vcd_writer::identifier_code(94 + 94 * 94 - 1), "~~");
    EXPECT_EQ(vcd_writer::identifier_code(94 + 94 * 94), "!!!");
    std::set<std::string> seen;
    for (sim::signal_id id = 0; id < 20000; ++id) {
        const std::string code = vcd_writer::identifier_code(id);
        // Identifier codes use printable ASCII 33..126 (IEEE Std 1364-2005 clause 18, from memory).
        for (const char c : code) {
            EXPECT_GE(static_cast<int>(c), 33);
            EXPECT_LE(static_cast<int>(c), 126);
        }
        EXPECT_TRUE(seen.insert(code).second) << id;
    }
}

TEST(vcd_writer_test, timescale_units_are_powers_of_ten) {
    // $timescale takes 1, 10 or 100 and s, ms, us, ns, ps or fs (IEEE Std 1364-2005 clause 18,
    // from memory).
    EXPECT_EQ(vcd_writer::timescale_text(1), "1 ps");
    EXPECT_EQ(vcd_writer::timescale_text(100), "100 ps");
    EXPECT_EQ(vcd_writer::timescale_text(10'000), "10 ns");
    EXPECT_EQ(vcd_writer::timescale_text(1'000'000), "1 us");
    EXPECT_EQ(vcd_writer::timescale_text(1'000'000'000'000), "1 s");
    EXPECT_EQ(vcd_writer::timescale_text(100'000'000'000'000), "100 s");
    EXPECT_THROW(vcd_writer::timescale_text(0), std::invalid_argument);
    EXPECT_THROW(vcd_writer::timescale_text(20), std::invalid_argument);
    EXPECT_THROW(vcd_writer::timescale_text(1'000'000'000'000'000), std::invalid_argument);
    EXPECT_THROW(vcd_writer(temp_path("bad_unit.vcd"), fixed(3)), std::invalid_argument);
}

TEST(vcd_writer_test, coarsest_exact_unit_keeps_every_time_exact) {
    // 25 kHz PWM edges at whole microseconds: 1 us; a 48 MHz tick (20833.33 ps, rounded to the ps)
    // forces 1 ps.
    EXPECT_EQ(vcd_writer::coarsest_exact_unit({40'000'000, 10'000'000, 4'000'000}), 1'000'000u);
    EXPECT_EQ(vcd_writer::coarsest_exact_unit({40'000'000, 20'833}), 1u);
    EXPECT_EQ(vcd_writer::coarsest_exact_unit({0, 500}), 100u);
    EXPECT_EQ(vcd_writer::coarsest_exact_unit({}), sim::ps_per_second);
    EXPECT_EQ(vcd_writer::coarsest_exact_unit({40'000'000}, 50'000), 10'000u);
}

TEST(vcd_writer_test, coarse_unit_rounds_to_nearest_and_counts) {
    const std::string path = temp_path("rounded.vcd");
    vcd_writer w(path, fixed(10'000));  // 10 ns
    w.declare(0, {"t", "a", false});
    w.begin();
    w.change(0, true, 14'999);   // 1.4999 units: #1, rounded
    w.change(0, false, 15'000);  // 1.5 units: half goes up, #2, rounded
    w.change(0, true, 20'000);   // exact: #2
    w.change(0, false, 70'000);  // exact: #7
    EXPECT_EQ(w.rounded_changes(), 2u);
    w.end(70'000);
    const auto v = tickbench::waves_test::read_vcd(path);
    EXPECT_EQ(v.unit_ps, 10'000u);
    const std::vector<std::pair<sim::time_ps, char>> expected = {
        {10'000, '1'}, {20'000, '0'}, {20'000, '1'}, {70'000, '0'}};
    EXPECT_EQ(v.of("t.a"), expected);
    EXPECT_NE(slurp(path).find("$comment"), std::string::npos);  // says that rounding happens
}

TEST(vcd_writer_test, no_time_after_the_runs_end_even_with_a_coarse_unit) {
    const std::string path = temp_path("ended.vcd");
    sim::vcd_options o = fixed(10'000);  // 10 ns
    o.end_ps = 25'000;                   // the run ends half-way through a unit
    vcd_writer w(path, o);
    w.declare(0, {"t", "a", false});
    w.begin();
    w.change(0, true, 14'000);   // 1.4 units: #1
    w.change(0, false, 25'000);  // 2.5 units would go up to #3, after the end: #2
    EXPECT_THROW(w.change(0, true, 25'001), std::logic_error);  // after the end
    EXPECT_EQ(w.rounded_changes(), 2u);
    w.end(25'000);
    const auto v = tickbench::waves_test::read_vcd(path);
    const std::vector<std::pair<sim::time_ps, char>> expected = {{10'000, '1'}, {20'000, '0'}};
    EXPECT_EQ(v.of("t.a"), expected);
    // The final time line is the last unit at or before the end, not the nearest one.
    ASSERT_FALSE(v.times.empty());
    EXPECT_EQ(v.times.back(), 20'000u);
}

TEST(vcd_writer_test, unopenable_path_raises_output_error_naming_file_and_reason) {
    try {
        vcd_writer w("/nonexistent_folder_of_tickbench/waves.vcd");
        FAIL() << "no exception";
    } catch (const sim::output_error& e) {
        const std::string what = e.what();
        EXPECT_NE(what.find("/nonexistent_folder_of_tickbench/waves.vcd"), std::string::npos)
            << what;
        EXPECT_NE(what.find("No such file or directory"), std::string::npos) << what;
    }
    EXPECT_THROW(vcd_writer(fs::temp_directory_path().string()), sim::output_error);  // a folder
}

// Both ways of writing (a writer thread, or the calling thread) give the same bytes, and every
// time line says its time exactly: 200 000 times spread over every digit count up to 10^13 ps,
// through small buffers so that many hand-overs happen.
TEST(vcd_writer_test, writer_thread_and_calling_thread_write_the_same_exact_times) {
    std::vector<sim::time_ps> times;
    sim::time_ps t = 0;
    for (std::uint64_t k = 0; times.size() < 200'000; ++k) {
        t += 1 + (k * 7919) % (k < 100'000 ? 997 : 99'999'999);
        times.push_back(t);
    }
    std::string texts[2];
    for (const bool thread : {false, true}) {
        const std::string path = temp_path(thread ? "thread.vcd" : "caller.vcd");
        sim::vcd_options o = fixed();
        o.buffer_bytes = 4096;
        o.writer_thread = thread;
        {
            vcd_writer w(path, o);
            w.declare(0, {"t", "a", false});
            w.declare(1, {"t", "b", false});
            w.begin();
            bool level = false;
            for (const sim::time_ps at : times) {
                level = !level;
                w.change(0, level, at);
                w.change(1, level, at);
            }
            w.end(times.back());
        }
        const auto v = tickbench::waves_test::read_vcd(path);
        std::vector<sim::time_ps> expected = {0};
        expected.insert(expected.end(), times.begin(), times.end());
        EXPECT_EQ(v.times, expected) << (thread ? "writer thread" : "calling thread");
        texts[thread ? 1 : 0] = slurp(path);
    }
    EXPECT_EQ(texts[0], texts[1]);
}

TEST(vcd_writer_test, full_disk_raises_output_error) {
    if (!fs::exists("/dev/full")) GTEST_SKIP() << "no /dev/full on this system";
    for (const bool thread : {false, true}) {
        SCOPED_TRACE(thread ? "writer thread" : "calling thread");
        sim::vcd_options o = fixed();
        o.buffer_bytes = 4096;
        o.writer_thread = thread;
        vcd_writer w("/dev/full", o);
        w.declare(0, {"t", "a", false});
        w.begin();
        try {
            for (sim::time_ps t = 1; t < 10'000; ++t) w.change(0, t % 2 == 1, t);
            w.end(10'000);
            FAIL() << "no exception";
        } catch (const sim::output_error& e) {
            const std::string what = e.what();
            EXPECT_NE(what.find("/dev/full"), std::string::npos) << what;
            EXPECT_NE(what.find("No space left on device"), std::string::npos) << what;
        }
    }
}

TEST(vcd_writer_test, file_on_disk_ends_on_a_time_step_while_running) {
    const std::string path = temp_path("partial.vcd");
    sim::vcd_options o = fixed();
    o.buffer_bytes = 4096;
    vcd_writer w(path, o);
    for (sim::signal_id id = 0; id < 10; ++id)
        w.declare(id, {"t", "s" + std::to_string(id), false});
    w.begin();
    for (sim::time_ps t = 1; t <= 3000; ++t)
        for (sim::signal_id id = 0; id < 10; ++id) w.change(id, t % 2 == 1, t * 1000);
    // Not ended: what is on disk parses and ends on a complete time step (all 10 changes); the
    // step in progress stays in memory. flush() waits for the writer thread.
    w.flush();
    const auto partial = tickbench::waves_test::read_vcd(path);
    ASSERT_FALSE(partial.times.empty());
    EXPECT_EQ(partial.times.back(), 2'999'000u);
    EXPECT_EQ(partial.changes.size(), 10 * partial.times.size() - 10);  // "#0" has no changes
    EXPECT_EQ(slurp(path).back(), '\n');
    w.end(3'000'000);
    const auto whole = tickbench::waves_test::read_vcd(path);
    EXPECT_EQ(whole.changes.size(), 30'000u);
    EXPECT_EQ(whole.times.back(), 3'000'000u);
}

TEST(vcd_writer_test, destructor_finishes_the_file) {
    const std::string path = temp_path("unended.vcd");
    {
        vcd_writer w(path, fixed());
        w.declare(0, {"t", "a", false});
        w.begin();
        w.change(0, true, 700);
    }
    EXPECT_EQ(slurp(path).substr(slurp(path).size() - 8), "#700\n1!\n");
}

TEST(vcd_writer_test, misuse_is_a_logic_error) {
    vcd_writer w(temp_path("misuse.vcd"), fixed());
    EXPECT_THROW(w.declare(1, {"t", "a", false}), std::logic_error);  // ids start at 0
    w.declare(0, {"t", "a", false});
    EXPECT_THROW(w.change(0, true, 5), std::logic_error);  // before begin()
    w.begin();
    EXPECT_THROW(w.declare(1, {"t", "b", false}), std::logic_error);
    EXPECT_THROW(w.change(1, true, 5), std::logic_error);
    w.change(0, true, 10);
    EXPECT_THROW(w.change(0, false, 9), std::logic_error);  // time went back
    w.end(10);
    w.end(10);  // does nothing
    EXPECT_THROW(w.change(0, false, 11), std::logic_error);
}

}  // namespace
