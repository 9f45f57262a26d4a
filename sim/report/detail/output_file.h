#pragma once
// Writing a finished report file in one go, with errors that name the file and the system's reason.
// Internal to sim/report.

#include <string>

namespace sim::detail {

// Creates (truncates) `path` and writes `text` to it, then flushes and closes it; throws
// sim::output_error ("cannot write out/junit.xml: No space left on device") on any failure.
void write_output_file(const std::string& path, const std::string& text);

}  // namespace sim::detail
