// firmware.log (harness/run/firmware_log.h): every tick_log() line stamped with the exact simulated
// time in a fixed format, the file created up front, and write failures reported at close().

#include "harness/run/firmware_log.h"

#include "sim/vcd_writer.h"  // sim::output_error
#include "tests/support/temp_files.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <string>

namespace {

using harness::run::firmware_log;
namespace fs = std::filesystem;

using tickbench::test_support::read_whole_file;

// A fresh file name in the test's temporary folder.
std::string temp_path(const std::string& name) {
    return tickbench::test_support::temp_path("tickbench_firmware_log", name);
}

TEST(firmware_log_test, stamps_are_milliseconds_with_nine_exact_decimals) {
    EXPECT_EQ(firmware_log::stamp(0), "0.000000000 ms");
    EXPECT_EQ(firmware_log::stamp(1), "0.000000001 ms");  // 1 ps
    EXPECT_EQ(firmware_log::stamp(833'354'167), "0.833354167 ms");
    EXPECT_EQ(firmware_log::stamp(40'000'000'000), "40.000000000 ms");
    // 10 simulated minutes and 1 ps.
    EXPECT_EQ(firmware_log::stamp(600'000'000'000'001), "600000.000000001 ms");
}

TEST(firmware_log_test, every_line_of_a_text_is_stamped) {
    EXPECT_EQ(firmware_log::format(5, "duty 40 %"), "0.000000005 ms  duty 40 %\n");
    // A trailing line break (printf habit) is dropped; an inner one starts a stamped line.
    EXPECT_EQ(firmware_log::format(5, "a\n"), "0.000000005 ms  a\n");
    EXPECT_EQ(firmware_log::format(5, "a\nb"), "0.000000005 ms  a\n0.000000005 ms  b\n");
    // An empty text is a stamp alone, without trailing blanks.
    EXPECT_EQ(firmware_log::format(5, ""), "0.000000005 ms\n");
}

TEST(firmware_log_test, the_file_exists_from_the_start_and_holds_every_line) {
    const std::string path = temp_path("firmware.log");
    firmware_log log(path);
    EXPECT_TRUE(fs::exists(path));
    log.write(1'000'000'000, "first");
    log.write(2'500'000'000, "second\nthird");
    EXPECT_EQ(log.lines(), 3u);
    log.close();
    log.close();                    // does nothing
    log.write(3'000'000'000, "x");  // after close: nothing
    EXPECT_EQ(read_whole_file(path),
              "1.000000000 ms  first\n2.500000000 ms  second\n2.500000000 ms  third\n");
    const std::string empty = temp_path("empty.log");
    firmware_log none(empty);
    none.close();
    EXPECT_TRUE(fs::exists(empty));
    EXPECT_EQ(read_whole_file(empty), "");
}

TEST(firmware_log_test, failures_name_the_file_and_the_reason) {
    try {
        firmware_log log("/nonexistent-tickbench-dir/firmware.log");
        FAIL() << "no error";
    } catch (const sim::output_error& e) {
        EXPECT_STREQ(e.what(),
                     "cannot create /nonexistent-tickbench-dir/firmware.log: No such file or "
                     "directory");
    }
    if (!fs::exists("/dev/full")) GTEST_SKIP() << "no /dev/full on this system";
    firmware_log full("/dev/full");
    // Writes never throw (they come from the firmware's thread); close() reports the failure.
    for (int i = 0; i < 10'000; ++i) full.write(0, "a line of the firmware's log");
    try {
        full.close();
        FAIL() << "no error";
    } catch (const sim::output_error& e) {
        EXPECT_STREQ(e.what(), "cannot write /dev/full: No space left on device");
    }
}

}  // namespace
