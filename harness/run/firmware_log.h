#pragma once
// firmware.log, the run's output of the firmware's own log lines (tick_log), each stamped with the
// firmware's simulated time (docs/cli.md, "run"). The format is fixed so that logs of two runs diff
// cleanly and a time can be read back exactly: the time in milliseconds with exactly nine decimals
// (so exact to the picosecond), " ms", two spaces, the text:
//
//     0.833354167 ms  20 reloads seen
//
// A line break inside the text starts another line with the same stamp (every line of the file is
// stamped); a line break at the end of the text is dropped. The file is created when the run's
// outputs are, so it exists after every run, empty when the firmware logged nothing.
//
// Lines are written from the firmware's thread, where an exception must not be thrown (it would
// cross the firmware's C frames): a write failure is kept and reported by close().

#include "sim/clock_domain.h"

#include <cstdint>
#include <cstdio>
#include <string>
#include <string_view>

namespace harness::run {

class firmware_log {
public:
    // Creates (truncates) the file at `path`; throws sim::output_error naming it and the reason.
    explicit firmware_log(std::string path);
    // Closes the file if close() was not called (errors are dropped then).
    ~firmware_log();
    firmware_log(const firmware_log&) = delete;
    firmware_log& operator=(const firmware_log&) = delete;

    // Writes `text` logged at `at`. Does nothing after close() or after a failed write.
    void write(sim::time_ps at, std::string_view text);
    // Flushes and closes the file; throws sim::output_error for this or an earlier write failure.
    // Later calls do nothing.
    void close();

    // Lines written so far.
    std::uint64_t lines() const { return lines_; }
    // The file being written.
    const std::string& path() const { return path_; }

    // "0.833354167 ms": `at` in milliseconds with exactly nine decimals.
    static std::string stamp(sim::time_ps at);
    // The file's lines for `text` logged at `at`, each ending in '\n'.
    static std::string format(sim::time_ps at, std::string_view text);

private:
    std::string path_;
    std::FILE* file_ = nullptr;
    std::uint64_t lines_ = 0;
    int error_ = 0;  // errno of the first failed write
};

}  // namespace harness::run
