#pragma once
// Logging of the tickbench command: one stderr logger, every line stamped with the simulated time
// once a simulation runs ("tickbench: info: @ 12.5 us: ..."), so logs diff cleanly between runs.

#include <string>

namespace harness::run {

// Makes the default logger (and every logger created later) write to stderr at `level` ("trace"
// .. "off") with the simulated-time stamp.
void set_up_logging(const std::string& level);
// From now on log lines carry the kernel's simulated time.
void stamp_simulated_time(bool on);

}  // namespace harness::run
